/**
 * `landreach hazard DEM --out DIR …`: slope, roughness and hazard rasters (GeoTIFF) plus a JSON
 * summary for one elevation model. Reading and writing files happens here; the work is core/terrain.
 */
import { mkdir, access } from 'node:fs/promises';
import { basename, resolve, join } from 'node:path';
import { demReadLine, nominalTargetOnDem, num, openDem, parseFlagArgs, wholeDem, type Flags, type OpenedDem } from '../dem.ts';
import { autoExtent } from './footprint.ts';
import type { CliCommand, CliIo } from '../command.ts';
import { UsageError } from '../command.ts';
import type { DemReadReport, ElevationGrid, HazardLimits, HazardMap } from '../../terrain/index.ts';
import { CAUTION } from '../../study/provenance.ts';
import os from 'node:os';
import type { Study } from '../../study/index.ts';
import { manifestName, readStudy, removeOrphanTemporaries, writeOutputSet, type OutputFile } from '../files.ts';
import { StopRequest } from '../stop.ts';
import { hazardFootprintGeoJson } from '../hazardGeoJson.ts';
import { runStudyFootprint } from '../footprintRun.ts';
import { FOOTPRINT_NODES } from '../../footprint/studyFootprint.ts';
import { TARGET } from '../../footprint/field.ts';
import { parseGridSize, type TargetGrid } from '../../footprint/grid.ts';
import {
  DEFAULT_HAZARD_LIMITS, HAZARD_MARGIN, HAZARD_ROUGHNESS, HAZARD_SLOPE, HAZARD_UNKNOWN, TerrainInputError,
  gridGeometry, gridRasterGeoreference, hazardMap, toDegrees, validCount, writeGeoTiff,
  groundFrameOnDem, rankSites, resampleReachability, safeReachableSet, type GridSpec,
  GRID_BYTES_PER_CELL, MAX_GRID_CELLS, groundRegionOnDem, hazardMargin_m,
} from '../../terrain/index.ts';


const USAGE = `Usage: landreach hazard DEM --out DIR [options]

Reads an elevation model (single-band GeoTIFF, 16-bit greyscale PNG heightmap, or Landreach JSON grid)
and writes into DIR:
  slope.tif        Horn (1981) slope at DEM resolution, degrees (Float32; NaN at edges / next to no-data)
  footprint-slope.tif  slope of the plane fitted over the lander footprint, degrees (what the mask uses)
  roughness.tif    max (or RMS) residual above/below the plane fitted over the lander footprint, m
  hazard.tif       hazard flags (UInt8): 0 safe, +1 slope, +2 roughness, +4 unknown (no data or edge),
                   8 within the safety margin of a hazard
  hazard-summary.json   safe fraction, limits used, DEM metadata
  hazard.manifest.json  written last: each file's size and SHA-256 and the run record (landreach verify DIR)
Every file goes to a temporary that is flushed to disk and renamed into place; temporaries left by a
killed run are removed by the next one. Exit codes: 0 done, 1 computation failed, 2 bad input; with
--study, a footprint stopped by Ctrl-C / SIGTERM writes what finished and exits 130 / 143.

Options:
  --out DIR                 output folder (created if missing)                                  [required]
  --max-slope-deg S         largest footprint slope, degrees          (default ${DEFAULT_HAZARD_LIMITS.maxSlope_deg}, common practice)
  --max-roughness-m R       largest residual over the footprint, m    (default ${DEFAULT_HAZARD_LIMITS.maxRoughness_m}, common practice)
  --lander-diameter-m D     lander footprint diameter, m              (default ${DEFAULT_HAZARD_LIMITS.landerDiameter_m})
  --margin-m M              safety margin around hazards, m           (default ${DEFAULT_HAZARD_LIMITS.safetyMargin_m})
  --roughness max|rms       roughness measure                         (default max)
  --window C0,R0,C1,R1      read only this pixel window of a GeoTIFF
  --extent-m M              with --study: half-width of the footprint grid, m; only the DEM window it needs
                            (the grid's cells, plus the lander radius, the safety margin and two pixels) is
                            read and analysed, at full resolution. Default: the whole DEM when it has at most
                            4096 × 4096 cells, else the footprint command's reach-boundary extent. The
                            window must fit ${MAX_GRID_CELLS} cells (4096 × 4096) at full resolution.
  --body-radius-m R         body radius for geographic (degree) GeoTIFFs without one
  --origin-lat-deg A, --origin-lon-deg B
                            geographic GeoTIFFs: origin of the local east–north frame (default: grid centre)
  --vertical-scale K        GeoTIFF: metres per height unit (default: the file's VerticalUnitsGeoKey, else 1;
                            e.g. 0.3048 for heights stored in feet without saying so)
  --pixel-size-m P          PNG heightmaps: ground size of a pixel, m                            [PNG: required]
  --height-scale-m K        PNG heightmaps: metres per sample step                               [PNG: required]
  --height-offset-m Z       PNG heightmaps: height of sample 0, m     (default 0)
  --overwrite               replace output files that already exist
  --study STUDY.json        also the safe reachable set and ranked landing sites: the study's footprint is
                            computed over the DEM (reachable = minimum propellant within usable − reserve),
                            laid onto the DEM grid and intersected with the safe cells; writes
                            safe-reachable.tif and footprint.geojson (contours, reserve boundary and sites;
                            longitude/latitude for EPSG:4326, UTM-on-WGS 84 and spherical geographic DEMs,
                            local metres always) and adds "safeReachable" and "sites" to the summary
  --target-east-m E, --target-north-m N
                            with --study: DEM coordinates of the study's nominal target (default: DEM centre)
  --targets NXxNY           with --study: footprint targets over the DEM (default 21x21)
  --workers N               with --study: worker threads (default: the number of cores, at most 8)
  --sites K                 with --study: how many ranked sites (default 10)

${CAUTION}`;

const VALUE_FLAGS = new Set([
  'out', 'max-slope-deg', 'max-roughness-m', 'lander-diameter-m', 'margin-m', 'roughness', 'window',
  'body-radius-m', 'origin-lat-deg', 'origin-lon-deg', 'vertical-scale', 'pixel-size-m', 'height-scale-m', 'height-offset-m', 'study',
  'target-east-m', 'target-north-m', 'targets', 'workers', 'sites', 'extent-m',
]);
const BOOLEAN_FLAGS = new Set(['overwrite']);


async function exists(path: string): Promise<boolean> {
  try { await access(path); return true; } catch { return false; }
}


function stats(values: Float32Array, scale = 1) {
  let n = 0, sum = 0, max = -Infinity;
  for (const v of values) if (!Number.isNaN(v)) { n++; sum += v * scale; if (v * scale > max) max = v * scale; }
  return n === 0 ? { cells: 0, mean: null, max: null } : { cells: n, mean: sum / n, max };
}

export function hazardSummary(path: string, format: string, grid: ElevationGrid, map: HazardMap, given: HazardLimits) {
  const count = (bit: number) => map.flags.reduce((n, f) => n + (f & bit ? 1 : 0), 0);
  const deg = 180 / Math.PI;
  const valid = validCount(grid);
  return {
    tool: 'landreach hazard',
    caution: CAUTION,
    input: {
      path,
      format,
      ...gridGeometry(grid),
      validCells: valid,
      noDataCells: grid.width * grid.height - valid,
      georeference: grid.georeference ?? null,
    },
    limits: {
      ...map.limits,
      defaulted: (Object.keys(map.limits) as (keyof HazardLimits)[]).filter((k) => given[k] === undefined),
      note: 'Default slope and roughness limits are common practice for small landers, not a published requirement.',
    },
    results: {
      safeFraction: map.safeFraction,
      safeCells: map.safeCells,
      safeArea_m2: map.safeCells * map.cellArea_m2,
      slopeHazardCells: count(HAZARD_SLOPE),
      roughnessHazardCells: count(HAZARD_ROUGHNESS),
      unknownCells: count(HAZARD_UNKNOWN),
      marginCells: count(HAZARD_MARGIN),
      roughnessAssessed: map.roughnessAssessed,
      hornSlope_deg: stats(map.slope_rad, deg),
      footprintSlope_deg: stats(map.footprintSlope_rad, deg),
      roughness_m: stats(map.roughness_m),
    },
    outputs: { slope: 'slope.tif', footprintSlope: 'footprint-slope.tif', roughness: 'roughness.tif', hazard: 'hazard.tif' },
    hazardCodes: { 0: 'safe', 1: 'slope', 2: 'roughness', 4: 'unknown (no data or footprint off the grid)', 8: 'within the safety margin' },
  };
}

async function run(args: string[], io: CliIo): Promise<number> {
  const { positional, flags } = parseFlagArgs(args, VALUE_FLAGS, BOOLEAN_FLAGS, 'landreach hazard');
  if (positional.length !== 1) throw new UsageError(`expected one DEM file, got ${positional.length} (see landreach hazard --help)`);
  if (typeof flags.out !== 'string') throw new UsageError('--out DIR is required');
  const study = typeof flags.study === 'string' ? readStudy(flags.study) : null;
  if (!study) {
    for (const f of ['target-east-m', 'target-north-m', 'targets', 'workers', 'sites', 'extent-m']) {
      if (flags[f] !== undefined) throw new UsageError(`--${f} only applies with --study STUDY.json`);
    }
  }
  const demPath = resolve(positional[0]);
  const outDir = resolve(flags.out);
  const roughness = flags.roughness;
  if (roughness !== undefined && roughness !== 'max' && roughness !== 'rms') throw new UsageError(`--roughness: '${String(roughness)}' must be max or rms`);
  const limits: HazardLimits = {
    maxSlope_deg: num(flags, 'max-slope-deg'),
    maxRoughness_m: num(flags, 'max-roughness-m'),
    landerDiameter_m: num(flags, 'lander-diameter-m'),
    safetyMargin_m: num(flags, 'margin-m'),
    roughnessMeasure: roughness as 'max' | 'rms' | undefined,
  };
  const files = {
    slope: join(outDir, 'slope.tif'),
    footprintSlope: join(outDir, 'footprint-slope.tif'),
    roughness: join(outDir, 'roughness.tif'),
    hazard: join(outDir, 'hazard.tif'),
    summary: join(outDir, 'hazard-summary.json'),
    safeReachable: join(outDir, 'safe-reachable.tif'),
    geojson: join(outDir, 'footprint.geojson'),
  };
  const manifestPath = join(outDir, manifestName('hazard'));
  const outputs = [...Object.values(files).filter((f) => study || (f !== files.safeReachable && f !== files.geojson)), manifestPath];
  if (outputs.includes(demPath)) throw new UsageError(`--out would overwrite the input DEM '${demPath}'; choose another folder`);
  if (!flags.overwrite) {
    for (const p of outputs) if (await exists(p)) throw new UsageError(`'${p}' already exists; pass --overwrite to replace it or choose another --out`);
  }
  const removed = removeOrphanTemporaries(outDir, [...Object.values(files), manifestPath].map((f) => basename(f)));
  if (removed.length) io.stderr(`removed ${removed.length} temporary file(s) left in ${outDir} by an interrupted run: ${removed.join(', ')}\n`);
  const startedAt = new Date();
  const stop = new StopRequest(io).install();
  try {
    io.stderr(`reading ${demPath}\n`);
    const opened = await openDem(demPath, flags);
    let demRead: { grid: ElevationGrid; target_m: [number, number]; extent_m: number | null; report: DemReadReport | null; what: string | null };
    try {
      demRead = await hazardGrid(opened, study, flags, limits, io);
    } finally {
      await opened.close();
    }
    const { grid } = demRead;
    const format = opened.format;
    io.stderr(`${grid.width} × ${grid.height} cells at ${grid.pixelSizeX_m} × ${grid.pixelSizeY_m} m; computing hazard map\n`);
    const map = hazardMap(grid, limits);
    const geo = gridRasterGeoreference(grid);
    await mkdir(outDir, { recursive: true });
    const common = { width: grid.width, height: grid.height, georeference: geo };
    // Rasters are encoded when written (one at a time); the whole set goes out through writeOutputSet:
    // flushed temporaries renamed into place, then the manifest (files.ts).
    const out: OutputFile[] = [
      { path: files.slope, bytes: () => writeGeoTiff({ ...common, data: toDegrees(map.slope_rad), noData: NaN, description: 'Horn (1981) slope, degrees' }) },
      { path: files.footprintSlope, bytes: () => writeGeoTiff({ ...common, data: toDegrees(map.footprintSlope_rad), noData: NaN, description: `footprint-plane slope over ${map.limits.landerDiameter_m} m, degrees` }) },
      { path: files.roughness, bytes: () => writeGeoTiff({ ...common, data: map.roughness_m, noData: NaN, description: `footprint roughness (${map.limits.roughnessMeasure}), metres` }) },
      { path: files.hazard, bytes: () => writeGeoTiff({ ...common, data: map.flags, description: 'hazard flags: 0 safe, 1 slope, 2 roughness, 4 unknown, 8 margin' }) },
    ];
    const summary: Record<string, unknown> = hazardSummary(demPath, format, grid, map, limits);
    if (demRead.report) {
      (summary.input as Record<string, unknown>).read = {
        region: demRead.what,
        demSize: [opened.frame.width, opened.frame.height],
        ...demRead.report,
        memoryBound: `a read builds at most ${MAX_GRID_CELLS} cells (4096 × 4096): ${MAX_GRID_CELLS * GRID_BYTES_PER_CELL} bytes of heights and mask at full resolution, plus one block at a time`,
      };
    }
    let cancelled = false;
    if (study) {
      const reach = await studyReach(study, grid, map, flags, io, stop.signal, demRead.target_m, demRead.extent_m);
      cancelled = reach.summary.footprintCancelled;
      out.push({ path: files.safeReachable, bytes: () => writeGeoTiff({ ...common, data: reach.safe.mask, description: 'safe and reachable (1) with the reserve kept' }) });
      summary.safeReachable = reach.summary;
      summary.sites = reach.sites;
      (summary.outputs as Record<string, string>).safeReachable = 'safe-reachable.tif';
      (summary.outputs as Record<string, string>).footprintGeoJson = 'footprint.geojson';
      const sites = reach.sites.map(({ east_m, north_m, propellant_kg, height_m, hazardDistance_m, footprintSlope_deg, roughness_m }) => ({
        east_m,
        north_m,
        properties: { propellant_kg, height_m, hazardDistance_m: Number.isFinite(hazardDistance_m) ? hazardDistance_m : null, footprintSlope_deg, roughness_m },
      }));
      out.push({ path: files.geojson, text: hazardFootprintGeoJson(study, grid, reach.field, reach.target_m, sites, io, cancelled) });
      io.stdout(`safe and reachable: ${(reach.safe.area_m2 / 1e6).toFixed(4)} km² (${reach.safe.cells} cells); best site ${reach.sites[0] ? `${reach.sites[0].east_m.toFixed(0)} m east, ${reach.sites[0].north_m.toFixed(0)} m north, ${reach.sites[0].propellant_kg.toFixed(1)} kg` : 'none'}\n`);
    }
    out.push({ path: files.summary, text: JSON.stringify(summary, null, 2) + '\n' });
    writeOutputSet(out, {
      name: manifestName('hazard'),
      run: {
        status: cancelled ? 'stopped-early' : 'complete',
        stoppedBy: stop.signalName,
        command: 'hazard',
        startedAt: startedAt.toISOString(),
        finishedAt: new Date().toISOString(),
      },
    });
    io.stdout(`safe fraction ${(100 * map.safeFraction).toFixed(2)} % (${map.safeCells} of ${grid.width * grid.height} cells); wrote ${outDir}\n`);
    if (!map.roughnessAssessed) io.stderr('note: the DEM is coarser than half the lander diameter, so roughness was not assessed\n');
    return stop.exitCode ?? 0;
  } catch (err) {
    if (err instanceof TerrainInputError) throw new UsageError(err.message);
    throw err;
  } finally {
    stop.dispose();
  }
}

function targetCounts(flags: Flags): [number, number] {
  if (typeof flags.targets !== 'string') return [21, 21];
  try {
    return parseGridSize(flags.targets, '--targets');
  } catch (err) {
    throw new UsageError((err as Error).message);
  }
}

/**
 * The grid the hazard map is computed on. With --study and --extent-m, or with --study on a GeoTIFF over
 * MAX_GRID_CELLS: only the window the footprint needs — its target grid's cells (±extent plus half a
 * spacing) mapped onto the DEM through the ground frame, widened by the hazard margin (dem-region.ts) — at
 * full resolution, decoding only the blocks under it; a window over the bound is refused naming
 * --extent-m. Otherwise the whole DEM (a GeoTIFF over the bound is refused naming the options).
 */
async function hazardGrid(opened: OpenedDem, study: Study | null, flags: Flags, limits: HazardLimits, io: CliIo) {
  const { frame } = opened;
  const target_m = nominalTargetOnDem(frame, flags);
  const tooLarge = frame.width * frame.height > MAX_GRID_CELLS;
  if (!study || (flags['extent-m'] === undefined && !(tooLarge && opened.dem))) {
    const grid = await wholeDem(opened, study ? 'give --extent-m M (the footprint grid\'s half-width) to read only the window the footprint needs, or --window C0,R0,C1,R1' : 'pass --window C0,R0,C1,R1 to read a part of it, or --study STUDY.json (with --extent-m M) to read the window a footprint needs');
    return { grid, target_m, extent_m: null, report: null, what: null };
  }
  const extent_m = flags['extent-m'] !== undefined ? num(flags, 'extent-m')! : autoExtent(study, study.vehicle.wetMass_kg - study.vehicle.dryMass_kg - study.vehicle.propellantReserve_kg, FOOTPRINT_NODES, io);
  if (!(extent_m > 0)) throw new UsageError(`--extent-m ${extent_m}: must be a distance in metres > 0`);
  const [nx, ny] = targetCounts(flags);
  const halfCellE = extent_m / (nx - 1);
  const halfCellN = extent_m / (ny - 1);
  const ground = groundFrameOnDem(frame.georeference, target_m, 'DEM');
  const margin = hazardMargin_m(frame, limits.landerDiameter_m ?? DEFAULT_HAZARD_LIMITS.landerDiameter_m, limits.safetyMargin_m ?? DEFAULT_HAZARD_LIMITS.safetyMargin_m);
  const region = groundRegionOnDem(ground, { west_m: -extent_m - halfCellE, east_m: extent_m + halfCellE, south_m: -extent_m - halfCellN, north_m: extent_m + halfCellN }, margin);
  const what = `the footprint (±${extent_m} m, ${nx} × ${ny} targets) with a ${margin.toPrecision(4)} m hazard margin`;
  if (!opened.dem) {
    // PNG heightmaps and JSON grids are read whole (at most MAX_GRID_CELLS).
    return { grid: opened.grid!, target_m, extent_m, report: null, what };
  }
  const pixel = Math.max(frame.pixelSizeX_m, frame.pixelSizeY_m);
  const largest = Math.floor((Math.sqrt(MAX_GRID_CELLS) * pixel) / 2 / Math.max(ground.scale, 1e-12) - margin - Math.max(halfCellE, halfCellN));
  const read = await opened.dem.readRegion({
    ...region,
    resolution: 'native',
    what,
    fix: `hazards are computed at the DEM's full resolution (${pixel} m pixels): give a smaller --extent-m (about ${Math.max(largest, 0)} m or less here), or resample the DEM coarser first (gdalwarp -tr)`,
  });
  io.stderr(demReadLine(opened.name, read.report, read.grid));
  return { grid: read.grid, target_m, extent_m, report: read.report, what };
}

/**
 * The study's footprint over the DEM: targets on a grid covering the DEM (in the study's frame, the nominal
 * target at the given DEM coordinates), reachable = minimum propellant ≤ usable − reserve, laid onto the
 * DEM grid (conservatively), intersected with the safe cells, and the best sites ranked.
 */
export async function studyReach(study: Study, grid: ElevationGrid, map: HazardMap, flags: Flags, io: CliIo, signal: AbortSignal, target_m: [number, number], extent_m: number | null) {
  const geom = gridGeometry(grid);
  const [tE, tN] = target_m;
  const [nx, ny] = targetCounts(flags);
  const workers = flags.workers === undefined ? Math.min(8, Math.max(1, os.availableParallelism?.() ?? os.cpus().length)) : num(flags, 'workers')!;
  if (!Number.isInteger(workers) || workers < 1 || workers > 64) throw new UsageError(`--workers ${workers}: must be a whole number from 1 to 64`);
  const count = flags.sites === undefined ? 10 : num(flags, 'sites')!;
  // Target centres span ±extent about the nominal target (the DEM window was read around them), or the
  // DEM's cell centres, in the study frame (east, north of the nominal target).
  const west = extent_m !== null ? -extent_m : grid.originEast_m + grid.pixelSizeX_m / 2 - tE;
  const east = extent_m !== null ? extent_m : grid.originEast_m + (grid.width - 0.5) * grid.pixelSizeX_m - tE;
  const south = extent_m !== null ? -extent_m : grid.originNorth_m - (grid.height - 0.5) * grid.pixelSizeY_m - tN;
  const north = extent_m !== null ? extent_m : grid.originNorth_m - grid.pixelSizeY_m / 2 - tN;
  const targets: TargetGrid = {
    nx,
    ny,
    east: Float64Array.from({ length: nx }, (_, i) => west + ((east - west) * i) / (nx - 1)),
    north: Float64Array.from({ length: ny }, (_, j) => south + ((north - south) * j) / (ny - 1)),
    spacingEast_m: (east - west) / (nx - 1),
    spacingNorth_m: (north - south) / (ny - 1),
  };
  const usable = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
  const budget = usable - study.vehicle.propellantReserve_kg;
  io.stderr(`footprint of '${study.name}' over the DEM: ${nx} × ${ny} targets (${extent_m !== null ? `±${extent_m} m` : `${(geom.width * geom.pixelSizeX_m).toFixed(0)} × ${(geom.height * geom.pixelSizeY_m).toFixed(0)} m`})\n`);
  const run = await runStudyFootprint(study, targets, { nodes: FOOTPRINT_NODES, workers, signal }, io);
  // The footprint's rows run south → north; the terrain's grid rows north → south.
  const n = nx * ny;
  const reachable = new Uint8Array(n);
  const propellant = new Float32Array(n).fill(NaN);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const src = j * nx + i;
      const dst = (ny - 1 - j) * nx + i;
      const ok = run.field.status[src] === TARGET.reachable && run.field.propellant_kg[src] <= budget;
      reachable[dst] = ok ? 1 : 0;
      if (ok) propellant[dst] = run.field.propellant_kg[src];
    }
  }
  const spec: GridSpec = {
    width: nx,
    height: ny,
    pixelSizeX_m: targets.spacingEast_m,
    pixelSizeY_m: targets.spacingNorth_m,
    originEast_m: west - targets.spacingEast_m / 2,
    originNorth_m: north + targets.spacingNorth_m / 2,
  };
  // The footprint is in ground metres from the target; on a UTM DEM the grid is rotated and scaled from
  // them (meridian convergence, point scale: groundFrame.ts). Elsewhere the map is a plain shift.
  const ground = groundFrameOnDem(grid.georeference, [tE, tN], 'DEM');
  const onDem = resampleReachability({ width: nx, height: ny, reachable, propellant_kg: propellant }, spec, grid, ground.fromDem);
  const safe = safeReachableSet(map, onDem);
  const sites = rankSites(grid, map, onDem, { count }).map((site) => {
    const [east_m, north_m] = ground.fromDem(site.east_m, site.north_m);
    return { ...site, east_m, north_m, frame: 'study (m east, north of the nominal target)' };
  });
  return {
    safe,
    sites,
    field: run.field,
    target_m: [tE, tN] as const,
    summary: {
      study: study.name,
      budget_kg: budget,
      reserve_kg: study.vehicle.propellantReserve_kg,
      nominalTargetOnDem_m: [tE, tN],
      footprintTargets: [nx, ny],
      ...(extent_m !== null ? { footprintExtent_m: extent_m } : {}),
      footprintNodes: FOOTPRINT_NODES,
      footprintCancelled: run.cancelled,
      reachableCells: safe.reachableCells,
      safeReachableCells: safe.cells,
      safeReachableArea_m2: safe.area_m2,
      note: "Targets are solved on the nominal target's height plane; local relief changes the propellant little at these altitudes, but is not modelled here.",
    },
  };
}

export const hazardCommand: CliCommand = {
  name: 'hazard',
  summary: 'slope, roughness and hazard rasters (GeoTIFF) and a JSON summary for an elevation model',
  usage: USAGE,
  run,
};
