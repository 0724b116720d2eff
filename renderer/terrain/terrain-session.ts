/**
 * Terrain processing in one Web Worker (core/parallel's JobPool): bytes + limits in, a TerrainProduct out.
 * Requests run in order; the app keeps the bytes of the current DEM so new limits re-run the analysis.
 */
import { JobPool } from '../../core/parallel/pool.ts';
import type { WorkerFactory } from '../../core/parallel/protocol.ts';
import type { HazardLimits } from '../../core/terrain/index.ts';
import { MAX_DISPLAY_VERTICES, type PngHeightmapInputs, type TerrainProduct } from './terrain-product.ts';
import type { FootprintOnTerrain, SitesFootprint } from './terrain-sites.ts';

export type TerrainJob =
  | { kind: 'process'; bytes: Uint8Array; name: string; png: PngHeightmapInputs; limits: HazardLimits; maxVertices: number }
  /** A footprint laid on the DEM the worker processed last (terrain-sites.ts), with its hazard map. */
  | { kind: 'sites'; footprint: SitesFootprint; budget_kg: number; target: { east_m: number; north_m: number } };

/** A file the user can fix comes back as a message naming the file and the problem. */
export type TerrainJobResult = { ok: true; product: TerrainProduct } | { ok: false; message: string } | { ok: true; onTerrain: FootprintOnTerrain };

export class TerrainSession {
  private pool: JobPool<TerrainJob, TerrainJobResult> | null = null;
  private queue: Promise<unknown> = Promise.resolve();

  constructor(private readonly factory: WorkerFactory) {}

  /** Reads and analyses a DEM. The bytes are copied to the worker (the caller keeps them). */
  process(bytes: Uint8Array, name: string, png: PngHeightmapInputs, limits: HazardLimits, maxVertices = MAX_DISPLAY_VERTICES): Promise<{ ok: true; product: TerrainProduct } | { ok: false; message: string }> {
    return this.enqueue({ kind: 'process', bytes, name, png, limits, maxVertices }).then((r) => {
      if ('onTerrain' in r) throw new Error('the terrain worker answered a DEM with sites');
      return r;
    });
  }

  /**
   * Safe ∩ reachable and the ranked sites of a footprint on the DEM processed last (in order: after any DEM or
   * limits sent before), at the DEM's resolution; null when no DEM is there yet.
   */
  sites(footprint: SitesFootprint, budget_kg: number, target: { east_m: number; north_m: number }): Promise<FootprintOnTerrain | null> {
    return this.enqueue({ kind: 'sites', footprint, budget_kg, target }).then((r) => (r.ok && 'onTerrain' in r ? r.onTerrain : null));
  }

  private enqueue(job: TerrainJob): Promise<TerrainJobResult> {
    const next = this.queue.then(() => this.processNow(job));
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
