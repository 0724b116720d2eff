/** Result figures as the app shows them: a label, a value with its unit, and a note where it needs one. */
import type { FootprintSummary } from '../../core/export/footprintExport.ts';
import type { PickedTrajectory } from '../../core/footprint/pickedTrajectory.ts';

export interface Figure {
  label: string;
  value: string;
  note?: string;
}

import { fixed } from '../format.ts';

export function footprintFigureList(s: FootprintSummary): Figure[] {
  const done = s.targets - s.pending;
  return [
    { label: 'Targets', value: `${s.reachable} reachable / ${done} computed`, note: s.pending ? `${s.pending} not computed${s.cancelled ? ' (cancelled)' : ''}` : undefined },
    ...(s.betweenNodesMissed > 0
      ? [{ label: 'Between nodes', value: `${s.betweenNodesMissed} targets miss a constraint`, note: 'in the dense re-simulation of their trajectories (CSV column between_nodes)' }]
      : []),
    // Never merged with the reachable ones: the relaxation was not lossless there (core/footprint/field.ts).
    ...(s.relaxationGap > 0
      ? [{ label: 'Relaxation gap', value: `${s.relaxationGap} targets`, note: 'not lossless: flyable cost above the certified bound (contours use the flyable cost)' }]
      : []),
    ...((s.undecided ?? 0) > 0
      ? [{ label: 'Undecided', value: `${s.undecided} targets`, note: 'throttle band: the lower bound does not exclude them, but no band-respecting trajectory was found within the budget' }]
      : []),
    { label: 'Budget', value: `${fixed(s.budget_kg, 1)} kg`, note: `usable ${fixed(s.usablePropellant_kg, 1)} kg − reserve ${fixed(s.reserve_kg, 1)} kg` },
    // Targets not computed count as out of reach (core/footprint/contours.ts), so a partial field gives
    // lower bounds: said so rather than shown as if final.
    { label: 'Reachable area', value: `${fixed(s.reachableArea_m2 / 1e6, 3)} km²`, note: s.pending ? 'with the reserve kept; at least (rows not computed)' : 'with the reserve kept' },
    {
      label: 'Guaranteed divert radius',
      value: `${fixed(s.guaranteedDivertRadius_m, 0)} m`,
      note: s.pending ? 'at least (rows not computed)' : s.divertRadiusLimitedByGrid ? 'limited by the grid: widen it' : undefined,
    },
    { label: 'Propellant', value: Number.isFinite(s.minPropellant_kg) ? `${fixed(s.minPropellant_kg, 1)} … ${fixed(s.maxPropellant_kg, 1)} kg` : '—', note: 'over reachable targets' },
  ];
}

/**
 * A picked trajectory's figures. `budget_kg` is the budget of the inputs it was solved from, or null for no
 * verdict (it is stale); a budget ≤ 0 (dry mass and reserve use up the wet mass) is said so, never printed
 * as a negative budget.
 */
export function trajectoryFigureList(t: PickedTrajectory, budget_kg: number | null): Figure[] {
  const at = `${fixed(t.target_m[0], 0)} m E, ${fixed(t.target_m[1], 0)} m N`;
  if (t.status === 'solver-failure') return [{ label: 'Target', value: at }, { label: 'Status', value: 'solver failure', note: t.warnings.join('; ') || undefined }];
  if (t.status === 'unreachable') {
    return [
      { label: 'Target', value: at },
      { label: 'Status', value: 'unreachable', note: `closest landing ${fixed(t.miss_m, 0)} m away` },
      { label: 'Time of flight', value: `${fixed(t.timeOfFlight_s, 2)} s`, note: 'closest-approach trajectory' },
    ];
  }
  if (t.status === 'undecided') {
    return [
      { label: 'Target', value: at },
      { label: 'Status', value: 'undecided', note: 'throttle band: neither reachable nor unreachable is proven' },
      { label: 'Propellant', value: Number.isFinite(t.propellant_kg) ? `${fixed(t.propellant_kg, 2)} kg (band-respecting, above the budget)` : 'no band-respecting trajectory found', note: `certified lower bound ${fixed(t.propellantLowerBound_kg, 2)} kg (ignoring the band)` },
      ...warningFigure(t),
    ];
  }
  if (t.status === 'relaxation-gap') {
    return [
      { label: 'Target', value: at },
      { label: 'Status', value: 'relaxation gap', note: 'the convex relaxation is not lossless here: optimality not certified' },
      { label: 'Propellant', value: Number.isFinite(t.propellant_kg) ? `${fixed(t.propellant_kg, 2)} kg` : 'no flyable trajectory found', note: `certified lower bound ${fixed(t.propellantLowerBound_kg, 2)} kg` },
      { label: 'Time of flight t_f', value: `${fixed(t.timeOfFlight_s, 2)} s`, note: `N = ${t.nodes}` },
      ...warningFigure(t),
    ];
  }
  return [
    { label: 'Target', value: at },
    { label: 'Propellant', value: `${fixed(t.propellant_kg, 2)} kg`, note: budgetNote(t.propellant_kg, budget_kg) },
    { label: 'Time of flight t_f', value: `${fixed(t.timeOfFlight_s, 2)} s`, note: `N = ${t.nodes}` },
    ...baselineFigure(t),
    ...warningFigure(t),
  ];
}

/** The search's and the re-simulation's warnings (e.g. a constraint missed between nodes), never hidden. */
function warningFigure(t: PickedTrajectory): Figure[] {
  if (t.warnings.length === 0) return [];
  return [{ label: t.warnings.length === 1 ? 'Warning' : `Warnings (${t.warnings.length})`, value: t.warnings[0], note: t.warnings.slice(1).join('; ') || undefined }];
}

/** The polynomial-guidance baseline to the same target: what optimal guidance saves over it. */
function baselineFigure(t: PickedTrajectory): Figure[] {
  const b = t.baseline;
  if (!b || !Number.isFinite(b.propellant_kg)) return [];
  const extra = b.propellant_kg - t.propellant_kg;
  const onTarget = b.miss_m <= 1;
  return [{
    label: 'Polynomial guidance',
    value: `${fixed(b.propellant_kg, 2)} kg`,
    note: onTarget
      ? `${extra >= 0 ? '+' : ''}${fixed(extra, 2)} kg (${extra >= 0 ? '+' : ''}${fixed((100 * extra) / t.propellant_kg, 1)} %) over the optimum, t_f ${fixed(b.timeOfFlight_s, 1)} s`
      : `misses the target by ${fixed(b.miss_m, 0)} m`,
  }];
}

function budgetNote(propellant_kg: number, budget_kg: number | null): string | undefined {
  if (budget_kg === null) return undefined;
  if (!(budget_kg > 0)) return 'no propellant budget: dry mass plus reserve reach the wet mass';
  return propellant_kg <= budget_kg ? `within the ${fixed(budget_kg, 1)} kg budget` : `ABOVE the ${fixed(budget_kg, 1)} kg budget`;
}
