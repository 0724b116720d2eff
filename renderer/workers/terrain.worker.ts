/**
 * Web Worker entry: reads an elevation model and computes its hazard map and display grid off the UI thread
 * (the demo DEM takes ~30 ms to read and ~75 ms for the hazard map on a desktop core). Speaks core/parallel's
 * job protocol; the readers are asynchronous, so jobs are served one after another through a promise chain.
 */
import type { JobMessage, WorkerReply } from '../../core/parallel/protocol.ts';
import { webWorkerPort } from '../../core/parallel/webWorker.ts';
import { TerrainInputError, hazardMap, type ElevationGrid, type GridSpec, type HazardMap } from '../../core/terrain/index.ts';
import { productTransfer, readTerrain, terrainProduct } from '../terrain/terrain-product.ts';
import type { TerrainJob, TerrainJobResult } from '../terrain/terrain-session.ts';
import { footprintOnTerrain } from '../terrain/terrain-sites.ts';

const port = webWorkerPort();
let queue: Promise<void> = Promise.resolve();
/** The DEM processed last, its hazard map and display cells: footprints are laid on them (sites jobs). */
let last: { grid: ElevationGrid; map: HazardMap; display: GridSpec } | null = null;

async function handle(job: TerrainJob): Promise<{ result: TerrainJobResult; transfer: Transferable[] }> {
  try {
    if (job.kind === 'sites') {
      if (!last) return { result: { ok: false, message: 'no elevation model has been read yet' }, transfer: [] };
      const onTerrain = footprintOnTerrain(last.grid, last.map, last.display, job.footprint, job.budget_kg, job.target);
      return { result: { ok: true, onTerrain }, transfer: [onTerrain.displayShare.buffer as ArrayBuffer] };
    }
    const { grid, format, shownName } = await readTerrain(job.bytes, job.name, job.png);
    const map = hazardMap(grid, job.limits);
    const product = terrainProduct(grid, shownName, format, job.limits, job.maxVertices, map);
    last = { grid, map, display: product.display.spec };
    return { result: { ok: true, product }, transfer: productTransfer(product) };
  } catch (error) {
    // A file or limit the user can fix comes back as a message; anything else is a bug and fails the job.
    if (error instanceof TerrainInputError) return { result: { ok: false, message: error.message }, transfer: [] };
    throw error;
  }
}

port.onMessage((message) => {
  const m = message as JobMessage<TerrainJob>;
  if (!m || m.type !== 'job') return;
  queue = queue.then(async () => {
    try {
      const { result, transfer } = await handle(m.job);
      port.post({ type: 'result', id: m.id, result } satisfies WorkerReply<TerrainJobResult>, transfer);
    } catch (error) {
      port.post({ type: 'error', id: m.id, message: error instanceof Error ? error.message : String(error) } satisfies WorkerReply<TerrainJobResult>);
    }
  });
});
