/**
 * Hazard map: which DEM cells are safe to touch down on, from user limits on footprint slope and
 * roughness, with unknown cells (no data, or footprint leaving the grid) counted as unsafe, and an
 * optional safety-margin buffer around every hazard.
 */
import type { ElevationGrid } from './grid.ts';
import { TerrainInputError } from './grid.ts';
import type { RoughnessMeasure } from './footprint-fit.ts';
import { fitFootprint, footprintResolvable } from './footprint-fit.ts';
import { hornSlope } from './slope.ts';
import { distanceToNearest } from './distance.ts';

/** Hazard flag bits in `HazardMap.flags`; 0 means safe. */
export const HAZARD_SLOPE = 1;
export const HAZARD_ROUGHNESS = 2;
export const HAZARD_UNKNOWN = 4;
/** Not itself hazardous, but closer than the safety margin to a hazard. */
export const HAZARD_MARGIN = 8;

/** User limits. Defaults are common practice for small robotic landers, not a published requirement (from memory). */
export interface HazardLimits {
  /** Largest footprint-plane slope the lander tolerates, degrees. Default 10 (common practice). */
  maxSlope_deg?: number;
  /** Largest residual above/below the footprint plane, metres. Default 0.3 (common practice). */
  maxRoughness_m?: number;
  /** Lander footprint diameter (landing-gear span), metres. Default 4 (invented demo lander). */
  landerDiameter_m?: number;
  /** Cells closer than this to a hazard cell (centre to centre) are flagged HAZARD_MARGIN. Default 0. */
  safetyMargin_m?: number;
  /** 'max' (default) or 'rms' residual. */
  roughnessMeasure?: RoughnessMeasure;
}

export const DEFAULT_HAZARD_LIMITS = {
  maxSlope_deg: 10,
  maxRoughness_m: 0.3,
  landerDiameter_m: 4,
  safetyMargin_m: 0,
  roughnessMeasure: 'max',
} as const satisfies Required<HazardLimits>;

export interface HazardMap {
  width: number;
  height: number;
  /** Horn (1981) slope at DEM resolution, radians, 'no-data' edges (NaN). */
  slope_rad: Float32Array;
  /** Slope of the plane fitted over the lander footprint, radians (NaN unknown). Horn slope when the DEM is too coarse. */
  footprintSlope_rad: Float32Array;
  /** Roughness over the footprint, metres (NaN unknown or not assessed). */
  roughness_m: Float32Array;
  /** Bit flags per cell (HAZARD_*), 0 = safe. */
  flags: Uint8Array;
  /** Distance from each cell centre to the nearest hazard cell centre (slope, roughness or unknown), metres. */
  hazardDistance_m: Float32Array;
  /** The limits used, defaults filled in. */
  limits: Required<HazardLimits>;
  /** False when the DEM is coarser than half the lander: roughness cannot be seen and is not assessed. */
  roughnessAssessed: boolean;
  safeCells: number;
  /** Safe fraction of all cells (safe / width·height). */
  safeFraction: number;
  cellArea_m2: number;
}

function checkLimit(name: string, v: number, min: number, max: number): void {
  if (!Number.isFinite(v) || v < min || v > max) {
    throw new TerrainInputError(`invalid ${name}: ${v} (must be a number from ${min} to ${max})`);
  }
}

/** Fills defaults and validates the limits; errors name the field, the value and the range. */
export function resolveLimits(limits: HazardLimits = {}): Required<HazardLimits> {
  const out = { ...DEFAULT_HAZARD_LIMITS, ...Object.fromEntries(Object.entries(limits).filter(([, v]) => v !== undefined)) } as Required<HazardLimits>;
  checkLimit('maxSlope_deg', out.maxSlope_deg, 0, 89);
  checkLimit('maxRoughness_m', out.maxRoughness_m, 0, 1e4);
  checkLimit('landerDiameter_m', out.landerDiameter_m, 1e-3, 1e4);
  checkLimit('safetyMargin_m', out.safetyMargin_m, 0, 1e5);
  if (out.roughnessMeasure !== 'max' && out.roughnessMeasure !== 'rms') {
    throw new TerrainInputError(`invalid roughnessMeasure: ${String(out.roughnessMeasure)} (must be 'max' or 'rms')`);
  }
  return out;
}

export function hazardMap(grid: ElevationGrid, limitsIn: HazardLimits = {}): HazardMap {
  const limits = resolveLimits(limitsIn);
  const { width: w, height: h } = grid;
  const n = w * h;
  const slope = hornSlope(grid, 'no-data');
  const resolvable = footprintResolvable(grid, limits.landerDiameter_m);
  let footprintSlope: Float32Array;
  let roughness: Float32Array;
  if (resolvable) {
    const fit = fitFootprint(grid, limits.landerDiameter_m, limits.roughnessMeasure);
    footprintSlope = fit.slope_rad;
    roughness = fit.roughness_m;
  } else {
    footprintSlope = slope;
    roughness = new Float32Array(n).fill(NaN);
  }
  const tanMax = Math.tan((limits.maxSlope_deg * Math.PI) / 180);
  const slopeMax = Math.atan(tanMax);
  const flags = new Uint8Array(n);
  for (let k = 0; k < n; k++) {
    const s = footprintSlope[k];
    let f = 0;
    if (Number.isNaN(s)) f = HAZARD_UNKNOWN;
    else {
      if (s > slopeMax) f |= HAZARD_SLOPE;
      if (resolvable) {
        const r = roughness[k];
        if (Number.isNaN(r)) f |= HAZARD_UNKNOWN;
        else if (r > limits.maxRoughness_m) f |= HAZARD_ROUGHNESS;
      }
    }
    flags[k] = f;
  }
  const distance = distanceToNearest(flags, w, h, grid.pixelSizeX_m, grid.pixelSizeY_m);
  let safe = 0;
  for (let k = 0; k < n; k++) {
    if (flags[k] === 0 && distance[k] < limits.safetyMargin_m) flags[k] = HAZARD_MARGIN;
    if (flags[k] === 0) safe++;
  }
  return {
    width: w,
    height: h,
    slope_rad: slope,
    footprintSlope_rad: footprintSlope,
    roughness_m: roughness,
    flags,
    hazardDistance_m: distance,
    limits,
    roughnessAssessed: resolvable,
    safeCells: safe,
    safeFraction: safe / n,
    cellArea_m2: grid.pixelSizeX_m * grid.pixelSizeY_m,
  };
}
