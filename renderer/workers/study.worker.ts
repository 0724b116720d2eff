/** Web Worker entry: trade-study jobs (an ignition altitude by the reach boundary, a dispersion study). */
import { serveStudyJobs } from '../../core/footprint/studyWorker.ts';
import { webWorkerPort } from '../../core/parallel/webWorker.ts';

serveStudyJobs(webWorkerPort());
