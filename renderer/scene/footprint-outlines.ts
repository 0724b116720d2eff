/**
 * Footprint region outlines (propellant contours and the reserve boundary, GeoJSON rings in local metres
 * from core/footprint) as line segments laid on the terrain surface, with one label per outline. The rings
 * come at the footprint grid's spacing, often far coarser than the terrain's: each edge is cut at the
 * terrain's pixel size so the line follows the relief between ring vertices instead of cutting through a
 * ridge or floating over a valley. Where there is no terrain (past the DEM's edge, no-data) the line lies on
 * the plane of the nominal target's ground (elevation-grid.ts targetGroundHeight): the landing plane the
 * footprint was solved on, never an arbitrary height.
 */
import { BufferAttribute, BufferGeometry } from 'three';
import { surfaceHeight, targetGroundHeight, type ElevationGrid } from './elevation-grid.ts';
import type { ContourLabel } from './contour-lines.ts';

export interface FootprintOutline {
  /** MultiPolygon coordinates: polygons → rings → [east_m, north_m] points. */
  coordinates: number[][][][];
  /** Level of the outline, kg (its label). */
  level_kg: number;
  /** The reserve boundary: drawn bold and bright. */
  emphasis: boolean;
}

/**
 * Scene positions (x, y, z per vertex, flattened) of a polyline laid on the surface: every edge cut into
 * pieces no longer than `step_m`, each vertex at (surface height + lift) × exaggeration.
 */
export function drapePolyline(points: readonly (readonly number[])[], grid: ElevationGrid, options: { exaggeration: number; lift_m: number; step_m?: number; plane_m?: number }): number[] {
  const step = options.step_m ?? grid.pixelSize_m;
  if (!(step > 0)) throw new Error(`invalid step_m: ${step} (must be a positive number of metres)`);
  const plane = options.plane_m ?? targetGroundHeight(grid);
  const z = (e: number, n: number) => (surfaceHeight(grid, e, n, plane) + options.lift_m) * options.exaggeration;
  const out: number[] = [];
  if (!points.length) return out;
  out.push(points[0][0], points[0][1], z(points[0][0], points[0][1]));
  for (let k = 1; k < points.length; k++) {
    const [e0, n0] = points[k - 1];
    const [e1, n1] = points[k];
    const pieces = Math.max(1, Math.min(10000, Math.ceil(Math.hypot(e1 - e0, n1 - n0) / step)));
    for (let s = 1; s <= pieces; s++) {
      const t = s / pieces;
      const e = e0 + t * (e1 - e0);
      const n = n0 + t * (n1 - n0);
      out.push(e, n, z(e, n));
    }
  }
  return out;
}

/** Line segments of every ring laid on the surface (drapePolyline), and a label on the longest ring. */
export function buildOutlineGeometry(outline: FootprintOutline, grid: ElevationGrid, exaggeration: number, lift_m: number): { geometry: BufferGeometry; label: ContourLabel | null } {
  const coords: number[] = [];
  const plane = targetGroundHeight(grid);
  let label: ContourLabel | null = null;
  let longest = 0;
  for (const polygon of outline.coordinates) {
    for (const ring of polygon) {
      const strip = drapePolyline(ring, grid, { exaggeration, lift_m, plane_m: plane });
      for (let k = 3; k < strip.length; k += 3) coords.push(strip[k - 3], strip[k - 2], strip[k - 1], strip[k], strip[k + 1], strip[k + 2]);
      if (ring.length > longest) {
        longest = ring.length;
        // Labels sit on the northern-most point of the longest ring, where they overlap the drape least.
        const top = ring.reduce((best, p) => (p[1] > best[1] ? p : best), ring[0]);
        label = { value: outline.level_kg, unit: 'kg', position: [top[0], top[1], (surfaceHeight(grid, top[0], top[1], plane) + lift_m) * exaggeration] };
      }
    }
  }
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(new Float32Array(coords), 3));
  return { geometry, label };
}
