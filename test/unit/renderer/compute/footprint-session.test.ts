import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { rowJobHandler, type RowJob } from '../../../../core/footprint/engine.ts';
import { descentEvaluator, type DescentFootprintContext } from '../../../../core/footprint/descentEvaluator.ts';
import { countByStatus, TARGET, type FootprintField } from '../../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../../core/footprint/grid.ts';
import { inlineWorkerFactory } from '../../../../core/parallel/pool.ts';
import { parseStudyText } from '../../../../core/study/index.ts';
import { FootprintSession, footprintWorkerCount } from '../../../../renderer/compute/footprint-session.ts';

// The session's pool with in-thread workers running the same row handler as the Web Worker entry.
const handler = rowJobHandler({ fromContext: (c) => descentEvaluator(c as DescentFootprintContext) });
const factory = inlineWorkerFactory((job: RowJob) => handler(job).result);
const study = parseStudyText(readFileSync(new URL('../../../../assets/demo/demo-lander.study.json', import.meta.url), 'utf8'));
const grid = makeTargetGrid({ halfWidthEast_m: 800, halfWidthNorth_m: 800, nx: 3, ny: 3 });

describe('footprint session (demo study, 3 × 3, in-thread workers)', () => {
  it('streams rows into a live field that ends equal to the run result', async () => {
    const session = new FootprintSession(factory);
    const seen: number[] = [];
    const run = await session.run(study, grid, { onRow: (_field, p) => seen.push(p.targetsDone) });
    expect(seen).toEqual([3, 6, 9]);
    expect(run.cancelled).toBe(false);
    expect(countByStatus(run.field).pending).toBe(0);
    session.close();
  });

  it('cancel keeps the finished rows and nothing else', async () => {
    const session = new FootprintSession(factory, 1);
    let live: FootprintField | null = null;
    const run = await session.run(study, grid, {
      onRow: (field) => {
        live = field;
        session.cancel();
      },
    });
    expect(run.cancelled).toBe(true);
    // One worker, cancelled at the first row: exactly one row (the centre one, solved first) is kept.
    const counts = countByStatus(run.field);
    expect(counts.pending).toBe(6);
    for (let i = 0; i < 3; i++) expect(run.field.status[3 + i]).not.toBe(TARGET.pending);
    expect(Array.from(live!.status)).toEqual(Array.from(run.field.status));
    expect(session.running).toBe(false);
    session.close();
  });
});

describe('footprint worker count', () => {
  it('is one per core but one, at least two and at most eight; unknown core counts give two', () => {
    expect([1, 2, 3, 4, 8, 16, 64].map(footprintWorkerCount)).toEqual([2, 2, 2, 3, 7, 8, 8]);
    expect(footprintWorkerCount(undefined)).toBe(2);
    expect(footprintWorkerCount(0)).toBe(2);
    expect(footprintWorkerCount(2.5)).toBe(2);
  });
});
