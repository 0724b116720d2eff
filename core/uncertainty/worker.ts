/**
 * Worker body of the landing-success study, shared by both adapters: one job is a range of samples. The
 * prepared study (the guidance setup and the nominal plan) is kept between jobs of the same run (`runId`);
 * each sample starts from the nominal optimum, so which worker flies it changes nothing.
 */
import type { HandledJob, WorkerPort } from '../parallel/protocol.ts';
import { serveJobs } from '../parallel/protocol.ts';
import type { LandingSample } from './closedLoop.ts';
import { prepareLandingSuccess, runLandingSamples, type LandingSuccessJob, type PreparedLandingSuccess } from './landingSuccess.ts';

export interface LandingSamplesJob extends LandingSuccessJob {
  /** Same id, same study, inputs, hazard and sites (the worker then reuses its preparation). */
  runId: string;
  replan: boolean;
}

let cached: { runId: string; prepared: PreparedLandingSuccess } | null = null;

export function handleLandingSamples(job: LandingSamplesJob): HandledJob<LandingSample[]> {
  if (!cached || cached.runId !== job.runId) {
    cached = { runId: job.runId, prepared: prepareLandingSuccess(job.study, job.inputs, job.hazard, job.sites, job.replan) };
  }
  return { result: runLandingSamples(cached.prepared, job.from, job.to) };
}

export function serveLandingSamples(port: WorkerPort): void {
  serveJobs(port, handleLandingSamples);
}
