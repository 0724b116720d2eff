/**
 * `landreach study landing-success STUDY.json --out DIR [options]`: P(safe touchdown) without divert (open
 * loop: Monte Carlo and the Gaussian ellipse model over the DEM's hazard map) and with divert (closed loop,
 * re-planning to a safe target), core/uncertainty. Writes study-landing-success.{csv,json,svg},
 * study-landing-success-comparison.csv and the manifest.
 */
import { mkdirSync, readFileSync } from 'node:fs';
import os from 'node:os';
import { join, resolve } from 'node:path';
import type { CliIo } from '../command.ts';
import { UsageError } from '../command.ts';
import { nominalTargetOnDem, num, parseFlagArgs, readDem, type Flags } from '../dem.ts';
import { manifestName, readStudy, removeOrphanTemporaries, writeOutputSet } from '../files.ts';
import { StopRequest } from '../stop.ts';
import { studyReach } from './hazard.ts';
import { autoExtent } from './footprint.ts';
import { FOOTPRINT_NODES } from '../../footprint/studyFootprint.ts';
import { DEMO_DEM, landingSuccessPool } from '../landingSuccessPool.ts';
import { APP_VERSION, CAUTION, inputsHash } from '../../study/provenance.ts';
import { cellEast, cellNorth, groundFrameOnDem, hazardMap, type HazardLimits } from '../../terrain/index.ts';
import { rankSites } from '../../terrain/sites.ts';
import { comparisonCsvLines, comparisonText, landingSamplesCsvLines, landingSuccessReport, landingSuccessSvg } from '../../uncertainty/export.ts';
import { hazardLayer } from '../../uncertainty/hazardLayer.ts';
import { UncertaintyInputError } from '../../uncertainty/inputError.ts';
import { DEFAULT_LANDING_SUCCESS, resolveLandingSuccessInputs, type LandingSuccessInputs } from '../../uncertainty/inputs.ts';
import { LANDING_POLICY, LANDING_MODEL, prepareLandingSuccess, summariseLandingSuccess, isNominalSafe } from '../../uncertainty/landingSuccess.ts';
import { flySamplesOnPool } from '../../uncertainty/pooled.ts';
import { diagonalCovariance } from '../../uncertainty/covariance.ts';
import type { HazardLayer } from '../../uncertainty/hazardLayer.ts';
import { studyAtAltitude } from '../../footprint/studyRuns.ts';
import type { Study } from '../../study/index.ts';

/**
 * Illustrative safety margin around hazards for choosing targets, m: the horizontal touchdown miss left by a
 * 5 m-per-axis navigation error at the last plan is Rayleigh, P99 = 5·√(−2 ln 0.01) ≈ 15 m; 20 m covers it
 * with room for the flight's own errors.
 */
export const DEFAULT_TARGET_MARGIN_M = 20;

export const LANDING_SUCCESS_USAGE = `landing-success (P(safe touchdown) without and with divert; defaults ILLUSTRATIVE, not from any mission):
  --dem DEM.tif          elevation model for the hazard map (default: the bundled invented demo DEM);
                         reader options as for landreach hazard (--pixel-size-m, --height-scale-m, --window …)
  --target-east-m E, --target-north-m N   the nominal target on the DEM (default its centre)
  --extent-m M           half-width of the footprint grid that ranks the safe sites (default: the study's
                         reach, as landreach footprint sizes its grid)
  --max-slope-deg, --max-roughness-m, --lander-diameter-m, --roughness max|rms   hazard limits (as landreach hazard)
  --margin-m M           targets keep this distance from hazards, m (default ${DEFAULT_TARGET_MARGIN_M})
  --sites K              ranked safe sites the policy may divert to (default ${DEFAULT_LANDING_SUCCESS.sites}): safe cells
                         outside the margin, reachable with the reserve kept by the study's footprint over the DEM
                         (--targets NXxNY, default 21x21), nearest the nominal target first
  --samples N (default ${DEFAULT_LANDING_SUCCESS.samples})   --seed S (default ${DEFAULT_LANDING_SUCCESS.seed})   --workers W
  --inputs FILE.json     any inputs of the study as JSON (full 3 × 3 covariances: ignitionPositionCovariance_m2,
                         ignitionVelocityCovariance_m2ps2, navPositionCovariance_m2, navVelocityCovariance_m2ps2;
                         sigmaMass_kg, sigmaThrustFraction, sigmaIspFraction, replanInterval_s, minTimeToGo_s,
                         touchdownVelocityTolerance_mps, reserve_kg, nodes, confidence, ellipseProbability);
                         the options below override it
  --sigma-position-m, --sigma-velocity-mps   per-axis 1σ at ignition (diagonal covariances; default 50, 2)
  --nav-sigma-position-m, --nav-sigma-velocity-mps   per-axis 1σ navigation error (default 5, 0.2)
  --sigma-mass-kg (5)  --sigma-thrust (0.01)  --sigma-isp (0.005)
  --replan-interval-s (${DEFAULT_LANDING_SUCCESS.replanInterval_s})  --min-time-to-go-s (${DEFAULT_LANDING_SUCCESS.minTimeToGo_s})  --touchdown-velocity-tolerance-mps (${DEFAULT_LANDING_SUCCESS.touchdownVelocityTolerance_mps})
  --reserve-kg R (default the study's)   --nodes N (${DEFAULT_LANDING_SUCCESS.nodes})   --confidence C (0.95)
  --no-replan            fly the first plan open loop (the re-planning reference)
  --trade-reserves A,B,… and/or --trade-altitudes A,B,…   trade curves: the study again per reserve (kg) or per
                         ignition altitude (m; fixed-velocity rule, sites from the study's altitude) with
                         --trade-samples N samples each (default 200): study-landing-success-trade.csv
  Writes study-landing-success.csv (one row per sample), -comparison.csv (without vs with divert), .json
  (report with inputs, seed, interval method, policy) and .svg (map and table).`;

const VALUE_FLAGS = new Set([
  'out', 'dem', 'target-east-m', 'target-north-m', 'max-slope-deg', 'max-roughness-m', 'lander-diameter-m', 'roughness', 'margin-m',
  'sites', 'targets', 'samples', 'seed', 'workers', 'inputs', 'sigma-position-m', 'sigma-velocity-mps', 'nav-sigma-position-m',
  'nav-sigma-velocity-mps', 'sigma-mass-kg', 'sigma-thrust', 'sigma-isp', 'replan-interval-s', 'min-time-to-go-s',
  'touchdown-velocity-tolerance-mps', 'reserve-kg', 'nodes', 'confidence', 'window', 'body-radius-m', 'origin-lat-deg',
  'origin-lon-deg', 'vertical-scale', 'pixel-size-m', 'height-scale-m', 'height-offset-m', 'trade-reserves', 'trade-altitudes',
  'trade-samples', 'extent-m',
]);


/** The study's inputs from --inputs and the options (options win); checked by core/uncertainty. */
function studyInputs(flags: Flags): Partial<LandingSuccessInputs> {
  let given: Record<string, unknown> = {};
  if (typeof flags.inputs === 'string') {
    try {
      given = JSON.parse(readFileSync(flags.inputs, 'utf8')) as Record<string, unknown>;
    } catch (err) {
      throw new UsageError(`--inputs ${flags.inputs}: ${(err as Error).message} (give a JSON object of landing-success inputs)`);
    }
    if (!given || typeof given !== 'object' || Array.isArray(given)) throw new UsageError(`--inputs ${flags.inputs}: must hold a JSON object of landing-success inputs`);
  }
  const set = (flag: string, key: keyof LandingSuccessInputs, f: (v: number) => unknown = (v) => v) => {
    const v = num(flags, flag);
    if (v !== undefined) given[key] = f(v);
  };
  set('samples', 'samples');
  set('seed', 'seed');
  set('sigma-position-m', 'ignitionPositionCovariance_m2', (s) => diagonalCovariance([s, s, s]));
  set('sigma-velocity-mps', 'ignitionVelocityCovariance_m2ps2', (s) => diagonalCovariance([s, s, s]));
  set('nav-sigma-position-m', 'navPositionCovariance_m2', (s) => diagonalCovariance([s, s, s]));
  set('nav-sigma-velocity-mps', 'navVelocityCovariance_m2ps2', (s) => diagonalCovariance([s, s, s]));
  set('sigma-mass-kg', 'sigmaMass_kg');
  set('sigma-thrust', 'sigmaThrustFraction');
  set('sigma-isp', 'sigmaIspFraction');
  set('replan-interval-s', 'replanInterval_s');
  set('min-time-to-go-s', 'minTimeToGo_s');
  set('touchdown-velocity-tolerance-mps', 'touchdownVelocityTolerance_mps');
  set('reserve-kg', 'reserve_kg');
  set('nodes', 'nodes');
  set('sites', 'sites');
  set('confidence', 'confidence');
  for (const k of ['sigma-position-m', 'sigma-velocity-mps', 'nav-sigma-position-m', 'nav-sigma-velocity-mps']) {
    const v = num(flags, k);
    if (v !== undefined && !(v >= 0)) throw new UsageError(`--${k} ${v}: must be zero or a positive 1σ value`);
  }
  try {
    resolveLandingSuccessInputs(given);
  } catch (err) {
    if (err instanceof UncertaintyInputError) throw new UsageError(`landing-success input ${err.message}`);
    throw err;
  }
  return given as Partial<LandingSuccessInputs>;
}

export async function runLandingSuccess(args: string[], io: CliIo): Promise<number> {
  const { positional, flags } = parseFlagArgs(args, VALUE_FLAGS, new Set(['no-replan']), 'landreach study');
  if (positional.length !== 1) throw new UsageError(`expected one study file, got ${positional.length} (usage: landreach study landing-success STUDY.json --out DIR)`);
  if (typeof flags.out !== 'string') throw new UsageError('missing --out DIR');
  const study = readStudy(positional[0]);
  const given = studyInputs(flags);
  const { inputs } = resolveLandingSuccessInputs(given);
  const workers = flags.workers === undefined ? Math.min(8, Math.max(1, os.availableParallelism?.() ?? os.cpus().length)) : num(flags, 'workers')!;
  if (!Number.isInteger(workers) || workers < 1 || workers > 64) throw new UsageError(`--workers ${workers}: must be a whole number from 1 to 64`);
  const demPath = resolve(typeof flags.dem === 'string' ? flags.dem : DEMO_DEM);
  const { grid, format } = await readDem(demPath, flags);
  const roughness = flags.roughness;
  if (roughness !== undefined && roughness !== 'max' && roughness !== 'rms') throw new UsageError(`--roughness: '${String(roughness)}' must be max or rms`);
  const limits: HazardLimits = {
    maxSlope_deg: num(flags, 'max-slope-deg'),
    maxRoughness_m: num(flags, 'max-roughness-m'),
    landerDiameter_m: num(flags, 'lander-diameter-m'),
    safetyMargin_m: num(flags, 'margin-m') ?? DEFAULT_TARGET_MARGIN_M,
    roughnessMeasure: roughness as 'max' | 'rms' | undefined,
  };
  let map;
  try {
    map = hazardMap(grid, limits);
  } catch (err) {
    throw new UsageError((err as Error).message);
  }
  const [tE, tN] = nominalTargetOnDem(grid, flags);
  const ground = groundFrameOnDem(grid.georeference, [tE, tN], 'DEM');
  const layer = hazardLayer(grid, map, [tE, tN], ground.jacobian);
  const outDir = resolve(flags.out);
  const stem = 'study-landing-success';
  const names = ['.csv', '-comparison.csv', '-trade.csv', '.json', '.svg'].map((x) => stem + x);
  const removed = removeOrphanTemporaries(outDir, [...names, manifestName(stem)]);
  if (removed.length) io.stderr(`removed ${removed.length} temporary file(s) left in ${outDir} by an interrupted run: ${removed.join(', ')}\n`);
  const hashed = { study, inputs, dem: { path: demPath, format, width: grid.width, height: grid.height }, limits: map.limits, target_m: [tE, tN], replan: flags['no-replan'] !== true, sites: inputs.sites, extent_m: flags['extent-m'] ?? null };
  const hash = await inputsHash(hashed);
  const startedAt = new Date();
  const stop = new StopRequest(io).install();
  try {
    // Ranked safe sites: the study's footprint over the DEM, as `landreach hazard --study` ranks them.
    let sites: [number, number][] = [];
    if (inputs.sites > 0) {
      io.stderr(`ranking safe sites: the study's footprint over the DEM (${demPath})\n`);
      // The target grid spans the study's reach (as `landreach footprint` sizes it), not the whole DEM.
      const extent_m = flags['extent-m'] !== undefined ? num(flags, 'extent-m')! : autoExtent(study, study.vehicle.wetMass_kg - study.vehicle.dryMass_kg - study.vehicle.propellantReserve_kg, FOOTPRINT_NODES, io);
      if (!(extent_m > 0)) throw new UsageError(`--extent-m ${extent_m}: must be a distance in metres > 0`);
      const reach = await studyReach(study, grid, map, { ...flags, sites: String(inputs.sites), workers: String(workers) }, io, stop.signal, [tE, tN], extent_m);
      // Divert sites nearest the nominal target first: the least divert, and the farthest from the DEM's
      // unknown edges (rankSites on the safe reachable cells, with the distance as its cost).
      const distance = new Float32Array(grid.width * grid.height);
      for (let r = 0; r < grid.height; r++) {
        for (let c = 0; c < grid.width; c++) distance[r * grid.width + c] = Math.hypot(cellEast(grid, c) - tE, cellNorth(grid, r) - tN);
      }
      sites = rankSites(grid, map, { width: grid.width, height: grid.height, reachable: reach.safe.mask, propellant_kg: distance }, { count: inputs.sites })
        .map((site) => ground.fromDem(site.east_m, site.north_m));
    }
    let prepared;
    try {
      prepared = prepareLandingSuccess(study, given, layer, sites, flags['no-replan'] !== true);
    } catch (err) {
      throw new UsageError((err as Error).message);
    }
    io.stderr(`nominal: ${prepared.nominal.propellant_kg.toFixed(2)} kg in ${prepared.nominal.timeOfFlight_s.toFixed(1)} s; nominal target ${isNominalSafe(prepared) ? 'clear of hazards' : 'ON OR NEAR A HAZARD'}; ${sites.length} ranked safe sites\n`);
    const pool = landingSuccessPool(workers);
    let run;
    let lastPrint = 0;
    try {
      run = await flySamplesOnPool(pool, { runId: hash, study, inputs: given, hazard: layer, sites, replan: flags['no-replan'] !== true }, inputs.samples, {
        signal: stop.signal,
        onProgress: (p) => {
          const line = `${p.done}/${p.total} samples  ${p.rate_per_s.toFixed(1)} /s  ${Number.isFinite(p.remaining_s) ? `${p.remaining_s.toFixed(0)} s left` : '…'}`;
          const now = Date.now();
          if (io.interactive) io.stderr(`\r${line}   `);
          else if (now - lastPrint > 2000 || p.done === p.total) { io.stderr(line + '\n'); lastPrint = now; }
        },
      });
    } finally {
      pool.close();
    }
    if (io.interactive) io.stderr('\n');
    const summary = summariseLandingSuccess(prepared, run.samples, isNominalSafe(prepared));
    const trade = run.cancelled ? { rows: [], cancelled: false } : await tradeCurves(flags, study, given, layer, sites, hash, workers, io, stop.signal);
    mkdirSync(outDir, { recursive: true });
    const stopped = (lines: string[]) => (run.cancelled ? [lines[0], `# STOPPED EARLY: ${run.samples.length} of ${inputs.samples} samples finished`, ...lines.slice(1)] : lines);
    const hazardInfo = { dem: demPath, format, limits: map.limits, targetOnDem_m: [tE, tN], safeFraction: map.safeFraction, unknownCellsUnsafe: true, nominalTargetClear: isNominalSafe(prepared) };
    const caption = [
      `${study.name} — ${summary.samples}${run.cancelled ? ` of ${inputs.samples} (STOPPED EARLY)` : ''} samples, seed ${inputs.seed}, re-plan every ${inputs.replanInterval_s} s, reserve ${prepared.settings.reserve_kg} kg, N = ${inputs.nodes}`,
      `Landreach ${APP_VERSION}, inputs ${hash.slice(0, 16)}; ${(summary.confidence * 100).toFixed(0)} % Wilson score intervals (date and run time: the manifest)`,
    ];
    const files = [
      ...(trade.rows.length ? [{ path: join(outDir, `${stem}-trade.csv`), text: tradeCsv(trade.rows, trade.cancelled) }] : []),
      { path: join(outDir, `${stem}.csv`), text: stopped(landingSamplesCsvLines(run.samples)).join('\n') + '\n' },
      { path: join(outDir, `${stem}-comparison.csv`), text: stopped(comparisonCsvLines(summary)).join('\n') + '\n' },
      { path: join(outDir, `${stem}.json`), text: landingSuccessReport({ inputs: { ...hashed, inputs }, inputsHash: hash, seed: inputs.seed, cancelled: run.cancelled, summary, sites, hazard: hazardInfo, policy: LANDING_POLICY, model: LANDING_MODEL, trade: trade.rows }) },
      { path: join(outDir, `${stem}.svg`), text: landingSuccessSvg(layer, run.samples, summary, sites, caption) },
    ];
    const manifest = writeOutputSet(files, {
      name: manifestName(stem),
      run: {
        status: run.cancelled || trade.cancelled ? 'stopped-early' : 'complete',
        stoppedBy: stop.signalName,
        command: 'study landing-success',
        inputsHash: hash,
        startedAt: startedAt.toISOString(),
        finishedAt: new Date().toISOString(),
        elapsed_s: Number(((Date.now() - startedAt.getTime()) / 1000).toFixed(2)),
        workers,
      },
    });
    io.stdout(comparisonText(summary) + '\n');
    io.stdout(`${run.cancelled ? `stopped early${stop.signalName ? ` by ${stop.signalName}` : ''}; ` : ''}wrote ${[...files.map((f) => f.path), manifest].join(', ')}\n\n${CAUTION}\n`);
    return stop.exitCode ?? 0;
  } finally {
    stop.dispose();
  }
}

export interface TradeRow {
  variable: 'reserve_kg' | 'ignition_altitude_m';
  value: number;
  samples: number;
  pSafeWithoutDivert: number;
  pSafeWithDivert: number;
  lower: number;
  upper: number;
  propellantP99_kg: number;
  noSafeSite: number;
}

/** The trade curves: the same study again per reserve and per ignition altitude, `--trade-samples` each. */
async function tradeCurves(
  flags: Flags, study: Study, given: Partial<LandingSuccessInputs>, layer: HazardLayer, sites: [number, number][], hash: string, workers: number, io: CliIo, signal: AbortSignal,
): Promise<{ rows: TradeRow[]; cancelled: boolean }> {
  const list = (name: string) => {
    const t = flags[name];
    if (typeof t !== 'string') return [];
    const v = t.split(',').map((x) => Number(x.trim()));
    if (!v.length || !v.every((x) => Number.isFinite(x) && x >= 0)) throw new UsageError(`--${name} ${t}: must be numbers ≥ 0 separated by commas`);
    return v;
  };
  const reserves = list('trade-reserves');
  const altitudes = list('trade-altitudes');
  if (!reserves.length && !altitudes.length) {
    if (flags['trade-samples'] !== undefined) throw new UsageError('--trade-samples only applies with --trade-reserves or --trade-altitudes');
    return { rows: [], cancelled: false };
  }
  const samples = num(flags, 'trade-samples') ?? 200;
  if (!Number.isInteger(samples) || samples < 10 || samples > 100000) throw new UsageError(`--trade-samples ${samples}: must be a whole number from 10 to 100000`);
  const cases: { variable: TradeRow['variable']; value: number; study: Study; inputs: Partial<LandingSuccessInputs> }[] = [
    ...reserves.map((r) => ({ variable: 'reserve_kg' as const, value: r, study, inputs: { ...given, samples, reserve_kg: r } })),
    ...altitudes.map((h) => {
      try {
        return { variable: 'ignition_altitude_m' as const, value: h, study: studyAtAltitude(study, h, { kind: 'fixed-velocity' }), inputs: { ...given, samples } };
      } catch (err) {
        throw new UsageError(`--trade-altitudes ${h}: ${(err as Error).message}`);
      }
    }),
  ];
  const rows: TradeRow[] = [];
  const pool = landingSuccessPool(workers);
  try {
    for (const [k, c] of cases.entries()) {
      io.stderr(`trade ${k + 1} of ${cases.length}: ${c.variable} = ${c.value}\n`);
      let prepared;
      try {
        prepared = prepareLandingSuccess(c.study, c.inputs, layer, sites);
      } catch (err) {
        throw new UsageError(`trade ${c.variable} = ${c.value}: ${(err as Error).message}`);
      }
      const run = await flySamplesOnPool(pool, { runId: `${hash}-trade-${k}`, study: c.study, inputs: c.inputs, hazard: layer, sites, replan: true }, samples, { signal });
      const s = summariseLandingSuccess(prepared, run.samples, isNominalSafe(prepared));
      rows.push({
        variable: c.variable,
        value: c.value,
        samples: run.samples.length,
        pSafeWithoutDivert: s.withoutDivert.safeTouchdown.estimate,
        pSafeWithDivert: s.withDivert.safeTouchdown.estimate,
        lower: s.withDivert.safeTouchdown.lower,
        upper: s.withDivert.safeTouchdown.upper,
        propellantP99_kg: s.withDivert.propellant.p99_kg,
        noSafeSite: s.withDivert.noSafeReachableSite.estimate,
      });
      if (run.cancelled) return { rows, cancelled: true };
    }
  } finally {
    pool.close();
  }
  return { rows, cancelled: false };
}

function tradeCsv(rows: readonly TradeRow[], cancelled: boolean): string {
  const f = (v: number, d: number) => (Number.isFinite(v) ? Number(v.toFixed(d)).toString() : '');
  return [
    `# ${CAUTION}`,
    ...(cancelled ? ['# STOPPED EARLY: the trade curves were stopped before they finished'] : []),
    '# P(safe touchdown) with divert: Wilson score interval (95 % unless --confidence)',
    'variable,value,samples,p_safe_without_divert,p_safe_with_divert,ci_lower,ci_upper,propellant_p99_kg,no_safe_site_share',
    ...rows.map((r) => [r.variable, r.value, r.samples, f(r.pSafeWithoutDivert, 5), f(r.pSafeWithDivert, 5), f(r.lower, 5), f(r.upper, 5), f(r.propellantP99_kg, 3), f(r.noSafeSite, 5)].join(',')),
  ].join('\n') + '\n';
}
