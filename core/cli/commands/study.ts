/**
 * `landreach study reserve|ignition-altitude STUDY.json --out DIR [options]`: trade studies built on
 * footprints (core/footprint/studies.ts). Each writes a CSV and a versioned JSON report.
 */
import { mkdirSync } from 'node:fs';
import os from 'node:os';
import { join } from 'node:path';
import type { CliCommand, CliIo } from '../command.ts';
import { UsageError } from '../command.ts';
import { manifestName, readStudy, removeOrphanTemporaries, writeOutputSet } from '../files.ts';
import { StopRequest } from '../stop.ts';
import { LANDING_SUCCESS_USAGE, runLandingSuccess } from './landingSuccess.ts';
import { runStudyFootprint } from '../footprintRun.ts';
import { FOOTPRINT_NODES, footprintFigures } from '../../footprint/studyFootprint.ts';
import { footprintMapSvg } from '../../export/footprintSvg.ts';
import { makeTargetGrid, parseGridSize, type TargetGrid } from '../../footprint/grid.ts';
import { minimumAltitude, reserveStudy, type AltitudeStudyRow, type IgnitionRule } from '../../footprint/studies.ts';
import type { Study } from '../../study/index.ts';
import { probabilityOfReach, type DispersionSigmas } from '../../footprint/dispersion.ts';
import {
  altitudeRowByDirections,
  altitudeRowFromField,
  defaultAltitudes,
  defaultReserves,
  DEFAULT_DIRECTIONS,
  DEFAULT_DISPERSION,
  DEFAULT_SIGMAS,
  dispersionFromStudy,
  reachSampleStudies,
  studyAtAltitude,
} from '../../footprint/studyRuns.ts';
import { APP_VERSION, CAUTION, inputsHash } from '../../study/provenance.ts';
import { altitudeStudyCsvLines, DISPERSION_MODEL, dispersionCsvLines, reachMapCsv, reserveStudyCsvLines, studyReport } from '../../export/studyExport.ts';

const USAGE = `Usage: landreach study reserve|ignition-altitude|dispersion|landing-success STUDY.json --out DIR [options]

  reserve             one footprint; reachable area and guaranteed divert radius for each reserve
  ignition-altitude   a footprint per ignition altitude; guaranteed divert radius at the reserve, and the
                      lowest altitude meeting --required-radius-m
  dispersion          Monte Carlo landing ellipse of the no-divert landing point (the nominal optimal
                      thrust flown open loop from dispersed ignition states) and, with --reach-samples,
                      the probability-of-reach map

Common options:
  --out DIR             folder for study-<name>.csv and study-<name>.json
  --grid NXxNY          targets per footprint (default 21x21)
  --extent-m M          half-width of each footprint grid, m (default 2500)
  --workers N           worker threads (default: the number of cores, at most 8)
  --nodes N             time nodes per trajectory (default ${FOOTPRINT_NODES})
reserve:
  --reserves A,B,...    reserves to evaluate, kg (default 0 and round steps up to half the usable propellant)
ignition-altitude:
  --altitudes A,B,...   ignition altitudes above the target, m (default 0.6, 0.8, 1, 1.2, 1.4 × the study's)
  --rule R              how the ignition state follows the altitude: fixed-velocity (default) or
                        fixed-flight-path-angle (slide along the ignition velocity's direction)
  --reserve-kg R        reserve to keep (default: the study's vehicle.propellantReserve_kg)
  --required-radius-m D divert radius the mission requires, m (reports the lowest altitude meeting it)
  --method M            directions (default: the reach boundary along --directions K directions, 24 by
                        default, from max-divert cone programs — far fewer solves) or grid (a footprint
                        per altitude on --grid / --extent-m; its radius is limited by the grid's extent)
dispersion (1σ values; the defaults are illustrative, not from any mission):
  --samples N           Monte Carlo samples (default 1000)      --seed S        (default 1)
  --probability P       ellipse probability (default 0.997; 2-D: 3.409σ)
  --sigma-position-m    per axis (default 50)                   --sigma-velocity-mps  per axis (default 2)
  --sigma-mass-kg       (default 5)      --sigma-thrust  fraction (default 0.01)   --sigma-isp  fraction (default 0.005)
  --reach-samples K     also the probability-of-reach map: a footprint (--grid, --extent-m) for each of K
                        dispersed samples; each target's fraction of samples reaching it with the reserve kept
                        The study also writes study-dispersion.svg: the nominal footprint (--grid, --extent-m)
                        with its reserve boundary and the landing ellipse, a map for reports.

${LANDING_SUCCESS_USAGE}

Every study also writes study-<name>.manifest.json last (each file's size and SHA-256, and the run record).
Ctrl-C (once or more), SIGTERM or SIGHUP stop the study: what finished is written, marked as stopped early
(the report's "cancelled", a "# STOPPED EARLY" line in the CSV), and the exit code is 128 + the signal's
number (130 Ctrl-C, 143 SIGTERM). Exit codes otherwise: 0 done, 1 computation failed, 2 bad input.

${CAUTION}`;

interface Common {
  kind: 'reserve' | 'ignition-altitude' | 'dispersion';
  study: string;
  out: string;
  grid: [number, number];
  extent: number;
  workers: number;
  nodes: number;
  values: Record<string, string>;
}

const LIST = (flag: string, text: string) => {
  const v = text.split(',').map((x) => Number(x.trim()));
  if (!v.length || !v.every((x) => Number.isFinite(x) && x >= 0)) throw new UsageError(`${flag} ${text}: must be numbers ≥ 0 separated by commas`);
  return v;
};

function parse(args: string[]): Common {
  const [kind, ...rest] = args;
  if (kind !== 'reserve' && kind !== 'ignition-altitude' && kind !== 'dispersion') {
    throw new UsageError(`unknown study '${kind ?? ''}': choose reserve, ignition-altitude, dispersion or landing-success (see landreach study --help)`);
  }
  const o: Common = {
    kind,
    study: '',
    out: '',
    grid: [21, 21],
    extent: 2500,
    workers: Math.min(8, Math.max(1, os.availableParallelism?.() ?? os.cpus().length)),
    nodes: FOOTPRINT_NODES,
    values: {},
  };
  const known = new Set(
    kind === 'reserve'
      ? ['reserves']
      : kind === 'ignition-altitude'
        ? ['altitudes', 'rule', 'reserve-kg', 'required-radius-m', 'method', 'directions']
        : ['samples', 'seed', 'probability', 'sigma-position-m', 'sigma-velocity-mps', 'sigma-mass-kg', 'sigma-thrust', 'sigma-isp', 'reach-samples'],
  );
  for (let i = 0; i < rest.length; i++) {
    const a = rest[i];
    const value = () => {
      const v = rest[++i];
      if (v === undefined || v.startsWith('--')) throw new UsageError(`${a} needs a value (see landreach study --help)`);
      return v;
    };
    if (a === '--out') o.out = value();
    else if (a === '--grid') {
      try {
        o.grid = parseGridSize(value());
      } catch (err) {
        throw new UsageError((err as Error).message);
      }
    } else if (a === '--extent-m') {
      const t = value();
      o.extent = Number(t);
      if (!(o.extent > 0)) throw new UsageError(`--extent-m ${t}: must be a positive distance in metres`);
    } else if (a === '--workers' || a === '--nodes') {
      const t = value();
      const v = Number(t);
      if (!Number.isInteger(v) || v < (a === '--nodes' ? 5 : 1) || v > (a === '--nodes' ? 2000 : 64)) {
        throw new UsageError(`${a} ${t}: must be a whole number from ${a === '--nodes' ? '5 to 2000' : '1 to 64'}`);
      }
      if (a === '--workers') o.workers = v;
      else o.nodes = v;
    } else if (a.startsWith('--') && known.has(a.slice(2))) o.values[a.slice(2)] = value();
    else if (a.startsWith('--')) throw new UsageError(`unknown option '${a}' for the ${kind} study (see landreach study --help)`);
    else if (!o.study) o.study = a;
    else throw new UsageError(`unexpected argument '${a}': give one study file`);
  }
  if (!o.study) throw new UsageError(`missing STUDY.json (usage: landreach study ${kind} STUDY.json --out DIR)`);
  if (!o.out) throw new UsageError('missing --out DIR');
  return o;
}

function grid(o: Common): TargetGrid {
  return makeTargetGrid({ halfWidthEast_m: o.extent, halfWidthNorth_m: o.extent, nx: o.grid[0], ny: o.grid[1] });
}

/** Lets a signal's handler run between steps that compute on this thread (the signal is then seen). */
const signalsHandled = () => new Promise<void>((resolve) => setImmediate(resolve));

async function runReserve(o: Common, study: Study, io: CliIo, signal: AbortSignal) {
  const usable = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
  const reserves = o.values.reserves
    ? LIST('--reserves', o.values.reserves)
    : defaultReserves(usable);
  for (const r of reserves) if (r >= usable) throw new UsageError(`--reserves: ${r} kg is not below the usable propellant, ${usable} kg`);
  const run = await runStudyFootprint(study, grid(o), { nodes: o.nodes, workers: o.workers, signal }, io);
  const rows = reserveStudy(run.field, usable, reserves);
  return { rows, csv: reserveStudyCsvLines(rows), cancelled: run.cancelled, extra: { usablePropellant_kg: usable } };
}

async function runAltitude(o: Common, study: Study, io: CliIo, signal: AbortSignal) {
  const h0 = study.ignition.position_m[2];
  const altitudes = o.values.altitudes ? LIST('--altitudes', o.values.altitudes) : defaultAltitudes(h0);
  const ruleName = o.values.rule ?? 'fixed-velocity';
  if (ruleName !== 'fixed-velocity' && ruleName !== 'fixed-flight-path-angle') {
    throw new UsageError(`--rule ${ruleName}: choose fixed-velocity or fixed-flight-path-angle`);
  }
  const rule: IgnitionRule = { kind: ruleName };
  const usable = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
  const reserve = o.values['reserve-kg'] !== undefined ? Number(o.values['reserve-kg']) : study.vehicle.propellantReserve_kg;
  if (!(reserve >= 0 && reserve < usable)) throw new UsageError(`--reserve-kg ${o.values['reserve-kg']}: must be from 0 up to below ${usable} kg`);
  const required = o.values['required-radius-m'] !== undefined ? Number(o.values['required-radius-m']) : null;
  if (required !== null && !(required > 0)) throw new UsageError(`--required-radius-m ${o.values['required-radius-m']}: must be a positive distance in metres`);
  const method = o.values.method ?? 'directions';
  if (method !== 'directions' && method !== 'grid') throw new UsageError(`--method ${method}: choose directions or grid`);
  const directions = o.values.directions === undefined ? DEFAULT_DIRECTIONS : Number(o.values.directions);
  if (!Number.isInteger(directions) || directions < 3 || directions > 720) {
    throw new UsageError(`--directions ${o.values.directions}: must be a whole number from 3 to 720`);
  }
  // Every altitude's study is built (and checked) before anything is computed.
  const studies = altitudes.map((h) => {
    try {
      return studyAtAltitude(study, h, rule);
    } catch (err) {
      throw new UsageError(`--altitudes ${h}: ${(err as Error).message}`);
    }
  });
  const rows: AltitudeStudyRow[] = [];
  let cancelled = false;
  for (const [k, h] of altitudes.entries()) {
    await signalsHandled();
    if (signal.aborted) {
      cancelled = true;
      break;
    }
    const at: Study = studies[k];
    io.stderr(`ignition altitude ${h} m (${ruleName}): position [${at.ignition.position_m.map((v) => v.toFixed(0)).join(', ')}] m\n`);
    if (method === 'directions') {
      rows.push(altitudeRowByDirections(at, h, usable - reserve, directions, o.nodes));
      continue;
    }
    const run = await runStudyFootprint(at, grid(o), { nodes: o.nodes, workers: o.workers, signal }, io);
    cancelled ||= run.cancelled;
    rows.push(altitudeRowFromField(run.field, h, usable - reserve));
    if (run.cancelled) break;
  }
  const minimum = required === null ? null : minimumAltitude(rows, required);
  return { rows, csv: altitudeStudyCsvLines(rows), cancelled, extra: { method, directions: method === 'directions' ? directions : null, rule: ruleName, reserve_kg: reserve, requiredRadius_m: required, minimumAltitude: minimum } };
}

async function runDispersion(o: Common, study: Study, io: CliIo, hash: string, signal: AbortSignal) {
  const numberOpt = (name: string, fallback: number, check: (v: number) => boolean, fix: string) => {
    const t = o.values[name];
    if (t === undefined) return fallback;
    const v = Number(t);
    if (!check(v)) throw new UsageError(`--${name} ${t}: ${fix}`);
    return v;
  };
  const nonNeg = (v: number) => Number.isFinite(v) && v >= 0;
  const samples = numberOpt('samples', DEFAULT_DISPERSION.samples, (v) => Number.isInteger(v) && v >= 10 && v <= 100000, 'must be a whole number from 10 to 100000');
  const seed = numberOpt('seed', DEFAULT_DISPERSION.seed, (v) => Number.isInteger(v) && v >= 0, 'must be a whole number ≥ 0');
  const probability = numberOpt('probability', DEFAULT_DISPERSION.probability, (v) => v > 0 && v < 1, 'must be between 0 and 1, e.g. 0.997');
  const sigmas: DispersionSigmas = {
    position_m: numberOpt('sigma-position-m', DEFAULT_SIGMAS.position_m, nonNeg, 'must be zero or a positive distance in metres'),
    velocity_mps: numberOpt('sigma-velocity-mps', DEFAULT_SIGMAS.velocity_mps, nonNeg, 'must be zero or a positive speed in m/s'),
    mass_kg: numberOpt('sigma-mass-kg', DEFAULT_SIGMAS.mass_kg, nonNeg, 'must be zero or a positive mass in kg'),
    thrustFraction: numberOpt('sigma-thrust', DEFAULT_SIGMAS.thrustFraction, nonNeg, 'must be zero or a positive fraction, e.g. 0.01'),
    ispFraction: numberOpt('sigma-isp', DEFAULT_SIGMAS.ispFraction, nonNeg, 'must be zero or a positive fraction, e.g. 0.005'),
  };
  let dispersion;
  try {
    dispersion = dispersionFromStudy(study, sigmas, { samples, seed, probability, nodes: o.nodes });
  } catch (err) {
    throw new UsageError((err as Error).message);
  }
  const r = dispersion.result;
  const csv = dispersionCsvLines(r);
  const e = r.ellipse;
  const reachSamples = numberOpt('reach-samples', 0, (v) => Number.isInteger(v) && v >= 0 && v <= 1000, 'must be a whole number from 0 to 1000');
  let reachMap: { csv: string | null; samples: number; cancelled: boolean } | null = null;
  if (reachSamples > 0) {
    const draws = reachSampleStudies(study, sigmas, reachSamples, seed);
    const fields = [];
    const budgets: number[] = [];
    let cancelled = false;
    for (const [i, s] of draws.entries()) {
      await signalsHandled();
      if (signal.aborted) {
        cancelled = true;
        break;
      }
      io.stderr(`reach map: sample ${i + 1} of ${reachSamples}\n`);
      const run = await runStudyFootprint(s.study, grid(o), { nodes: o.nodes, workers: o.workers, signal }, io);
      fields.push(run.field);
      budgets.push(s.budget_kg);
      if (run.cancelled) {
        cancelled = true;
        break;
      }
    }
    reachMap = fields.length
      ? { csv: reachMapCsv(fields[0], probabilityOfReach(fields, budgets), fields.length, study.vehicle.propellantReserve_kg), samples: fields.length, cancelled }
      : { csv: null, samples: 0, cancelled };
  }
  // The map for a report: the nominal footprint on --grid / --extent-m with its reserve boundary, and the
  // landing ellipse over it.
  io.stderr('map: the nominal footprint\n');
  const nominal = await runStudyFootprint(study, grid(o), { nodes: o.nodes, workers: o.workers, signal }, io);
  const usable = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
  const reserve = study.vehicle.propellantReserve_kg;
  const fig = footprintFigures(nominal.field, { usable_kg: usable, reserve_kg: reserve }, { cancelled: nominal.cancelled });
  const map = footprintMapSvg(nominal.field, fig, {
    title: `Landing ellipse and divert footprint — ${study.name}`,
    caption: [
      `${study.name} — ${(probability * 100).toFixed(1)} % ellipse of ${samples} dispersed samples (seed ${seed}); footprint ${o.grid[0]} × ${o.grid[1]}, N = ${o.nodes}, reserve ${reserve} kg${nominal.cancelled ? ' — STOPPED EARLY: partial footprint' : ''}`,
      `Landreach ${APP_VERSION}, ${new Date().toISOString()}, inputs ${hash.slice(0, 16)}`,
    ],
  }, e);
  return {
    rows: [{ ...e }],
    csv,
    cancelled: (reachMap?.cancelled ?? false) || nominal.cancelled,
    extraFiles: [...(reachMap?.csv ? [{ suffix: '-reach.csv', text: reachMap.csv }] : []), { suffix: '.svg', text: map }],
    extra: {
      sigmas,
      samples,
      seed,
      nominalPropellant_kg: dispersion.nominalPropellant_kg,
      nominalTimeOfFlight_s: dispersion.nominalTimeOfFlight_s,
      model: DISPERSION_MODEL,
      reachMapSamples: reachMap?.samples ?? 0,
    },
    summaryLine: `${(probability * 100).toFixed(1)} % landing ellipse: ${e.semiMajor_m.toFixed(1)} × ${e.semiMinor_m.toFixed(1)} m (semi-axes), major axis ${e.orientation_deg.toFixed(1)}° from east, centre ${e.centreEast_m.toFixed(1)} m east, ${e.centreNorth_m.toFixed(1)} m north`,
  };
}

export const studyCommand: CliCommand = {
  name: 'study',
  summary: 'trade studies: reserve (area, divert radius vs reserve), ignition-altitude (divert radius vs altitude), dispersion (landing ellipse), landing-success (P(safe touchdown) without and with divert)',
  usage: USAGE,
  async run(args: string[], io: CliIo): Promise<number> {
    if (args[0] === 'landing-success') return runLandingSuccess(args.slice(1), io);
    const o = parse(args);
    const study = readStudy(o.study);
    const inputs = { study, kind: o.kind, grid: o.grid, extent_m: o.extent, nodes: o.nodes, options: o.values };
    const hash = await inputsHash(inputs);
    const stem = `study-${o.kind}`;
    const removed = removeOrphanTemporaries(o.out, ['.csv', '.json', '.svg', '-reach.csv'].map((x) => stem + x).concat(manifestName(stem)));
    if (removed.length) io.stderr(`removed ${removed.length} temporary file(s) left in ${o.out} by an interrupted run: ${removed.join(', ')}\n`);
    const startedAt = new Date();
    const stop = new StopRequest(io).install();
    try {
      const result: { rows: unknown[]; csv: string[]; cancelled: boolean; extra: Record<string, unknown>; summaryLine?: string; extraFiles?: { suffix: string; text: string }[] } =
        o.kind === 'reserve'
          ? await runReserve(o, study, io, stop.signal)
          : o.kind === 'ignition-altitude'
            ? await runAltitude(o, study, io, stop.signal)
            : await runDispersion(o, study, io, hash, stop.signal);
      mkdirSync(o.out, { recursive: true });
      const report = studyReport({ kind: o.kind, inputs, inputsHash: hash, cancelled: result.cancelled, extra: result.extra, rows: result.rows });
      const base = join(o.out, stem);
      // A partial study says so under the caution line (the report's "cancelled" says it too).
      const csv = result.cancelled ? [result.csv[0], '# STOPPED EARLY: partial result (the study was stopped before it finished)', ...result.csv.slice(1)] : result.csv;
      const files = [
        { path: `${base}.csv`, text: csv.join('\n') + '\n' },
        { path: `${base}.json`, text: report },
        ...(result.extraFiles ?? []).map((f) => ({ path: `${base}${f.suffix}`, text: f.text })),
      ];
      const manifest = writeOutputSet(files, {
        name: manifestName(stem),
        run: {
          status: result.cancelled ? 'stopped-early' : 'complete',
          stoppedBy: stop.signalName,
          command: `study ${o.kind}`,
          inputsHash: hash,
          startedAt: startedAt.toISOString(),
          finishedAt: new Date().toISOString(),
          elapsed_s: Number(((Date.now() - startedAt.getTime()) / 1000).toFixed(2)),
          workers: o.workers,
        },
      });
      if (result.summaryLine) io.stdout(result.summaryLine + '\n');
      else io.stdout(result.csv.slice(1).join('\n') + '\n');
      if ('minimumAltitude' in result.extra && result.extra.requiredRadius_m !== null) {
        const m = result.extra.minimumAltitude as { altitude_m: number; bracketed: boolean } | null;
        io.stdout(
          m === null
            ? `no sampled altitude meets a ${result.extra.requiredRadius_m} m divert radius with ${result.extra.reserve_kg} kg in reserve\n`
            : `lowest ignition altitude for a ${result.extra.requiredRadius_m} m divert radius: ${m.bracketed ? '' : 'at most '}${m.altitude_m.toFixed(0)} m\n`,
        );
      }
      const written = [...files.map((f) => f.path), manifest];
      io.stdout(`${result.cancelled ? `stopped early${stop.signalName ? ` by ${stop.signalName}` : ''}; ` : ''}wrote ${written.join(', ')}\n\n${CAUTION}\n`);
      return stop.exitCode ?? 0;
    } finally {
      stop.dispose();
    }
  },
};
