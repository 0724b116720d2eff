import { workerData } from 'node:worker_threads';
import { rowJobHandler } from '../../core/footprint/engine.ts';
import { nodeWorkerPort } from '../../core/parallel/nodeWorker.ts';
import { serveJobs } from '../../core/parallel/protocol.ts';
import { discEvaluator } from './analytic-evaluator.ts';

const { radius, delayMs } = workerData as { radius: number; delayMs: number };
serveJobs(nodeWorkerPort(), rowJobHandler(discEvaluator(radius, delayMs)));
