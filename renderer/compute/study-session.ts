/**
 * Runs the trade studies off the UI thread with core/ functions only: footprints through the app's
 * FootprintSession (row workers), ignition altitudes by the reach boundary and dispersion studies through a
 * pool of study workers (core/footprint/studyWorker.ts). One study at a time; cancel keeps what finished
 * (finished altitudes, finished rows, finished reach-map samples). Knows nothing of Svelte.
 */
import { probabilityOfReach } from '../../core/footprint/dispersion.ts';
import type { FootprintField } from '../../core/footprint/field.ts';
import type { TargetGrid } from '../../core/footprint/grid.ts';
import { minimumAltitude, reserveStudy, type AltitudeStudyRow, type ReserveStudyRow } from '../../core/footprint/studies.ts';
import { FOOTPRINT_NODES } from '../../core/footprint/studyFootprint.ts';
import { altitudeRowFromField, reachSampleStudies, studyAtAltitude, type StudyDispersion } from '../../core/footprint/studyRuns.ts';
import type { StudyJob, StudyJobResult } from '../../core/footprint/studyWorker.ts';
import { JobPool } from '../../core/parallel/pool.ts';
import type { WorkerFactory } from '../../core/parallel/protocol.ts';
import type { Study } from '../../core/study/schema.ts';
import type { FootprintSession } from './footprint-session.ts';
import type { AltitudeStudyInputs, DispersionStudyInputs, ReserveStudyInputs } from '../studies/study-inputs.ts';

/** Study workers: altitudes run side by side on this two-core machine class. */
export const STUDY_WORKERS = 2;

export interface StudyProgressEvents {
  /** `unit` names what is counted ("targets", "altitudes", "steps"). */
  onProgress(done: number, total: number, unit: string): void;
}

interface Common {
  study: Study;
  /** The grid the footprints of the study used (reserve; grid method; reach map), or null. */
  grid: { side: number; halfWidth_m: number } | null;
  nodes: number;
  cancelled: boolean;
}

export interface ReserveStudyResult extends Common {
  kind: 'reserve';
  inputs: ReserveStudyInputs;
  usable_kg: number;
  rows: ReserveStudyRow[];
}

export interface AltitudeStudyResult extends Common {
  kind: 'ignition-altitude';
  inputs: AltitudeStudyInputs;
  rows: AltitudeStudyRow[];
  minimum: { altitude_m: number; bracketed: boolean } | null;
}

export interface ReachMap {
  field: Pick<FootprintField, 'nx' | 'ny' | 'east' | 'north'>;
  probability: Float32Array;
  samples: number;
}

export interface DispersionStudyResult extends Common {
  kind: 'dispersion';
  inputs: DispersionStudyInputs;
  dispersion: StudyDispersion;
  reach: ReachMap | null;
}

export type StudyResult = ReserveStudyResult | AltitudeStudyResult | DispersionStudyResult;

export interface GridChoice {
  grid: TargetGrid;
  side: number;
  halfWidth_m: number;
}

function needGrid(choice: GridChoice | null, what: string): GridChoice {
  if (!choice) throw new Error(`${what} needs a footprint grid: fix the grid in the top bar`);
  return choice;
}

export class StudySession {
  private pool: JobPool<StudyJob, StudyJobResult> | null = null;
  private reachPool: JobPool<StudyJob, StudyJobResult> | null = null;
  private controller: AbortController | null = null;

  constructor(
    private readonly factory: WorkerFactory,
    private readonly footprints: FootprintSession,
    private readonly workers = STUDY_WORKERS,
  ) {}

  get running(): boolean {
    return this.controller !== null;
  }

  cancel(): void {
    this.controller?.abort();
    this.footprints.cancel();
  }

  close(): void {
    this.cancel();
    this.pool?.close();
    this.pool = null;
    this.reachPool?.close();
    this.reachPool = null;
  }

  private begin(): AbortSignal {
    if (this.controller || this.footprints.running) throw new Error('a computation is already going: wait for it or cancel it');
    this.controller = new AbortController();
    return this.controller.signal;
  }

  private async guarded<T>(body: (signal: AbortSignal) => Promise<T>): Promise<T> {
    const signal = this.begin();
    try {
      return await body(signal);
    } finally {
      this.controller = null;
    }
  }

  /** Study jobs through the worker pool; results in job order, `null` where cancelled before finishing. */
  private async runJobs(jobs: StudyJob[], signal: AbortSignal, onResult: (done: number) => void): Promise<{ results: (StudyJobResult | null)[]; cancelled: boolean }> {
    this.pool ??= new JobPool<StudyJob, StudyJobResult>(this.factory, this.workers);
    const results: (StudyJobResult | null)[] = jobs.map(() => null);
    let next = 0;
    let done = 0;
    const index = new Map<StudyJob, number>();
    const summary = await this.pool.run({
      next: () => {
        if (next >= jobs.length) return null;
        index.set(jobs[next], next);
        return { job: jobs[next++] };
      },
      done: () => next >= jobs.length,
      onResult: (r, job) => {
        results[index.get(job)!] = r;
        onResult(++done);
      },
      signal,
    });
    return { results, cancelled: summary.cancelled };
  }

  /**
   * The default footprint grid's half-width for `study` (core/footprint/studyRuns.ts reachExtent: the reach
   * boundary along 16 directions, 10 % beyond the farthest), in one study worker. Null with a message when the
   * nominal target cannot be reached with the reserve kept.
   */
  reachExtent(study: Study): Promise<{ extent_m: number; farthest_m: number } | { extent_m: null; message: string }> {
    // Its own worker, outside the one-study-at-a-time rule: it sizes the footprint grid at start-up and before a
    // run, and must neither wait for a study nor make one wait.
    this.reachPool ??= new JobPool<StudyJob, StudyJobResult>(this.factory, 1);
    const budget_kg = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg - study.vehicle.propellantReserve_kg;
    const job: StudyJob = { kind: 'reach-extent', study, budget_kg, nodes: FOOTPRINT_NODES };
    let sent = false;
    let result: StudyJobResult | null = null;
    return this.reachPool
      .run({ next: () => (sent ? null : ((sent = true), { job })), done: () => sent, onResult: (r) => (result = r) })
      .then(() => {
        const r = result as StudyJobResult | null;
        if (r?.kind !== 'reach-extent') throw new Error('the reach estimate returned nothing');
        return r.extent ? { extent_m: r.extent.extent_m, farthest_m: r.extent.farthest_m } : { extent_m: null, message: r.message ?? 'no reach' };
      });
  }

  runReserve(study: Study, inputs: ReserveStudyInputs, choice: GridChoice | null, events: StudyProgressEvents): Promise<ReserveStudyResult> {
    return this.guarded(async () => {
      const grid = needGrid(choice, 'the reserve study');
      const total = grid.side * grid.side;
      events.onProgress(0, total, 'targets');
      const run = await this.footprints.run(study, grid.grid, { onRow: (_f, p) => events.onProgress(p.targetsDone, total, 'targets') });
      const usable_kg = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
      return {
        kind: 'reserve',
        study,
        inputs,
        usable_kg,
        rows: reserveStudy(run.field, usable_kg, inputs.reserves_kg),
        grid: { side: grid.side, halfWidth_m: grid.halfWidth_m },
        nodes: FOOTPRINT_NODES,
        cancelled: run.cancelled,
      };
    });
  }

  runAltitude(study: Study, inputs: AltitudeStudyInputs, choice: GridChoice | null, events: StudyProgressEvents): Promise<AltitudeStudyResult> {
    return this.guarded(async (signal) => {
      const grid = inputs.method === 'grid' ? needGrid(choice, 'the grid method') : null;
      const budget_kg = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg - inputs.reserve_kg;
      const studies = inputs.altitudes_m.map((h) => studyAtAltitude(study, h, inputs.rule));
      const rows: AltitudeStudyRow[] = [];
      let cancelled: boolean;
      if (inputs.method === 'directions') {
        const total = studies.length;
        events.onProgress(0, total, 'altitudes');
        const jobs: StudyJob[] = studies.map((s, k) => ({ kind: 'altitude', study: s, altitude_m: inputs.altitudes_m[k], budget_kg, directions: inputs.directions, nodes: FOOTPRINT_NODES }));
        const out = await this.runJobs(jobs, signal, (done) => events.onProgress(done, total, 'altitudes'));
        for (const r of out.results) if (r?.kind === 'altitude') rows.push(r.row);
        cancelled = out.cancelled;
      } else {
        const per = grid!.side * grid!.side;
        const total = per * studies.length;
        events.onProgress(0, total, 'targets');
        for (const [k, s] of studies.entries()) {
          if (signal.aborted) break;
          const run = await this.footprints.run(s, grid!.grid, { onRow: (_f, p) => events.onProgress(k * per + p.targetsDone, total, 'targets') });
          // A cancelled footprint's radius would be a lower bound: only finished altitudes are kept.
          if (run.cancelled) break;
          rows.push(altitudeRowFromField(run.field, inputs.altitudes_m[k], budget_kg));
        }
        cancelled = rows.length < studies.length;
      }
      return {
        kind: 'ignition-altitude',
        study,
        inputs,
        rows,
        minimum: inputs.requiredRadius_m === null ? null : minimumAltitude(rows, inputs.requiredRadius_m),
        grid: grid ? { side: grid.side, halfWidth_m: grid.halfWidth_m } : null,
        nodes: FOOTPRINT_NODES,
        cancelled,
      };
    });
  }

  runDispersion(study: Study, inputs: DispersionStudyInputs, choice: GridChoice | null, events: StudyProgressEvents): Promise<DispersionStudyResult | null> {
    return this.guarded(async (signal) => {
      const grid = inputs.reachSamples > 0 ? needGrid(choice, 'the probability-of-reach map') : null;
      const total = 1 + inputs.reachSamples;
      events.onProgress(0, total, 'steps');
      const job: StudyJob = { kind: 'dispersion', study, sigmas: inputs.sigmas, samples: inputs.samples, seed: inputs.seed, probability: inputs.probability, nodes: FOOTPRINT_NODES };
      const out = await this.runJobs([job], signal, (done) => events.onProgress(done, total, 'steps'));
      const first = out.results[0];
      if (out.cancelled || first?.kind !== 'dispersion') return null;
      let reach: ReachMap | null = null;
      let cancelled = false;
      if (inputs.reachSamples > 0) {
        const fields: FootprintField[] = [];
        const budgets: number[] = [];
        for (const s of reachSampleStudies(study, inputs.sigmas, inputs.reachSamples, inputs.seed)) {
          if (signal.aborted) break;
          const run = await this.footprints.run(s.study, grid!.grid, { onRow: () => undefined });
          if (run.cancelled) break;
          fields.push(run.field);
          budgets.push(s.budget_kg);
          events.onProgress(1 + fields.length, total, 'steps');
        }
        cancelled = fields.length < inputs.reachSamples;
        if (fields.length) reach = { field: fields[0], probability: probabilityOfReach(fields, budgets), samples: fields.length };
      }
      return {
        kind: 'dispersion',
        study,
        inputs,
        dispersion: first.dispersion,
        reach,
        grid: grid ? { side: grid.side, halfWidth_m: grid.halfWidth_m } : null,
        nodes: FOOTPRINT_NODES,
        cancelled,
      };
    });
  }
}
