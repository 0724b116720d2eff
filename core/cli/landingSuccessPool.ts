/**
 * The landing-success study's worker pool and default DEM. Both URLs are written relative to this file, one
 * folder below the root of core/ (as core/cli/footprintRun.ts does for the footprint's worker), so that they
 * name the tsx bootstrap (core/uncertainty/nodeWorker.mjs) and the demo DEM from the sources, and the
 * compiled worker (dist-cli/uncertainty/nodeWorker.mjs, bin/build-cli.mjs CLI_BUNDLES) and the same DEM from
 * the build, whose files also sit one folder below its root.
 */
import { fileURLToPath } from 'node:url';
import { nodeWorkerFactory } from '../parallel/nodeWorker.ts';
import { JobPool } from '../parallel/pool.ts';
import type { LandingSample } from '../uncertainty/closedLoop.ts';
import type { LandingSamplesJob } from '../uncertainty/worker.ts';

/** The bundled invented demo DEM, the study's default (same rule: one folder below core/ or dist-cli/). */
export const DEMO_DEM = fileURLToPath(new URL('../../assets/demo/terrain/demo-site.tif', import.meta.url));

export function landingSuccessPool(workers: number): JobPool<LandingSamplesJob, LandingSample[]> {
  return new JobPool<LandingSamplesJob, LandingSample[]>(nodeWorkerFactory(new URL('../uncertainty/nodeWorker.mjs', import.meta.url)), workers);
}
