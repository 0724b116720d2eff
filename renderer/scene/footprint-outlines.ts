/**
 * Footprint region outlines (propellant contours and the reserve boundary, GeoJSON rings in local metres
 * from core/footprint) as line segments draped just above the terrain, with one label per outline.
 */
import { BufferAttribute, BufferGeometry } from 'three';
import { sampleHeight, type ElevationGrid } from './elevation-grid.ts';
import type { ContourLabel } from './contour-lines.ts';

export interface FootprintOutline {
  /** MultiPolygon coordinates: polygons → rings → [east_m, north_m] points. */
  coordinates: number[][][][];
  /** Level of the outline, kg (its label). */
  level_kg: number;
  /** The reserve boundary: drawn bold and bright. */
  emphasis: boolean;
}

/** Segments of every ring, each point at the terrain height + lift (NaN off the terrain: height 0). */
export function buildOutlineGeometry(outline: FootprintOutline, grid: ElevationGrid, exaggeration: number, lift_m: number): { geometry: BufferGeometry; label: ContourLabel | null } {
  const coords: number[] = [];
  const at = (p: number[]): [number, number, number] => {
    const h = sampleHeight(grid, p[0], p[1]);
    return [p[0], p[1], ((Number.isNaN(h) ? 0 : h) + lift_m) * exaggeration];
  };
  let label: ContourLabel | null = null;
  let longest = 0;
  for (const polygon of outline.coordinates) {
    for (const ring of polygon) {
      for (let k = 1; k < ring.length; k++) coords.push(...at(ring[k - 1]), ...at(ring[k]));
      if (ring.length > longest) {
        longest = ring.length;
        // Labels sit on the northern-most point of the longest ring, where they overlap the drape least.
        const top = ring.reduce((best, p) => (p[1] > best[1] ? p : best), ring[0]);
        label = { value: outline.level_kg, unit: 'kg', position: at(top) };
      }
    }
  }
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(new Float32Array(coords), 3));
  return { geometry, label };
}
