/**
 * Terrain benchmark: hazard map (Horn slope, footprint plane fit + roughness, masks, distance
 * transform) for a 2048 × 2048 DEM at 1 m. Target: under 2 s and under 200 MB on the project machine.
 * Time: median of 3 runs in this process. Memory: a fresh child process does what `landreach hazard`
 * does — reads the DEM from a GeoTIFF file, runs one hazard map — and reports its peak resident set
 * (process.resourceUsage().maxRSS), so earlier suites do not inflate the figure. The figure includes
 * Node and tsx themselves (reported separately as the RSS before reading the DEM).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ElevationGrid } from '../../core/terrain/index.ts';
import { generateDemoTerrain, hazardMap, readGeoTiff, writeGeoTiff, gridRasterGeoreference } from '../../core/terrain/index.ts';

const SIZE = 2048;
const CHILD_FLAG = 'LANDREACH_TERRAIN_BENCH_CHILD';

function demoDem(): ElevationGrid {
  // The invented demo generator at 2048 × 2048, 1 m: plain, craters, ridges, boulders, escarpment.
  return generateDemoTerrain({ width: SIZE, height: SIZE, pixelSize_m: 1, craterCount: 900, boulderFieldCount: 12 }).grid;
}

function medianOf3(f: () => void): number {
  const t: number[] = [];
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    f();
    t.push(performance.now() - t0);
  }
  return t.sort((a, b) => a - b)[1];
}

/** Child mode: read the DEM file, one hazard map, then print memory figures as JSON. */
async function child(path: string): Promise<void> {
  const before = process.memoryUsage().rss;
  const grid = await readGeoTiff(new Uint8Array(readFileSync(path)));
  const map = hazardMap(grid);
  process.stdout.write(JSON.stringify({
    rssBefore_MB: before / 2 ** 20,
    peakRss_MB: process.resourceUsage().maxRSS / 1024,
    safeFraction: map.safeFraction,
  }));
}

export async function benchTerrain(): Promise<Record<string, number>> {
  const grid = demoDem();
  const hazard4 = medianOf3(() => hazardMap(grid)); // defaults: lander 4 m, max roughness
  const hazard10 = medianOf3(() => hazardMap(grid, { landerDiameter_m: 10 }));
  const hazardRms = medianOf3(() => hazardMap(grid, { roughnessMeasure: 'rms' }));
  const tif = writeGeoTiff({ width: SIZE, height: SIZE, data: grid.heights, georeference: gridRasterGeoreference(grid), noData: NaN });
  const t0 = performance.now();
  await readGeoTiff(tif);
  const read = performance.now() - t0;

  const dir = mkdtempSync(join(tmpdir(), 'landreach-bench-'));
  const demPath = join(dir, 'dem.tif');
  writeFileSync(demPath, tif);
  const r = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url)], {
    env: { ...process.env, [CHILD_FLAG]: demPath },
    encoding: 'utf8',
  });
  rmSync(dir, { recursive: true, force: true });
  if (r.status !== 0) throw new Error(`terrain bench child failed: ${r.stderr}`);
  const mem = JSON.parse(r.stdout) as Record<string, number>;
  const figures: Record<string, number> = {
    'hazard_2048sq_lander4m_ms': hazard4,
    'hazard_2048sq_lander10m_ms': hazard10,
    'hazard_2048sq_rms_ms': hazardRms,
    'read_geotiff_2048sq_ms': read,
    'peak_rss_MB': mem.peakRss_MB,
    'rss_node_tsx_baseline_MB': mem.rssBefore_MB,
    'peak_minus_baseline_MB': mem.peakRss_MB - mem.rssBefore_MB,
    'time_vs_target_2s': hazard4 / 2000,
    'rss_vs_target_200MB': mem.peakRss_MB / 200,
  };
  for (const [k, v] of Object.entries(figures)) console.log(`  terrain ${k}: ${v.toFixed(k.includes('vs_target') ? 3 : 1)}`);
  return figures;
}

const childPath = process.env[CHILD_FLAG];
if (childPath) await child(childPath);
