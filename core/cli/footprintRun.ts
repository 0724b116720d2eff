/**
 * Running a study's footprint in worker threads, with progress on stderr; `signal` (a StopRequest's, stop.ts)
 * stops it keeping every finished row.
 */
import type { CliIo } from './command.ts';
import { computeFootprint, type FootprintProgress, type FootprintRun, type RowJob } from '../footprint/engine.ts';
import type { FieldRow } from '../footprint/field.ts';
import type { TargetGrid } from '../footprint/grid.ts';
import { nodeWorkerFactory } from '../parallel/nodeWorker.ts';
import { JobPool } from '../parallel/pool.ts';
import type { Study } from '../study/index.ts';
import { footprintContext } from '../footprint/studyFootprint.ts';
import { refineBudgetBoundary, type BoundaryRefinement } from '../footprint/refine.ts';


export function progressLine(p: FootprintProgress): string {
  const pct = (100 * p.targetsDone) / p.targetsTotal;
  const width = 30;
  const fill = Math.round((width * p.targetsDone) / p.targetsTotal);
  const eta = Number.isFinite(p.remaining_s) ? `${p.remaining_s.toFixed(0)} s left` : '…';
  return `[${'#'.repeat(fill)}${'.'.repeat(width - fill)}] ${pct.toFixed(0).padStart(3)} %  ${p.targetsDone}/${p.targetsTotal} targets  ${p.rate_per_s.toFixed(1)} /s  ${eta}`;
}


export async function runStudyFootprint(
  study: Study,
  grid: TargetGrid,
  /**
   * propellantBudget_kg: a reachable-set run (see DescentFootprintContext.propellantBudget_kg);
   * refineBoundary: then refine the boundary at that level coarse-to-fine (refine.ts).
   */
  options: {
    nodes: number;
    workers: number;
    propellantBudget_kg?: number;
    refineBoundary?: { factor: number; level_kg: number };
    /** Stops the run (finished rows are kept and returned, `cancelled` set). */
    signal?: AbortSignal;
  },
  io: CliIo,
): Promise<FootprintRun & { refinement?: BoundaryRefinement }> {
  const pool = new JobPool<RowJob, FieldRow>(nodeWorkerFactory(new URL('../footprint/nodeWorker.mjs', import.meta.url)), options.workers);
  const signal = options.signal;
  // Without a stream of rows the first line comes with the first finished row (tests wait on it).
  let lastPrint = 0;
  try {
    const context = { ...footprintContext(study, options.nodes), propellantBudget_kg: options.propellantBudget_kg };
    const run = await computeFootprint(grid, pool, {
      context,
      signal,
      onRow: (_r, p) => {
        const now = Date.now();
        if (io.interactive) io.stderr(`\r${progressLine(p)}`);
        else if (now - lastPrint > 2000 || p.rowsDone === p.rowsTotal) {
          io.stderr(progressLine(p) + '\n');
          lastPrint = now;
        }
      },
    });
    if (io.interactive) io.stderr('\n');
    if (!options.refineBoundary || run.cancelled) return run;
    io.stderr(`refining the ${options.refineBoundary.level_kg} kg boundary ${options.refineBoundary.factor}× …\n`);
    const started = Date.now();
    const refinement = await refineBudgetBoundary(run.field, pool, { ...options.refineBoundary, context, signal });
    // The run's time includes the refinement's, so the summary's time and solves go together.
    return { ...run, progress: { ...run.progress, elapsed_s: run.progress.elapsed_s + (Date.now() - started) / 1000 }, refinement };
  } finally {
    pool.close();
  }
}
