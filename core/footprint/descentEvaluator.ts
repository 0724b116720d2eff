/**
 * The footprint's target evaluator on top of core/descent: one DescentSolver per worker (one symbolic
 * analysis for the whole grid), the slope-based free-final-time search warm-started from the neighbour,
 * the bracketing search (which also certifies unreachable targets) when that does not settle it.
 */
import type { SolverSettings } from '../conic/settings.ts';
import type { ConicBackend } from '../descent/backend.ts';
import { landreachConicBackend } from '../descent/conicBackend.ts';
import type { DescentSetup, IgnitionState } from '../descent/setup.ts';
import { searchFreeFinalTime } from '../descent/search.ts';
import { DescentSolver } from '../descent/solver.ts';
import type { TargetEvaluator } from './engine.ts';
import { BETWEEN_NODES, TARGET, type TargetOutcome } from './field.ts';
import { verifyBetweenNodes } from '../descent/verify.ts';

/** Everything a worker needs to evaluate targets (plain data, sent with every row job). */
export interface DescentFootprintContext {
  setup: DescentSetup;
  ignition: IgnitionState;
  /** Height of the target plane in the surface frame, m (targets lie at this z). */
  targetHeight_m: number;
  /** Solver settings for the footprint's cone programs. */
  solver?: Partial<SolverSettings>;
  /** Time-of-flight tolerance of the closest-approach search for unreachable targets, s (default 0.3). */
  tfTolerance_s?: number;
  /** Certified propellant tolerance of each target's time-of-flight search, kg (default FOOTPRINT_PROPELLANT_TOLERANCE_KG). */
  propellantTolerance_kg?: number;
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

/**
 * A footprint target's certified propellant tolerance, kg: each target's search stops once convexity proves
 * that no other time of flight saves more than this. Coarser than a single trajectory's 0.01 kg: the
 * contours are drawn from a grid whose interpolation error is larger.
 */
export const FOOTPRINT_PROPELLANT_TOLERANCE_KG = 0.05;
/**
 * Closest-approach t_f tolerance for unreachable targets: 0.3 s instead of 0.03 s moved the misses of a
 * 15 × 15 low-propellant demo grid by ≤ 0.15 m (measured) and saved 1.2 solves per unreachable target.
 */
const MISS_TF_TOLERANCE_S = 0.3;

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
    const res = searchFreeFinalTime(solver, [east, north, ctx.targetHeight_m], ctx.ignition, {
      tfGuess: guess,
      curvatureGuess: curvature,
      probeHalfWidth: half,
      landingErrorTfTolerance: ctx.tfTolerance_s ?? MISS_TF_TOLERANCE_S,
      propellantTolerance: ctx.propellantTolerance_kg ?? FOOTPRINT_PROPELLANT_TOLERANCE_KG,
      propellantBudget_kg: ctx.propellantBudget_kg,
      guessFromUnreachable,
      // Decoded (cheap next to the solves) for the dense re-simulation between nodes below.
      decode: true,
    });
    if (Number.isFinite(res.curvature) && res.curvature > 0) curvature = res.curvature;
    if (res.status === 'solved') {
      history.push({ east, north, tf: res.timeOfFlight });
      if (history.length > 2) history.shift();
    } else history.length = 0;
    if (Number.isFinite(res.overBudgetBound_kg)) {
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
    const code = res.status === 'solved' ? TARGET.reachable
      : res.status === 'relaxation-gap' ? TARGET.relaxationGap
        : res.status === 'undecided' ? TARGET.undecided
        : res.status === 'unreachable' ? TARGET.unreachable : TARGET.failed;
    const out: TargetOutcome = {
      code,
      // relaxation-gap: the best flyable trajectory (an upper bound; NaN when none was found).
      // undecided (throttle band): the band-respecting cost above the budget when one was found, else NaN.
      propellant_kg: res.status === 'solved' || res.status === 'relaxation-gap' || res.status === 'undecided' ? res.propellant : NaN,
      // Unreachable: the time of flight of the closest-approach (minimum-landing-error) trajectory.
      timeOfFlight_s: res.status === 'solver-failure' ? NaN : res.timeOfFlight,
      peakTilt_deg: res.status === 'solved' || res.status === 'relaxation-gap' ? res.peakTilt * RAD : NaN,
      miss_m: res.status === 'unreachable' ? res.miss : res.status === 'solver-failure' ? NaN : 0,
      solves: res.solves,
      betweenNodes: res.trajectory && res.kind !== 'min-landing-error'
        ? (verifyBetweenNodes(ctx.setup, res.trajectory, [east, north, ctx.targetHeight_m]).violations.length === 0 ? BETWEEN_NODES.met : BETWEEN_NODES.missed)
        : BETWEEN_NODES.unchecked,
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
