/**
 * One picked target's optimal trajectory (minimum propellant, free final time), as plain data a worker can
 * send back: the decoded time series and the search outcome.
 */
import { landreachConicBackend } from '../descent/conicBackend.ts';
import type { Vec3 } from '../descent/constants.ts';
import { searchFreeFinalTime, type DescentStatus } from '../descent/search.ts';
import { DescentSolver } from '../descent/solver.ts';
import type { TrajectorySeries } from '../descent/trajectory.ts';
import type { Study } from '../study/schema.ts';
import { studyToDescent } from '../study/toDescent.ts';

export interface PickedTrajectoryJob {
  study: Study;
  /** Target, m east, north of the nominal target (on the study's target plane). */
  east_m: number;
  north_m: number;
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
}

/** Solved with the study's own reserve and node count (the footprint uses fewer nodes and no reserve). */
export function solvePickedTrajectory(job: PickedTrajectoryJob): PickedTrajectory {
  const d = studyToDescent(job.study);
  const solver = new DescentSolver(d.setup, landreachConicBackend(), d.ignition);
  const target: Vec3 = [job.east_m, job.north_m, d.target[2]];
  const r = searchFreeFinalTime(solver, target, d.ignition, { decode: true });
  return {
    status: r.status,
    target_m: target,
    propellant_kg: r.propellant,
    timeOfFlight_s: r.timeOfFlight,
    miss_m: r.status === 'solved' ? 0 : r.miss,
    nodes: d.setup.nodes,
    series: r.trajectory?.series ?? null,
    warnings: r.warnings,
  };
}
