/**
 * Samples on a job pool: gathered by index whatever the completion order, and a stop keeps every finished
 * job's samples. The workers here run the real job handler in this thread (an in-process WorkerFactory), so
 * the order of completion is chosen by the test, not by timing.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { JobPool } from '../../../core/parallel/pool.ts';
import type { PoolWorker, WorkerFactory } from '../../../core/parallel/protocol.ts';
import { parseStudyText } from '../../../core/study/load.ts';
import type { LandingSample } from '../../../core/uncertainty/closedLoop.ts';
import type { HazardLayer } from '../../../core/uncertainty/hazardLayer.ts';
import { flySamplesOnPool } from '../../../core/uncertainty/pooled.ts';
import { handleLandingSamples, type LandingSamplesJob } from '../../../core/uncertainty/worker.ts';
import { DEMO_STUDY_PATH } from '../../support/scenarios.ts';

const study = parseStudyText(readFileSync(DEMO_STUDY_PATH, 'utf8'));
const allSafe: HazardLayer = { width: 10, height: 10, pixelSizeX_m: 1000, pixelSizeY_m: 1000, originEast_m: -5000, originNorth_m: 5000, safe: new Uint8Array(100).fill(1), clear: new Uint8Array(100).fill(1), target_m: [0, 0], jacobian: [1, 0, 0, 1] };
const base = { runId: 'test', study, inputs: { samples: 6, nodes: 15 }, hazard: allSafe, sites: [] as [number, number][], replan: false };

/** Workers that answer only when `release()` is called, newest job first (the reverse of dispatch order). */
function heldFactory() {
  const pending: (() => void)[] = [];
  const factory: WorkerFactory = (): PoolWorker => {
    let handler: (m: unknown) => void = () => {};
    return {
      post: (message) => {
        const m = message as { id: number; job: LandingSamplesJob };
        pending.push(() => handler({ type: 'result', id: m.id, result: handleLandingSamples(m.job).result }));
      },
      onMessage: (h) => { handler = h; },
      onError: () => {},
      terminate: () => {},
    };
  };
  return { factory, release: () => pending.pop()?.(), pending };
}

describe('landing-success samples on a pool', () => {
  it('gathers samples by index when jobs finish out of order', async () => {
    const held = heldFactory();
    const pool = new JobPool<LandingSamplesJob, LandingSample[]>(held.factory, 2);
    const run = flySamplesOnPool(pool, base, 6, { chunk: 2 });
    while ((await Promise.race([run.then(() => true), new Promise<false>((r) => setImmediate(() => r(false)))])) === false) held.release();
    const { samples, cancelled } = await run;
    expect(cancelled).toBe(false);
    expect(samples.map((s) => s.index)).toEqual([0, 1, 2, 3, 4, 5]);
  });

  it('a stop keeps the samples of every finished job', async () => {
    const held = heldFactory();
    const pool = new JobPool<LandingSamplesJob, LandingSample[]>(held.factory, 2);
    const stop = new AbortController();
    let finished = 0;
    const run = flySamplesOnPool(pool, base, 6, { chunk: 2, signal: stop.signal, onProgress: (p) => { finished = p.done; } });
    await new Promise((r) => setImmediate(r));
    held.release(); // the second job (samples 2, 3) finishes; the first is still running
    await new Promise((r) => setImmediate(r));
    expect(finished).toBe(2);
    stop.abort();
    const { samples, cancelled } = await run;
    expect(cancelled).toBe(true);
    expect(samples.map((s) => s.index)).toEqual([2, 3]);
  });
});
