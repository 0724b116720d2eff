/**
 * Resampling terrain products onto another regular grid in the same local frame (e.g. the footprint's
 * target grid). Heights: bilinear between source cell centres (NaN when a corner is no-data or the
 * target centre is outside the source centres). Hazard flags: conservative — a target cell takes the
 * OR of every source cell whose area overlaps it, so a coarse cell is safe only if all of it is.
 */
import type { ElevationGrid, GridSpec } from './grid.ts';
import { TerrainInputError, checkDimensions, makeGrid, sampleBilinear } from './grid.ts';
import { HAZARD_UNKNOWN } from './hazard.ts';

function checkSpec(spec: GridSpec): void {
  checkDimensions(spec.width, spec.height, 'target grid');
  for (const name of ['pixelSizeX_m', 'pixelSizeY_m'] as const) {
    if (!Number.isFinite(spec[name]) || spec[name] <= 0) throw new TerrainInputError(`invalid target ${name}: ${spec[name]} (must be > 0)`);
  }
}

export function resampleHeights(grid: ElevationGrid, target: GridSpec): ElevationGrid {
  checkSpec(target);
  const e0 = target.originEast_m ?? 0;
  const n0 = target.originNorth_m ?? 0;
  const out = new Float32Array(target.width * target.height);
  for (let r = 0; r < target.height; r++) {
    const north = n0 - (r + 0.5) * target.pixelSizeY_m;
    for (let c = 0; c < target.width; c++) {
      out[r * target.width + c] = sampleBilinear(grid, e0 + (c + 0.5) * target.pixelSizeX_m, north);
    }
  }
  return makeGrid({ ...target, originEast_m: e0, originNorth_m: n0, georeference: undefined }, out);
}

/**
 * Conservative hazard-flag resampling: OR of overlapping source cells; target cells not fully covered
 * by the source grid get HAZARD_UNKNOWN as well.
 */
export function resampleHazardFlags(flags: Uint8Array, source: ElevationGrid, target: GridSpec): Uint8Array {
  checkSpec(target);
  const e0 = target.originEast_m ?? 0;
  const n0 = target.originNorth_m ?? 0;
  const out = new Uint8Array(target.width * target.height);
  const eps = 1e-9;
  for (let r = 0; r < target.height; r++) {
    const top = (source.originNorth_m - (n0 - r * target.pixelSizeY_m)) / source.pixelSizeY_m;
    const bottom = (source.originNorth_m - (n0 - (r + 1) * target.pixelSizeY_m)) / source.pixelSizeY_m;
    const r0 = Math.floor(top + eps), r1 = Math.ceil(bottom - eps) - 1;
    for (let c = 0; c < target.width; c++) {
      const left = (e0 + c * target.pixelSizeX_m - source.originEast_m) / source.pixelSizeX_m;
      const right = (e0 + (c + 1) * target.pixelSizeX_m - source.originEast_m) / source.pixelSizeX_m;
      const c0 = Math.floor(left + eps), c1 = Math.ceil(right - eps) - 1;
      let f = 0;
      if (r0 < 0 || c0 < 0 || r1 >= source.height || c1 >= source.width) f |= HAZARD_UNKNOWN;
      for (let rr = Math.max(0, r0); rr <= Math.min(source.height - 1, r1); rr++) {
        for (let cc = Math.max(0, c0); cc <= Math.min(source.width - 1, c1); cc++) f |= flags[rr * source.width + cc];
      }
      out[r * target.width + c] = f;
    }
  }
  return out;
}
