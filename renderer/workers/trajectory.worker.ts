/** Web Worker entry: optimal trajectories of picked targets, off the UI thread. */
import { solvePickedTrajectory, type PickedTrajectory, type PickedTrajectoryJob } from '../../core/footprint/pickedTrajectory.ts';
import { serveJobs } from '../../core/parallel/protocol.ts';
import { webWorkerPort } from '../../core/parallel/webWorker.ts';

serveJobs<PickedTrajectoryJob, PickedTrajectory>(webWorkerPort(), (job) => ({ result: solvePickedTrajectory(job) }));
