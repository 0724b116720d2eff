/**
 * Resample a scalar field given on one regular grid (e.g. propellant cost on the target grid) onto
 * the sample positions of another (the terrain), bilinearly, so it can be draped as vertex colours.
 * Points outside the source grid, or next to a missing source value, get NaN (drawn as no-data).
 */
import type { ElevationGrid } from './elevation-grid.ts';

/** A scalar field on a regular grid: same layout as ElevationGrid (row 0 north, column 0 west). */
export interface ScalarGrid {
  width: number;
  height: number;
  pixelSize_m: number;
  west_m: number;
  north_m: number;
  values: Float32Array;
}

export function resampleToTerrain(source: ScalarGrid, terrain: ElevationGrid): Float32Array {
  if (source.values.length !== source.width * source.height) {
    throw new Error(`invalid scalar grid: ${source.values.length} values for ${source.width} × ${source.height}`);
  }
  const out = new Float32Array(terrain.width * terrain.height);
  const v = source.values;
  for (let r = 0; r < terrain.height; r++) {
    const north = terrain.north_m - r * terrain.pixelSize_m;
    const sr = (source.north_m - north) / source.pixelSize_m;
    for (let c = 0; c < terrain.width; c++) {
      const east = terrain.west_m + c * terrain.pixelSize_m;
      const sc = (east - source.west_m) / source.pixelSize_m;
      const i = r * terrain.width + c;
      // A hair of slack so points on the source's edge (up to float rounding) still count as inside.
      if (sc < -1e-9 || sr < -1e-9 || sc > source.width - 1 + 1e-9 || sr > source.height - 1 + 1e-9) {
        out[i] = NaN;
        continue;
      }
      const c0 = Math.min(source.width - 2, Math.max(0, Math.floor(sc)));
      const r0 = Math.min(source.height - 2, Math.max(0, Math.floor(sr)));
      const fc = Math.min(1, Math.max(0, sc - c0));
      const fr = Math.min(1, Math.max(0, sr - r0));
      const k = r0 * source.width + c0;
      // A missing corner with non-zero weight makes the point missing; one with zero weight (the
      // point lies on the opposite edge or sample) does not matter.
      let sum = 0;
      const corners: [number, number][] = [
        [k, (1 - fc) * (1 - fr)],
        [k + 1, fc * (1 - fr)],
        [k + source.width, (1 - fc) * fr],
        [k + source.width + 1, fc * fr],
      ];
      for (const [index, weight] of corners) if (weight > 0) sum += v[index] * weight;
      out[i] = sum;
    }
  }
  return out;
}
