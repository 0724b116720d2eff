/** Web Worker entry: solves footprint rows (core/footprint) for the app's job pool. */
import { serveFootprintRows } from '../../core/footprint/worker.ts';
import { webWorkerPort } from '../../core/parallel/webWorker.ts';

serveFootprintRows(webWorkerPort());
