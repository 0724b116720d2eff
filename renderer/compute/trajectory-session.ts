/**
 * Optimal trajectories of picked targets, solved one at a time in a Web Worker (a picked target takes about
 * a second at the study's nodes), and their conversion to the shapes the charts and the scene draw.
 */
import type { PickedTrajectory, PickedTrajectoryJob } from '../../core/footprint/pickedTrajectory.ts';
import type { TrajectorySeries as CoreSeries } from '../../core/descent/trajectory.ts';
import { JobPool } from '../../core/parallel/pool.ts';
import type { WorkerFactory } from '../../core/parallel/protocol.ts';
import type { TrajectorySeries } from '../plots/trajectory-charts.ts';

/** Core's struct-of-arrays series → interleaved (east, north, up) vectors per sample, SI. */
export function chartSeries(s: CoreSeries): TrajectorySeries {
  const n = s.t.length;
  const interleave = (a: Float64Array, b: Float64Array, c: Float64Array) => {
    const out = new Float64Array(3 * n);
    for (let i = 0; i < n; i++) {
      out[3 * i] = a[i];
      out[3 * i + 1] = b[i];
      out[3 * i + 2] = c[i];
    }
    return out;
  };
  return {
    time_s: s.t,
    thrust_N: interleave(s.thrustX, s.thrustY, s.thrustZ),
    mass_kg: s.mass,
    position_m: interleave(s.x, s.y, s.z),
    velocity_mps: interleave(s.vx, s.vy, s.vz),
  };
}

export class TrajectorySession {
  private pool: JobPool<PickedTrajectoryJob, PickedTrajectory> | null = null;
  private queue: Promise<unknown> = Promise.resolve();

  constructor(private readonly factory: WorkerFactory) {}

  /** Solves one target; calls run in order, one at a time. */
  solve(job: PickedTrajectoryJob): Promise<PickedTrajectory> {
    const next = this.queue.then(() => this.solveNow(job));
    this.queue = next.catch(() => undefined);
    return next;
  }

  private async solveNow(job: PickedTrajectoryJob): Promise<PickedTrajectory> {
    this.pool ??= new JobPool<PickedTrajectoryJob, PickedTrajectory>(this.factory, 1);
    let result: PickedTrajectory | null = null;
    let sent = false;
    await this.pool.run({
      next: () => (sent ? null : ((sent = true), { job })),
      done: () => sent,
      onResult: (r) => (result = r),
    });
    if (!result) throw new Error('the trajectory worker returned nothing');
    return result;
  }

  close(): void {
    this.pool?.close();
    this.pool = null;
  }
}
