/**
 * Terrain processing in one Web Worker (core/parallel's JobPool): bytes + limits in, a TerrainProduct out.
 * Requests run in order; the app keeps the bytes of the current DEM so new limits re-run the analysis.
 */
import { JobPool } from '../../core/parallel/pool.ts';
import type { WorkerFactory } from '../../core/parallel/protocol.ts';
import type { HazardLimits } from '../../core/terrain/index.ts';
import { MAX_DISPLAY_VERTICES, type PngHeightmapInputs, type TerrainProduct } from './terrain-product.ts';

export interface TerrainJob {
  bytes: Uint8Array;
  name: string;
  png: PngHeightmapInputs;
  limits: HazardLimits;
  maxVertices: number;
}

/** A file the user can fix comes back as a message naming the file and the problem. */
export type TerrainJobResult = { ok: true; product: TerrainProduct } | { ok: false; message: string };

export class TerrainSession {
  private pool: JobPool<TerrainJob, TerrainJobResult> | null = null;
  private queue: Promise<unknown> = Promise.resolve();

  constructor(private readonly factory: WorkerFactory) {}

  /** Reads and analyses a DEM. The bytes are copied to the worker (the caller keeps them). */
  process(bytes: Uint8Array, name: string, png: PngHeightmapInputs, limits: HazardLimits, maxVertices = MAX_DISPLAY_VERTICES): Promise<TerrainJobResult> {
    const next = this.queue.then(() => this.processNow({ bytes, name, png, limits, maxVertices }));
    this.queue = next.catch(() => undefined);
    return next;
  }

  private async processNow(job: TerrainJob): Promise<TerrainJobResult> {
    this.pool ??= new JobPool<TerrainJob, TerrainJobResult>(this.factory, 1);
    let result: TerrainJobResult | null = null;
    let sent = false;
    await this.pool.run({
      next: () => (sent ? null : ((sent = true), { job })),
      done: () => sent,
      onResult: (r) => (result = r),
    });
    if (!result) throw new Error('the terrain worker returned nothing');
    return result;
  }

  close(): void {
    this.pool?.close();
    this.pool = null;
  }
}
