/**
 * Study worker body, shared by both adapters: one job is one ignition altitude by the reach boundary, or
 * one dispersion study (the nominal trajectory and its open-loop samples). Footprints go through the row
 * worker (worker.ts) instead.
 */
import type { HandledJob, WorkerPort } from '../parallel/protocol.ts';
import { serveJobs } from '../parallel/protocol.ts';
import type { Study } from '../study/schema.ts';
import type { DispersionSigmas } from './dispersion.ts';
import type { AltitudeStudyRow } from './studies.ts';
import { altitudeRowByDirections, dispersionFromStudy, reachExtent, type ReachExtent, type StudyDispersion } from './studyRuns.ts';

export type StudyJob =
  /** `study` already at `altitude_m` (studyAtAltitude). */
  | { kind: 'altitude'; study: Study; altitude_m: number; budget_kg: number; directions: number; nodes: number }
  | { kind: 'dispersion'; study: Study; sigmas: DispersionSigmas; samples: number; seed: number; probability: number; nodes: number }
  /** The default footprint grid's half-width from the reach boundary (studyRuns.ts reachExtent). */
  | { kind: 'reach-extent'; study: Study; budget_kg: number; nodes: number };

export type StudyJobResult =
  | { kind: 'altitude'; row: AltitudeStudyRow }
  | { kind: 'dispersion'; dispersion: StudyDispersion }
  /** `extent` null with `message` when the nominal target is out of reach with the reserve kept. */
  | { kind: 'reach-extent'; extent: ReachExtent | null; message?: string };

export function handleStudyJob(job: StudyJob): HandledJob<StudyJobResult> {
  if (job.kind === 'altitude') {
    return { result: { kind: 'altitude', row: altitudeRowByDirections(job.study, job.altitude_m, job.budget_kg, job.directions, job.nodes) } };
  }
  if (job.kind === 'reach-extent') {
    try {
      return { result: { kind: 'reach-extent', extent: reachExtent(job.study, job.budget_kg, job.nodes) } };
    } catch (error) {
      if (error instanceof RangeError) return { result: { kind: 'reach-extent', extent: null, message: error.message } };
      throw error;
    }
  }
  const dispersion = dispersionFromStudy(job.study, job.sigmas, job);
  const { landingEast_m, landingNorth_m } = dispersion.result;
  return { result: { kind: 'dispersion', dispersion }, transfer: [landingEast_m.buffer, landingNorth_m.buffer] };
}

export function serveStudyJobs(port: WorkerPort): void {
  serveJobs(port, handleStudyJob);
}
