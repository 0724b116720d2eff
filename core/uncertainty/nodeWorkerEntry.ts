/** worker_threads entry of the landing-success pool (started through nodeWorker.mjs). */
import { nodeWorkerPort } from '../parallel/nodeWorker.ts';
import { serveLandingSamples } from './worker.ts';

serveLandingSamples(nodeWorkerPort());
