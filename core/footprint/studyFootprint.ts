/**
 * A study's footprint, the parts shared by every front end (CLI and desktop app): the worker context built
 * from a study, the default contour levels and the summary figures of a (possibly partial) field.
 */
import type { Study } from '../study/schema.ts';
import { studyToDescent } from '../study/toDescent.ts';
import { guaranteedDivertRadius, niceStep, propellantRegions, regionBounds, type PropellantRegion, type DivertRadius } from './contours.ts';
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

export interface FootprintSummary {
  targets: number;
  reachable: number;
  unreachable: number;
  failed: number;
  pending: number;
  /** Targets stopped early as certainly over the budget (reachable-set runs only). */
  overBudget: number;
  /** Targets where the relaxation was not lossless and no flyable trajectory within tolerance of its bound was found. */
  relaxationGap: number;
  /** Forbidden throttle bands: targets neither proven reachable within the budget nor excluded by the lower bound. */
  undecided?: number;
  /**
   * Targets whose trajectory misses a constraint between its nodes beyond tolerance in the dense
   * re-simulation (core/descent/verify.ts); 0 when all met.
   */
  betweenNodesMissed: number;
  /**
   * Present when the budget boundary was refined coarse-to-fine: area and divert radius then come from the
   * refined boundary; `solves` includes the refinement's.
   */
  boundaryRefinement?: { factor: number; extraTargets: number; extraSolves: number; unrefinedArea_m2: number; complete: boolean };
  usablePropellant_kg: number;
  reserve_kg: number;
  budget_kg: number;
  /** Area of {propellant ≤ budget}, m². */
  reachableArea_m2: number;
  guaranteedDivertRadius_m: number;
  /** True when the divert radius is limited by the grid's extent rather than by reach. */
  divertRadiusLimitedByGrid: boolean;
  minPropellant_kg: number;
  maxPropellant_kg: number;
  solves: number;
  /** The run stopped (Ctrl-C, a signal, Cancel) before every target was computed: `pending` are missing. */
  cancelled: boolean;
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
