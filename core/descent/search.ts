/**
 * Free-final-time search for one target: the one search behind single trajectories, footprints, studies and
 * picks.
 *
 * 1. Bracket t_f from physics (bracket.ts).
 * 2. Opening probes of the minimum-propellant problem: a neighbour's t_f (either side of it when the caller
 *    knows how far neighbouring optima move), else a few multiples of the bracket's lower bound. Infeasible
 *    probes carry the solver's certificate and bound the feasible window.
 * 3. From the best feasible probe, the slope minimiser (slopeMinimise.ts) on J(t_f) = −ln m_final with the
 *    envelope-theorem slope; it stops when the convex lower bound from the bracket's tangents certifies the
 *    stated propellant tolerance (or, for reachable-set runs, once that bound exceeds the budget).
 * 4. If no probe is feasible, the minimum-landing-error problem (Blackmore et al. 2010), feasible over a much
 *    wider range of t_f, is searched the same way; a zero miss means the probes stepped over a narrow
 *    feasible window and the propellant search restarts from that t_f; otherwise the target is unreachable
 *    and the result carries the closest reachable landing point and the miss distance.
 * 5. Losslessness: a relaxed optimum that is not lossless is a lower bound only. A flyable trajectory is
 *    sought by convex restriction (flyable.ts) over t_f near the relaxed optimum; the result is `solved` only
 *    when that flyable trajectory is within the propellant tolerance of the certified lower bound, else
 *    `relaxation-gap` with both figures.
 */
import type { SolveStatus } from '../conic/types.ts';
import { isInfeasible, isSolved } from '../conic/types.ts';
import type { Vec3 } from './constants.ts';
import { timeOfFlightBracket } from './bracket.ts';
import type { TimeBracket } from './bracket.ts';
import { bracketFrom, brentMinimise } from './brent.ts';
import { flyableAt, relativeLosslessnessGap } from './flyable.ts';
import { bandRespectingNear } from './band.ts';
import type { BandStructure } from './band.ts';
import { slopeMinimise } from './slopeMinimise.ts';
import type { SlopePoint } from './slopeMinimise.ts';
import type { ProgramKind } from './program.ts';
import { NODE } from './program.ts';
import { validateAltitudeFloor } from './setup.ts';
import type { IgnitionState } from './setup.ts';
import type { DescentSolver, FixedTimeSolve } from './solver.ts';
import type { DecodedTrajectory } from './trajectory.ts';
import { decodeTrajectory, LOSSLESS_TOLERANCE } from './trajectory.ts';

export interface SearchOptions {
  /** Warm start: a neighbour's optimal t_f, s. */
  tfGuess?: number;
  /**
   * Open with two probes at tfGuess ± this (s) instead of one at tfGuess: when neighbouring optima move by
   * less, the two slopes already bracket the optimum.
   */
  probeHalfWidth?: number;
  /** A neighbour's curvature d²J/dt_f² (J = −ln m_final), for the first Newton step. */
  curvatureGuess?: number;
  /**
   * Time-of-flight tolerance, s: the minimum-landing-error search stops on it; for the propellant search
   * it only sets the first step (and Brent's tolerance with `useDerivative: false`). Default 0.1.
   */
  tfTolerance?: number;
  /** Probe times as multiples of the bracket's lower bound, tried when there is no usable guess. */
  probes?: readonly number[];
  /** How many start times the minimum-propellant problem tries before the minimum-landing-error search
   * takes over. Default 1 with a usable guess (the guess itself, or the pair around it), else 3. */
  propellantProbes?: number;
  /** Cap on solves per target (all phases). Default 60. */
  maxSolves?: number;
  /** Override the physical bracket. */
  bracket?: TimeBracket;
  /** Use the envelope-theorem slope (default true); false: Brent's method on values only (a reference). */
  useDerivative?: boolean;
  /**
   * Certified propellant tolerance, kg (default 0.01): the search stops once a convex lower bound proves that
   * no time of flight saves more than this; the result's `propellantGap` says what was certified.
   */
  propellantTolerance?: number;
  /**
   * Reachable-set runs: stop as soon as the certified lower bound on the propellant exceeds this budget, kg
   * (the result's `overBudgetBound_kg` is then that bound and `propellant` the best point found).
   */
  propellantBudget_kg?: number;
  /** The guess is the closest-approach t_f of an unreachable neighbour: start with the landing-error search. */
  guessFromUnreachable?: boolean;
  /** Decode the trajectory of the result (default true). */
  decode?: boolean;
  /** t_f tolerance of the minimum-landing-error search, s (default: tfTolerance). */
  landingErrorTfTolerance?: number;
  /** Seek a flyable trajectory when the relaxation is not lossless (default true; false reports the gap only). */
  restoreFlyable?: boolean;
  /** Forbidden throttle bands: most solves the band-respecting search may spend per target (default 80). */
  bandMaxSolves?: number;
}

/** First step of the local search, as a fraction of the starting t_f. */
const LOCAL_STEP_FRACTION = 0.03;
/** The propellant search stops at this bracket width whatever its gap (the gap is then reported). */
const WIDTH_FLOOR_S = 1e-3;
/** t_f tolerance of the search for the best flyable trajectory near a lossy relaxed optimum, s. */
const FLYABLE_TF_TOLERANCE = 0.02;

/**
 * solved: an optimal flyable trajectory (lossless, propellant certified to the tolerance).
 * relaxation-gap: the convex relaxation is not lossless there and the best flyable trajectory found costs
 * more than the tolerance above the certified lower bound (or none was found): both are reported.
 * unreachable: certified (infeasibility certificates or a positive minimum landing error).
 * solver-failure: neither a solution nor a certificate.
 * undecided (forbidden throttle bands only): the relaxation that ignores the band does not exclude the target
 * (its certified lower bound is within the budget, or there is no budget), but no band-respecting trajectory
 * was found within the budget: neither reachable nor unreachable is proven. With bands, 'solved' means a
 * band-respecting trajectory within the propellant tolerance of the lower bound, 'relaxation-gap' one that
 * costs more (both figures reported; band.ts).
 */
export type DescentStatus = 'solved' | 'relaxation-gap' | 'unreachable' | 'solver-failure' | 'undecided';

export interface DescentResult {
  status: DescentStatus;
  target: Vec3;
  /** Optimal powered-descent time (unreachable: the minimum-landing-error time), s. */
  timeOfFlight: number;
  /**
   * Propellant of the returned trajectory, kg (unreachable: of the minimum-landing-error trajectory;
   * relaxation-gap: of the best flyable trajectory, an upper bound, NaN if none was found).
   */
  propellant: number;
  /** Certified lower bound on the minimum propellant over all times of flight, kg (NaN when not known). */
  propellantLowerBound: number;
  /** Conic solves spent on this target. */
  solves: number;
  bracket: TimeBracket;
  /** For unreachable targets: closest reachable landing point and the horizontal miss, m. */
  closestPoint: Vec3 | null;
  miss: number;
  /** Solver outcomes of the minimum-propellant probes that failed (certificates for unreachable). */
  infeasibleStatuses: SolveStatus[];
  /** Solver failures that were neither solved nor a certificate. */
  failures: number;
  /** Which problem the trajectory comes from. */
  kind: ProgramKind | null;
  trajectory: DecodedTrajectory | null;
  /** Relative losslessness gap max(σ − ‖u‖)/(full-throttle acceleration) of the relaxed optimum (NaN if none). */
  relaxedLosslessnessGap: number;
  /** Estimate of d²J/dt_f² at the optimum (J = −ln m_final), for a neighbour's first step; NaN if unknown. */
  curvature: number;
  /** Largest thrust tilt from vertical over the returned trajectory, rad (NaN unless one is returned). */
  peakTilt: number;
  /** Reachable-set runs: the certified lower bound above the budget when the search stopped for it, kg; else NaN. */
  overBudgetBound_kg: number;
  /**
   * Forbidden throttle bands: band-respecting propellant less the certified lower bound (the relaxation that
   * ignores the band), kg; NaN without bands or when no band-respecting trajectory was found.
   */
  bandGap_kg: number;
  /** Forbidden throttle bands: the max–min–max switch indices of the returned trajectory (hold intervals), or null. */
  bandStructure: BandStructure | null;
  /** Forbidden throttle bands: conic solves the band-respecting search spent (included in `solves`). */
  bandSolves: number;
  warnings: string[];
}

/**
 * Probe times as multiples of the bracket's lower bound, in the order tried (capped at the upper bound).
 * A heuristic: the minimum-propellant times of flight in our checks sit at 1.7–2.6 × the lower bound
 * (Açıkmeşe 2007 example 1.7–1.85, demo study 2.3, our Moon scenarios 2.5–2.6); the list then widens.
 */
export const DEFAULT_PROBES: readonly number[] = [2.3, 1.9, 2.7, 1.6, 3.2, 1.35, 4, 1.15, 5.5, 8];

/**
 * Probe times inside the bracket: multiples of its lower bound, capped below the upper bound; a bracket
 * narrower than that (a few kg of usable propellant at a high lowest thrust) gets its midpoint, so a
 * probe is always a time of flight strictly inside it.
 */
function probeTimes(br: TimeBracket, multiples: readonly number[] | undefined, tol: number): number[] {
  const inside = [...new Set((multiples ?? DEFAULT_PROBES).map((f) => Math.min(br.lower * f, br.upper - tol)))].filter((t) => t > br.lower && t < br.upper);
  return inside.length > 0 ? inside : [0.5 * (br.lower + br.upper)];
}

interface Phase {
  best: FixedTimeSolve | null;
  /** Certified lower bound on the phase's cost over the window (cost units; −∞ if none). */
  bound: number;
  curvature: number;
  boundStopped: boolean;
  /** Times at which this problem came back with an infeasibility certificate. */
  infeasibleTimes: number[];
  /** Every solved evaluation. */
  solvedTimes: FixedTimeSolve[];
  statuses: SolveStatus[];
  failures: number;
}

interface PhaseOptions {
  kind: ProgramKind;
  starts: number[];
  /** Evaluate every start (a pair around a guess) instead of stopping at the first feasible one. */
  allStarts: boolean;
  stopBelow: number;
  knownInfeasible: readonly number[];
  /** Admissible times (default: the target's bracket). */
  window?: TimeBracket;
}

function peakTiltOf(solver: DescentSolver, r: FixedTimeSolve): number {
  const program = solver.program(r.kind);
  let peak = 0;
  for (let k = 0; k < solver.setup.nodes; k++) {
    const o = k * NODE.size + NODE.u;
    const ux = program.value(r.solution.x, o);
    const uy = program.value(r.solution.x, o + 1);
    const uz = program.value(r.solution.x, o + 2);
    const un = Math.hypot(ux, uy, uz);
    if (un > 0) peak = Math.max(peak, Math.acos(Math.max(-1, Math.min(1, uz / un))));
  }
  return peak;
}

export function searchFreeFinalTime(solver: DescentSolver, target: Vec3, ignition: IgnitionState, options: SearchOptions = {}): DescentResult {
  const con = solver.setup.constraints;
  validateAltitudeFloor(solver.setup, ignition, target[2]);
  const br = options.bracket ?? timeOfFlightBracket(solver.setup, ignition, target);
  const tol = options.tfTolerance ?? 0.1;
  const propTol = options.propellantTolerance ?? 0.01;
  const maxSolves = options.maxSolves ?? 60;
  const useDerivative = options.useDerivative ?? true;
  const startSolves = solver.solves;
  const budget = () => maxSolves - (solver.solves - startSolves);
  const L = solver.scales.length;
  const m0 = ignition.mass;
  const warnings: string[] = [];
  const probes = probeTimes(br, options.probes, tol);
  const guess = options.tfGuess !== undefined && options.tfGuess > br.lower && options.tfGuess < br.upper ? options.tfGuess : undefined;
  const half = options.probeHalfWidth;
  const pair = guess !== undefined && half !== undefined && half > 0 && guess - half > br.lower && guess + half < br.upper;
  const guessStarts = guess === undefined ? [] : pair ? [guess - half!, guess + half!] : [guess];
  const starts = [...guessStarts, ...probes];

  const runPhase = (p: PhaseOptions): Phase => {
    const cache = new Map<number, FixedTimeSolve>();
    const statuses: SolveStatus[] = [];
    const infeasibleTimes: number[] = [];
    let failures = 0;
    const evalAt = (tf: number): FixedTimeSolve => {
      const hit = cache.get(tf);
      if (hit) return hit;
      const r = solver.solveFixed(p.kind, tf, target, ignition);
      cache.set(tf, r);
      if (!isSolved(r.status)) {
        statuses.push(r.status);
        if (!isInfeasible(r.status)) failures++;
      }
      if (isInfeasible(r.status)) infeasibleTimes.push(tf);
      return r;
    };
    const propellantKind = p.kind === 'min-propellant';
    const point = (tf: number): SlopePoint => {
      const r = evalAt(tf);
      if (!isSolved(r.status)) return { t: tf, feasible: false, f: Infinity, g: NaN };
      if (propellantKind) return { t: tf, feasible: true, f: r.solution.info.primalObjective, g: solver.objectiveSlope(r, target, ignition) };
      return { t: tf, feasible: true, f: r.solution.info.primalObjective * L, g: solver.objectiveSlope(r, target, ignition) * L, stop: r.miss <= p.stopBelow };
    };
    const phase = (best: FixedTimeSolve | null, bound = -Infinity, curvature = NaN, boundStopped = false): Phase => ({
      best, bound, curvature, boundStopped, statuses, failures, infeasibleTimes,
      solvedTimes: [...cache.values()].filter((r) => isSolved(r.status)),
    });
    const opening: SlopePoint[] = [];
    for (const tf of p.starts) {
      if (budget() <= 0) break;
      const q = useDerivative ? point(tf) : { t: tf, feasible: isSolved(evalAt(tf).status), f: NaN, g: NaN };
      opening.push(q);
      if (q.feasible && !p.allStarts) break;
    }
    const feasible = opening.filter((q) => q.feasible);
    if (feasible.length === 0) return phase(null);
    // The feasible times form an interval: infeasible times either side of the start bound it.
    const x0 = feasible[0].t;
    let lo = (p.window ?? br).lower;
    let hi = (p.window ?? br).upper;
    for (const tf of [...infeasibleTimes, ...p.knownInfeasible]) {
      if (tf < x0 && tf > lo) lo = tf;
      if (tf > x0 && tf < hi) hi = tf;
    }
    const cost = (r: FixedTimeSolve) => (!isSolved(r.status) ? Infinity : propellantKind ? r.propellant : r.miss);
    if (!useDerivative) {
      // Brent's method on values only: kept as an independent reference for the slope search.
      const f = (tf: number) => cost(evalAt(tf));
      const step = Math.max(4 * tol, LOCAL_STEP_FRACTION * x0);
      const bb = bracketFrom(f, x0, f(x0), step, lo, hi, p.stopBelow);
      const res = brentMinimise(f, bb.a, bb.b, bb.x, bb.fx, tol, Math.max(0, budget()), p.stopBelow);
      return phase(cache.get(res.x) ?? evalAt(x0));
    }
    const t0 = feasible[0].t;
    const m = slopeMinimise(point, opening, {
      lo, hi,
      gapTolerance: propellantKind ? propTol : Math.max(0.01, p.stopBelow),
      // J = −ln m_final: J ≥ bound ⇒ propellant ≥ m0 − e^{−bound}, so at most e^{−bound} − e^{−J} can be saved.
      gapOf: propellantKind ? (f, b) => Math.exp(-b) - Math.exp(-f) : (f, b) => f - b,
      widthFloor: propellantKind ? WIDTH_FLOOR_S : (options.landingErrorTfTolerance ?? tol),
      step: Math.max(4 * tol, LOCAL_STEP_FRACTION * t0),
      curvature: propellantKind ? options.curvatureGuess : undefined,
      maxEvaluations: Math.max(0, budget()),
      boundStop: propellantKind && options.propellantBudget_kg !== undefined
        ? (b) => m0 - Math.exp(-b) > options.propellantBudget_kg!
        : undefined,
    });
    return phase(cache.get(m.best.t) ?? null, m.bound, m.curvature, m.reason === 'bound-stop');
  };

  const result = (partial: Partial<DescentResult> & Pick<DescentResult, 'status'>): DescentResult => ({
    target, timeOfFlight: NaN, propellant: NaN, propellantLowerBound: NaN, solves: solver.solves - startSolves, bracket: br,
    closestPoint: null, miss: NaN, infeasibleStatuses: [], failures: 0, kind: null, trajectory: null,
    relaxedLosslessnessGap: NaN, curvature: NaN, peakTilt: NaN, overBudgetBound_kg: NaN, bandGap_kg: NaN, bandStructure: null, bandSolves: 0, warnings, ...partial,
  });
  const decodeOf = (r: FixedTimeSolve) => ((options.decode ?? true) ? decodeTrajectory(solver.program(r.kind), r.solution.x, r.timeOfFlight, target) : null);

  /** A solved minimum-propellant phase: certify the tolerance, check losslessness, restore a flyable thrust. */
  const finishPropellant = (phase: Phase): DescentResult => {
    const relaxed = phase.best!;
    const lowerBound = Number.isFinite(phase.bound) ? m0 - Math.exp(-phase.bound) : NaN;
    const gapKg = relaxed.propellant - lowerBound;
    if (phase.failures > 0) warnings.push(`${phase.failures} solve(s) ended without a solution or a certificate; they were treated as infeasible`);
    if (relaxed.timeOfFlight - br.lower < 2 * tol || br.upper - relaxed.timeOfFlight < 2 * tol) warnings.push('optimal time of flight lies at the edge of the search bracket');
    if (useDerivative && !phase.boundStopped && !(gapKg <= propTol)) {
      warnings.push(`propellant tolerance not certified: the time-of-flight search could only bound the remaining saving by ${Number.isFinite(gapKg) ? gapKg.toFixed(3) : '∞'} kg (asked ${propTol} kg)`);
    }
    const common = {
      propellantLowerBound: lowerBound, infeasibleStatuses: phase.statuses, failures: phase.failures,
      curvature: phase.curvature, kind: 'min-propellant' as ProgramKind,
    };
    if (phase.boundStopped) {
      return result({ ...common, status: 'solved', timeOfFlight: relaxed.timeOfFlight, propellant: relaxed.propellant, overBudgetBound_kg: lowerBound, relaxedLosslessnessGap: NaN });
    }
    const relGap = relativeLosslessnessGap(solver, relaxed, ignition);
    if ((solver.setup.vehicle.throttleBands ?? []).length > 0) return finishBand(phase, relaxed, lowerBound, relGap, common);
    if (relGap <= LOSSLESS_TOLERANCE) {
      return result({
        ...common, status: 'solved', timeOfFlight: relaxed.timeOfFlight, propellant: relaxed.propellant,
        relaxedLosslessnessGap: relGap, trajectory: decodeOf(relaxed), peakTilt: peakTiltOf(solver, relaxed),
      });
    }
    // Not lossless: the relaxed optimum is only a lower bound. Best flyable trajectory near it.
    const flyable = options.restoreFlyable === false ? null : bestFlyableNear(solver, relaxed, target, ignition, phase, br, budget);
    const bound = Number.isFinite(lowerBound) ? lowerBound : relaxed.propellant;
    const within = flyable !== null && flyable.propellant - bound <= propTol;
    const relText = `max(σ − ‖u‖) = ${relGap.toExponential(2)} of full-throttle acceleration`;
    if (flyable && within) {
      warnings.push(`the relaxed optimum was not lossless (${relText}); a flyable trajectory within ${propTol} kg of it was found by fixing the thrust direction at the lossy nodes`);
    } else if (flyable) {
      warnings.push(`convexification not lossless (${relText}): best flyable trajectory ${flyable.propellant.toFixed(2)} kg, certified lower bound ${bound.toFixed(2)} kg`);
    } else {
      warnings.push(`convexification not lossless (${relText}) and no flyable trajectory was found near the relaxed optimum: lower bound ${bound.toFixed(2)} kg only`);
    }
    const returned = flyable ?? relaxed;
    return result({
      ...common,
      status: within ? 'solved' : 'relaxation-gap',
      propellantLowerBound: bound,
      timeOfFlight: returned.timeOfFlight,
      propellant: flyable ? flyable.propellant : NaN,
      kind: returned.kind,
      relaxedLosslessnessGap: relGap,
      trajectory: decodeOf(returned),
      peakTilt: peakTiltOf(solver, returned),
    });
  };

  /**
   * Forbidden throttle bands: the relaxed optimum (ignoring the band) gives the certified lower bound; the
   * band-respecting trajectory comes from the phase-assigned restriction (band.ts).
   */
  const finishBand = (
    phase: Phase, relaxed: FixedTimeSolve, lowerBound: number, relGap: number,
    common: Pick<DescentResult, 'propellantLowerBound' | 'infeasibleStatuses' | 'failures' | 'curvature' | 'kind'>,
  ): DescentResult => {
    const bound = Number.isFinite(lowerBound) ? lowerBound : relaxed.propellant;
    let lo = br.lower;
    let hi = br.upper;
    for (const tf of phase.infeasibleTimes) {
      if (tf < relaxed.timeOfFlight && tf > lo) lo = tf;
      if (tf > relaxed.timeOfFlight && tf < hi) hi = tf;
    }
    const before = solver.solves;
    const band = bandRespectingNear(solver, relaxed, target, ignition, { lower: lo, upper: hi }, { maxSolves: options.bandMaxSolves });
    const bandSolves = solver.solves - before;
    const budgetKg = options.propellantBudget_kg;
    const shared = { ...common, propellantLowerBound: bound, relaxedLosslessnessGap: relGap, bandSolves };
    if (!band.best) {
      warnings.push(`forbidden throttle band: no band-respecting trajectory found (${band.evaluations} phase assignments tried); certified lower bound ${bound.toFixed(2)} kg only`);
      return result({ ...shared, status: 'undecided', timeOfFlight: relaxed.timeOfFlight });
    }
    const ub = band.best.propellant;
    const gap = ub - bound;
    const overBudget = budgetKg !== undefined && ub > budgetKg;
    if (overBudget) warnings.push(`forbidden throttle band: the best band-respecting trajectory found, ${ub.toFixed(2)} kg, is above the budget ${budgetKg.toFixed(2)} kg while the lower bound ${bound.toFixed(2)} kg is not`);
    else if (gap > propTol) warnings.push(`forbidden throttle band: band-respecting trajectory ${ub.toFixed(2)} kg, certified lower bound ${bound.toFixed(2)} kg (gap ${gap.toFixed(3)} kg)`);
    return result({
      ...shared,
      status: overBudget ? 'undecided' : gap <= propTol ? 'solved' : 'relaxation-gap',
      timeOfFlight: band.best.timeOfFlight,
      propellant: ub,
      kind: band.best.kind,
      trajectory: decodeOf(band.best),
      peakTilt: peakTiltOf(solver, band.best),
      bandGap_kg: gap,
      bandStructure: band.structure,
    });
  };

  const propellantStarts = options.guessFromUnreachable ? [] : starts.slice(0, options.propellantProbes ?? (guess !== undefined ? guessStarts.length : 3));
  const fuel = runPhase({ kind: 'min-propellant', starts: propellantStarts, allStarts: pair, stopBelow: -Infinity, knownInfeasible: [] });
  if (fuel.best) return finishPropellant(fuel);

  const missTolerance = 1e-6 * L + 1e-3;
  // The landing-error problem lands anywhere on the plane: its own bracket, so that a target beyond every
  // landing still gets a closest point (the target's bracket may be empty there).
  const free = options.bracket ?? timeOfFlightBracket(solver.setup, ignition, target, true);
  const freeProbes = probeTimes(free, options.probes, tol);
  const errStarts = [...guessStarts, ...freeProbes];
  const err = runPhase({ kind: 'min-landing-error', starts: errStarts, allStarts: false, stopBelow: missTolerance, knownInfeasible: [], window: free });
  if (!err.best) {
    const status: DescentStatus = fuel.failures + err.failures > 0 || budget() <= 0 ? 'solver-failure' : 'unreachable';
    warnings.push(status === 'unreachable'
      ? 'no soft landing anywhere: the minimum-landing-error problem is infeasible at every probed time of flight'
      : 'no time of flight gave a solution or an infeasibility certificate');
    return result({ status, infeasibleStatuses: fuel.statuses, failures: fuel.failures + err.failures });
  }
  if (err.best.miss <= missTolerance) {
    // A feasible window the probes stepped over: restart the propellant search from it.
    // Minimum-landing-error infeasible ⇒ minimum-propellant infeasible (the latter is a restriction).
    // So is it wherever the smallest landing error is positive.
    const known = [...fuel.infeasibleTimes, ...err.infeasibleTimes, ...err.solvedTimes.filter((t) => t.miss > missTolerance).map((t) => t.timeOfFlight)];
    const again = runPhase({ kind: 'min-propellant', starts: [err.best.timeOfFlight], allStarts: false, stopBelow: -Infinity, knownInfeasible: known });
    if (again.best) return finishPropellant({ ...again, failures: again.failures + fuel.failures });
    // The landing is possible (zero miss) but the propellant problem gave no answer there: a solver failure,
    // never "unreachable".
    warnings.push('a soft landing on the target exists (zero landing error) but the minimum-propellant problem gave no solution there');
    return result({ status: 'solver-failure', infeasibleStatuses: [...fuel.statuses, ...again.statuses], failures: fuel.failures + err.failures + again.failures });
  }
  const prog = solver.program('min-landing-error');
  const last = (solver.setup.nodes - 1) * NODE.size + NODE.r;
  const x = err.best.solution.x;
  const closestPoint: Vec3 = [prog.value(x, last), prog.value(x, last + 1), prog.value(x, last + 2) - con.gateHeight];
  if (err.failures > 0) warnings.push(`${err.failures} solve(s) ended without a solution or a certificate; they were treated as infeasible`);
  // A positive minimum landing error proves the target unreachable — but only alongside the propellant
  // probes' own certificates: propellant solves that failed without any certificate leave it a solver failure.
  const uncertified = fuel.failures > 0 && fuel.statuses.every((s) => !isInfeasible(s));
  if (uncertified) warnings.push('the minimum-propellant solves failed without an infeasibility certificate: reachability is not established');
  return result({
    status: uncertified ? 'solver-failure' : 'unreachable',
    timeOfFlight: err.best.timeOfFlight,
    propellant: err.best.propellant,
    kind: 'min-landing-error',
    trajectory: decodeOf(err.best),
    peakTilt: peakTiltOf(solver, err.best),
    infeasibleStatuses: fuel.statuses,
    closestPoint,
    miss: err.best.miss,
    failures: fuel.failures + err.failures,
  });
}

/**
 * The flyable trajectory of least propellant near a lossy relaxed optimum: the true cost equals the relaxed one
 * wherever the relaxation is lossless and exceeds it elsewhere, so its minimum often sits at the edge of the
 * lossless times of flight. Brent's method on the flyable propellant (+∞ where none is found) about the
 * relaxed optimum.
 */
function bestFlyableNear(
  solver: DescentSolver, relaxed: FixedTimeSolve, target: Vec3, ignition: IgnitionState, phase: Phase, br: TimeBracket, budget: () => number,
): FixedTimeSolve | null {
  const found = new Map<number, FixedTimeSolve | null>();
  const flyable = (tf: number): FixedTimeSolve | null => {
    if (found.has(tf)) return found.get(tf)!;
    if (budget() <= 1) return null;
    const r = tf === relaxed.timeOfFlight ? relaxed : solver.solveFixed('min-propellant', tf, target, ignition);
    const f = flyableAt(solver, r, target, ignition);
    found.set(tf, f);
    return f;
  };
  const cost = (tf: number) => flyable(tf)?.propellant ?? Infinity;
  let lo = br.lower;
  let hi = br.upper;
  const t0 = relaxed.timeOfFlight;
  for (const tf of phase.infeasibleTimes) {
    if (tf < t0 && tf > lo) lo = tf;
    if (tf > t0 && tf < hi) hi = tf;
  }
  // Start from the relaxed optimum; if it has no flyable trajectory, from the nearest solved time that has one.
  let x = t0;
  let fx = cost(t0);
  if (!Number.isFinite(fx)) {
    const others = phase.solvedTimes.map((r) => r.timeOfFlight).filter((t) => t !== t0).sort((a, b) => Math.abs(a - t0) - Math.abs(b - t0));
    for (const t of others.slice(0, 3)) {
      const c = cost(t);
      if (Number.isFinite(c)) { x = t; fx = c; break; }
    }
  }
  if (!Number.isFinite(fx)) return null;
  const step = Math.max(4 * FLYABLE_TF_TOLERANCE, LOCAL_STEP_FRACTION * x);
  const bb = bracketFrom(cost, x, fx, step, lo, hi, -Infinity);
  const res = brentMinimise(cost, bb.a, bb.b, bb.x, bb.fx, FLYABLE_TF_TOLERANCE, Math.max(0, Math.min(12, budget())), -Infinity);
  return flyable(res.x) ?? flyable(x);
}
