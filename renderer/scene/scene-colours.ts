/**
 * The colours of what the scene draws over the terrain, each with the name the legend gives it: one source
 * for the three.js objects (scene-objects.ts, terrain-scene.ts) and the legend (SceneView.svelte). Chosen to
 * differ from one another, from the viridis drape and from the trajectory colours (plots/palette.ts,
 * Okabe–Ito), and to be told apart by shape too (ring, ball, outline, tint, pin, stripes), not by colour alone.
 */
export const SCENE_COLOURS = {
  /** Nominal target: a ring on the ground. */
  target: { hex: '#ff3b3b', name: 'red ring' },
  /** Ignition point: a ball in the air with a drop line to the ground. */
  ignition: { hex: '#9dff3d', name: 'lime ball and drop line' },
  /** Reachable with the reserve kept: the footprint's boundary, bold. */
  reserve: { hex: '#ffffff', name: 'white outline' },
  /** Propellant contours inside the reserve boundary. */
  contours: { hex: '#bdb7ad', name: 'grey lines' },
  /** Landing dispersion ellipse (dispersion study). */
  ellipse: { hex: '#ff3df2', name: 'magenta ellipse' },
  /** Safe ∩ reachable with the reserve kept: a tint over the drape. */
  safeReachable: { hex: '#00d8ff', name: 'cyan tint' },
  /** Ranked landing sites: numbered pins. */
  sites: { hex: '#111111', name: 'black pins, numbered' },
  /** Hazards: stripes, not a colour (hazard-overlay.ts), so they never hide the drape's colours. */
  hazard: { hex: '#fafafa', name: 'pale diagonal stripes' },
} as const;

/** One legend line: a key (its colour and shape) and what it marks. */
export interface LegendEntry {
  /** `legend-…` test id, and the key for lists. */
  id: string;
  colour: string;
  shape: 'ring' | 'ball' | 'line' | 'bold-line' | 'fill' | 'pin' | 'stripes';
  text: string;
}

/** What the scene shows, as far as the legend needs to know. */
export interface LegendState {
  ignition: boolean;
  hazards: boolean;
  /** The reserve boundary's level, kg, when a footprint is shown. */
  reserve_kg: number | null;
  contours: boolean;
  /** Safe ∩ reachable area, m², and the number of sites, when laid on the terrain. */
  safeReachable: { area_m2: number; sites: number } | null;
  ellipse: boolean;
  /** Colour of the first trajectory, when any is drawn. */
  trajectory: string | null;
}

/** The legend's entries for everything drawn over the terrain, in drawing order; the HTML legend and exported figures share them. */
export function legendEntries(s: LegendState): LegendEntry[] {
  const c = SCENE_COLOURS;
  const out: LegendEntry[] = [{ id: 'legend-target', colour: c.target.hex, shape: 'ring', text: `${c.target.name}: nominal target` }];
  if (s.ignition) out.push({ id: 'legend-ignition', colour: c.ignition.hex, shape: 'ball', text: `${c.ignition.name}: ignition point` });
  if (s.hazards) out.push({ id: 'legend-hazard', colour: c.hazard.hex, shape: 'stripes', text: `${c.hazard.name}: hazard (slope, roughness or unknown)` });
  if (s.reserve_kg !== null) {
    out.push({ id: 'reserve-legend', colour: c.reserve.hex, shape: 'bold-line', text: `${c.reserve.name}: reachable with the reserve kept (≤ ${s.reserve_kg} kg)` });
    if (s.contours) out.push({ id: 'legend-contours', colour: c.contours.hex, shape: 'line', text: `${c.contours.name}: propellant contours (kg)` });
  }
  if (s.safeReachable) {
    out.push({ id: 'safe-reachable-legend', colour: c.safeReachable.hex, shape: 'fill', text: `${c.safeReachable.name}: safe ∩ reachable, ${(s.safeReachable.area_m2 / 1e6).toFixed(3)} km²` });
    if (s.safeReachable.sites) out.push({ id: 'legend-sites', colour: c.sites.hex, shape: 'pin', text: `${c.sites.name}: landing sites (list)` });
  }
  if (s.ellipse) out.push({ id: 'ellipse-legend', colour: c.ellipse.hex, shape: 'ring', text: `${c.ellipse.name}: landing dispersion without divert` });
  if (s.trajectory) out.push({ id: 'legend-trajectories', colour: s.trajectory, shape: 'line', text: 'coloured paths: trajectories to the picked targets, thrust ticks' });
  return out;
}
