/**
 * Free-final-time search for one target.
 *
 * 1. Bracket t_f from physics (bracket.ts).
 * 2. Find a feasible t_f: the warm-start guess (a neighbour's t_f) first, then a few probe points.
 *    Each infeasible probe carries the solver's infeasibility certificate.
 * 3. Minimise from that point: by default a safeguarded secant search on the slope dP/dt_f, which the
 *    dual solution gives by the envelope theorem (secant.ts); otherwise steps downhill to a bracket and
 *    Brent's method inside it (brent.ts). Infeasible times count as +∞ in both.
 * If no probe is feasible, the minimum-landing-error problem (Blackmore et al. 2010), feasible over a much
 * wider range of t_f, is searched the same way; a zero miss means the probes stepped over a narrow
 * feasible window, and the
 * minimum-propellant search restarts from that t_f; otherwise the target is unreachable and the result
 * carries the closest reachable landing point and the miss distance.
 */
import type { SolveStatus } from '../conic/types.ts';
import { isInfeasible, isSolved } from '../conic/types.ts';
import type { Vec3 } from './constants.ts';
import { timeOfFlightBracket } from './bracket.ts';
import type { TimeBracket } from './bracket.ts';
import { bracketFrom, brentMinimise } from './brent.ts';
import { secantMinimise } from './secant.ts';
import type { Probe } from './secant.ts';
import type { ProgramKind } from './program.ts';
import { NODE } from './program.ts';
import type { IgnitionState } from './setup.ts';
import type { DescentSolver, FixedTimeSolve } from './solver.ts';
import type { DecodedTrajectory } from './trajectory.ts';
import { decodeTrajectory } from './trajectory.ts';

export interface SearchOptions {
  /** Warm start: a neighbour's optimal t_f, s. */
  tfGuess?: number;
  /** Absolute tolerance on t_f, s. Default 0.1 (the propellant is flat in t_f near the optimum). */
  tfTolerance?: number;
  /** Probe times as multiples of the bracket's lower bound, tried when the guess is infeasible. */
  probes?: readonly number[];
  /** How many of the start times the minimum-propellant problem tries before the minimum-landing-error
   * search takes over to locate the feasible window (or prove the target unreachable). Default 1 with a
   * usable warm start (the guess itself), else 3. */
  propellantProbes?: number;
  /** Cap on solves per target (all phases). Default 60. */
  maxSolves?: number;
  /** Override the physical bracket. */
  bracket?: TimeBracket;
  /** Use the envelope-theorem slope dP/dt_f in the minimum-propellant search (default true); false: Brent. */
  useDerivative?: boolean;
  /** Stop the slope search once the remaining propellant gain is bounded below this, kg. Default 0.01. */
  propellantTolerance?: number;
  /** Decode the trajectory of the result (default true). */
  decode?: boolean;
  /**
   * t_f tolerance of the minimum-landing-error search, s (default: tfTolerance). The miss is flat in t_f
   * near its minimum, so a footprint can afford a coarser one.
   */
  landingErrorTfTolerance?: number;
}

/** First step of the local bracketing, as a fraction of the starting t_f. */
const LOCAL_STEP_FRACTION = 0.03;

export type DescentStatus = 'solved' | 'unreachable' | 'solver-failure';

export interface DescentResult {
  status: DescentStatus;
  target: Vec3;
  /** Optimal powered-descent time (unreachable: the minimum-landing-error time), s. */
  timeOfFlight: number;
  /** Propellant used, kg (unreachable: by the minimum-landing-error trajectory). */
  propellant: number;
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
  warnings: string[];
}

/**
 * Probe times as multiples of the bracket's lower bound, in the order tried (capped at the upper bound).
 * A heuristic: the minimum-propellant times of flight in our checks sit at 1.7–2.6 × the lower bound
 * (Açıkmeşe 2007 example 1.7–1.85, demo study 2.3, our Moon scenarios 2.5–2.6); the list then widens.
 */
export const DEFAULT_PROBES: readonly number[] = [2.3, 1.9, 2.7, 1.6, 3.2, 1.35, 4, 1.15, 5.5, 8];

interface Phase {
  best: FixedTimeSolve | null;
  /** Times at which this problem came back with an infeasibility certificate. */
  infeasibleTimes: number[];
  /** Every solved evaluation. */
  solvedTimes: FixedTimeSolve[];
  statuses: SolveStatus[];
  failures: number;
}

function runPhase(
  solver: DescentSolver, kind: ProgramKind, target: Vec3, ignition: IgnitionState, br: TimeBracket,
  starts: number[], tol: number, budget: () => number, knownInfeasible: readonly number[] = [], stopBelow = -Infinity,
  useDerivative = true, propellantTolerance = 0,
): Phase {
  const cache = new Map<number, FixedTimeSolve>();
  const statuses: SolveStatus[] = [];
  const infeasibleTimes: number[] = [];
  let failures = 0;
  const evalAt = (tf: number): FixedTimeSolve => {
    const hit = cache.get(tf);
    if (hit) return hit;
    const r = solver.solveFixed(kind, tf, target, ignition);
    cache.set(tf, r);
    if (!isSolved(r.status)) {
      statuses.push(r.status);
      if (!isInfeasible(r.status)) failures++;
    }
    if (isInfeasible(r.status)) infeasibleTimes.push(tf);
    return r;
  };
  const cost = (r: FixedTimeSolve) => (!isSolved(r.status) ? Infinity : kind === 'min-propellant' ? r.propellant : r.miss);
  let start: FixedTimeSolve | null = null;
  for (const tf of starts) {
    if (budget() <= 0) break;
    const r = evalAt(tf);
    if (isSolved(r.status)) {
      start = r;
      break;
    }
  }
  if (!start) return { best: null, statuses, failures, infeasibleTimes, solvedTimes: [] };
  // The feasible times form an interval: infeasible probes on either side of the start bound it.
  let lo = br.lower;
  let hi = br.upper;
  const x0 = start.timeOfFlight;
  for (const tf of [...cache.keys(), ...knownInfeasible]) {
    const r = cache.get(tf);
    if (r && isSolved(r.status)) continue;
    if (r && !isInfeasible(r.status)) continue;
    if (tf < x0 && tf > lo) lo = tf;
    if (tf > x0 && tf < hi) hi = tf;
  }
  const f = (tf: number) => cost(evalAt(tf));
  let res: { x: number };
  if (cost(start) <= stopBelow) {
    res = { x: x0 };
  } else if (useDerivative) {
    // Envelope-theorem slope at every solved point: a safeguarded slope search (secant.ts). For the
    // landing-error problem the cost is the objective in metres (miss plus the tiny propellant tie-break).
    const L = solver.scales.length;
    const probe = (tf: number): Probe => {
      const r = evalAt(tf);
      if (!isSolved(r.status)) return { feasible: false, f: Infinity, g: NaN };
      if (kind === 'min-propellant') return { feasible: true, f: r.propellant, g: solver.timeDerivative(r, target, ignition) };
      return { feasible: true, f: r.solution.info.primalObjective * L, g: solver.objectiveSlope(r, target, ignition) * L, stop: r.miss <= stopBelow };
    };
    const step = Math.max(4 * tol, LOCAL_STEP_FRACTION * x0);
    res = secantMinimise(probe, x0, probe(x0), lo, hi, tol, step, Math.max(0, budget()), kind === 'min-propellant' ? propellantTolerance : 0);
  } else {
    // Local bracket around the (often warm-started) feasible point, then Brent inside it.
    const step = Math.max(4 * tol, LOCAL_STEP_FRACTION * x0);
    const br = bracketFrom(f, x0, cost(start), step, lo, hi, stopBelow);
    res = brentMinimise(f, br.a, br.b, br.x, br.fx, tol, Math.max(0, budget()), stopBelow);
  }
  const best = cache.get(res.x) ?? start;
  return { best, statuses, failures, infeasibleTimes, solvedTimes: [...cache.values()].filter((r) => isSolved(r.status)) };
}

export function searchFreeFinalTime(solver: DescentSolver, target: Vec3, ignition: IgnitionState, options: SearchOptions = {}): DescentResult {
  const br = options.bracket ?? timeOfFlightBracket(solver.setup, ignition, target);
  const tol = options.tfTolerance ?? 0.1;
  const maxSolves = options.maxSolves ?? 60;
  const startSolves = solver.solves;
  const budget = () => maxSolves - (solver.solves - startSolves);
  // Capped below the upper bound, but never below the lower one (a bracket narrower than tol: a few kg of
  // usable propellant at a high lowest thrust) — a probe must be a positive time of flight.
  const probes = [...new Set((options.probes ?? DEFAULT_PROBES).map((f) => Math.max(br.lower, Math.min(br.lower * f, br.upper - tol))))];
  const starts = options.tfGuess !== undefined && options.tfGuess > br.lower && options.tfGuess < br.upper ? [options.tfGuess, ...probes] : probes;
  const warnings: string[] = [];
  const result = (partial: Partial<DescentResult> & Pick<DescentResult, 'status'>): DescentResult => ({
    target, timeOfFlight: NaN, propellant: NaN, solves: solver.solves - startSolves, bracket: br, closestPoint: null,
    miss: NaN, infeasibleStatuses: [], failures: 0, kind: null, trajectory: null, warnings, ...partial,
  });
  const finish = (best: FixedTimeSolve, phase: Phase, extra: Partial<DescentResult> & Pick<DescentResult, 'status'>): DescentResult => {
    const decode = options.decode ?? true;
    const traj = decode ? decodeTrajectory(solver.program(best.kind), best.solution.x, best.timeOfFlight, target) : null;
    if (traj && !traj.diagnostics.lossless) {
      warnings.push(`convexification not lossless: max(σ − ‖u‖) = ${traj.diagnostics.losslessnessGap.toExponential(2)} m/s² (${traj.diagnostics.losslessnessGapRelative.toExponential(2)} of full-throttle acceleration)`);
    }
    if (phase.failures > 0) warnings.push(`${phase.failures} solve(s) ended without a solution or a certificate; they were treated as infeasible`);
    if (best.timeOfFlight - br.lower < 2 * tol || br.upper - best.timeOfFlight < 2 * tol) warnings.push('optimal time of flight lies at the edge of the search bracket');
    return result({
      timeOfFlight: best.timeOfFlight, propellant: best.propellant, kind: best.kind, trajectory: traj,
      infeasibleStatuses: phase.statuses, failures: phase.failures, ...extra,
    });
  };

  const useDerivative = options.useDerivative ?? true;
  const propTol = options.propellantTolerance ?? 0.01;
  const fuel = runPhase(solver, 'min-propellant', target, ignition, br, starts.slice(0, options.propellantProbes ?? (starts[0] === options.tfGuess ? 1 : 3)), tol, budget, [], -Infinity, useDerivative, propTol);
  if (fuel.best) return finish(fuel.best, fuel, { status: 'solved' });

  const missTolerance = 1e-6 * solver.scales.length + 1e-3;
  const err = runPhase(solver, 'min-landing-error', target, ignition, br, starts, options.landingErrorTfTolerance ?? tol, budget, [], missTolerance);
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
    const again = runPhase(solver, 'min-propellant', target, ignition, br, [err.best.timeOfFlight], tol, budget, known, -Infinity, useDerivative, propTol);
    if (again.best) return finish(again.best, again, { status: 'solved' });
  }
  const prog = solver.program('min-landing-error');
  const last = (solver.setup.nodes - 1) * NODE.size + NODE.r;
  const x = err.best.solution.x;
  const closestPoint: Vec3 = [prog.value(x, last), prog.value(x, last + 1), prog.value(x, last + 2) - solver.setup.constraints.gateHeight];
  const status: DescentStatus = fuel.failures > 0 && fuel.statuses.every((s) => !isInfeasible(s)) ? 'solver-failure' : 'unreachable';
  return finish(err.best, { ...err, statuses: fuel.statuses }, {
    status,
    closestPoint,
    miss: err.best.miss,
    failures: fuel.failures + err.failures,
  });
}
