/**
 * Large DEMs, checked against GDAL 3.6 (Debian gdal-bin) reading the same files:
 * - a 20 000 × 20 000 tiled GeoTIFF (GDAL `gdal_create -co SPARSE_OK=TRUE`, Mars-sized equirectangular CRS,
 *   invented terrain written by `gdalwarp` into the tiles around the target): `landreach hazard --study`
 *   with a 5 × 5 footprint reads only the window the footprint needs, at full resolution; its window is the
 *   one the equirectangular projection's scale predicts, its heights are GDAL's (`gdal_translate -srcwin
 *   -of XYZ`), its Horn slope is `gdaldem slope` of the same pixels, and its memory is bounded (cells, bytes
 *   and blocks counted by the reader, bytes counted by a byte source the test owns); `trajectory --terrain`
 *   reads the window under the ground track; the app reads the full-resolution central 4096 × 4096 window;
 * - overview selection on a file with `gdaladdo` overviews: the level read is the one asked for and its
 *   heights are GDAL's own reading of that overview (`gdal_translate -ovr N`);
 * - block averaging on a file without overviews against `gdal_translate -outsize … -r average`;
 * - a geographic DEM's region reads share the whole file's frame, placed as `gdal_translate -srcwin` places them.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openSync, readSync, closeSync, fstatSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';
import { MAX_GRID_CELLS, openGeoTiff, type ByteSource, type ElevationGrid } from '../../../core/terrain/index.ts';
import { readTerrain } from '../../../renderer/terrain/terrain-product.ts';
import { gdal, gdalAvailable, gdalinfoJson, readXyz, tempDir, writeAsciiGrid } from './gdal.ts';

const tmp = tempDir();
afterAll(() => tmp.cleanup());
const STUDY = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));

// A Mars-sized sphere (R = 3 396 190 m, the IAU 2015 Mars equatorial radius the study notes use) in
// equirectangular metres: x = R λ, y = R φ (Snyder 1987, USGS PP 1395, eq. 12-1, 12-2, standard parallel 0).
const R = 3396190;
const CRS = `+proj=eqc +R=${R} +units=m +no_defs`;
const SIDE = 20000; // pixels
const PIXEL = 2; // m
const WEST = -20000, NORTH = 1220000; // the DEM spans x −20 km … +20 km, y 1180 … 1220 km (φ ≈ 20°)
const TILE = 256; // gdal_create's default tile size with TILED=YES
const TARGET: [number, number] = [1500, 1201000];
// Invented terrain written around the target: 1100 × 1100 pixels, corner at pixel (10200, 8950).
const T0C = 10200, T0R = 8950, TW = 1100;

/** Invented relief (metres) at pixel (c, r) of the written block: a hill, a bowl, a ramp and ripples. */
function relief(c: number, r: number): number {
  const x = (c - TW / 2) * PIXEL, y = (TW / 2 - r) * PIXEL;
  return 1500 + 60 * Math.exp(-((x - 150) ** 2 + (y + 100) ** 2) / (2 * 120 ** 2)) - 25 * Math.exp(-((x + 200) ** 2 + (y - 150) ** 2) / (2 * 60 ** 2))
    + 0.05 * x + 3 * Math.sin(x / 17) * Math.cos(y / 23);
}

/** Bytes of a file, a range at a time, counting what was asked for. */
function countingFileSource(path: string): { source: ByteSource; requested: () => number; close: () => void } {
  const fd = openSync(path, 'r');
  const size = fstatSync(fd).size;
  let requested = 0;
  return {
    source: {
      byteLength: size,
      read: async (offset, length) => {
        const n = Math.max(0, Math.min(length, size - offset));
        requested += n;
        const buf = new Uint8Array(n);
        readSync(fd, buf, 0, n, offset);
        return buf;
      },
    },
    requested: () => requested,
    close: () => closeSync(fd),
  };
}

/** Our grid against GDAL's XYZ dump of the same pixels: same centres, same values (float32) and no-data. */
function expectSameAsXyz(grid: ElevationGrid, xyz: { x: number; y: number; z: number }[], gdalNoData: number, tolerance: (z: number) => number = () => 0) {
  expect(xyz.length).toBe(grid.width * grid.height);
  let worst = 0;
  for (let k = 0; k < xyz.length; k++) {
    const c = k % grid.width, r = Math.floor(k / grid.width);
    const east = grid.originEast_m + (c + 0.5) * grid.pixelSizeX_m;
    const north = grid.originNorth_m - (r + 0.5) * grid.pixelSizeY_m;
    if (Math.abs(east - xyz[k].x) > 1e-6 || Math.abs(north - xyz[k].y) > 1e-6) throw new Error(`cell ${c},${r}: centre ${east},${north} but GDAL ${xyz[k].x},${xyz[k].y}`);
    const gdalNd = xyz[k].z === gdalNoData || Number.isNaN(xyz[k].z);
    if (gdalNd !== (grid.noData[k] === 1)) throw new Error(`cell ${c},${r}: no-data ${grid.noData[k]} but GDAL ${xyz[k].z}`);
    if (!gdalNd) {
      const d = Math.abs(grid.heights[k] - xyz[k].z);
      worst = Math.max(worst, d);
      if (d > tolerance(xyz[k].z)) throw new Error(`cell ${c},${r}: ${grid.heights[k]} but GDAL ${xyz[k].z}`);
    }
  }
  return worst;
}

describe.runIf(gdalAvailable())('a 20 000 × 20 000 tiled DEM (GDAL-made, sparse)', () => {
  const big = tmp.path('big.tif');
  beforeAll(() => {
    gdal('gdal_create', ['-q', '-of', 'GTiff', '-ot', 'Float32', '-outsize', String(SIDE), String(SIDE), '-bands', '1', '-a_srs', CRS,
      '-a_ullr', String(WEST), String(NORTH), String(WEST + SIDE * PIXEL), String(NORTH - SIDE * PIXEL), '-a_nodata', '-32768',
      '-co', 'TILED=YES', '-co', 'SPARSE_OK=TRUE', '-co', 'COMPRESS=DEFLATE', big]);
    const asc = tmp.path('relief.asc');
    writeAsciiGrid(asc, TW, TW, Float64Array.from({ length: TW * TW }, (_, k) => relief(k % TW, Math.floor(k / TW))));
    const west = WEST + T0C * PIXEL, north = NORTH - T0R * PIXEL;
    const small = tmp.path('relief.tif');
    gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', CRS, '-a_ullr', String(west), String(north), String(west + TW * PIXEL), String(north - TW * PIXEL), '-a_nodata', '-99999', asc, small]);
    // Same CRS and pixel grid: nearest-neighbour warping copies the pixels into the big file's tiles.
    gdal('gdalwarp', ['-q', '-r', 'near', small, big]);
  }, 60_000);

  it('hazard --study with a 5 × 5 footprint reads only the footprint window, at full resolution; slope matches gdaldem, memory is bounded', async () => {
    const out = tmp.path('hz');
    const h = captureIo();
    const code = await main(['hazard', big, '--out', out, '--study', STUDY, '--extent-m', '400', '--targets', '5x5', '--workers', '1',
      '--target-east-m', String(TARGET[0]), '--target-north-m', String(TARGET[1])], h.io);
    expect(code, h.err.join('')).toBe(0);
    const summary = JSON.parse(readFileSync(join(out, 'hazard-summary.json'), 'utf8'));
    const read = summary.input.read;
    const [c0, r0, c1, r1] = read.window as number[];
    // The window predicted from the projection: ±(extent + half a target spacing) = ±500 ground metres, one
    // ground metre east = 1/cos φ grid metres on the sphere's equirectangular projection (x = R λ), north = 1;
    // plus the hazard margin: lander radius 2 m (the study CLI's default lander, 4 m) + 0 safety margin +
    // two 2 m pixels = 6 m. Floor/ceil of the bounds: ±1 pixel.
    const phi = TARGET[1] / R;
    const halfE = 500 / Math.cos(phi) + 6, halfN = 500 + 6;
    const expected = [(TARGET[0] - halfE - WEST) / PIXEL, (NORTH - TARGET[1] - halfN) / PIXEL, (TARGET[0] + halfE - WEST) / PIXEL, (NORTH - TARGET[1] + halfN) / PIXEL];
    for (let i = 0; i < 4; i++) expect(Math.abs(read.window[i] - expected[i])).toBeLessThanOrEqual(1);
    expect(read.method).toBe('full resolution');
    expect([summary.input.width, summary.input.height]).toEqual([c1 - c0, r1 - r0]);
    expect(summary.input.pixelSizeX_m).toBe(PIXEL);
    // Memory: the grid is the window's cells (5 bytes each: Float32 height + Uint8 mask) and one 256 × 256
    // Float32 tile at a time; the tiles decoded are exactly those the window touches, of 79 × 79 = 6241.
    const tiles = (Math.ceil(c1 / TILE) - Math.floor(c0 / TILE)) * (Math.ceil(r1 / TILE) - Math.floor(r0 / TILE));
    expect(read.blocksDecoded + read.blocksSparse).toBe(tiles);
    expect(read.blocksSparse).toBe(0); // the window lies inside the written relief
    expect(read.cells).toBe((c1 - c0) * (r1 - r0));
    expect(read.cells).toBeLessThanOrEqual(MAX_GRID_CELLS);
    expect(read.gridBytes).toBe(read.cells * 5);
    expect(read.largestBlockBytes).toBe(TILE * TILE * 4);
    expect(read.workingBytes).toBeLessThanOrEqual(read.cells * 5 + 3 * TILE * TILE * 4);
    console.info(`20k × 20k DEM, 5 × 5 footprint ±400 m: window ${read.window.join(',')} (${c1 - c0} × ${r1 - r0} cells), ${read.workingBytes} bytes held by the read, ${read.blocksDecoded} of 6241 tiles decoded, ${read.bytesRead} bytes of tiles read`);
    // Hazards: the footprint ran over the window and the map has both safe and unsafe cells.
    expect(summary.safeReachable.footprintTargets).toEqual([5, 5]);
    expect(summary.results.safeCells).toBeGreaterThan(0);
    expect(summary.results.slopeHazardCells).toBeGreaterThan(0);
    // Horn slope over the window against gdaldem slope of the same pixels (Horn is gdaldem's default;
    // 0.01° as in gdal-slope.test.ts, far above float32 rounding of the slope, far below any limit).
    const win = tmp.path('win.tif');
    gdal('gdal_translate', ['-q', '-srcwin', String(c0), String(r0), String(c1 - c0), String(r1 - r0), big, win]);
    const refSlope = tmp.path('win-slope.tif');
    gdal('gdaldem', ['slope', '-q', win, refSlope]);
    const theirs = readXyz(refSlope, refSlope + '.xyz');
    const ours = readXyz(join(out, 'slope.tif'), tmp.path('our-slope.xyz'));
    expect(ours.length).toBe(theirs.length);
    let worst = 0, compared = 0;
    for (let k = 0; k < ours.length; k++) {
      expect(Math.abs(ours[k].x - theirs[k].x) + Math.abs(ours[k].y - theirs[k].y)).toBeLessThan(1e-6);
      const theirsNd = theirs[k].z === -9999;
      expect(Number.isNaN(ours[k].z)).toBe(theirsNd);
      if (!theirsNd) { worst = Math.max(worst, Math.abs(ours[k].z - theirs[k].z)); compared++; }
    }
    expect(compared).toBeGreaterThan(0.99 * (c1 - c0 - 2) * (r1 - r0 - 2));
    expect(worst).toBeLessThan(0.01);
  }, 60_000);

  it('a region read decodes only its tiles (bytes counted at the source) and its heights are GDAL\'s; the whole file is refused before any tile is read', async () => {
    const file = countingFileSource(big);
    try {
      const dem = await openGeoTiff(file.source, { sourceName: 'big.tif' });
      expect([dem.width, dem.height]).toEqual([SIDE, SIDE]);
      const opened = file.requested();
      // Reading all 400 M cells is refused on the sizes alone: no tile is read.
      await expect(dem.readPixels([0, 0, SIDE, SIDE])).rejects.toThrow(/is 20000 × 20000 = 400000000 cells, over the limit of 16777216 \(4096 × 4096, 83886080 bytes of grid\); pass a window/);
      expect(file.requested()).toBe(opened);
      const { grid, report } = await dem.readRegion({ west_m: TARGET[0] - 300, east_m: TARGET[0] + 300, south_m: TARGET[1] - 200, north_m: TARGET[1] + 200 });
      expect([grid.width, grid.height]).toEqual([300, 200]);
      // What the test's own source handed out: the header and directory (opened) plus the tiles' bytes the
      // reader reports, plus the tile offsets and byte counts it looked up (8 bytes per tile, generously).
      expect(file.requested() - opened).toBeLessThanOrEqual(report.bytesRead + 64 * report.blocksDecoded + 4096);
      expect(file.requested()).toBeLessThan(fstatSync(openSync(big, 'r')).size);
      const [c0, r0, c1, r1] = report.window;
      const srcwin = tmp.path('region.xyz');
      gdal('gdal_translate', ['-q', '-of', 'XYZ', '-srcwin', String(c0), String(r0), String(c1 - c0), String(r1 - r0), big, srcwin]);
      const ref = readFileSync(srcwin, 'utf8').trim().split('\n').map((l) => { const [x, y, z] = l.trim().split(/\s+/).map(Number); return { x, y, z }; });
      // Same stored float32 samples: equal.
      expectSameAsXyz(grid, ref, -32768);
    } finally {
      file.close();
    }
  }, 60_000);

  it('the app reads the full-resolution 4096 × 4096 window about the centre and says so; heights are GDAL\'s', async () => {
    const { grid, shownName } = await readTerrain(new Uint8Array(readFileSync(big)), 'big.tif', { pixelSize_m: null, heightScale_m: null });
    expect([grid.width, grid.height, grid.pixelSizeX_m]).toEqual([4096, 4096, PIXEL]);
    expect(shownName).toBe('big.tif (full-resolution window 4096 × 4096 about the centre of its 20000 × 20000)');
    const c0 = (SIDE - 4096) / 2;
    expect(grid.originEast_m).toBe(WEST + c0 * PIXEL);
    // A few pixels of the written relief and one never-written (no-data) pixel, as gdallocationinfo reads them.
    for (const [c, r] of [[T0C + 3, T0R + 5], [T0C + 600, T0R + 500], [T0C + TW - 1, T0R + TW - 1], [c0 + 5, c0 + 5]]) {
      const v = Number(gdal('gdallocationinfo', ['-valonly', big, String(c), String(r)]).trim());
      const k = (r - c0) * 4096 + (c - c0);
      if (v === -32768) expect(grid.noData[k]).toBe(1);
      else expect(grid.heights[k]).toBe(Math.fround(v)); // gdallocationinfo prints the float32 to 15 digits
    }
  }, 60_000);

  it('trajectory --terrain reads only the window under the ground track, from the ignition point to the target', async () => {
    const h = captureIo();
    const code = await main(['trajectory', STUDY, '--terrain', big, '--target-east-m', String(TARGET[0]), '--target-north-m', String(TARGET[1])], h.io);
    expect(code, h.err.join('')).toBe(0);
    const m = /read big\.tif window \[(\d+), (\d+), (\d+), (\d+)\] at full resolution: (\d+) × (\d+) cells .* (\d+) blocks decoded \((\d+) never written\)/.exec(h.err.join(''));
    expect(m, h.err.join('')).not.toBeNull();
    const [c0, r0, c1, r1, w, hh, decoded, sparse] = m!.slice(1).map(Number);
    expect([w, hh]).toEqual([c1 - c0, r1 - r0]);
    // The study's ignition point is 2500 m west and 400 m north of the target (ground metres): on the
    // equirectangular sphere 2500 / cos φ grid metres west, 400 north, plus the two-pixel margin.
    const phi = TARGET[1] / R;
    expect(c0).toBeLessThanOrEqual(Math.floor((TARGET[0] - 2500 / Math.cos(phi) - 2 * PIXEL - WEST) / PIXEL));
    expect(r0).toBeLessThanOrEqual(Math.floor((NORTH - TARGET[1] - 400 - 2 * PIXEL) / PIXEL));
    expect(c1).toBeGreaterThan((TARGET[0] - WEST) / PIXEL);
    expect(r1).toBeGreaterThan((NORTH - TARGET[1]) / PIXEL);
    expect(w * hh).toBeLessThanOrEqual(MAX_GRID_CELLS);
    expect(decoded + sparse).toBe((Math.ceil(c1 / TILE) - Math.floor(c0 / TILE)) * (Math.ceil(r1 / TILE) - Math.floor(r0 / TILE)));
  }, 60_000);

  it('refuses, naming the fix, a footprint window too large for full resolution and a whole-DEM hazard map', async () => {
    const h = captureIo();
    expect(await main(['hazard', big, '--out', tmp.path('too-large'), '--study', STUDY, '--extent-m', '5000', '--targets', '5x5', '--target-east-m', String(TARGET[0]), '--target-north-m', String(TARGET[1])], h.io)).toBe(2);
    expect(h.err.join('')).toMatch(/the footprint \(±5000 m, 5 × 5 targets\) with a 6\.000 m hazard margin needs \d+ × \d+ = \d+ cells at full resolution \(2 × 2 m\), over the memory bound of 16777216 cells .*give a smaller --extent-m \(about \d+ m or less here\)/);
    const h2 = captureIo();
    expect(await main(['hazard', big, '--out', tmp.path('whole')], h2.io)).toBe(2);
    expect(h2.err.join('')).toMatch(/'big\.tif' is 20000 × 20000 = 400000000 cells, over the memory bound of 16777216 cells .*--window C0,R0,C1,R1.*--study STUDY\.json \(with --extent-m M\)/);
  }, 60_000);
});

describe.runIf(gdalAvailable())('coarse reads: gdaladdo overviews and block averages', () => {
  const N = 512;
  const values = Float64Array.from({ length: N * N }, (_, k) => {
    const c = k % N, r = Math.floor(k / N);
    return 800 + 40 * Math.sin(c / 37) * Math.cos(r / 53) + 0.02 * c - 0.01 * r + 5 * Math.sin(c * r / 5000);
  });
  // No-data holes: one 8 × 8 block entirely (a 4 × 4 average cell with no data at all) and single pixels.
  for (let r = 200; r < 208; r++) for (let c = 200; c < 208; c++) values[r * N + c] = NaN;
  for (const [r, c] of [[151, 152], [255, 311], [256, 311], [350, 123]]) values[r * N + c] = NaN;
  const ullr = ['-a_ullr', '0', '100000', String(N * 2), String(100000 - N * 2)];

  it('picks the coarsest gdaladdo overview at least as fine as asked; its heights are GDAL\'s reading of that overview', async () => {
    const asc = tmp.path('ov.asc');
    writeAsciiGrid(asc, N, N, values);
    const tif = tmp.path('ov.tif');
    gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', CRS, ...ullr, '-a_nodata', '-99999', '-co', 'TILED=YES', asc, tif]);
    gdal('gdaladdo', ['-q', '-r', 'average', tif, '2', '4', '8']);
    const info = gdalinfoJson(tif);
    const ovs = (info.bands[0].overviews as { size: number[] }[]).map((o) => o.size);
    const dem = await openGeoTiff(new Uint8Array(readFileSync(tif)), { sourceName: 'ov.tif' });
    const levels = await dem.levels();
    // GDAL's overview sizes; pixel sizes the full extent over them (GDAL places overviews so).
    expect(levels.map((l) => [l.width, l.height])).toEqual([[N, N], ...ovs]);
    expect(levels.map((l) => l.pixelSizeX_m)).toEqual([2, 4, 8, 16]);
    const region = { west_m: 300, east_m: 900, south_m: 100000 - 850, north_m: 100000 - 200 };
    for (const [asked, level] of [[5, 1], [9, 2], [16, 3], [100, 3], [3.9, 0]] as const) {
      const { grid, report } = await dem.readRegion({ ...region, resolution: asked });
      expect(report.level, `asked ${asked} m`).toBe(level);
      if (asked === 100) { expect(report.decimation).toBe(6); continue; } // 16 m overview, 6 × 6 averaged → 96 m
      expect(report.decimation).toBe(1);
      const [c0, r0, c1, r1] = report.window;
      // GDAL's own reading of overview level − 1 (gdal_translate -ovr; its -srcwin would count full-resolution
      // pixels, so the overview is extracted whole first, then cut).
      const level1 = tmp.path(`ov-${level}.tif`);
      gdal('gdal_translate', ['-q', ...(level > 0 ? ['-ovr', String(level - 1)] : []), tif, level1]);
      const xyz = tmp.path(`ov-${level}.xyz`);
      gdal('gdal_translate', ['-q', '-of', 'XYZ', '-srcwin', String(c0), String(r0), String(c1 - c0), String(r1 - r0), level1, xyz]);
      const ref = readFileSync(xyz, 'utf8').trim().split('\n').map((l) => { const [x, y, z] = l.trim().split(/\s+/).map(Number); return { x, y, z }; });
      // The overview's stored float32 samples: equal; cell centres GDAL's to 1e-6 m.
      expectSameAsXyz(grid, ref, -99999);
    }
  }, 60_000);

  it('a geographic DEM: every region read shares the whole file\'s local frame (origin at the image centre), placed as GDAL places the pixels', async () => {
    const n = 64;
    const asc = tmp.path('geo.asc');
    writeAsciiGrid(asc, n, n, values.subarray(0, n * n));
    const tif = tmp.path('geo.tif');
    gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', 'EPSG:4326', '-a_ullr', '10', '20.064', '10.064', '20', '-a_nodata', '-99999', asc, tif]);
    const dem = await openGeoTiff(new Uint8Array(readFileSync(tif)), { sourceName: 'geo.tif' });
    const frame = dem.frame.georeference!.localFrame!;
    expect([frame.originLongitude_deg, frame.originLatitude_deg]).toEqual([10.032, 20.032]);
    const whole = (await dem.readPixels([0, 0, n, n])).grid;
    const { grid, report } = await dem.readRegion({ west_m: whole.originEast_m + 500, east_m: whole.originEast_m + 2000, south_m: whole.originNorth_m - 3000, north_m: whole.originNorth_m - 1000 });
    const [c0, r0] = report.window;
    // Same frame: the region's cells sit where the whole read's cells do, and carry their heights.
    expect(grid.georeference!.localFrame!.originLatitude_deg).toBe(20.032);
    expect(grid.originEast_m).toBeCloseTo(whole.originEast_m + c0 * whole.pixelSizeX_m, 6);
    expect(grid.originNorth_m).toBeCloseTo(whole.originNorth_m - r0 * whole.pixelSizeY_m, 6);
    for (let r = 0; r < grid.height; r++) for (let c = 0; c < grid.width; c++) expect(grid.heights[r * grid.width + c]).toBe(whole.heights[(r + r0) * n + c + c0]);
    // And its longitude/latitude corner is GDAL's (geotransform of the same pixel window, gdal_translate -srcwin).
    const cut = tmp.path('geo-cut.tif');
    gdal('gdal_translate', ['-q', '-srcwin', String(c0), String(r0), String(grid.width), String(grid.height), tif, cut]);
    const gt = gdalinfoJson(cut).geoTransform as number[];
    expect(grid.georeference!.geoTransform[0]).toBeCloseTo(gt[0], 12);
    expect(grid.georeference!.geoTransform[3]).toBeCloseTo(gt[3], 12);
  }, 60_000);

  it('without overviews, averages k × k pixels block by block as gdal_translate -outsize -r average does (no-data left out)', async () => {
    const asc = tmp.path('avg.asc');
    writeAsciiGrid(asc, N, N, values);
    const tif = tmp.path('avg.tif');
    gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', CRS, ...ullr, '-a_nodata', '-99999', asc, tif]); // strips
    const dem = await openGeoTiff(new Uint8Array(readFileSync(tif)), { sourceName: 'avg.tif' });
    expect((await dem.levels()).length).toBe(1);
    for (const k of [4, 3]) {
      const { grid, report } = await dem.readRegion({ west_m: 300, east_m: 950, south_m: 100000 - 750, north_m: 100000 - 275, resolution: 2 * k });
      expect([report.level, report.decimation, report.method]).toEqual([0, k, 'block average']);
      const [c0, r0, c1, r1] = report.window;
      expect((c1 - c0) % k).toBe(0);
      expect((r1 - r0) % k).toBe(0);
      expect([c0 % k, r0 % k]).toEqual([0, 0]);
      expect(report.gridBytes).toBe(grid.width * grid.height * 17);
      const xyz = tmp.path(`avg-${k}.xyz`);
      gdal('gdal_translate', ['-q', '-of', 'XYZ', '-srcwin', String(c0), String(r0), String(c1 - c0), String(r1 - r0), '-outsize', String((c1 - c0) / k), String((r1 - r0) / k), '-r', 'average', tif, xyz]);
      const ref = readFileSync(xyz, 'utf8').trim().split('\n').map((l) => { const [x, y, z] = l.trim().split(/\s+/).map(Number); return { x, y, z }; });
      // Both are means of the same float32 samples, accumulated in double and rounded to float32; the order
      // of summation differs, so the float32 results may differ by one unit in the last place (2⁻²³ relative).
      const worst = expectSameAsXyz(grid, ref, -99999, (z) => Math.abs(z) * 2 ** -23 * 1.01);
      expect(worst).toBeLessThan(1e-3);
      if (k === 4) {
        // The 8 × 8 hole is two by two whole cells with no data at all.
        let holes = 0;
        for (let i = 0; i < grid.noData.length; i++) holes += grid.noData[i];
        expect(holes).toBe(4);
      }
    }
  }, 60_000);
});
