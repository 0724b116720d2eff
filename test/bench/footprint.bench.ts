/**
 * Footprint benchmark: the demo study's 41 × 41 divert footprint at the footprint's default N with two
 * worker threads, end to end (grid, continuation, slope search, fallbacks), and CVXOPT's time for the same
 * per-target search on a few targets, compared per worker (one of our threads against one CVXOPT process).
 * Also the peak resident memory of the run.
 * Targets (issue 4): 41 × 41 in under 10 s on this 2-core machine; 101 × 101 under 60 s; < 300 MB at 201 × 201.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { computeFootprint, type RowJob } from '../../core/footprint/engine.ts';
import { countByStatus, type FieldRow } from '../../core/footprint/field.ts';
import { makeTargetGrid } from '../../core/footprint/grid.ts';
import { nodeWorkerFactory } from '../../core/parallel/nodeWorker.ts';
import { JobPool } from '../../core/parallel/pool.ts';
import { FOOTPRINT_NODES, footprintContext } from '../../core/footprint/studyFootprint.ts';
import { parseStudyText, studyToDescent } from '../../core/study/index.ts';
import { DescentSolver } from '../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../core/descent/search.ts';
import { FOOTPRINT_PROPELLANT_TOLERANCE_KG } from '../../core/footprint/descentEvaluator.ts';
import { cvxoptAvailable } from '../reference/cvxopt.ts';
import { cvxoptBackend } from '../reference/descent/cvxoptBackend.ts';
import type { BenchResult } from './util.ts';

const DEMO = fileURLToPath(new URL('../../assets/demo/demo-lander.study.json', import.meta.url));

export async function benchFootprint(sides = [41]): Promise<BenchResult[]> {
  const demo = parseStudyText(readFileSync(DEMO, 'utf8'));
  // Two scenarios: the demo (everything within ±2.5 km reachable) and our low-propellant variant of it
  // (250 kg usable; about 40 % of a ±3.5 km grid unreachable, which costs more solves per target).
  const scenarios = [
    { label: 'demo ±2.5 km', study: demo, half: 2500 },
    { label: 'low-propellant ±3.5 km', study: { ...demo, vehicle: { ...demo.vehicle, wetMass_kg: demo.vehicle.dryMass_kg + 250 } }, half: 3500 },
  ];
  const results: BenchResult[] = [];
  for (const side of sides) for (const sc of scenarios) {
    const study = sc.study;
    const d = studyToDescent(study);
    const context = footprintContext(study, FOOTPRINT_NODES);
    const grid = makeTargetGrid({ halfWidthEast_m: sc.half, halfWidthNorth_m: sc.half, nx: side, ny: side });
    const pool = new JobPool<RowJob, FieldRow>(nodeWorkerFactory(new URL('../../core/footprint/nodeWorker.mjs', import.meta.url)), 2);
    const t0 = performance.now();
    const run = await computeFootprint(grid, pool, { context });
    const wall = (performance.now() - t0) / 1000;
    pool.close();
    const counts = countByStatus(run.field);
    let solves = 0;
    for (const s of run.field.solves) solves += s;
    const figures: Record<string, number> = {
      targets: side * side,
      reachable: counts.reachable,
      unreachable: counts.unreachable,
      failed: counts.failed,
      nodes: FOOTPRINT_NODES,
      workers: 2,
      wall_s: wall,
      ms_per_target_per_worker: (wall * 1000 * 2) / (side * side),
      solves_per_target: solves / (side * side),
      peak_rss_mb: process.resourceUsage().maxRSS / 1024,
    };
    if (cvxoptAvailable() && sc === scenarios[0]) {
      // CVXOPT running the same search for a few targets (conelp time only), scaled to the grid.
      const be = cvxoptBackend();
      const ref = new DescentSolver(context.setup, be, d.ignition);
      let guess: number | undefined;
      const sample = [[0, 0], [500, 0], [500, 500]];
      for (const [e, n] of sample) {
        const r = searchFreeFinalTime(ref, [e, n, 0], d.ignition, { tfGuess: guess, decode: false, propellantTolerance: FOOTPRINT_PROPELLANT_TOLERANCE_KG });
        if (r.status === 'solved') guess = r.timeOfFlight;
      }
      // Per worker against one process: our two workers' time per target (wall × 2 / targets) against CVXOPT's
      // conelp time per target in its one process (its conelp factorises the KKT system densely when there
      // are second-order cones). No ratio of two workers against one process.
      const cvxPerTarget = be.stats.solverSeconds / sample.length;
      figures.cvxopt_s_per_target = cvxPerTarget;
      figures.cvxopt_over_ours_per_worker = (cvxPerTarget * 1000) / figures.ms_per_target_per_worker;
    }
    results.push({ name: `footprint ${side}×${side} ${sc.label}`, figures });
  }
  return results;
}
