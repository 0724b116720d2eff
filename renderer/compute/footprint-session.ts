/**
 * One footprint computation at a time in a pool of Web Workers: rows stream in (onRow) while the UI stays
 * live; cancel stops dispatching, ends busy workers and keeps every finished row. Knows nothing of Svelte.
 */
import { computeFootprint, type FootprintProgress, type FootprintRun, type RowJob } from '../../core/footprint/engine.ts';
import { emptyField, writeRow, type FieldRow, type FootprintField } from '../../core/footprint/field.ts';
import type { TargetGrid } from '../../core/footprint/grid.ts';
import { footprintContext, FOOTPRINT_NODES } from '../../core/footprint/studyFootprint.ts';
import { JobPool } from '../../core/parallel/pool.ts';
import type { WorkerFactory } from '../../core/parallel/protocol.ts';
import type { Study } from '../../core/study/schema.ts';

/**
 * Workers for a footprint: one per core but one (the UI thread keeps a core for the scene), at least two
 * (on two cores the UI thread's share is small: both workers still run near full speed), at most eight.
 */
export function footprintWorkerCount(cores: number | undefined): number {
  const n = Number.isInteger(cores) && (cores as number) > 0 ? (cores as number) : 2;
  return Math.max(2, Math.min(8, n - 1));
}

export const FOOTPRINT_WORKERS = footprintWorkerCount(typeof navigator !== 'undefined' ? navigator.hardwareConcurrency : undefined);

export interface FootprintSessionEvents {
  /** A row finished: `field` holds every row finished so far (the same object through the run). */
  onRow(field: FootprintField, progress: FootprintProgress): void;
}

export class FootprintSession {
  private pool: JobPool<RowJob, FieldRow> | null = null;
  private controller: AbortController | null = null;

  constructor(
    private readonly factory: WorkerFactory,
    private readonly workers = FOOTPRINT_WORKERS,
  ) {}

  get running(): boolean {
    return this.controller !== null;
  }

  /** Runs the whole grid; resolves with the field (partial when cancelled). Rejects if a run is going. */
  async run(study: Study, grid: TargetGrid, events: FootprintSessionEvents): Promise<FootprintRun> {
    if (this.controller) throw new Error('a footprint run is already going');
    this.pool ??= new JobPool<RowJob, FieldRow>(this.factory, this.workers);
    const controller = new AbortController();
    this.controller = controller;
    // The engine writes rows into its own field; the UI gets a live copy kept row by row.
    const live = emptyField(grid);
    try {
      return await computeFootprint(grid, this.pool, {
        context: footprintContext(study, FOOTPRINT_NODES),
        signal: controller.signal,
        onRow: (row, progress) => {
          writeRow(live, row);
          events.onRow(live, progress);
        },
      });
    } finally {
      this.controller = null;
    }
  }

  cancel(): void {
    this.controller?.abort();
  }

  close(): void {
    this.cancel();
    this.pool?.close();
    this.pool = null;
  }
}
