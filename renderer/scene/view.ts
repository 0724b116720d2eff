/**
 * Pure helpers for the scene's view furniture: preset camera poses, scale bar, north arrow.
 * Scene frame: x east, y north, z up.
 */
import { PerspectiveCamera, Vector3 } from 'three';

export interface SceneBounds {
  minEast: number;
  maxEast: number;
  minNorth: number;
  maxNorth: number;
  minZ: number;
  maxZ: number;
  /** Height the camera orbits around (default: middle of minZ…maxZ); the ground, not a point in the air. */
  focusZ?: number;
}

export interface CameraPose {
  position: [number, number, number];
  target: [number, number, number];
}

export type ViewPreset = 'top' | 'oblique';

/**
 * Camera pose that frames the bounds. `top`: straight down, north up. `oblique`: from the
 * south-south-west, 35° above the horizon (shows relief without hiding the far side).
 */
export function presetPose(preset: ViewPreset, b: SceneBounds, verticalFov_deg: number, aspect: number): CameraPose {
  const cx = (b.minEast + b.maxEast) / 2;
  const cy = (b.minNorth + b.maxNorth) / 2;
  const cz = b.focusZ ?? (b.minZ + b.maxZ) / 2;
  const halfWidth = (b.maxEast - b.minEast) / 2;
  const halfHeight = (b.maxNorth - b.minNorth) / 2;
  const fov = (verticalFov_deg * Math.PI) / 180;
  // Distance at which the larger half-extent fills the view (horizontal fov from the aspect ratio).
  const hfov = 2 * Math.atan(Math.tan(fov / 2) * aspect);
  const fit = Math.max(halfHeight / Math.tan(fov / 2), halfWidth / Math.tan(hfov / 2)) * 1.08;
  if (preset === 'top') return { position: [cx, cy, b.maxZ + fit], target: [cx, cy, cz] };
  const elevation = (35 * Math.PI) / 180;
  const azimuth = (200 * Math.PI) / 180; // direction from target to camera, clockwise from north
  const d = fit;
  return {
    position: [cx + d * Math.cos(elevation) * Math.sin(azimuth), cy + d * Math.cos(elevation) * Math.cos(azimuth), cz + d * Math.sin(elevation)],
    target: [cx, cy, cz],
  };
}

/** Largest 1, 2 or 5 × 10ᵏ not above `max`. */
export function niceLength(max: number): number {
  if (!(max > 0) || !Number.isFinite(max)) throw new Error(`invalid scale length: ${max} (must be a positive number)`);
  const magnitude = 10 ** Math.floor(Math.log10(max));
  for (const m of [5, 2, 1]) if (m * magnitude <= max * (1 + 1e-12)) return m * magnitude;
  return magnitude;
}

export function formatDistance(metres: number): string {
  return metres >= 1000 ? `${Number((metres / 1000).toPrecision(6))} km` : `${Number(metres.toPrecision(6))} m`;
}

/** A scale bar at most `maxPixels` long for a view showing `metresPerPixel` at its centre. */
export function scaleBar(metresPerPixel: number, maxPixels: number): { length_m: number; pixels: number; label: string } {
  const length_m = niceLength(metresPerPixel * maxPixels);
  return { length_m, pixels: length_m / metresPerPixel, label: formatDistance(length_m) };
}

/** Ground metres per screen pixel at distance `distance_m` for a perspective camera. */
export function metresPerPixel(distance_m: number, verticalFov_deg: number, viewportHeight_px: number): number {
  return (2 * distance_m * Math.tan((verticalFov_deg * Math.PI) / 360)) / viewportHeight_px;
}

/**
 * Screen angle of north, radians clockwise from screen-up, from the camera's world matrix
 * (column-major 4×4, as three.js Matrix4.elements). North (0, 1, 0) is projected onto the camera's
 * right (column 0) and up (column 1) axes.
 */
export function northAngle(cameraWorld: ArrayLike<number>): number {
  const right = cameraWorld[1]; // right-axis north component
  const up = cameraWorld[5]; // up-axis north component
  return Math.atan2(right, up);
}

/** Keep screen labels at least `spacing_px` apart, in the given order of priority. */
export function declutter<T extends { x: number; y: number }>(labels: readonly T[], spacing_px: number): T[] {
  const kept: T[] = [];
  for (const label of labels) if (kept.every((k) => Math.hypot(k.x - label.x, k.y - label.y) >= spacing_px)) kept.push(label);
  return kept;
}

/**
 * Distance from the camera along its view direction to the horizontal plane z = groundZ, or null
 * when the view does not point down at it. The scale bar is true on that plane.
 */
export function distanceToGround(position: readonly number[], direction: readonly number[], groundZ: number): number | null {
  const length = Math.hypot(direction[0], direction[1], direction[2]);
  const dz = direction[2] / length;
  if (dz > -1e-6) return null;
  const t = (groundZ - position[2]) / dz;
  return t > 0 ? t : null;
}

/**
 * Move the camera along the line from `pose.target` through `pose.position` until every corner of
 * `bounds` projects inside ±`margin` of the view (normalised device coordinates), as close as
 * possible. Bisection on the distance; 40 halvings are far below a pixel.
 */
export function fitPose(pose: CameraPose, b: SceneBounds, verticalFov_deg: number, aspect: number, margin = 0.9): CameraPose {
  const camera = new PerspectiveCamera(verticalFov_deg, aspect, 0.1, 1e9);
  camera.up.set(0, 0, 1);
  const target = new Vector3(...pose.target);
  const dir = new Vector3(...pose.position).sub(target).normalize();
  const corners: Vector3[] = [];
  for (const e of [b.minEast, b.maxEast]) for (const n of [b.minNorth, b.maxNorth]) for (const z of [b.minZ, b.maxZ]) corners.push(new Vector3(e, n, z));
  const fits = (d: number) => {
    camera.position.copy(target).addScaledVector(dir, d);
    camera.lookAt(target);
    camera.updateMatrixWorld();
    return corners.every((c) => {
      const p = c.clone().project(camera);
      return p.z < 1 && p.z > -1 && Math.abs(p.x) <= margin && Math.abs(p.y) <= margin;
    });
  };
  const size = Math.hypot(b.maxEast - b.minEast, b.maxNorth - b.minNorth, b.maxZ - b.minZ);
  let lo = 0;
  let hi = size * 50;
  if (!fits(hi)) return pose;
  for (let k = 0; k < 40; k++) {
    const mid = (lo + hi) / 2;
    if (fits(mid)) hi = mid;
    else lo = mid;
  }
  const position = target.clone().addScaledVector(dir, hi);
  return { position: [position.x, position.y, position.z], target: pose.target };
}

/** "Nice" tick values (1, 2, 2.5 or 5 × 10ᵏ apart) inside [lo, hi], about `count` of them, 0 included when in range. */
export function niceTicks(lo: number, hi: number, count: number): number[] {
  if (!(hi > lo) || count < 1) return [];
  const raw = (hi - lo) / count;
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * magnitude).find((x) => x >= raw) ?? 10 * magnitude;
  const out: number[] = [];
  for (let k = Math.ceil(lo / step); k * step <= hi + step * 1e-9; k++) out.push(Number((k * step).toPrecision(12)));
  return out;
}

/** Signed distance label for an axis tick: "−2 km", "0 m", "500 m". */
export function formatAxisTick(metres: number): string {
  if (metres === 0) return '0 m';
  return `${metres < 0 ? '−' : ''}${formatDistance(Math.abs(metres))}`;
}

/** What the default view frames, in scene metres before exaggeration (x east, y north, heights on the DEM's datum). */
export interface DivertExtent {
  /** Terrain drawn: its outer sample centres and its height range. */
  terrain: { west_m: number; east_m: number; south_m: number; north_m: number; lo_m: number; hi_m: number };
  /** Other things drawn (ignition point, trajectory samples, footprint corners, sites): east, north, height. */
  points: readonly (readonly [number, number, number])[];
}

/**
 * The box the scene frames by default: the terrain, the ignition point, the trajectories and the footprint
 * together (the whole divert), heights scaled by `exaggeration`. The camera orbits about the ground (focusZ:
 * the middle of the terrain's heights), not a point in the air. A margin of 8 % of the span on the south and
 * west sides leaves room for the axis labels drawn outside those edges.
 */
export function divertBounds(extent: DivertExtent, exaggeration: number): SceneBounds {
  const t = extent.terrain;
  let minEast = t.west_m, maxEast = t.east_m, minNorth = t.south_m, maxNorth = t.north_m;
  let lo = t.lo_m, hi = t.hi_m;
  for (const [e, n, h] of extent.points) {
    if (!Number.isFinite(e) || !Number.isFinite(n) || !Number.isFinite(h)) continue;
    minEast = Math.min(minEast, e); maxEast = Math.max(maxEast, e);
    minNorth = Math.min(minNorth, n); maxNorth = Math.max(maxNorth, n);
    lo = Math.min(lo, h); hi = Math.max(hi, h);
  }
  const margin = Math.max(maxEast - minEast, maxNorth - minNorth) * 0.08;
  return {
    minEast: minEast - margin,
    maxEast,
    minNorth: minNorth - margin,
    maxNorth,
    minZ: lo * exaggeration,
    maxZ: hi * exaggeration,
    focusZ: ((t.lo_m + t.hi_m) / 2) * exaggeration,
  };
}

/**
 * The pose looking along the same direction as `from` (camera position minus target), re-centred on `bounds`
 * and moved as close as every corner allows (fitPose): used when what is framed changes (exaggeration, a new
 * footprint) so the user's viewing direction is kept and nothing drawn leaves the view.
 */
export function poseAlong(from: CameraPose, b: SceneBounds, verticalFov_deg: number, aspect: number): CameraPose {
  const d = new Vector3(...from.position).sub(new Vector3(...from.target));
  if (!(d.length() > 0)) return fitPose(presetPose('oblique', b, verticalFov_deg, aspect), b, verticalFov_deg, aspect);
  d.normalize();
  const target: [number, number, number] = [(b.minEast + b.maxEast) / 2, (b.minNorth + b.maxNorth) / 2, b.focusZ ?? (b.minZ + b.maxZ) / 2];
  const size = Math.hypot(b.maxEast - b.minEast, b.maxNorth - b.minNorth, b.maxZ - b.minZ);
  const start: [number, number, number] = [target[0] + d.x * size * 4, target[1] + d.y * size * 4, target[2] + d.z * size * 4];
  return fitPose({ position: start, target }, b, verticalFov_deg, aspect);
}

/** True when box `outer` holds box `inner` (a footprint or trajectory inside what is framed needs no new fit). */
export function boundsContain(outer: SceneBounds, inner: SceneBounds): boolean {
  return inner.minEast >= outer.minEast && inner.maxEast <= outer.maxEast && inner.minNorth >= outer.minNorth && inner.maxNorth <= outer.maxNorth && inner.minZ >= outer.minZ && inner.maxZ <= outer.maxZ;
}
