/**
 * GeoTIFF reading checked against GDAL 3.6 (Debian gdal-bin): files written by gdal_translate /
 * gdal_create, and the values and pixel-centre coordinates GDAL itself reports (gdal_translate -of XYZ).
 * Also checks that GDAL reads back what our writer produces (gdalinfo -json, XYZ values).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import type { ElevationGrid } from '../../../core/terrain/index.ts';
import { TerrainInputError, cellEast, cellNorth, readGeoTiff, readPngHeightmap, writeGeoTiff } from '../../../core/terrain/index.ts';
import { gdal, gdalAvailable, gdalinfoJson, readXyz, tempDir, writeAsciiGrid } from './gdal.ts';

const tmp = tempDir();
afterAll(() => tmp.cleanup());
const bytes = (p: string) => new Uint8Array(readFileSync(p));

const W = 23, H = 17;
const values = Float64Array.from({ length: W * H }, (_, k) => 100 + 3.25 * (k % W) - 1.5 * Math.floor(k / W) + 0.001 * k);
values[5] = NaN;
values[W * 4 + 9] = NaN;

function makeTif(name: string, options: string[], vals: ArrayLike<number> = values, noData = -99999): string {
  const asc = tmp.path(`${name}.asc`);
  const tif = tmp.path(`${name}.tif`);
  writeAsciiGrid(asc, W, H, vals, noData);
  gdal('gdal_translate', ['-q', '-a_srs', 'EPSG:32633', '-a_ullr', '350000', '4800000', String(350000 + 2 * W), String(4800000 - 3 * H), ...options, asc, tif]);
  return tif;
}

/** Our grid against GDAL's XYZ dump: same cell centres (in the file's CRS) and values; nodata cells flagged. */
function expectMatchesXyz(grid: ElevationGrid, tif: string, gdalNoData: number) {
  const xyz = readXyz(tif, tif + '.xyz');
  expect(xyz.length).toBe(grid.width * grid.height);
  for (let k = 0; k < xyz.length; k++) {
    const c = k % grid.width, r = Math.floor(k / grid.width);
    expect(cellEast(grid, c)).toBeCloseTo(xyz[k].x, 6);
    expect(cellNorth(grid, r)).toBeCloseTo(xyz[k].y, 6);
    const gdalIsNoData = Number.isNaN(gdalNoData) ? Number.isNaN(xyz[k].z) : xyz[k].z === gdalNoData || Math.fround(xyz[k].z) === Math.fround(gdalNoData);
    expect(grid.noData[k]).toBe(gdalIsNoData ? 1 : 0);
    if (!gdalIsNoData) expect(grid.heights[k]).toBeCloseTo(xyz[k].z, 3);
  }
}

describe.runIf(gdalAvailable())('GeoTIFFs written by GDAL', () => {
  it('Int16 with nodata −32768', async () => {
    const tif = makeTif('int16', ['-ot', 'Int16', '-a_nodata', '-32768'], values.map((v) => (Number.isNaN(v) ? NaN : Math.round(v))), -32768);
    const g = await readGeoTiff(bytes(tif));
    expect([g.width, g.height, g.pixelSizeX_m, g.pixelSizeY_m]).toEqual([W, H, 2, 3]);
    expect(g.georeference?.projectedEpsg).toBe(32633);
    expectMatchesXyz(g, tif, -32768);
  });

  it('Float32 with a nodata value that float32 cannot hold exactly (0.1), compared after Math.fround', async () => {
    const vals = values.map((v) => (Number.isNaN(v) ? 0.1 : v));
    const tif = makeTif('f32', ['-ot', 'Float32', '-a_nodata', '0.1'], vals, -99999);
    const g = await readGeoTiff(bytes(tif));
    expect(g.noData[5]).toBe(1);
    expect(g.noData[W * 4 + 9]).toBe(1);
    expect(g.noData[6]).toBe(0);
    expectMatchesXyz(g, tif, 0.1);
  });

  it('Float32 with nodata "nan", deflate-compressed, tiled 16 × 16 with a float predictor, and window reads', async () => {
    // gdalwarp (no reprojection) turns the −99999 cells into real NaN values with nodata "nan".
    const src = makeTif('nan-src', ['-ot', 'Float32', '-a_nodata', '-99999']);
    const tif = tmp.path('nan.tif');
    gdal('gdalwarp', ['-q', '-overwrite', '-srcnodata', '-99999', '-dstnodata', 'nan', '-tr', '2', '3', '-te', '350000', String(4800000 - 3 * H), String(350000 + 2 * W), '4800000', '-co', 'COMPRESS=DEFLATE', '-co', 'PREDICTOR=3', '-co', 'TILED=YES', '-co', 'BLOCKXSIZE=16', '-co', 'BLOCKYSIZE=16', src, tif]);
    const g = await readGeoTiff(bytes(tif));
    expect(g.width).toBe(W);
    const info = gdalinfoJson(tif);
    expect(String(info.bands[0].noDataValue)).toMatch(/nan/i);
    expectMatchesXyz(g, tif, NaN);
    // Window [3, 2, 20, 15): origin moves by 3 columns and 2 rows.
    const win = await readGeoTiff(bytes(tif), { window: [3, 2, 20, 15] });
    expect([win.width, win.height]).toEqual([17, 13]);
    expect(win.originEast_m).toBe(350000 + 3 * 2);
    expect(win.originNorth_m).toBe(4800000 - 2 * 3);
    for (let r = 0; r < 13; r++) for (let c = 0; c < 17; c++) {
      const full = g.heights[(r + 2) * W + c + 3], part = win.heights[r * 17 + c];
      expect(Number.isNaN(full) ? Number.isNaN(part) : part === full).toBe(true);
    }
  });

  it('LZW (our bounded decoder) with the horizontal predictor, in strips, and Float32 LZW tiled', async () => {
    const ints = makeTif('lzw16', ['-ot', 'Int16', '-a_nodata', '-32768', '-co', 'COMPRESS=LZW', '-co', 'PREDICTOR=2', '-co', 'BLOCKYSIZE=5'], values.map((v) => (Number.isNaN(v) ? NaN : Math.round(v * 10))), -32768);
    expectMatchesXyz(await readGeoTiff(bytes(ints)), ints, -32768);
    const floats = makeTif('lzw32', ['-ot', 'Float32', '-a_nodata', '-99999', '-co', 'COMPRESS=LZW', '-co', 'TILED=YES', '-co', 'BLOCKXSIZE=16', '-co', 'BLOCKYSIZE=16']);
    expectMatchesXyz(await readGeoTiff(bytes(floats)), floats, -99999);
  });

  it('LERC (lossless here), ZSTD and LERC_ZSTD read GDAL\'s values; JPEG is refused with the fix', async () => {
    const lerc = makeTif('lerc', ['-ot', 'Float32', '-a_nodata', '-99999', '-co', 'COMPRESS=LERC', '-co', 'MAX_Z_ERROR=0']);
    expectMatchesXyz(await readGeoTiff(bytes(lerc)), lerc, -99999);
    const zstd = makeTif('zstd', ['-ot', 'Float32', '-a_nodata', '-99999', '-co', 'COMPRESS=ZSTD', '-co', 'PREDICTOR=3']);
    expectMatchesXyz(await readGeoTiff(bytes(zstd)), zstd, -99999);
    const lercZstd = makeTif('lerc-zstd', ['-ot', 'Float32', '-a_nodata', '-99999', '-co', 'COMPRESS=LERC_ZSTD', '-co', 'MAX_Z_ERROR=0']);
    expectMatchesXyz(await readGeoTiff(bytes(lercZstd)), lercZstd, -99999);
    const jpeg = makeTif('jpeg', ['-ot', 'Byte', '-scale', '-co', 'COMPRESS=JPEG']);
    await expect(readGeoTiff(bytes(jpeg))).rejects.toThrow(/compression 7/);
  });

  it('PixelIsPoint: the tiepoint names a pixel centre; cell centres match GDAL', async () => {
    const tif = makeTif('point', ['-ot', 'Float32', '-a_nodata', '-99999', '-mo', 'AREA_OR_POINT=Point']);
    const info = gdalinfoJson(tif);
    expect(JSON.stringify(info.metadata)).toMatch(/"AREA_OR_POINT":"Point"/);
    const g = await readGeoTiff(bytes(tif));
    expectMatchesXyz(g, tif, -99999);
  });

  it('geographic EPSG:4326 DEM with non-square degree pixels → local east–north frame, checked with PROJ', async () => {
    // 0.001° × 0.0005° pixels around 45° N. Reference: GDAL's gdaltransform (PROJ) to an equirectangular
    // projection on a sphere of WGS 84's semi-major axis with standard parallel = the frame origin.
    const asc = tmp.path('geo.asc');
    writeAsciiGrid(asc, W, H, values);
    const tif = tmp.path('geo.tif');
    const west = 7.0, north = 45.0 + 0.0005 * H / 2, east = west + 0.001 * W, south = 45.0 - 0.0005 * H / 2;
    gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_nodata', '-99999', '-a_srs', 'EPSG:4326', '-a_ullr', String(west), String(north), String(east), String(south), asc, tif]);
    const g = await readGeoTiff(bytes(tif));
    const lf = g.georeference?.localFrame;
    expect(lf?.bodyRadius_m).toBe(6378137);
    expect(lf?.originLatitude_deg).toBeCloseTo(45, 9);
    const proj = `+proj=eqc +lat_ts=${lf!.originLatitude_deg} +lat_0=${lf!.originLatitude_deg} +lon_0=${lf!.originLongitude_deg} +R=6378137 +units=m`;
    // Pixel centres of the corners and one interior cell, lon/lat → metres by PROJ.
    const cells = [[0, 0], [W - 1, 0], [0, H - 1], [W - 1, H - 1], [11, 7]];
    const lonlat = cells.map(([c, r]) => `${west + (c + 0.5) * 0.001} ${north - (r + 0.5) * 0.0005}`).join('\n') + '\n';
    const out = gdal('gdaltransform', ['-s_srs', 'EPSG:4326', '-t_srs', proj], lonlat); // gdaltransform reads lon lat
    const xy = out.trim().split('\n').map((l) => l.trim().split(/\s+/).map(Number));
    cells.forEach(([c, r], i) => {
      expect(cellEast(g, c)).toBeCloseTo(xy[i][0], 3); // mm
      expect(cellNorth(g, r)).toBeCloseTo(xy[i][1], 3);
    });
    expect(g.pixelSizeX_m / g.pixelSizeY_m).toBeCloseTo((0.001 * Math.cos(Math.PI / 4)) / 0.0005, 9);
  });

  it('geographic DEM on a sphere of radius 1 737 400 m (GDAL writes GeogSemiMajorAxisGeoKey): that radius is used', async () => {
    const asc = tmp.path('sphere.asc');
    writeAsciiGrid(asc, W, H, values);
    const tif = tmp.path('sphere.tif');
    gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_nodata', '-99999', '-a_srs', '+proj=longlat +R=1737400 +no_defs', '-a_ullr', '20', String(0.01 * H), String(20 + 0.01 * W), '0', asc, tif]);
    const g = await readGeoTiff(bytes(tif), { originLatitude_deg: 0, originLongitude_deg: 20 });
    expect(g.georeference?.localFrame?.bodyRadius_m).toBe(1737400);
    // At the equator a 0.01° pixel spans R·0.01·π/180 both ways.
    expect(g.pixelSizeX_m).toBeCloseTo((1737400 * 0.01 * Math.PI) / 180, 6);
    expect(g.pixelSizeY_m).toBeCloseTo((1737400 * 0.01 * Math.PI) / 180, 6);
    expect(g.originEast_m).toBe(0);
    expect(g.originNorth_m).toBeCloseTo((1737400 * 0.01 * H * Math.PI) / 180, 6);
    await expect(readGeoTiff(bytes(tif), { bodyRadius_m: -1 })).rejects.toThrow('invalid bodyRadius_m: -1');
  });

  it('projected CRS in US survey feet (EPSG:2227, ProjLinearUnitsGeoKey 9003): pixel sizes in metres', async () => {
    const asc = tmp.path('ft.asc');
    writeAsciiGrid(asc, W, H, values);
    const tif = tmp.path('ft.tif');
    gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_nodata', '-99999', '-a_srs', 'EPSG:2227', '-a_ullr', '6000000', '2000000', String(6000000 + 10 * W), String(2000000 - 10 * H), asc, tif]);
    const g = await readGeoTiff(bytes(tif));
    // 1 US survey foot = 1200/3937 m exactly (US survey foot definition, NIST).
    expect(g.pixelSizeX_m).toBeCloseTo((10 * 1200) / 3937, 12);
    expect(g.originEast_m).toBeCloseTo((6000000 * 1200) / 3937, 6);
    expect(g.georeference?.geoTransform).toEqual([6000000, 10, 0, 2000000, 0, -10]);
  });

  it('reads band 1 of multi-band files (pixel- and band-interleaved), as GDAL\'s XYZ output does', async () => {
    for (const interleave of ['PIXEL', 'BAND']) {
      const multi = makeTif(`multi-${interleave}`, ['-ot', 'Float32', '-a_nodata', '-99999', '-b', '1', '-b', '1', '-b', '1', '-co', `INTERLEAVE=${interleave}`, '-co', 'COMPRESS=ZSTD']);
      expectMatchesXyz(await readGeoTiff(bytes(multi)), multi, -99999);
    }
  });

  it('refuses alpha-band, rotated, enormous and all-nodata files with a clear message', async () => {
    const alpha = makeTif('alpha', ['-ot', 'Byte', '-scale', '-b', '1', '-b', '1', '-co', 'ALPHA=YES']);
    await expect(readGeoTiff(bytes(alpha))).rejects.toThrow(/band 2 is an alpha band.*gdal_translate -b 1 -a_nodata/);

    const vrt = tmp.path('rot.vrt');
    const base = makeTif('rot-src', ['-ot', 'Float32']);
    writeFileSync(vrt, `<VRTDataset rasterXSize="${W}" rasterYSize="${H}"><GeoTransform>350000, 2, 0.5, 4800000, 0.5, -3</GeoTransform>
  <VRTRasterBand dataType="Float32" band="1"><SimpleSource><SourceFilename relativeToVRT="0">${base}</SourceFilename><SourceBand>1</SourceBand></SimpleSource></VRTRasterBand></VRTDataset>`);
    const rot = tmp.path('rot.tif');
    gdal('gdal_translate', ['-q', vrt, rot]);
    await expect(readGeoTiff(bytes(rot))).rejects.toThrow(/rotated or sheared ModelTransformation/);

    const huge = tmp.path('huge.tif');
    gdal('gdal_create', ['-q', '-of', 'GTiff', '-outsize', '100000', '100000', '-ot', 'Float32', '-co', 'SPARSE_OK=TRUE', '-co', 'TILED=YES', '-a_srs', 'EPSG:32633', '-a_ullr', '0', '100000', '100000', '0', huge]);
    await expect(readGeoTiff(bytes(huge))).rejects.toThrow(/over the limit of 16777216 .*pass a window/);
    const w = await readGeoTiff(bytes(huge), { window: [5000, 5000, 5064, 5032] });
    expect([w.width, w.height, w.originEast_m, w.originNorth_m]).toEqual([64, 32, 5000, 95000]);

    const empty = tmp.path('empty.tif');
    gdal('gdal_create', ['-q', '-of', 'GTiff', '-outsize', '10', '10', '-ot', 'Int16', '-burn', '-9999', '-a_nodata', '-9999', '-a_srs', 'EPSG:32633', '-a_ullr', '0', '10', '10', '0', empty]);
    await expect(readGeoTiff(bytes(empty))).rejects.toThrow(/every cell is no-data/);

    const truncated = bytes(makeTif('trunc', ['-ot', 'Float32', '-co', 'COMPRESS=DEFLATE', '-co', 'TILED=YES', '-co', 'BLOCKXSIZE=16', '-co', 'BLOCKYSIZE=16']));
    await expect(readGeoTiff(truncated.subarray(0, Math.floor(truncated.length * 0.6)))).rejects.toThrow(TerrainInputError);
  });
});

describe.runIf(gdalAvailable())('16-bit PNG heightmaps written by GDAL', () => {
  it('samples match GDAL\'s own values (gdal_translate -of PNG -ot UInt16, then XYZ of the PNG)', async () => {
    const tif = makeTif('png-src', ['-ot', 'UInt16'], values.map((v, k) => (Number.isNaN(v) ? 0 : Math.round(v * 300 + (k % 7) * 1000))), -1);
    const png = tmp.path('height.png');
    gdal('gdal_translate', ['-q', '-of', 'PNG', '-ot', 'UInt16', tif, png]);
    const g = await readPngHeightmap(bytes(png), { pixelSize_m: 2, heightScale_m: 0.01, heightOffset_m: -50 });
    const xyz = readXyz(png, png + '.xyz');
    expect(xyz.length).toBe(W * H);
    // GDAL carries the source nodata (−1, clamped to 0 for UInt16) into the PNG as a tRNS grey value.
    const noData = gdalinfoJson(png).bands[0].noDataValue;
    expect(noData).toBe(0);
    let maxSample = 0, noDataCells = 0;
    xyz.forEach((p, k) => {
      maxSample = Math.max(maxSample, p.z);
      if (p.z === noData) { noDataCells++; expect(g.noData[k]).toBe(1); }
      else expect(g.heights[k]).toBeCloseTo(-50 + 0.01 * p.z, 3);
    });
    expect(noDataCells).toBe(2);
    expect(maxSample).toBeGreaterThan(255); // really 16-bit content
  });
});

describe.runIf(gdalAvailable())('GeoTIFFs written by our writer, read by GDAL', () => {
  it('Float32 slope-style raster: size, geotransform, CRS, nodata and values', () => {
    const data = Float32Array.from({ length: 12 * 7 }, (_, k) => (k === 10 ? NaN : k * 0.37 - 5));
    const path = tmp.path('ours.tif');
    writeFileSync(path, writeGeoTiff({ width: 12, height: 7, data, noData: NaN, georeference: { geoTransform: [1000, 2.5, 0, 9000, 0, -4], projectedEpsg: 32633 }, description: 'test' }));
    const info = gdalinfoJson(path);
    expect(info.size).toEqual([12, 7]);
    expect(info.geoTransform).toEqual([1000, 2.5, 0, 9000, 0, -4]);
    expect(info.bands[0].type).toBe('Float32');
    expect(String(info.bands[0].noDataValue)).toMatch(/nan/i);
    expect(JSON.stringify(info.coordinateSystem)).toMatch(/"ID\[\\"EPSG\\",32633\]|EPSG\\",32633/);
    const xyz = readXyz(path, path + '.xyz');
    xyz.forEach((p, k) => {
      expect(p.x).toBeCloseTo(1000 + ((k % 12) + 0.5) * 2.5, 9);
      expect(p.y).toBeCloseTo(9000 - (Math.floor(k / 12) + 0.5) * 4, 9);
      if (k === 10) expect(Number.isNaN(p.z)).toBe(true);
      else expect(p.z).toBeCloseTo(data[k], 5);
    });
  });

  it('UInt8 hazard-style raster in a local frame without a CRS', () => {
    const data = Uint8Array.from({ length: 300 * 200 }, (_, k) => k % 9);
    const path = tmp.path('ours8.tif');
    writeFileSync(path, writeGeoTiff({ width: 300, height: 200, data, georeference: { geoTransform: [0, 1, 0, 0, 0, -1] } }));
    const info = gdalinfoJson(path);
    expect(info.bands[0].type).toBe('Byte');
    expect(info.geoTransform).toEqual([0, 1, 0, 0, 0, -1]);
    // Multi-strip file (64 KiB strips): every value back through GDAL.
    const asc = tmp.path('ours8.asc');
    gdal('gdal_translate', ['-q', '-of', 'AAIGrid', path, asc]);
    const numbers = readFileSync(asc, 'utf8').trim().split('\n').slice(5).join(' ').trim().split(/\s+/).map(Number);
    expect(numbers).toEqual(Array.from(data));
  });
});
