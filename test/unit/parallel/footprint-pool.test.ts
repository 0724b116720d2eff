import { describe, expect, it } from 'vitest';
import { computeFootprint, rowJobHandler, solveRow, type RowJob } from '../../../core/footprint/engine.ts';
import { countByStatus, TARGET, type FieldRow } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { nodeWorkerFactory } from '../../../core/parallel/nodeWorker.ts';
import { inlineWorkerFactory, JobPool } from '../../../core/parallel/pool.ts';
import { discEvaluator } from '../../support/analytic-evaluator.ts';

const grid = makeTargetGrid({ halfWidthEast_m: 1000, halfWidthNorth_m: 1000, nx: 21, ny: 21 });

function inlinePool(size: number, radius = 700) {
  const handler = rowJobHandler(discEvaluator(radius));
  return new JobPool<RowJob, FieldRow>(inlineWorkerFactory((job: RowJob) => handler(job).result), size);
}

describe('footprint engine', () => {
  it('solves every target and matches the evaluator target by target', async () => {
    const run = await computeFootprint(grid, inlinePool(2));
    expect(run.cancelled).toBe(false);
    const ev = discEvaluator(700);
    for (let j = 0; j < grid.ny; j++) {
      for (let i = 0; i < grid.nx; i++) {
        const k = j * grid.nx + i;
        const ref = ev(grid.east[i], grid.north[j], undefined);
        expect(run.field.status[k]).toBe(ref.code);
        if (ref.code === TARGET.reachable) expect(run.field.propellant_kg[k]).toBeCloseTo(ref.propellant_kg, 3);
      }
    }
    expect(run.progress.targetsDone).toBe(441);
  });

  it('warm-starts every reachable target but the first from a solved neighbour', () => {
    const job: RowJob = { context: null, row: 10, north_m: 0, east_m: grid.east.slice(), tfHint: null };
    const row = solveRow(job, discEvaluator(700));
    const cold = Array.from(row.solves).filter((s, i) => row.status[i] === TARGET.reachable && s === 10).length;
    expect(cold).toBe(1);
  });

  it('cancelling keeps the finished rows and marks the rest pending', async () => {
    const controller = new AbortController();
    const handler = rowJobHandler(discEvaluator(700, 2));
    const pool = new JobPool<RowJob, FieldRow>(inlineWorkerFactory((job: RowJob) => handler(job).result), 1);
    const seen: number[] = [];
    const run = await computeFootprint(grid, pool, {
      signal: controller.signal,
      onRow: (r) => {
        seen.push(r.row);
        if (seen.length === 5) controller.abort();
      },
    });
    expect(run.cancelled).toBe(true);
    const counts = countByStatus(run.field);
    expect(counts.pending).toBe((21 - 5) * 21);
    for (const r of seen) expect(run.field.status.subarray(r * 21, r * 21 + 21).every((s) => s !== TARGET.pending)).toBe(true);
  });

  it('rejects a bad worker count naming it', () => {
    expect(() => inlinePool(0)).toThrow(/workers: 0 \(must be a whole number from 1 to 64\)/);
  });
});

describe('worker_threads adapter', () => {
  it('streams rows from real worker threads and gives the same field as the inline pool', async () => {
    const pool = new JobPool<RowJob, FieldRow>(
      nodeWorkerFactory(new URL('../../support/disc-worker.mjs', import.meta.url), { radius: 700, delayMs: 0 }),
      2,
    );
    try {
      const threaded = await computeFootprint(grid, pool);
      const inline = await computeFootprint(grid, inlinePool(1));
      expect(Array.from(threaded.field.status)).toEqual(Array.from(inline.field.status));
      for (let k = 0; k < 441; k++) {
        if (inline.field.status[k] === TARGET.reachable) {
          expect(threaded.field.propellant_kg[k]).toBeCloseTo(inline.field.propellant_kg[k], 3);
        }
      }
    } finally {
      pool.close();
    }
  });
});
