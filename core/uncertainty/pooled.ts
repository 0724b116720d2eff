/**
 * Flying the landing-success samples on a job pool (worker_threads in the CLI, Web Workers in the app): jobs
 * of `chunk` consecutive samples, handed out in index order; results gathered by index, so the summary is
 * the same bits for any worker count and completion order. Cancelling keeps every finished job's samples.
 */
import type { JobPool } from '../parallel/pool.ts';
import type { LandingSample } from './closedLoop.ts';
import type { LandingSamplesJob } from './worker.ts';

export interface LandingSamplesProgress {
  done: number;
  total: number;
  elapsed_s: number;
  rate_per_s: number;
  remaining_s: number;
}

/** Samples per job: small enough for progress and cancel, large enough to keep the message cost small. */
export const SAMPLES_PER_JOB = 10;

export async function flySamplesOnPool(
  pool: JobPool<LandingSamplesJob, LandingSample[]>,
  base: Omit<LandingSamplesJob, 'from' | 'to'>,
  total: number,
  options: { signal?: AbortSignal; onProgress?: (p: LandingSamplesProgress) => void; chunk?: number } = {},
): Promise<{ samples: LandingSample[]; cancelled: boolean }> {
  const chunk = options.chunk ?? SAMPLES_PER_JOB;
  const byIndex: (LandingSample | undefined)[] = new Array(total);
  let next = 0;
  let done = 0;
  const started = Date.now();
  const summary = await pool.run({
    next: () => {
      if (next >= total) return null;
      const from = next;
      next = Math.min(total, next + chunk);
      return { job: { ...base, from, to: next } };
    },
    done: () => next >= total,
    onResult: (rows) => {
      for (const r of rows) byIndex[r.index] = r;
      done += rows.length;
      const elapsed = (Date.now() - started) / 1000;
      const rate = elapsed > 0 ? done / elapsed : 0;
      options.onProgress?.({ done, total, elapsed_s: elapsed, rate_per_s: rate, remaining_s: rate > 0 ? (total - done) / rate : Infinity });
    },
    signal: options.signal,
  });
  return { samples: byIndex.filter((s): s is LandingSample => s !== undefined), cancelled: summary.cancelled };
}
