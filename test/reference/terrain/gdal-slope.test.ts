/**
 * Horn (1981) slope against GDAL's `gdaldem slope` (GDAL 3.6, Debian gdal-bin; Horn is its default
 * algorithm) on a synthetic DEM that GDAL itself writes (gdal_translate from an ASCII grid).
 * Requirement: max |ours − GDAL| < 0.01° over every cell where either gives a value, and the same
 * cells without a value. Edge handling compared in both of gdaldem's modes.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { hornSlope, readGeoTiff, toDegrees } from '../../../core/terrain/index.ts';
import { main } from '../../../core/cli/main.ts';
import { gdal, gdalAvailable, gdalinfoJson, readXyz, tempDir, writeAsciiGrid } from './gdal.ts';

const tmp = tempDir();
afterAll(() => tmp.cleanup());

// Synthetic terrain in pixel units: two hills, a paraboloid bowl, a ramp, small ripples, and no-data holes.
const W = 120, H = 90;
const values = new Float64Array(W * H);
for (let r = 0; r < H; r++) for (let c = 0; c < W; c++) {
  const x = c, y = r;
  values[r * W + c] =
    500 + 40 * Math.exp(-((x - 30) ** 2 + (y - 25) ** 2) / 300) + 25 * Math.exp(-((x - 85) ** 2 + (y - 60) ** 2) / 150) +
    0.01 * ((x - 60) ** 2 + (y - 45) ** 2) * (Math.hypot(x - 60, y - 45) < 20 ? 1 : 0) + 0.3 * x + 2 * Math.sin(x / 3) * Math.cos(y / 4);
}
for (const [r, c] of [[10, 10], [40, 70], [41, 70], [0, 50], [89, 119]]) values[r * W + c] = NaN;

async function compare(pixelX: number, pixelY: number, computeEdges: boolean) {
  const asc = tmp.path('dem.asc');
  const dem = tmp.path(`dem-${pixelX}-${pixelY}.tif`);
  const out = tmp.path(`slope-${pixelX}-${pixelY}-${computeEdges}.tif`);
  writeAsciiGrid(asc, W, H, values);
  // -a_ullr gives the pixel size (possibly non-square); EPSG:32633 is a projected CRS in metres.
  gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', 'EPSG:32633', '-a_ullr', '400000', '5000000', String(400000 + W * pixelX), String(5000000 - H * pixelY), asc, dem]);
  gdal('gdaldem', ['slope', '-q', ...(computeEdges ? ['-compute_edges'] : []), dem, out]);
  const grid = await readGeoTiff(new Uint8Array(readFileSync(dem)));
  expect([grid.pixelSizeX_m, grid.pixelSizeY_m]).toEqual([pixelX, pixelY]);
  const ours = toDegrees(hornSlope(grid, computeEdges ? 'extrapolate' : 'no-data'));
  const ref = await readGeoTiff(new Uint8Array(readFileSync(out))); // gdaldem writes nodata −9999
  let worst = 0, compared = 0, mismatchedNoData = 0;
  for (let k = 0; k < W * H; k++) {
    const a = ours[k], b = ref.heights[k];
    if (Number.isNaN(a) !== Number.isNaN(b)) { mismatchedNoData++; continue; }
    if (Number.isNaN(a)) continue;
    compared++;
    worst = Math.max(worst, Math.abs(a - b));
  }
  return { worst, compared, mismatchedNoData };
}

describe.runIf(gdalAvailable())('Horn slope vs gdaldem slope (GDAL 3.6)', () => {
  it('square pixels, default edges (no slope on the outer ring or next to no-data)', async () => {
    const r = await compare(2, 2, false);
    expect(r.mismatchedNoData).toBe(0);
    expect(r.compared).toBeGreaterThan((W - 2) * (H - 2) - 60);
    expect(r.worst).toBeLessThan(0.01); // degrees: the requirement
  });

  it('non-square pixels (3 m × 5 m), default edges', async () => {
    const r = await compare(3, 5, false);
    expect(r.mismatchedNoData).toBe(0);
    expect(r.worst).toBeLessThan(0.01);
  });

  it("gdaldem -compute_edges = our 'extrapolate' edges (linear extrapolation, no-data neighbours take the centre)", async () => {
    const r = await compare(2, 2, true);
    expect(r.mismatchedNoData).toBe(0);
    expect(r.compared).toBe(W * H - 5); // every valid cell has a slope, edges included
    expect(r.worst).toBeLessThan(0.01);
  });

  it('end to end: `landreach hazard` output read by GDAL matches gdaldem slope cell for cell, with the DEM\'s CRS', async () => {
    await compare(2, 2, false); // writes dem-2-2.tif and GDAL's slope-2-2-false.tif
    const out = tmp.path('cli-out');
    const quiet = { stdout: () => undefined, stderr: () => undefined, interactive: false };
    expect(await main(['hazard', tmp.path('dem-2-2.tif'), '--out', out], quiet)).toBe(0);
    const info = gdalinfoJson(`${out}/slope.tif`);
    expect(info.geoTransform).toEqual([400000, 2, 0, 5000000, 0, -2]);
    expect(JSON.stringify(info.coordinateSystem)).toMatch(/32633/);
    const ours = readXyz(`${out}/slope.tif`, `${out}/slope.xyz`);
    const ref = readXyz(tmp.path('slope-2-2-false.tif'), tmp.path('ref.xyz'));
    expect(ours.length).toBe(ref.length);
    let worst = 0;
    ours.forEach((p, k) => {
      expect([p.x, p.y]).toEqual([ref[k].x, ref[k].y]);
      const refMissing = ref[k].z === -9999; // gdaldem's nodata
      expect(Number.isNaN(p.z)).toBe(refMissing);
      if (!refMissing) worst = Math.max(worst, Math.abs(p.z - ref[k].z));
    });
    expect(worst).toBeLessThan(0.01); // degrees
    expect(gdalinfoJson(`${out}/hazard.tif`).bands[0].type).toBe('Byte');
  });
});
