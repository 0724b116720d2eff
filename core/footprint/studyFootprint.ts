/**
 * A study's footprint, the parts shared by every front end (CLI and desktop app): the worker context built
 * from a study, the default contour levels and the summary figures of a (possibly partial) field.
 */
import type { Study } from '../study/schema.ts';
import { studyToDescent } from '../study/toDescent.ts';
import type { FootprintSummary } from '../study/footprintExport.ts';
import { footprintSvg, niceStep } from '../study/footprintSvg.ts';
import { sampleColormap, VIRIDIS } from '../study/colormap.ts';
import type { Ellipse } from './ellipse.ts';
import { guaranteedDivertRadius, propellantRegions, regionBounds, type PropellantRegion, type DivertRadius } from './contours.ts';
import type { DescentFootprintContext } from './descentEvaluator.ts';
import type { BoundaryRefinement } from './refine.ts';
import { BETWEEN_NODES, countByStatus, TARGET, type FootprintField } from './field.ts';

/** Nodes for footprint targets: at N = 30 the demo study's propellant is within 0.04 kg of N = 200 (DEVELOPERS.md). */
export const FOOTPRINT_NODES = 30;

/**
 * Targets are solved against the dry mass alone (no reserve): the reserve is then a contour level, so one
 * run serves every reserve.
 */
export function footprintContext(study: Study, nodes: number): DescentFootprintContext {
  const d = studyToDescent(study);
  return {
    setup: { ...d.setup, nodes, vehicle: { ...d.setup.vehicle, dryMass: study.vehicle.dryMass_kg } },
    ignition: d.ignition,
    targetHeight_m: d.target[2],
  };
}

/** Six round contour levels from the cheapest target up to the budget. */
export function defaultLevels(field: FootprintField, budget: number): number[] {
  let min = Infinity;
  for (let k = 0; k < field.status.length; k++) if (field.status[k] === TARGET.reachable) min = Math.min(min, field.propellant_kg[k]);
  if (!Number.isFinite(min) || min >= budget) return [budget];
  const step = niceStep(budget - min, 6);
  const levels: number[] = [];
  for (let v = Math.ceil(min / step) * step; v < budget - 1e-9; v += step) levels.push(v);
  levels.push(budget);
  return levels;
}

export interface FootprintFigures {
  summary: FootprintSummary;
  levels_kg: number[];
  bands: PropellantRegion[];
  /** {propellant ≤ budget}: reachable with the reserve kept. */
  reachable: PropellantRegion;
  divert: DivertRadius;
}

/**
 * Contours, reachable region and summary of a field (pending targets count as out of reach). With a
 * boundary refinement (refine.ts) at the budget level, the reachable region, its area and the divert
 * radius come from the refined boundary.
 */
export function footprintFigures(
  field: FootprintField,
  budget: { usable_kg: number; reserve_kg: number },
  run: { cancelled: boolean },
  levels?: number[],
  refinement?: BoundaryRefinement,
): FootprintFigures {
  const budget_kg = budget.usable_kg - budget.reserve_kg;
  const levels_kg = levels ?? defaultLevels(field, budget_kg);
  const bands = propellantRegions(field, levels_kg);
  const [coarseReachable] = propellantRegions(field, [budget_kg]);
  if (refinement && Math.abs(refinement.region.level_kg - budget_kg) > 1e-9) {
    throw new RangeError(`boundary refinement at ${refinement.region.level_kg} kg does not match the budget ${budget_kg} kg`);
  }
  const reachable = refinement ? refinement.region : coarseReachable;
  const divert = guaranteedDivertRadius(reachable.geometry, 0, 0, regionBounds(field));
  let minP = Infinity;
  let maxP = -Infinity;
  let solves = 0;
  let missed = 0;
  for (let k = 0; k < field.status.length; k++) {
    solves += field.solves[k];
    if (field.betweenNodes[k] === BETWEEN_NODES.missed) missed++;
    if (field.status[k] !== TARGET.reachable) continue;
    minP = Math.min(minP, field.propellant_kg[k]);
    maxP = Math.max(maxP, field.propellant_kg[k]);
  }
  const summary: FootprintSummary = {
    targets: field.nx * field.ny,
    ...countByStatus(field),
    usablePropellant_kg: budget.usable_kg,
    reserve_kg: budget.reserve_kg,
    budget_kg,
    reachableArea_m2: Math.round(reachable.area_m2),
    guaranteedDivertRadius_m: Number(divert.radius_m.toFixed(1)),
    divertRadiusLimitedByGrid: divert.limitedByGrid,
    minPropellant_kg: Number.isFinite(minP) ? Number(minP.toFixed(3)) : NaN,
    maxPropellant_kg: Number.isFinite(maxP) ? Number(maxP.toFixed(3)) : NaN,
    solves: solves + (refinement?.extraSolves ?? 0),
    betweenNodesMissed: missed,
    cancelled: run.cancelled,
  };
  if (refinement) {
    summary.boundaryRefinement = {
      factor: refinement.factor,
      extraTargets: refinement.extraTargets,
      extraSolves: refinement.extraSolves,
      unrefinedArea_m2: Math.round(coarseReachable.area_m2),
      complete: !refinement.cancelled,
    };
  }
  return { summary, levels_kg, bands, reachable, divert };
}

/**
 * The report map of a field and its figures (core/study/footprintSvg.ts): propellant bands in viridis, the
 * reachable region at the budget, the guaranteed divert circle, and an optional landing ellipse.
 */
export function footprintMapSvg(field: FootprintField, figures: FootprintFigures, text: { title: string; caption: string[] }, ellipse?: Ellipse | null): string {
  return footprintSvg({
    title: text.title,
    bounds_m: regionBounds(field),
    bands: figures.bands,
    reachable: figures.reachable,
    budget_kg: figures.summary.budget_kg,
    colormap: (t) => sampleColormap(VIRIDIS, t) as unknown as [number, number, number],
    divertRadius_m: figures.divert.radius_m,
    caption: text.caption,
    ellipse,
  });
}
