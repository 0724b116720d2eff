/**
 * three.js objects for the markers over the terrain: nominal-target ring, ignition point with its
 * drop line, trajectories (path + thrust vectors) and the landing ellipse. Built from plain data by
 * the pure geometry builders; no renderer needed, so this is unit-tested in Node.
 */
import { BufferAttribute, BufferGeometry, Color, Line, LineBasicMaterial, LineDashedMaterial, LineSegments, Mesh, MeshBasicMaterial, MeshLambertMaterial, SphereGeometry, type Object3D } from 'three';
import { heightRange, surfaceHeight, targetGroundHeight, type ElevationGrid } from './elevation-grid.ts';
import { formatAxisTick, niceTicks } from './view.ts';
import { dropLinePositions, ellipsePositions, lineGeometry, ringPositions } from './markers.ts';
import { buildTrajectoryGeometry, type TrajectorySamples } from './trajectory-lines.ts';
import { TRAJECTORY_COLOURS } from '../plots/palette.ts';
import { SCENE_COLOURS } from './scene-colours.ts';
import { buildHazardGeometry } from './hazard-overlay.ts';

/** A trajectory to draw: samples relative to the target, as core/descent returns them. */
export interface SceneTrajectory {
  samples: TrajectorySamples;
  thrustMax_N: number;
  /** CSS colour; defaults cycle through the colour-blind-safe series palette. */
  color?: string;
  /** A baseline flight path to the same target (east, north, up per sample, flattened), drawn dashed. */
  baseline?: { position_m: ArrayLike<number> };
}

/** Landing dispersion ellipse around the nominal target. */
export interface LandingEllipse {
  semiMajor_m: number;
  semiMinor_m: number;
  /** Major-axis direction, degrees clockwise from north. */
  azimuth_deg: number;
  /** Centre, m east and north of the nominal target (default 0, 0). */
  centreEast_m?: number;
  centreNorth_m?: number;
}

export interface IgnitionMarker {
  east_m: number;
  north_m: number;
  altitude_m: number;
}

/** A target the user picked on the terrain. */
export interface PickedTarget {
  east_m: number;
  north_m: number;
}

export interface MarkerInputs {
  ignition: IgnitionMarker | null;
  trajectories: readonly SceneTrajectory[];
  ellipse: LandingEllipse | null;
  /** Picked targets, drawn as double rings in the colour their trajectory will have. */
  picks?: readonly PickedTarget[];
  /** Ranked landing sites, best first: numbered pins. */
  sites?: readonly PickedTarget[];
  /** Share of safe ∩ reachable ground per terrain sample (0 … 1): cells whose four samples are at least half so are tinted. */
  safeReachable?: Float32Array | null;
}

export { TRAJECTORY_COLOURS };
const MARKER_INK = SCENE_COLOURS.ignition.hex;

export function buildMarkerObjects(grid: ElevationGrid, exaggeration: number, inputs: MarkerInputs): Object3D[] {
  const ex = exaggeration;
  // Where there is no terrain, markers lie on the plane of the target's ground (the landing plane).
  const base = targetGroundHeight(grid);
  // Lines sit 2 m above the ground so the terrain does not swallow them.
  const ground = (e: number, n: number) => (surfaceHeight(grid, e, n, base) + 2) * ex;
  const span = (grid.width - 1) * grid.pixelSize_m;
  const objects: Object3D[] = [];

  const target = new Line(lineGeometry(ringPositions(0, 0, span / 60, 48, ground)), new LineBasicMaterial({ color: SCENE_COLOURS.target.hex }));
  target.name = 'nominal-target';
  objects.push(target);

  if (inputs.ignition) {
    const { east_m, north_m, altitude_m } = inputs.ignition;
    const z = (base + altitude_m) * ex;
    // Sized to the whole approach, not the terrain alone: the view frames both, and a small DEM under a long
    // approach would leave a terrain-sized ball invisible.
    const ball = new Mesh(new SphereGeometry(Math.max(span, Math.hypot(east_m, north_m, altitude_m * ex)) / 150, 16, 12), new MeshLambertMaterial({ color: MARKER_INK, emissive: 0x404040 }));
    ball.position.set(east_m, north_m, z);
    ball.name = 'ignition-point';
    const drop = new Line(lineGeometry(dropLinePositions(east_m, north_m, z, ground(east_m, north_m))), new LineBasicMaterial({ color: MARKER_INK, transparent: true, opacity: 0.6 }));
    drop.name = 'ignition-drop-line';
    objects.push(ball, drop);
  }

  inputs.trajectories.forEach((t, k) => {
    const color = new Color(t.color ?? TRAJECTORY_COLOURS[k % TRAJECTORY_COLOURS.length]);
    const { path, vectors } = buildTrajectoryGeometry(t.samples, { baseHeight_m: base, exaggeration: ex, vectorEvery: 5, vectorLength_m: span / 25, thrustMax_N: t.thrustMax_N });
    const line = new Line(path, new LineBasicMaterial({ color }));
    line.name = `trajectory-${k}`;
    const arrows = new LineSegments(vectors, new LineBasicMaterial({ color, transparent: true, opacity: 0.75 }));
    arrows.name = `thrust-vectors-${k}`;
    objects.push(line, arrows);
    if (t.baseline && t.baseline.position_m.length >= 6) {
      const dashed = new Line(baselinePathGeometry(t.baseline.position_m, base, ex), new LineDashedMaterial({ color, dashSize: span / 120, gapSize: span / 160 }));
      dashed.computeLineDistances();
      dashed.name = `baseline-${k}`;
      objects.push(dashed);
    }
  });

  (inputs.picks ?? []).forEach((p, k) => {
    const material = new LineBasicMaterial({ color: new Color(TRAJECTORY_COLOURS[k % TRAJECTORY_COLOURS.length]) });
    for (const [radius, part] of [[span / 90, 'outer'], [span / 160, 'inner']] as const) {
      const ring = new Line(lineGeometry(ringPositions(p.east_m, p.north_m, radius, 40, ground)), material);
      ring.name = `pick-${k}-${part}`;
      objects.push(ring);
    }
  });

  if (inputs.ellipse) {
    const { semiMajor_m, semiMinor_m, azimuth_deg, centreEast_m = 0, centreNorth_m = 0 } = inputs.ellipse;
    const ellipse = new Line(lineGeometry(ellipsePositions(centreEast_m, centreNorth_m, semiMajor_m, semiMinor_m, azimuth_deg, 96, ground)), new LineBasicMaterial({ color: SCENE_COLOURS.ellipse.hex }));
    ellipse.name = 'landing-ellipse';
    objects.push(ellipse);
  }

  if (inputs.safeReachable) {
    if (inputs.safeReachable.length !== grid.heights.length) throw new Error(`invalid safe ∩ reachable share: ${inputs.safeReachable.length} values for ${grid.heights.length} terrain samples`);
    const mask = Uint8Array.from(inputs.safeReachable, (v) => (v >= 0.5 ? 1 : 0));
    const tint = new Mesh(
      buildHazardGeometry(grid, mask, { exaggeration: ex, lift_m: 1.5, cells: 'all' }),
      new MeshBasicMaterial({ color: SCENE_COLOURS.safeReachable.hex, transparent: true, opacity: 0.4, depthWrite: false }),
    );
    tint.name = 'safe-reachable';
    objects.push(tint);
  }

  (inputs.sites ?? []).forEach((s, k) => {
    // A pin: a stick a twentieth of the terrain's span tall, a ring at its foot.
    const material = new LineBasicMaterial({ color: SCENE_COLOURS.sites.hex });
    const foot = ground(s.east_m, s.north_m);
    const pin = new LineSegments(lineGeometry(new Float32Array([s.east_m, s.north_m, foot, s.east_m, s.north_m, foot + (span / 20) * Math.min(ex, 3)])), material);
    pin.name = `site-${k}`;
    const ring = new Line(lineGeometry(ringPositions(s.east_m, s.north_m, span / 120, 24, ground)), material);
    ring.name = `site-${k}-ring`;
    objects.push(pin, ring);
  });
  return objects;
}

/** Where a site's number is written: the top of its pin (scene coordinates), as buildMarkerObjects draws it. */
export function siteLabelPositions(grid: ElevationGrid, exaggeration: number, sites: readonly PickedTarget[]): AxisLabel[] {
  const base = targetGroundHeight(grid);
  const span = (grid.width - 1) * grid.pixelSize_m;
  return sites.map((s, k) => ({
    text: String(k + 1),
    position: [s.east_m, s.north_m, (surfaceHeight(grid, s.east_m, s.north_m, base) + 2) * exaggeration + (span / 20) * Math.min(exaggeration, 3)],
  }));
}

/** Scene positions of a baseline path (same frame and exaggeration as the trajectories). */
export function baselinePathGeometry(position_m: ArrayLike<number>, baseHeight_m: number, exaggeration: number): BufferGeometry {
  const n = Math.floor(position_m.length / 3);
  const out = new Float32Array(3 * n);
  for (let i = 0; i < n; i++) {
    out[3 * i] = position_m[3 * i];
    out[3 * i + 1] = position_m[3 * i + 1];
    out[3 * i + 2] = (baseHeight_m + position_m[3 * i + 2]) * exaggeration;
  }
  return lineGeometry(out);
}

export interface AxisLabel {
  text: string;
  position: [number, number, number];
}

/**
 * Metre-ticked axes framing the terrain: an east axis along the south edge and a north axis along
 * the west edge, at a level just below the lowest ground so relief never hides them, with ticks
 * pointing outwards and one label per tick (distances from the nominal target).
 */
export function buildAxisObjects(grid: ElevationGrid, exaggeration: number, tickCount = 6): { object: LineSegments; labels: AxisLabel[] } {
  const west = grid.west_m;
  const east = grid.west_m + (grid.width - 1) * grid.pixelSize_m;
  const north = grid.north_m;
  const south = grid.north_m - (grid.height - 1) * grid.pixelSize_m;
  const [lo, hi] = heightRange(grid.heights);
  const z = (lo - 0.02 * (hi - lo || 1)) * exaggeration;
  const tick = Math.max(east - west, north - south) / 60;
  const coords: number[] = [west, south, z, east, south, z, west, south, z, west, north, z];
  const labels: AxisLabel[] = [];
  for (const x of niceTicks(west, east, tickCount)) {
    coords.push(x, south, z, x, south - tick, z);
    labels.push({ text: formatAxisTick(x), position: [x, south - 3 * tick, z] });
  }
  for (const y of niceTicks(south, north, tickCount)) {
    // The south-west corner already carries the east axis's first label.
    if (Math.abs(y - south) < 1e-6 * (north - south)) continue;
    coords.push(west, y, z, west - tick, y, z);
    labels.push({ text: formatAxisTick(y), position: [west - 4 * tick, y, z] });
  }
  labels.push({ text: 'E', position: [east + 3 * tick, south, z] }, { text: 'N', position: [west, north + 3 * tick, z] });
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(new Float32Array(coords), 3));
  const object = new LineSegments(geometry, new LineBasicMaterial({ color: 0x8c9aa7 }));
  object.name = 'axes';
  return { object, labels };
}
