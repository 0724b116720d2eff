/**
 * The footprint engine: targets solved row by row, each row by one worker. Results are reproducible: every
 * target's result is a function of the grid and the context alone, never of the number of workers or the
 * order in which they finish (issue 11). Two things make it so:
 * - the warm-start chain follows the grid: a row continues from its centre target (the column nearest
 *   east = 0), which the *seeding column* solved beforehand; the seeding column runs from the nominal row
 *   outwards, each of its targets starting from its neighbour toward the centre, and a seeding target is
 *   dispatched only once that neighbour is done. Rows need nothing else, so once its seed is known a row
 *   runs in parallel with every other row: the only chain is the column, one target per row;
 * - every job starts its worker's evaluator afresh (`TargetEvaluator.reset`: no warm start, estimate or
 *   solver scaling carried over from the jobs the worker ran before).
 * Knows nothing of threads beyond the JobPool interface.
 */
import type { JobPool } from '../parallel/pool.ts';
import { emptyField, emptyRow, rowBuffers, setOutcome, TARGET, writeRow, type FieldRow, type FootprintField, type TargetCode, type TargetOutcome } from './field.ts';
import { columnOrder, rowOrder, type TargetGrid } from './grid.ts';

/**
 * Solves one target: minimum propellant with free final time, starting the search from `tfGuess_s`;
 * `guessFromUnreachable` says the guess is the closest-approach time of flight of a certified
 * unreachable neighbour (the target is then probably out of reach too). `reset`, when present, returns the
 * evaluator to its state when new (called at the start of every row job, see the file comment).
 */
export type TargetEvaluator = ((east_m: number, north_m: number, tfGuess_s: number | undefined, guessFromUnreachable?: boolean) => TargetOutcome) & {
  reset?: () => void;
};

export interface RowJob {
  /** What the worker needs to build its evaluator (plain, structured-clonable data; same for every row). */
  context: unknown;
  row: number;
  north_m: number;
  east_m: Float64Array;
  /** Times of flight to start from where no solved neighbour in the row gives one (NaN where none). */
  tfHint: Float32Array | null;
  /**
   * Solve only these columns (ascending), the others stay pending: a refinement pass, or the row's seeding
   * target. Each target then starts from its left neighbour when that was just solved, else from `tfHint`.
   */
  columns?: Int32Array;
  /**
   * The outcome of the row's first target in continuation order (its centre column), solved beforehand
   * by the seeding column: copied into the row, not solved again; the row's other targets continue from it.
   */
  seed?: TargetOutcome;
}

/** Worker side: solves every target of a row in continuation order, starting the evaluator afresh. */
export function solveRow(job: RowJob, evaluate: TargetEvaluator): FieldRow {
  evaluate.reset?.();
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
    if (job.seed && i === columns[0]) {
      setOutcome(out, i, job.seed);
      continue;
    }
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

/** The outcome stored at column `i` of a finished row (the values as stored: single precision). */
function outcomeAt(r: FieldRow, i: number): TargetOutcome {
  return {
    code: r.status[i] as TargetCode,
    propellant_kg: r.propellant_kg[i],
    timeOfFlight_s: r.timeOfFlight_s[i],
    peakTilt_deg: r.peakTilt_deg[i],
    miss_m: r.miss_m[i],
    solves: r.solves[i],
    betweenNodes: r.betweenNodes[i],
  };
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
  const centre = columnOrder(grid).columns[0];
  const context = options.context ?? null;
  // Per row: its seeding target's outcome once known; whether its seeding and its row job were sent.
  const seeds: (TargetOutcome | null)[] = new Array(grid.ny).fill(null);
  const seedSent = new Uint8Array(grid.ny);
  const rowSent = new Uint8Array(grid.ny);
  let rowsSent = 0;
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
  const seedJob = (row: number): RowJob => {
    const parent = parentRow[row];
    let tfHint: Float32Array | null = null;
    if (parent >= 0) {
      tfHint = new Float32Array(grid.nx).fill(NaN);
      tfHint[centre] = seeds[parent]!.timeOfFlight_s;
    }
    return { context, row, north_m: grid.north[row], east_m: grid.east.slice(), tfHint, columns: Int32Array.of(centre) };
  };
  const summary = await pool.run({
    next: () => {
      // Seeding targets first (they are the only chain), each once its neighbour toward the centre is done;
      // then any row whose seed is known. Which job goes to which worker, and when, changes no result.
      for (const row of rows) {
        const parent = parentRow[row];
        if (!seedSent[row] && (parent < 0 || seeds[parent] !== null)) {
          seedSent[row] = 1;
          return { job: seedJob(row) };
        }
      }
      for (const row of rows) {
        if (!rowSent[row] && seeds[row] !== null) {
          rowSent[row] = 1;
          rowsSent++;
          return { job: { context, row, north_m: grid.north[row], east_m: grid.east.slice(), tfHint: null, seed: seeds[row]! } };
        }
      }
      return null;
    },
    done: () => rowsSent >= grid.ny,
    onResult: (r, job) => {
      if (job.columns) {
        // A seeding target: it reaches the field with its row (a cancelled run keeps whole rows only).
        seeds[r.row] = outcomeAt(r, centre);
        return;
      }
      writeRow(field, r);
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
