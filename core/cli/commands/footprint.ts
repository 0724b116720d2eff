/**
 * `landreach footprint STUDY.json --out DIR [--grid 41x41] [--extent-m 1500] [--reserve-kg R] [--workers N]
 *  [--nodes N] [--levels a,b,…] [--terrain DEM [--target-east-m E --target-north-m N]]`
 *
 * The divert footprint: minimum propellant (free final time) for every target of a grid around the
 * nominal target, in worker threads, with contours, the reserve boundary, the guaranteed divert radius and
 * report files. Ctrl-C or SIGTERM stops the run, writes what finished and says so (stop.ts).
 */
import { existsSync, mkdirSync, statSync } from 'node:fs';
import os from 'node:os';
import { join } from 'node:path';
import type { CliCommand, CliIo } from '../command.ts';
import { UsageError } from '../command.ts';
import { manifestName, parseVehicleFlag, readStudy, removeOrphanTemporaries, VEHICLE_FLAGS_USAGE, type VehicleFlags, writeOutputSet } from '../files.ts';
import { StopRequest } from '../stop.ts';
import { nominalTargetOnDem, openDem, type Flags } from '../dem.ts';
import { footprintLonLat, footprintPlace, type FootprintPlace } from '../../footprint/georeferencedFootprint.ts';
import type { FootprintLonLat } from '../../export/footprintExport.ts';
import { TerrainInputError } from '../../terrain/grid.ts';
import type { Study } from '../../study/index.ts';
import { APP_VERSION, CAUTION, inputsHash } from '../../study/provenance.ts';
import { footprintCsv, footprintGeoJson, footprintReport, partialResultLine } from '../../export/footprintExport.ts';
import { runStudyFootprint } from '../footprintRun.ts';
import { iterationModule } from '../../conic/index.ts';
import { MAX_NODES } from '../../descent/setup.ts';
import { reachExtent } from '../../footprint/studyRuns.ts';
import { makeTargetGrid, parseGridSize } from '../../footprint/grid.ts';
import { FOOTPRINT_NODES, footprintFigures, type FootprintFigures } from '../../footprint/studyFootprint.ts';
import type { FootprintField } from '../../footprint/field.ts';
import { footprintMapSvg } from '../../export/footprintSvg.ts';
import { footprintJsonFg } from '../../export/footprintJsonFg.ts';
import { footprintPropellantTiff, footprintReachableTiff } from '../../export/footprintRasters.ts';

const USAGE = `Usage: landreach footprint STUDY.json --out DIR [options]

Computes the divert footprint: for every target of a grid around the nominal target, the minimum
propellant to land there (free final time), or a certificate that it cannot be reached.

Options:
  --out DIR          folder for the result files (created if missing)
  --grid NXxNY       targets east × north (default 21x21)
  --extent-m M       half-width of the grid, m (default: 10 % beyond the farthest reach along 16 directions
                     with the reserve kept, rounded up to 100 m)
  --reserve-kg R     propellant to keep in reserve, kg (default: the study's vehicle.propellantReserve_kg)
  --workers N        worker threads (default: the number of cores, at most 8)
  --nodes N          time nodes per trajectory (default ${FOOTPRINT_NODES})
  --levels A,B,...   propellant contour levels, kg (default: six round levels up to the budget)
  --refine-boundary F  after the grid, solve the cells the budget boundary crosses again at F × the
                     resolution (2 … 8): area and divert radius then come from the refined boundary
  --reachable-only   stop each target's search once it is certainly over the budget (such targets are
                     reported 'over-budget' with the best trajectory found as their cost, an upper
                     bound; levels above the budget are then not drawn)
  --terrain DEM      a georeferenced GeoTIFF (EPSG:4326, a UTM zone on WGS 84, degrees on a sphere, or a
                     projected CRS on another body, e.g. IAU_2015 codes): footprint.geojson then carries
                     longitude/latitude geometry, the nominal target placed at --target-east-m,
                     --target-north-m of the DEM's frame (default: the DEM's centre). With a projected DEM
                     the footprint is also written in the DEM's own CRS: footprint.fg.json (OGC JSON-FG:
                     shapes in the DEM's easting/northing under 'place', its CRS in 'coordRefSys'),
                     footprint-propellant.tif (minimum propellant, kg, Float32, NaN where not
                     established) and footprint-reachable.tif (Byte: 1 reachable with the reserve kept,
                     0 not, 255 not established), one pixel centred on each target. Only the DEM's
                     header is read, so any size of DEM will do
  --body-radius-m R, --origin-lat-deg A, --origin-lon-deg B
                     with --terrain: as for landreach hazard (geographic DEMs)
${VEHICLE_FLAGS_USAGE}

Writes footprint.json (versioned report), footprint.csv (one row per target), footprint.geojson
(contours and the reserve boundary, RFC 7946: local metres
in the properties, longitude/latitude geometry with --terrain, null geometry without) and footprint.svg (a map for reports),
then footprint.manifest.json last: each file's size and SHA-256, and the run record (date, time taken,
workers, how the run ended). The result files are the same bytes for the same inputs, whatever the
number of workers; \`landreach verify DIR\` checks a folder's set against its manifest.

Ctrl-C (once or more), SIGTERM or SIGHUP stop the run: every finished row is written and the files say
the run stopped early. Temporary files left by a run that was killed (SIGKILL) are removed by the next run.
Exit codes: 0 done, 1 computation failed, 2 bad input, 128 + the signal's number when stopped by a signal
after writing what finished (130 Ctrl-C, 143 SIGTERM, 129 SIGHUP).

${CAUTION}`;

interface Options {
  study: string;
  out: string;
  nx: number;
  ny: number;
  extent: number | null;
  reserve: number | null;
  workers: number;
  nodes: number;
  levels: number[] | null;
  reachableOnly: boolean;
  refine: number | null;
  /** --terrain and the flags passed on to the DEM reader. */
  terrain: string | null;
  demFlags: Flags;
  vehicle: VehicleFlags;
}

const DEM_FLAGS = ['--target-east-m', '--target-north-m', '--body-radius-m', '--origin-lat-deg', '--origin-lon-deg'];

function positive(flag: string, text: string, integer: boolean, max: number): number {
  const v = Number(text);
  if (!Number.isFinite(v) || v <= 0 || (integer && !Number.isInteger(v)) || v > max) {
    throw new UsageError(`${flag} ${text}: must be a ${integer ? 'whole number' : 'number'} from ${integer ? 1 : 'above 0'} to ${max}`);
  }
  return v;
}

function parseArgs(args: string[]): Options {
  const o: Options = {
    study: '',
    out: '',
    nx: 21,
    ny: 21,
    extent: null,
    reserve: null,
    workers: Math.min(8, Math.max(1, os.availableParallelism?.() ?? os.cpus().length)),
    nodes: FOOTPRINT_NODES,
    levels: null,
    reachableOnly: false,
    refine: null,
    terrain: null,
    demFlags: {},
    vehicle: {},
  };
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    const used = parseVehicleFlag(args, i, o.vehicle);
    if (used > 0) { i += used - 1; continue; }
    const value = () => {
      const v = args[++i];
      if (v === undefined || v.startsWith('--')) throw new UsageError(`${a} needs a value (see landreach footprint --help)`);
      return v;
    };
    try {
      if (a === '--out') o.out = value();
      else if (a === '--reachable-only') o.reachableOnly = true;
      else if (a === '--refine-boundary') {
        const t = value();
        const v = Number(t);
        if (!Number.isInteger(v) || v < 2 || v > 8) throw new UsageError(`--refine-boundary ${t}: must be a whole number from 2 to 8`);
        o.refine = v;
      }
      else if (a === '--grid') [o.nx, o.ny] = parseGridSize(value());
      else if (a === '--extent-m') o.extent = positive(a, value(), false, 1e6);
      else if (a === '--reserve-kg') {
        const t = value();
        const v = Number(t);
        if (!Number.isFinite(v) || v < 0) throw new UsageError(`--reserve-kg ${t}: must be zero or a positive mass in kg`);
        o.reserve = v;
      } else if (a === '--workers') o.workers = positive(a, value(), true, 64);
      else if (a === '--nodes') {
        const t = value();
        const v = Number(t);
        if (!Number.isInteger(v) || v < 5 || v > MAX_NODES) throw new UsageError(`--nodes ${t}: must be a whole number from 5 to ${MAX_NODES}`);
        o.nodes = v;
      }
      else if (a === '--levels') {
        const t = value();
        const v = t.split(',').map((x) => Number(x.trim()));
        if (!v.length || !v.every((x) => Number.isFinite(x) && x > 0)) throw new UsageError(`--levels ${t}: must be positive masses in kg separated by commas, e.g. 150,200,250`);
        o.levels = v.sort((x, y) => x - y);
      } else if (a === '--terrain') o.terrain = value();
      else if (DEM_FLAGS.includes(a)) o.demFlags[a.slice(2)] = value();
      else if (a.startsWith('--')) throw new UsageError(`unknown option '${a}' (see landreach footprint --help)`);
      else if (!o.study) o.study = a;
      else throw new UsageError(`unexpected argument '${a}': give one study file`);
    } catch (err) {
      if (err instanceof RangeError) throw new UsageError(err.message);
      throw err;
    }
  }
  if (!o.study) throw new UsageError('missing STUDY.json (usage: landreach footprint STUDY.json --out DIR)');
  if (!o.out) throw new UsageError('missing --out DIR (the folder for footprint.json, .csv, .geojson and .svg)');
  if (!o.terrain && Object.keys(o.demFlags).length) throw new UsageError(`--${Object.keys(o.demFlags)[0]} only applies with --terrain DEM`);
  return o;
}

/**
 * Grid half-width from the reach boundary (max-divert cone programs along 16 directions): 10 % beyond the
 * farthest reach, rounded up to 100 m, so the footprint shows its edge.
 */
export function autoExtent(study: Study, budget_kg: number, nodes: number, io: CliIo): number {
  let reach;
  try {
    reach = reachExtent(study, budget_kg, nodes);
  } catch (error) {
    if (error instanceof RangeError) throw new UsageError(error.message);
    throw error;
  }
  io.stderr(`grid extent ±${reach.extent_m} m (farthest reach ${reach.farthest_m.toFixed(0)} m along ${reach.directions} directions)\n`);
  return reach.extent_m;
}

/** Reads --terrain, places the nominal target on it and builds the longitude/latitude conversion. */
async function terrainPlacement(path: string, flags: Flags, body: string): Promise<{ target_m: [number, number]; lonLat: FootprintLonLat; place: FootprintPlace | null }> {
  try {
    // Placing the target needs the DEM's frame and CRS only: the GeoTIFF is opened, no heights are read
    // (a 50k × 50k DEM costs its header and directory).
    const opened = await openDem(path, flags, '--terrain');
    await opened.close();
    const [tE, tN] = nominalTargetOnDem(opened.frame, flags);
    const lonLat = footprintLonLat(opened.frame, [tE, tN], body, `--terrain ${path}`);
    if (!lonLat) throw new UsageError(`--terrain ${path}: has no georeference (no CRS), so there is no longitude/latitude to write; give a GeoTIFF with a CRS (gdal_translate -a_srs …)`);
    return { target_m: [tE, tN], lonLat, place: footprintPlace(opened.frame, [tE, tN], `--terrain ${path}`) };
  } catch (err) {
    if (err instanceof TerrainInputError) throw new UsageError(err.message);
    throw err;
  }
}

export const footprintCommand: CliCommand = {
  name: 'footprint',
  summary: 'divert footprint over a grid of targets: propellant map, contours, reserve boundary, report files',
  usage: USAGE,
  async run(args: string[], io: CliIo): Promise<number> {
    const o = parseArgs(args);
    const study: Study = readStudy(o.study, o.vehicle);
    const reserve = o.reserve ?? study.vehicle.propellantReserve_kg;
    const usable = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
    if (reserve >= usable) throw new UsageError(`--reserve-kg ${reserve}: must be below the usable propellant, ${usable} kg (wet minus dry mass)`);
    if (existsSync(o.out) && !statSync(o.out).isDirectory()) throw new UsageError(`--out ${o.out}: exists and is not a folder`);
    mkdirSync(o.out, { recursive: true });
    const budget = usable - reserve;
    if (o.reachableOnly && o.levels?.some((l) => l > budget)) {
      throw new UsageError(`--levels: ${o.levels.filter((l) => l > budget).join(', ')} kg above the budget ${budget} kg cannot be drawn with --reachable-only`);
    }
    const removed = removeOrphanTemporaries(o.out, [...OUTPUT_NAMES, manifestName('footprint')]);
    if (removed.length) io.stderr(`removed ${removed.length} temporary file(s) left in ${o.out} by an interrupted run: ${removed.join(', ')}\n`);
    const stop = new StopRequest(io).install();
    try {
      return await runFootprint(o, study, { reserve, usable, budget }, stop, io);
    } finally {
      stop.dispose();
    }
  },
};

const OUTPUT_NAMES = ['footprint.json', 'footprint.csv', 'footprint.geojson', 'footprint.svg', 'footprint.fg.json', 'footprint-propellant.tif', 'footprint-reachable.tif'];

async function runFootprint(o: Options, study: Study, mass: { reserve: number; usable: number; budget: number }, stop: StopRequest, io: CliIo): Promise<number> {
  const { reserve, usable, budget } = mass;
  const startedAt = new Date();
  // The terrain is read and its CRS checked before any computing, so a bad DEM costs nothing.
  const placement = o.terrain ? await terrainPlacement(o.terrain, o.demFlags, study.planet.body) : null;
  const extent = o.extent ?? autoExtent(study, budget, o.nodes, io);
  const grid = makeTargetGrid({ halfWidthEast_m: extent, halfWidthNorth_m: extent, nx: o.nx, ny: o.ny });
  const inputs = {
    study,
    grid: { nx: o.nx, ny: o.ny, extent_m: extent },
    nodes: o.nodes,
    reserve_kg: reserve,
    reachableOnly: o.reachableOnly,
    refineBoundary: o.refine,
    ...(placement ? { terrain: { path: o.terrain, nominalTargetOnDem_m: placement.target_m } } : {}),
  };
  const hash = await inputsHash(inputs);
  io.stderr(`footprint of '${study.name}': ${o.nx} × ${o.ny} targets, ±${extent} m, N = ${o.nodes}, ${o.workers} worker(s)\n`);
  const run = await runStudyFootprint(study, grid, {
    nodes: o.nodes,
    workers: o.workers,
    propellantBudget_kg: o.reachableOnly ? budget : undefined,
    refineBoundary: o.refine ? { factor: o.refine, level_kg: budget } : undefined,
    signal: stop.signal,
  }, io);
  if (io.interactive) io.stderr('\n');
  const field = run.field;
  // A stop during the boundary refinement also makes the result partial.
  const cancelled = run.cancelled || (run.refinement?.cancelled ?? false);
  const figures = footprintFigures(field, { usable_kg: usable, reserve_kg: reserve }, { cancelled }, o.levels ?? undefined, run.refinement);
  const { summary, levels_kg: levels, bands, reachable, divert: radius } = figures;
  const counts = summary;
  const solves = summary.solves;
  // The result files hold only what the inputs determine (the same bytes for the same inputs); the date,
  // the time taken and the worker count go to the manifest's run record.
  const caption = [
    `${study.name} — ${o.nx} × ${o.ny} targets, N = ${o.nodes}, reserve ${reserve} kg${cancelled ? ' — STOPPED EARLY: partial result' : ''}`,
    `Landreach ${APP_VERSION}, inputs ${hash.slice(0, 16)}`,
  ];
  const stoppedEarly = cancelled ? (partialResultLine(field)?.replace(/^# /, '') ?? 'STOPPED EARLY: the boundary refinement is partial') : null;
  const files = [
    { path: join(o.out, 'footprint.json'), text: footprintReport({ studyName: study.name, inputsHash: hash, inputs, summary, field, contourLevels_kg: levels }) },
    { path: join(o.out, 'footprint.csv'), text: footprintCsv(field, budget) },
    { path: join(o.out, 'footprint.geojson'), text: JSON.stringify(footprintGeoJson({ contours: bands, reachable, reserve_kg: reserve, lonLat: placement?.lonLat, stoppedEarly })) },
    {
      path: join(o.out, 'footprint.svg'),
      text: footprintMapSvg(field, figures, { title: `Divert footprint — ${study.name}`, caption }),
    },
    ...(placement?.place ? demCrsFiles(o.out, placement.place, placement.lonLat, { field, figures, reserve, budget, stoppedEarly, description: `${study.name}, inputs ${hash.slice(0, 16)}` }) : []),
  ];
  const manifest = writeOutputSet(files, {
    name: manifestName('footprint'),
    run: {
      status: cancelled ? 'stopped-early' : 'complete',
      stoppedBy: stop.signalName,
      command: 'footprint',
      inputsHash: hash,
      startedAt: startedAt.toISOString(),
      finishedAt: new Date().toISOString(),
      elapsed_s: Number(run.progress.elapsed_s.toFixed(2)),
      workers: o.workers,
      solver: solverKernelsLine(),
      targetsComputed: counts.targets - counts.pending,
      targets: counts.targets,
    },
  });
  io.stdout(
    [
      `status:      ${cancelled ? `stopped early${stop.signalName ? ` by ${stop.signalName}` : ''} (partial result written: ${counts.pending} targets not computed)` : 'complete'}`,
      `targets:     ${counts.reachable} reachable, ${counts.unreachable} unreachable, ${counts.failed} failed, ${counts.pending} not computed` +
        (counts.overBudget > 0 ? `, ${counts.overBudget} over budget (search stopped early)` : '') +
        (counts.relaxationGap > 0 ? `, ${counts.relaxationGap} with a relaxation gap (flyable or band-respecting cost above the certified lower bound)` : '') +
        ((counts.undecided ?? 0) > 0 ? `, ${counts.undecided} undecided (throttle band: lower bound within the budget, no band-respecting trajectory found within it)` : ''),
      ...(summary.betweenNodesMissed > 0
        ? [`warning:     ${summary.betweenNodesMissed} target(s) miss a constraint between their nodes in the dense re-simulation (see between_nodes in footprint.csv)`]
        : []),
      `budget:      ${budget.toFixed(1)} kg (usable ${usable} kg − reserve ${reserve} kg)`,
      `area:        ${(reachable.area_m2 / 1e6).toFixed(3)} km² reachable with the reserve kept` +
        (summary.boundaryRefinement
          ? ` (boundary refined ${summary.boundaryRefinement.factor}×: ${summary.boundaryRefinement.extraTargets} more targets; ${(summary.boundaryRefinement.unrefinedArea_m2 / 1e6).toFixed(3)} km² unrefined)`
          : ''),
      `divert:      ${radius.radius_m.toFixed(0)} m guaranteed in every direction${radius.limitedByGrid ? ' (limited by the grid: widen --extent-m)' : ''}`,
      `propellant:  ${summary.minPropellant_kg} … ${summary.maxPropellant_kg} kg over reachable targets`,
      `time:        ${run.progress.elapsed_s.toFixed(1)} s, ${solves} cone-program solves (${(solves / Math.max(1, run.progress.targetsDone)).toFixed(1)} per target)`,
      `solver:      ${solverKernelsLine()}`,
      `wrote:       ${[...files.map((f) => f.path), manifest].join(', ')}`,
      '',
      CAUTION,
      '',
    ].join('\n'),
  );
  if (stop.exitCode !== null) return stop.exitCode;
  return counts.failed > 0 && counts.reachable === 0 ? 1 : 0;
}

/** The footprint in the DEM's own projected CRS: JSON-FG beside the RFC 7946 file, and the two rasters. */
function demCrsFiles(
  out: string,
  place: FootprintPlace,
  lonLat: FootprintLonLat,
  r: { field: FootprintField; figures: FootprintFigures; reserve: number; budget: number; stoppedEarly: string | null; description: string },
) {
  const jsonFg = footprintJsonFg({ contours: r.figures.bands, reachable: r.figures.reachable, reserve_kg: r.reserve, place, lonLat, stoppedEarly: r.stoppedEarly });
  return [
    { path: join(out, 'footprint.fg.json'), text: JSON.stringify(jsonFg) },
    { path: join(out, 'footprint-propellant.tif'), bytes: () => footprintPropellantTiff(r.field, place, r.description) },
    { path: join(out, 'footprint-reachable.tif'), bytes: () => footprintReachableTiff(r.field, r.budget, place, r.description) },
  ];
}

/**
 * Which implementation of the cone solver the workers run (worker threads share this process's
 * WebAssembly support): the WebAssembly iteration, or the portable TypeScript fallback.
 */
export function solverKernelsLine(): string {
  return iterationModule()
    ? 'WebAssembly iteration (the portable TypeScript path gives the same results)'
    : 'portable TypeScript (WebAssembly with SIMD unavailable here: same results, about 5× slower)';
}
