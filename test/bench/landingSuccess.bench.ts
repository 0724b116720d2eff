/**
 * Landing-success benchmark: 1,000 closed-loop samples on the invented demo study over the demo DEM's hazard
 * map (default, illustrative dispersions and navigation errors; re-plan every 10 s), two worker threads,
 * end to end from the first job to the last sample (the nominal plan and the hazard map are built first and
 * not timed; ranked sites are not needed there: the demo's nominal target is clear of hazards).
 * Target (issue 16): well under a minute on the 2-core machine. CPU seconds are reported too: wall time
 * depends on what else the machine runs.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { nodeWorkerFactory } from '../../core/parallel/nodeWorker.ts';
import { JobPool } from '../../core/parallel/pool.ts';
import { parseStudyText } from '../../core/study/index.ts';
import { hazardMap, readGeoTiff } from '../../core/terrain/index.ts';
import type { LandingSample } from '../../core/uncertainty/closedLoop.ts';
import { hazardLayer } from '../../core/uncertainty/hazardLayer.ts';
import { prepareLandingSuccess, summariseLandingSuccess, isNominalSafe } from '../../core/uncertainty/landingSuccess.ts';
import { flySamplesOnPool } from '../../core/uncertainty/pooled.ts';
import type { LandingSamplesJob } from '../../core/uncertainty/worker.ts';
import type { BenchResult } from './util.ts';

const DEMO = fileURLToPath(new URL('../../assets/demo/demo-lander.study.json', import.meta.url));
const DEM = fileURLToPath(new URL('../../assets/demo/terrain/demo-site.tif', import.meta.url));

export async function benchLandingSuccess(samples = 1000, workers = 2): Promise<BenchResult[]> {
  const study = parseStudyText(readFileSync(DEMO, 'utf8'));
  const grid = await readGeoTiff(new Uint8Array(readFileSync(DEM)), { sourceName: 'demo-site.tif' });
  const map = hazardMap(grid, { safetyMargin_m: 20 }); // the CLI's default target margin (DEFAULT_TARGET_MARGIN_M)
  const centre: [number, number] = [grid.originEast_m + (grid.width * grid.pixelSizeX_m) / 2, grid.originNorth_m - (grid.height * grid.pixelSizeY_m) / 2];
  const layer = hazardLayer(grid, map, centre);
  const inputs = { samples, seed: 1 };
  const prepared = prepareLandingSuccess(study, inputs, layer, []);
  const pool = new JobPool<LandingSamplesJob, LandingSample[]>(nodeWorkerFactory(new URL('../../core/uncertainty/nodeWorker.mjs', import.meta.url)), workers);
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  const run = await flySamplesOnPool(pool, { runId: 'bench', study, inputs, hazard: layer, sites: [], replan: true }, samples);
  const wall = (performance.now() - t0) / 1000;
  const cpu = process.cpuUsage(cpu0);
  pool.close();
  const s = summariseLandingSuccess(prepared, run.samples, isNominalSafe(prepared));
  return [{
    name: `landing-success ${samples} closed-loop samples, demo`,
    figures: {
      samples,
      workers,
      nodes: prepared.inputs.nodes,
      wall_s: wall,
      cpu_s: (cpu.user + cpu.system) / 1e6,
      ms_per_sample_per_worker: (wall * 1000 * workers) / samples,
      solves_per_sample: s.withDivert.solves / samples,
      replans_per_sample: s.withDivert.meanReplans,
      p_safe_without_divert: s.withoutDivert.safeTouchdown.estimate,
      p_safe_with_divert: s.withDivert.safeTouchdown.estimate,
      propellant_p99_kg: s.withDivert.propellant.p99_kg,
    },
  }];
}
