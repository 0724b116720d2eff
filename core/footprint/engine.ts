/**
 * The footprint engine: targets solved row by row, each row by one worker, rows dispatched from the
 * nominal target outwards. Within a row each target starts its time-of-flight search from its solved
 * neighbour; the first target of a row starts from the solved row toward the centre, when it has finished.
 * Knows nothing of threads beyond the JobPool interface.
 */
import type { JobPool } from '../parallel/pool.ts';
import { emptyField, emptyRow, rowBuffers, setOutcome, TARGET, writeRow, type FieldRow, type FootprintField, type TargetOutcome } from './field.ts';
import { columnOrder, rowOrder, type TargetGrid } from './grid.ts';

/**
 * Solves one target: minimum propellant with free final time, starting the search from `tfGuess_s`;
 * `guessFromUnreachable` says the guess is the closest-approach time of flight of a certified
 * unreachable neighbour (the target is then probably out of reach too).
 */
export type TargetEvaluator = (east_m: number, north_m: number, tfGuess_s: number | undefined, guessFromUnreachable?: boolean) => TargetOutcome;

export interface RowJob {
  /** What the worker needs to build its evaluator (plain, structured-clonable data; same for every row). */
  context: unknown;
  row: number;
  north_m: number;
  east_m: Float64Array;
  /** Optimal times of flight of the neighbouring row toward the centre, when known (NaN where not reachable). */
  tfHint: Float32Array | null;
  /**
   * Solve only these columns (ascending), the others stay pending: a refinement pass. Each target then
   * starts from its left neighbour when that was just solved, else from `tfHint`.
   */
  columns?: Int32Array;
}

/** Worker side: solves every target of a row in continuation order. */
export function solveRow(job: RowJob, evaluate: TargetEvaluator): FieldRow {
  const nx = job.east_m.length;
  const out = emptyRow(job.row, nx);
  if (job.columns) {
    let last = -2;
    for (const i of job.columns) {
      let guess: number | undefined;
      if (last === i - 1 && Number.isFinite(out.timeOfFlight_s[last])) guess = out.timeOfFlight_s[last];
      else if (job.tfHint && Number.isFinite(job.tfHint[i])) guess = job.tfHint[i];
      setOutcome(out, i, evaluate(job.east_m[i], job.north_m, guess));
      last = i;
    }
    return out;
  }
  const { columns, previous } = columnOrder({ nx, ny: 1, east: job.east_m, north: new Float64Array(1), spacingEast_m: 0, spacingNorth_m: 0 });
  for (const i of columns) {
    const prev = previous[i];
    let guess: number | undefined;
    // The neighbour's time of flight, optimal or (unreachable neighbour) of its closest approach.
    let fromUnreachable = false;
    if (prev >= 0 && Number.isFinite(out.timeOfFlight_s[prev])) {
      guess = out.timeOfFlight_s[prev];
      fromUnreachable = out.status[prev] === TARGET.unreachable;
    } else if (job.tfHint && Number.isFinite(job.tfHint[i])) guess = job.tfHint[i];
    setOutcome(out, i, evaluate(job.east_m[i], job.north_m, guess, fromUnreachable));
  }
  return out;
}

export interface FootprintProgress {
  rowsDone: number;
  rowsTotal: number;
  targetsDone: number;
  targetsTotal: number;
  elapsed_s: number;
  /** Targets per second so far. */
  rate_per_s: number;
  /** Estimated time left at the current rate, s. */
  remaining_s: number;
}

export interface FootprintRunOptions {
  /** Passed to every row job (see RowJob.context). */
  context?: unknown;
  signal?: AbortSignal;
  /** Called for each finished row (already written into the field). */
  onRow?: (row: FieldRow, progress: FootprintProgress) => void;
  /** Clock in seconds (injectable for tests). */
  clock?: () => number;
}

export interface FootprintRun {
  field: FootprintField;
  cancelled: boolean;
  progress: FootprintProgress;
}

export async function computeFootprint(
  grid: TargetGrid,
  pool: JobPool<RowJob, FieldRow>,
  options: FootprintRunOptions = {},
): Promise<FootprintRun> {
  const clock = options.clock ?? (() => (typeof performance !== 'undefined' ? performance.now() : Date.now()) / 1000);
  const field = emptyField(grid);
  const { rows, parentRow } = rowOrder(grid);
  const finishedRows = new Set<number>();
  let dispatched = 0;
  const start = clock();
  const progress: FootprintProgress = {
    rowsDone: 0,
    rowsTotal: grid.ny,
    targetsDone: 0,
    targetsTotal: grid.nx * grid.ny,
    elapsed_s: 0,
    rate_per_s: 0,
    remaining_s: NaN,
  };
  const summary = await pool.run({
    next: () => {
      if (dispatched >= rows.length) return null;
      const row = rows[dispatched++];
      const parent = parentRow[row];
      let tfHint: Float32Array | null = null;
      if (parent >= 0 && finishedRows.has(parent)) {
        tfHint = field.timeOfFlight_s.slice(parent * grid.nx, (parent + 1) * grid.nx);
      }
      return { job: { context: options.context ?? null, row, north_m: grid.north[row], east_m: grid.east.slice(), tfHint } };
    },
    done: () => dispatched >= rows.length,
    onResult: (r) => {
      writeRow(field, r);
      finishedRows.add(r.row);
      progress.rowsDone++;
      progress.targetsDone += grid.nx;
      progress.elapsed_s = clock() - start;
      progress.rate_per_s = progress.elapsed_s > 0 ? progress.targetsDone / progress.elapsed_s : 0;
      progress.remaining_s = progress.rate_per_s > 0 ? (progress.targetsTotal - progress.targetsDone) / progress.rate_per_s : NaN;
      options.onRow?.(r, { ...progress });
    },
    signal: options.signal,
  });
  progress.elapsed_s = clock() - start;
  return { field, cancelled: summary.cancelled, progress };
}

/**
 * Worker-side handler for the pool protocol: solve the row, transfer its buffers. `evaluate` is either an
 * evaluator or a factory from the job's context (called once per distinct context, then kept).
 */
export function rowJobHandler(evaluate: TargetEvaluator | { fromContext: (context: unknown) => TargetEvaluator }) {
  let cachedKey: string | null = null;
  let cached: TargetEvaluator | null = null;
  return (job: RowJob) => {
    let ev: TargetEvaluator;
    if (typeof evaluate === 'function') ev = evaluate;
    else {
      const key = JSON.stringify(job.context);
      if (key !== cachedKey || !cached) {
        cached = evaluate.fromContext(job.context);
        cachedKey = key;
      }
      ev = cached;
    }
    const result = solveRow(job, ev);
    return { result, transfer: rowBuffers(result) };
  };
}
