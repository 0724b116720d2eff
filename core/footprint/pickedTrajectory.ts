/**
 * One picked target's optimal trajectory (minimum propellant, free final time), as plain data a worker can
 * send back: the decoded time series and the search outcome.
 */
import { verifyBetweenNodes } from '../descent/verify.ts';
import { polynomialGuidance } from '../descent/baselines/polynomial.ts';
import { landreachConicBackend } from '../descent/conicBackend.ts';
import type { Vec3 } from '../descent/constants.ts';
import { searchFreeFinalTime, type DescentStatus } from '../descent/search.ts';
import { DescentSolver } from '../descent/solver.ts';
import type { TrajectorySeries } from '../descent/trajectory.ts';
import type { DescentSetup, IgnitionState } from '../descent/setup.ts';
import type { Study } from '../study/schema.ts';
import { studyToDescent } from '../study/toDescent.ts';

export interface PickedTrajectoryJob {
  study: Study;
  /** Target, m east, north of the nominal target (on the study's target plane). */
  east_m: number;
  north_m: number;
  /** A time-of-flight guess, s (e.g. the computed footprint's at the picked point): fewer solves. */
  tfGuess_s?: number;
}

export interface PickedTrajectory {
  status: DescentStatus;
  target_m: Vec3;
  /** Minimum propellant, kg (unreachable: that of the closest-approach trajectory). */
  propellant_kg: number;
  timeOfFlight_s: number;
  /** Horizontal miss of the closest reachable point, m (0 when reachable). */
  miss_m: number;
  nodes: number;
  /** Time series at the nodes (null on solver failure). */
  series: TrajectorySeries | null;
  warnings: string[];
  /** Certified lower bound on the minimum propellant, kg (NaN when unknown); below `propellant_kg` for relaxation-gap picks. */
  propellantLowerBound_kg: number;
  /** The polynomial-guidance baseline to the same target ("what does optimal guidance buy us?"); null if not computed. */
  baseline: PickedBaseline | null;
}

/** Polynomial guidance flown to the target (core/descent/baselines/polynomial.ts). */
export interface PickedBaseline {
  method: 'polynomial guidance';
  propellant_kg: number;
  timeOfFlight_s: number;
  /** Position error at the end of guidance, m. */
  miss_m: number;
  velocityError_mps: number;
  /** Fraction of the burn spent at a thrust or pointing limit. */
  saturatedFraction: number;
  /** Samples (at most BASELINE_SAMPLES, evenly spread over the flight): time, and east/north/up interleaved. */
  time_s: Float64Array;
  position_m: Float64Array;
}

/** Samples kept of the baseline's simulation (it steps every 0.05 s): enough for a smooth curve. */
export const BASELINE_SAMPLES = 120;

/** Solved with the study's own reserve and node count (the footprint uses fewer nodes and no reserve). */
export function solvePickedTrajectory(job: PickedTrajectoryJob): PickedTrajectory {
  const d = studyToDescent(job.study);
  const solver = new DescentSolver(d.setup, landreachConicBackend(), d.ignition);
  const target: Vec3 = [job.east_m, job.north_m, d.target[2]];
  const guess = job.tfGuess_s !== undefined && Number.isFinite(job.tfGuess_s) && job.tfGuess_s > 0 ? job.tfGuess_s : undefined;
  const r = searchFreeFinalTime(solver, target, d.ignition, { decode: true, tfGuess: guess });
  // Dense re-simulation between the nodes: a constraint missed there is a warning the user sees.
  if (r.trajectory && r.kind !== 'min-landing-error') {
    for (const v of verifyBetweenNodes(d.setup, r.trajectory, target).violations) r.warnings.push(`re-simulation: ${v}`);
  }
  return {
    status: r.status,
    target_m: target,
    propellant_kg: r.propellant,
    propellantLowerBound_kg: r.propellantLowerBound,
    timeOfFlight_s: r.timeOfFlight,
    miss_m: r.status === 'solved' ? 0 : r.miss,
    nodes: d.setup.nodes,
    series: r.trajectory?.series ?? null,
    warnings: r.warnings,
    baseline: baselineTo(d.setup, d.ignition, target),
  };
}

function baselineTo(setup: DescentSetup, ignition: IgnitionState, target: Vec3): PickedBaseline {
  const b = polynomialGuidance(setup, ignition, target);
  const n = Math.min(BASELINE_SAMPLES, b.samples.length);
  const time_s = new Float64Array(n);
  const position_m = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) {
    const s = b.samples[n === 1 ? 0 : Math.round((i * (b.samples.length - 1)) / (n - 1))];
    time_s[i] = s.t;
    position_m.set(s.r, 3 * i);
  }
  return {
    method: 'polynomial guidance',
    propellant_kg: b.propellant,
    timeOfFlight_s: b.timeOfFlight,
    miss_m: b.miss,
    velocityError_mps: b.velocityError,
    saturatedFraction: b.saturatedFraction,
    time_s,
    position_m,
  };
}
