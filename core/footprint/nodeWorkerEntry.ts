/** worker_threads entry of the footprint pool (started through nodeWorker.mjs). */
import { nodeWorkerPort } from '../parallel/nodeWorker.ts';
import { serveFootprintRows } from './worker.ts';

serveFootprintRows(nodeWorkerPort());
