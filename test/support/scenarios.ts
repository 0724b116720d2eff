/** Scenarios of our own for tests, and an in-process footprint run (no threads). */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { footprintContext } from '../../core/footprint/studyFootprint.ts';
import type { DescentFootprintContext } from '../../core/footprint/descentEvaluator.ts';
import { descentEvaluator } from '../../core/footprint/descentEvaluator.ts';
import { computeFootprint, rowJobHandler, type RowJob, type TargetEvaluator } from '../../core/footprint/engine.ts';
import type { FieldRow, FootprintField } from '../../core/footprint/field.ts';
import type { TargetGrid } from '../../core/footprint/grid.ts';
import { inlineWorkerFactory, JobPool } from '../../core/parallel/pool.ts';
import { parseStudyText, type Study } from '../../core/study/index.ts';

export const DEMO_STUDY_PATH = fileURLToPath(new URL('../../assets/demo/demo-lander.study.json', import.meta.url));

export function demoStudy(): Study {
  return parseStudyText(readFileSync(DEMO_STUDY_PATH, 'utf8'));
}

/**
 * The invented demo lander loaded with 250 kg of usable propellant instead of 500 and a 20 kg reserve, so
 * footprints have an edge close to the nominal target.
 */
export function lowPropellantDemo(nodes = 30): { study: Study; ctx: DescentFootprintContext } {
  const demo = demoStudy();
  const study = { ...demo, vehicle: { ...demo.vehicle, wetMass_kg: demo.vehicle.dryMass_kg + 250, propellantReserve_kg: 20 } };
  return { study, ctx: footprintContext(study, nodes) };
}

/** A one-worker pool on the calling thread, for footprint jobs with the given evaluator. */
export function inProcessPool(evaluate: TargetEvaluator): JobPool<RowJob, FieldRow> {
  const handler = rowJobHandler(evaluate);
  return new JobPool<RowJob, FieldRow>(inlineWorkerFactory((job: RowJob) => handler(job).result), 1);
}

/** A footprint computed on the calling thread. */
export async function footprintInProcess(grid: TargetGrid, ctx: DescentFootprintContext): Promise<FootprintField> {
  return (await computeFootprint(grid, inProcessPool(descentEvaluator(ctx)), { context: ctx })).field;
}
