/**
 * The footprint's target evaluator on top of core/descent: one DescentSolver per worker (one symbolic
 * analysis for the whole grid), the slope-based free-final-time search warm-started from the neighbour,
 * the bracketing search (which also certifies unreachable targets) when that does not settle it.
 */
import type { SolverSettings } from '../conic/settings.ts';
import type { ConicBackend } from '../descent/backend.ts';
import { landreachConicBackend } from '../descent/conicBackend.ts';
import type { DescentSetup, IgnitionState } from '../descent/setup.ts';
import { searchFreeFinalTimeBySlope } from '../descent/slopeSearch.ts';
import { DescentSolver } from '../descent/solver.ts';
import type { TargetEvaluator } from './engine.ts';
import { TARGET, type TargetOutcome } from './field.ts';

/** Everything a worker needs to evaluate targets (plain data, sent with every row job). */
export interface DescentFootprintContext {
  setup: DescentSetup;
  ignition: IgnitionState;
  /** Height of the target plane in the surface frame, m (targets lie at this z). */
  targetHeight_m: number;
  /** Solver settings for the footprint's cone programs. */
  solver?: Partial<SolverSettings>;
  /** Time-of-flight tolerance of the search, s. */
  tfTolerance_s?: number;
  /**
   * Reachable-set run: targets whose certified lower bound on propellant exceeds this budget, kg, stop
   * there and are stored as TARGET.overBudget (the exact cost of targets outside the budget is not computed).
   */
  propellantBudget_kg?: number;
}

const RAD = 180 / Math.PI;

/**
 * Cone-program tolerances for footprint targets: 1e-7 instead of the solver's 1e-8 saves interior-point
 * iterations; on the demo study's 9 × 9 grid the propellant summed over all targets moved by 0.01 kg.
 */
export const FOOTPRINT_SOLVER_SETTINGS: Partial<SolverSettings> = Object.freeze({
  feasibilityTolerance: 1e-7,
  gapAbsoluteTolerance: 1e-7,
  gapRelativeTolerance: 1e-7,
});

/** `backend` replaces the project's solver (the benchmark runs the same evaluator on CVXOPT). */
export function descentEvaluator(ctx: DescentFootprintContext, backend?: ConicBackend): TargetEvaluator {
  const solver = new DescentSolver(ctx.setup, backend ?? landreachConicBackend(ctx.solver ?? FOOTPRINT_SOLVER_SETTINGS), ctx.ignition);
  let curvature: number | undefined;
  // The last two solved targets: when the new one continues their line at the same spacing (the next
  // target along a row), its optimal time of flight is extrapolated linearly, and the opening probes go
  // a quarter of the last change either side of that (at least 0.1 s), which usually brackets it.
  const history: { east: number; north: number; tf: number }[] = [];
  const evaluate: TargetEvaluator = (east, north, tfGuess, guessFromUnreachable) => {
    let guess = tfGuess;
    let half: number | undefined;
    if (history.length === 2 && guess !== undefined) {
      const [a, b] = history;
      const collinear = Math.abs(north - b.north) < 1e-6 && Math.abs(b.north - a.north) < 1e-6;
      const even = Math.abs(east - b.east - (b.east - a.east)) < 1e-6 * (1 + Math.abs(east));
      // (the guess comes through a Float32Array row, hence the loose equality)
      if (collinear && even && Math.abs(guess - b.tf) < 1e-3) {
        guess = 2 * b.tf - a.tf;
        half = Math.max(0.1, 0.25 * Math.abs(b.tf - a.tf));
      }
    }
    const r = searchFreeFinalTimeBySlope(solver, [east, north, ctx.targetHeight_m], ctx.ignition, {
      tfGuess: guess,
      curvatureGuess: curvature,
      probeHalfWidth: half,
      tfTolerance: ctx.tfTolerance_s,
      propellantBudget_kg: ctx.propellantBudget_kg,
      guessFromUnreachable,
    });
    if (Number.isFinite(r.curvature) && r.curvature > 0) curvature = r.curvature;
    if (r.result.status === 'solved') {
      history.push({ east, north, tf: r.result.timeOfFlight });
      if (history.length > 2) history.shift();
    } else history.length = 0;
    const res = r.result;
    if (Number.isFinite(r.overBudgetBound_kg)) {
      return {
        code: TARGET.overBudget,
        // The best trajectory found: an upper bound on the minimum (above the budget, as is the bound).
        propellant_kg: res.propellant,
        timeOfFlight_s: res.timeOfFlight,
        peakTilt_deg: NaN,
        miss_m: 0,
        solves: res.solves,
      };
    }
    const out: TargetOutcome = {
      code: res.status === 'solved' ? TARGET.reachable : res.status === 'unreachable' ? TARGET.unreachable : TARGET.failed,
      propellant_kg: res.status === 'solved' ? res.propellant : NaN,
      // Unreachable: the time of flight of the closest-approach (minimum-landing-error) trajectory.
      timeOfFlight_s: res.status === 'solved' || res.status === 'unreachable' ? res.timeOfFlight : NaN,
      peakTilt_deg: res.status === 'solved' ? r.peakTilt * RAD : NaN,
      miss_m: res.status === 'solved' ? 0 : res.status === 'unreachable' ? res.miss : NaN,
      solves: res.solves,
    };
    return out;
  };
  // A row starts from nothing its worker solved before (reproducible footprints, engine.ts).
  evaluate.reset = () => {
    solver.reset();
    curvature = undefined;
    history.length = 0;
  };
  return evaluate;
}
