/**
 * The footprint run's own inputs (not part of the study file): targets per side and the grid's half-width.
 * A square grid around the nominal target, so east and north spacing are equal and the field drapes as one
 * regular grid on the terrain.
 */
import { makeTargetGrid, MAX_GRID_SIDE, type TargetGrid } from '../../core/footprint/grid.ts';

export interface RunSettingsText {
  /** Targets per side, as typed. */
  side: string;
  /** Half-width of the grid, m, as typed. */
  halfWidth_m: string;
}

/**
 * The half-width shown until the app has sized the grid from the vehicle's reach (App.svelte: the reach
 * boundary, core/footprint/studyRuns.ts reachExtent, replaces it before the first run unless the user typed one).
 */
export const DEFAULT_RUN_SETTINGS: RunSettingsText = { side: '21', halfWidth_m: '3000' };

export type RunSettingsCheck =
  | { ok: true; grid: TargetGrid; side: number; halfWidth_m: number }
  | { ok: false; field: 'side' | 'halfWidth_m'; message: string };

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

export function checkRunSettings(text: RunSettingsText): RunSettingsCheck {
  const side = text.side.trim();
  if (!/^\d+$/.test(side) || Number(side) < 2 || Number(side) > MAX_GRID_SIDE) {
    return { ok: false, field: 'side', message: `Targets per side “${side}”: enter a whole number from 2 to ${MAX_GRID_SIDE} (e.g. 21 for a 21 × 21 grid).` };
  }
  const half = text.halfWidth_m.trim();
  const halfValue = Number(half);
  if (!NUMBER.test(half) || !(halfValue > 0) || halfValue > 1e6) {
    return { ok: false, field: 'halfWidth_m', message: `Grid half-width “${half}” m: enter a distance above 0 and up to 1000000 m.` };
  }
  const n = Number(side);
  return { ok: true, side: n, halfWidth_m: halfValue, grid: makeTargetGrid({ halfWidthEast_m: halfValue, halfWidthNorth_m: halfValue, nx: n, ny: n }) };
}
