/**
 * A (possibly partial) footprint field as the scene shows it: propellant draped on the terrain samples
 * (resampled bilinearly; NaN where a target is not reachable or not computed yet), its legend range in kg,
 * and the outlines of the propellant contours with the reserve boundary emphasised. Pure.
 */
import type { FootprintFigures } from '../../core/footprint/studyFootprint.ts';
import { TARGET, type FootprintField } from '../../core/footprint/field.ts';
import type { ElevationGrid } from '../scene/elevation-grid.ts';
import type { FootprintOutline } from '../scene/footprint-outlines.ts';
import { resampleToTerrain, type ScalarGrid } from '../scene/resample.ts';

/** The field's propellant as a scalar grid in terrain layout (row 0 north). Needs equal east/north spacing. */
export function propellantGrid(field: FootprintField): ScalarGrid {
  const { nx, ny } = field;
  const dx = field.east[1] - field.east[0];
  const dy = field.north[1] - field.north[0];
  if (Math.abs(dx - dy) > 1e-9 * Math.max(dx, dy)) throw new Error(`footprint grid spacing differs east (${dx} m) and north (${dy} m)`);
  const values = new Float32Array(nx * ny);
  for (let j = 0; j < ny; j++) {
    const row = ny - 1 - j; // field rows ascend northwards; scalar grids start at the north edge
    for (let i = 0; i < nx; i++) {
      const k = j * nx + i;
      values[row * nx + i] = field.status[k] === TARGET.reachable ? field.propellant_kg[k] : NaN;
    }
  }
  return { width: nx, height: ny, pixelSize_m: dx, west_m: field.east[0], north_m: field.north[ny - 1], values };
}

/** Smallest and largest propellant over reachable targets, or null when none is reachable yet. */
export function propellantRange(field: FootprintField): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < field.status.length; k++) {
    if (field.status[k] !== TARGET.reachable) continue;
    lo = Math.min(lo, field.propellant_kg[k]);
    hi = Math.max(hi, field.propellant_kg[k]);
  }
  if (!Number.isFinite(lo)) return null;
  return hi > lo ? [lo, hi] : [lo, lo + 1];
}

export interface FootprintDrape {
  values: Float32Array;
  range: [number, number];
  title: string;
  /** The field on its own grid: the scene draws its cells past the terrain on the target's ground plane. */
  source?: ScalarGrid;
}

export function footprintDrape(field: FootprintField, terrain: ElevationGrid): FootprintDrape | null {
  const range = propellantRange(field);
  if (!range) return null;
  const source = propellantGrid(field);
  return { values: resampleToTerrain(source, terrain), range, title: 'Minimum propellant to land (kg)', source };
}

/** Contour outlines at every level below the budget, and the reserve boundary (propellant = budget) in bold. */
export function footprintOutlines(figures: FootprintFigures): FootprintOutline[] {
  const budget = figures.summary.budget_kg;
  const contours = figures.bands
    .filter((b) => b.level_kg < budget - 1e-9)
    .map((b) => ({ coordinates: b.geometry.coordinates as number[][][][], level_kg: b.level_kg, emphasis: false }));
  return [...contours, { coordinates: figures.reachable.geometry.coordinates as number[][][][], level_kg: Number(budget.toFixed(1)), emphasis: true }];
}
