/**
 * The footprint's target evaluator on top of core/descent: one DescentSolver per worker (one symbolic
 * analysis for the whole grid), the slope-based free-final-time search warm-started from the neighbour,
 * the bracketing search (which also certifies unreachable targets) when that does not settle it.
 */
import type { SolverSettings } from '../conic/settings.ts';
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
}

const RAD = 180 / Math.PI;

export function descentEvaluator(ctx: DescentFootprintContext): TargetEvaluator {
  const solver = new DescentSolver(ctx.setup, landreachConicBackend(ctx.solver ?? {}), ctx.ignition);
  let curvature: number | undefined;
  return (east, north, tfGuess) => {
    const r = searchFreeFinalTimeBySlope(solver, [east, north, ctx.targetHeight_m], ctx.ignition, {
      tfGuess,
      curvatureGuess: curvature,
      tfTolerance: ctx.tfTolerance_s,
    });
    if (Number.isFinite(r.curvature) && r.curvature > 0) curvature = r.curvature;
    const res = r.result;
    const out: TargetOutcome = {
      code: res.status === 'solved' ? TARGET.reachable : res.status === 'unreachable' ? TARGET.unreachable : TARGET.failed,
      propellant_kg: res.status === 'solved' ? res.propellant : NaN,
      timeOfFlight_s: res.status === 'solved' ? res.timeOfFlight : NaN,
      peakTilt_deg: res.status === 'solved' ? r.peakTilt * RAD : NaN,
      miss_m: res.status === 'solved' ? 0 : res.status === 'unreachable' ? res.miss : NaN,
      solves: res.solves,
    };
    return out;
  };
}
