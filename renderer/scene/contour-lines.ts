/**
 * Contour lines over the terrain from GeoJSON MultiPolygons as d3-contour returns them. d3-contour
 * works in grid space where sample (column i, row j) sits at (i + 0.5, j + 0.5); this module maps
 * those points to scene metres, lifts them onto the (exaggerated) terrain and returns line segments
 * plus one label anchor per level.
 */
import { BufferAttribute, BufferGeometry } from 'three';
import { contours } from 'd3-contour';
import { columnToEast, rowToNorth, surfaceHeight, type ElevationGrid } from './elevation-grid.ts';

/** The shape of d3-contour's output (a GeoJSON MultiPolygon with the threshold as `value`). */
export interface ContourMultiPolygon {
  type: 'MultiPolygon';
  value: number;
  coordinates: number[][][][];
}

export interface ContourLabel {
  value: number;
  /** Unit shown after the value; default "m" (terrain height). */
  unit?: string;
  position: [number, number, number];
}

export interface ContourOptions {
  exaggeration?: number;
  /** Height above the terrain surface, metres before exaggeration, so lines are not hidden in it. */
  lift_m?: number;
}

/** Contours of `values` (one per grid sample, row-major) at the given thresholds, via d3-contour. */
export function computeContours(values: ArrayLike<number>, width: number, height: number, thresholds: number[]): ContourMultiPolygon[] {
  return contours().size([width, height]).thresholds(thresholds)(Array.from(values)) as unknown as ContourMultiPolygon[];
}

/** Evenly spaced "nice" thresholds strictly inside [lo, hi], about `count` of them. */
export function niceThresholds(lo: number, hi: number, count: number): number[] {
  if (!(hi > lo) || count < 1) return [];
  const raw = (hi - lo) / (count + 1);
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * magnitude).find((s) => s >= raw) ?? 10 * magnitude;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v < hi; v += step) if (v > lo) out.push(Number(v.toPrecision(12)));
  return out;
}

/** Ring points (d3 grid space) to scene points; a ring closes on itself. */
export function gridPointToScene(grid: ElevationGrid, x: number, y: number, exaggeration: number, lift_m: number): [number, number, number] {
  const east = columnToEast(grid, x - 0.5);
  const north = rowToNorth(grid, y - 0.5);
  return [east, north, (surfaceHeight(grid, east, north) + lift_m) * exaggeration];
}

/**
 * d3-contour closes each polygon along the grid's outer frame (x = 0 or width, y = 0 or height),
 * outside the sample centres; those edges are region borders, not contour lines, and are dropped.
 */
function onFrame(point: number[], grid: ElevationGrid): boolean {
  return point[0] <= 0 || point[1] <= 0 || point[0] >= grid.width || point[1] >= grid.height;
}

export function buildContourGeometry(polygons: readonly ContourMultiPolygon[], grid: ElevationGrid, options: ContourOptions = {}): { geometry: BufferGeometry; labels: ContourLabel[] } {
  const exaggeration = options.exaggeration ?? 1;
  const lift = options.lift_m ?? 0;
  const coords: number[] = [];
  const labels: ContourLabel[] = [];
  for (const p of polygons) {
    let best: number[] | null = null;
    let bestCount = 0;
    for (const polygon of p.coordinates) {
      for (const ring of polygon) {
        const inner = ring.filter((pt) => !onFrame(pt, grid));
        if (inner.length > bestCount) {
          bestCount = inner.length;
          best = inner[Math.floor(inner.length / 2)];
        }
        for (let k = 1; k < ring.length; k++) {
          if (onFrame(ring[k - 1], grid) || onFrame(ring[k], grid)) continue;
          coords.push(...gridPointToScene(grid, ring[k - 1][0], ring[k - 1][1], exaggeration, lift));
          coords.push(...gridPointToScene(grid, ring[k][0], ring[k][1], exaggeration, lift));
        }
      }
    }
    if (best) labels.push({ value: p.value, position: gridPointToScene(grid, best[0], best[1], exaggeration, lift) });
  }
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(new Float32Array(coords), 3));
  return { geometry, labels };
}
