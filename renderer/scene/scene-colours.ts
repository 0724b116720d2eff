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
  ignition: { hex: '#f4f1ea', name: 'off-white ball and drop line' },
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
