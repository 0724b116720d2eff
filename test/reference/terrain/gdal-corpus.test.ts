/**
 * A corpus of GeoTIFFs written by GDAL 3.6's GTiff driver, read by our reader and by GDAL itself
 * (python3-gdal, ReadAsArray of band 1): every sample type GDAL 3.6 writes for elevation (Byte, signed
 * byte, UInt16, Int16, UInt32, Int32, Float32, Float64) × compression (none, Deflate, LZW, PackBits, LERC,
 * LERC_DEFLATE, ZSTD, LERC_ZSTD) × predictor (none, horizontal, floating point) × byte order × strips or
 * tiles, plus BigTIFF, sparse files, multi-band files (band 1 read, pixel- and band-interleaved) and the
 * no-data conventions. Each file must read with GDAL's heights and no-data mask (`judge` in
 * dem-oracle.ts), or be refused with the documented message (an alpha band, which GDAL uses as band 1's
 * mask).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { GdalOracle, gdalPythonAvailable, judge, readOurs, type GdalWrite } from './dem-oracle.ts';
import { tempDir } from './gdal.ts';

const W = 37, H = 23; // not multiples of the 16 × 16 tiles or 7-row strips: partial blocks on both edges
const GT = [500000, 2, 0, 4200000, 0, -3];

const TYPES: { name: string; gdal: string; lo: number; hi: number; extra?: string[]; float?: boolean }[] = [
  { name: 'Byte', gdal: 'Byte', lo: 0, hi: 255 },
  { name: 'Int8', gdal: 'Byte', lo: -128, hi: 127, extra: ['PIXELTYPE=SIGNEDBYTE'] },
  { name: 'UInt16', gdal: 'UInt16', lo: 0, hi: 65535 },
  { name: 'Int16', gdal: 'Int16', lo: -32768, hi: 32767 },
  { name: 'UInt32', gdal: 'UInt32', lo: 0, hi: 4294967295 },
  { name: 'Int32', gdal: 'Int32', lo: -2147483648, hi: 2147483647 },
  { name: 'Float32', gdal: 'Float32', lo: -8000, hi: 9000, float: true },
  { name: 'Float64', gdal: 'Float64', lo: -1e7, hi: 1e7, float: true },
];

/** Terrain-like values over the type's whole range, both extremes included (wrap-around in the predictor). */
function valuesFor(t: (typeof TYPES)[number]): number[] {
  return Array.from({ length: W * H }, (_, k) => {
    if (k === 0) return t.lo;
    if (k === 1) return t.hi;
    const c = k % W, r = Math.floor(k / W);
    const f = 0.5 + 0.45 * Math.sin(c / 5) * Math.cos(r / 4);
    const v = t.lo + f * (t.hi - t.lo);
    return t.float ? v + 0.123 * ((k * 7) % 11) : Math.round(v);
  });
}

const CODECS: { name: string; options: string[]; predictors: number[]; types?: string[] }[] = [
  { name: 'none', options: [], predictors: [1] },
  { name: 'DEFLATE', options: ['COMPRESS=DEFLATE'], predictors: [1, 2, 3] },
  { name: 'LZW', options: ['COMPRESS=LZW'], predictors: [1, 2, 3] },
  { name: 'PACKBITS', options: ['COMPRESS=PACKBITS'], predictors: [1] },
  { name: 'LERC', options: ['COMPRESS=LERC', 'MAX_Z_ERROR=0'], predictors: [1] },
  { name: 'LERC_DEFLATE', options: ['COMPRESS=LERC_DEFLATE', 'MAX_Z_ERROR=0'], predictors: [1], types: ['Float32', 'Int16'] },
  { name: 'ZSTD', options: ['COMPRESS=ZSTD'], predictors: [1, 2, 3] },
  { name: 'ZSTD22', options: ['COMPRESS=ZSTD', 'ZSTD_LEVEL=22'], predictors: [2], types: ['Int16', 'Float64'] },
  { name: 'LERC_ZSTD', options: ['COMPRESS=LERC_ZSTD', 'MAX_Z_ERROR=0'], predictors: [1], types: ['Float32', 'Int16', 'Byte'] },
];

interface Case { name: string; write: GdalWrite; refused?: RegExp }

function corpus(dir: (n: string) => string): Case[] {
  const cases: Case[] = [];
  for (const t of TYPES) {
    const values = valuesFor(t);
    for (const codec of CODECS) {
      if (codec.types && !codec.types.includes(t.name)) continue;
      for (const predictor of codec.predictors) {
        if (predictor === 3 && !t.float) continue;
        for (const endian of ['LITTLE', 'BIG']) {
          for (const layout of ['strips', 'tiles']) {
            const name = `${t.name}-${codec.name}-p${predictor}-${endian}-${layout}`;
            const options = [...codec.options, ...(t.extra ?? []), `ENDIANNESS=${endian}`, ...(predictor > 1 ? [`PREDICTOR=${predictor}`] : []),
              ...(layout === 'tiles' ? ['TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=16'] : ['BLOCKYSIZE=7'])];
            // GDAL 3.6 cannot read back its own big-endian Float64 files with Predictor 3: refused (tiff-blocks.ts).
            const refused = t.name === 'Float64' && predictor === 3 && endian === 'BIG' ? /big-endian Float64 with the floating-point predictor/ : undefined;
            cases.push({ name, refused, write: { path: dir(`${name}.tif`), type: t.gdal, width: W, height: H, values, options, srs: 'EPSG:32633', geotransform: GT } });
          }
        }
      }
    }
  }
  const f32 = valuesFor(TYPES[6]);
  const i16 = valuesFor(TYPES[3]);
  const holes = [5, 40, 41, 300, W * H - 1];
  const base = { width: W, height: H, srs: 'EPSG:32633', geotransform: GT };
  const more: Case[] = [
    // No-data conventions.
    { name: 'nodata-nan', write: { ...base, path: dir('nd-nan.tif'), type: 'Float32', values: f32, nan: holes, nodata: NaN, options: ['COMPRESS=DEFLATE', 'PREDICTOR=3'] } },
    { name: 'nodata-0.1-float32-inexact', write: { ...base, path: dir('nd-01.tif'), type: 'Float32', values: f32.map((v, k) => (holes.includes(k) ? 0.1 : v)), nodata: 0.1 } },
    { name: 'nodata-lowest-float32', write: { ...base, path: dir('nd-lowest.tif'), type: 'Float32', values: f32.map((v, k) => (holes.includes(k) ? -3.4028234663852886e38 : v)), nodata: -3.4028234663852886e38 } },
    { name: 'nodata-int16-sentinel', write: { ...base, path: dir('nd-i16.tif'), type: 'Int16', values: i16.map((v, k) => (holes.includes(k) ? -32768 : v)), nodata: -32768, options: ['COMPRESS=LZW', 'PREDICTOR=2', 'ENDIANNESS=BIG'] } },
    { name: 'nodata-float64-nan-none-set', write: { ...base, path: dir('nd-f64.tif'), type: 'Float64', values: f32, nan: holes } },
    { name: 'nodata-lerc-nan', write: { ...base, path: dir('nd-lerc.tif'), type: 'Float32', values: f32, nan: holes, nodata: NaN, options: ['COMPRESS=LERC', 'MAX_Z_ERROR=0', 'TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=16'] } },
    // BigTIFF.
    { name: 'bigtiff-int32-lzw-tiles', write: { ...base, path: dir('big1.tif'), type: 'Int32', values: valuesFor(TYPES[5]), options: ['BIGTIFF=YES', 'COMPRESS=LZW', 'PREDICTOR=2', 'TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=16'] } },
    { name: 'bigtiff-float64-deflate-be-strips', write: { ...base, path: dir('big2.tif'), type: 'Float64', values: valuesFor(TYPES[7]), options: ['BIGTIFF=YES', 'COMPRESS=DEFLATE', 'PREDICTOR=2', 'ENDIANNESS=BIG', 'BLOCKYSIZE=5'] } },
    { name: 'bigtiff-float32-deflate-be-tiles', write: { ...base, path: dir('big3.tif'), type: 'Float32', values: f32, options: ['BIGTIFF=YES', 'COMPRESS=DEFLATE', 'PREDICTOR=3', 'ENDIANNESS=BIG', 'TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=16'] } },
    // Sparse files: omitted blocks read as the no-data value, or 0 without one (GDAL's rule).
    ...sparse(dir, base, f32, i16),
    // Several bands: band 1 is the elevation, as GDAL reads it; pixel- and band-interleaved, every codec
    // family, no-data shared by the bands (GDAL_NODATA applies to all of them).
    ...bands(dir, base, f32, i16),
  ];
  return [...cases, ...more];
}

function bands(dir: (n: string) => string, base: Omit<GdalWrite, 'path' | 'type' | 'values'>, f32: number[], i16: number[]): Case[] {
  const holes = [5, 40, 41, 300, W * H - 1];
  const tiles = ['TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=16'];
  const i16nd = i16.map((v, k) => (holes.includes(k) ? -9999 : Math.max(-30000, Math.min(29000, v))));
  return [
    { name: 'three-bands-pixel-deflate-p2', write: { ...base, path: dir('b1.tif'), type: 'Int16', values: i16nd, nodata: -9999, bands: 3, options: ['INTERLEAVE=PIXEL', 'COMPRESS=DEFLATE', 'PREDICTOR=2', 'BLOCKYSIZE=7'] } },
    { name: 'two-bands-band-none', write: { ...base, path: dir('b2.tif'), type: 'Float32', values: f32, bands: 2, options: ['INTERLEAVE=BAND'] } },
    { name: 'two-bands-band-zstd-p3-tiles-nan', write: { ...base, path: dir('b3.tif'), type: 'Float32', values: f32, nan: holes, nodata: NaN, bands: 2, options: ['INTERLEAVE=BAND', 'COMPRESS=ZSTD', 'PREDICTOR=3', ...tiles] } },
    { name: 'four-bands-pixel-lzw-p3-be-tiles', write: { ...base, path: dir('b4.tif'), type: 'Float32', values: f32, bands: 4, options: ['INTERLEAVE=PIXEL', 'COMPRESS=LZW', 'PREDICTOR=3', 'ENDIANNESS=BIG', ...tiles] } },
    { name: 'two-bands-pixel-lerc', write: { ...base, path: dir('b5.tif'), type: 'Float32', values: f32, bands: 2, options: ['INTERLEAVE=PIXEL', 'COMPRESS=LERC', 'MAX_Z_ERROR=0', ...tiles] } },
    { name: 'two-bands-band-lerc-zstd-nan', write: { ...base, path: dir('b6.tif'), type: 'Float32', values: f32, nan: holes, nodata: NaN, bands: 2, options: ['INTERLEAVE=BAND', 'COMPRESS=LERC_ZSTD', 'MAX_Z_ERROR=0'] } },
    { name: 'three-bands-byte-pixel-packbits-rgb', write: { ...base, path: dir('b7.tif'), type: 'Byte', values: valuesFor(TYPES[0]).map((v) => v % 200), bands: 3, options: ['INTERLEAVE=PIXEL', 'COMPRESS=PACKBITS', 'PHOTOMETRIC=RGB'] } },
    { name: 'two-bands-uint16-band-zstd-sparse', write: { ...base, path: dir('b8.tif'), type: 'UInt16', values: i16nd.map((v, k) => (k % W < 10 && Math.floor(k / W) < 6 ? Math.abs(v) : 7)), nodata: 7, bands: 2, sparse_blocks: true, options: ['INTERLEAVE=BAND', 'COMPRESS=ZSTD', 'PREDICTOR=2', ...tiles] } },
    // Band 2 marked as alpha: GDAL masks band 1 by it (its mask band); we do not read alpha, so we refuse.
    { name: 'two-bands-alpha', write: { ...base, path: dir('b9.tif'), type: 'Byte', values: valuesFor(TYPES[0]).map((v) => v % 200), bands: 2, options: ['ALPHA=YES'] }, refused: /band 2 is an alpha band.*gdal_translate -b 1/ },
  ];
}

function sparse(dir: (n: string) => string, base: Omit<GdalWrite, 'path' | 'type' | 'values'>, f32: number[], i16: number[]): Case[] {
  // Data only in the north-west corner: every other 16 × 16 tile / 7-row strip is never written.
  const corner = (vals: number[], fill: number) => vals.map((v, k) => (k % W < 10 && Math.floor(k / W) < 6 ? v : fill));
  const tiles = ['TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=16'];
  return [
    { name: 'sparse-nan-tiles', write: { ...base, path: dir('sp1.tif'), type: 'Float32', values: corner(f32, NaN), nodata: NaN, sparse_blocks: true, options: [...tiles, 'COMPRESS=DEFLATE'] } },
    { name: 'sparse-nan-strips-be', write: { ...base, path: dir('sp2.tif'), type: 'Float32', values: corner(f32, NaN), nodata: NaN, sparse_blocks: true, options: ['BLOCKYSIZE=7', 'ENDIANNESS=BIG'] } },
    { name: 'sparse-int16-sentinel', write: { ...base, path: dir('sp3.tif'), type: 'Int16', values: corner(i16, -9999), nodata: -9999, sparse_blocks: true, options: [...tiles, 'COMPRESS=LZW', 'PREDICTOR=2'] } },
    { name: 'sparse-no-nodata-reads-0', write: { ...base, path: dir('sp4.tif'), type: 'Int16', values: corner(i16, 0), sparse_blocks: true, options: tiles } },
    { name: 'sparse-uint16-nodata-out-of-range', write: { ...base, path: dir('sp5.tif'), type: 'UInt16', values: corner(i16.map(Math.abs), 0), nodata: -5, sparse_blocks: true, options: tiles } },
  ];
}

const available = gdalPythonAvailable();
const tmp = tempDir();
let oracle: GdalOracle;
beforeAll(() => { if (available) oracle = new GdalOracle(); });
afterAll(() => { oracle?.close(); tmp.cleanup(); });

describe.skipIf(!available)('GDAL-written corpus: our reader agrees with GDAL or refuses as documented', () => {
  it('every sample type × compression × predictor × byte order × strips/tiles, BigTIFF, sparse, no-data, bands', async () => {
    const cases = corpus(tmp.path);
    for (const c of cases) await oracle.write(c.write);
    const gdal = await oracle.read(cases.map((c) => c.write.path));
    const problems: string[] = [];
    let agreed = 0;
    for (let i = 0; i < cases.length; i++) {
      const c = cases[i];
      expect(gdal[i].ok, `GDAL reads its own ${c.name}`).toBe(true);
      const j = judge(await readOurs(new Uint8Array(readFileSync(c.write.path))), gdal[i]);
      if (c.refused) {
        if (j.verdict !== 'we-refused' || !c.refused.test(j.detail)) problems.push(`${c.name}: expected a refusal matching ${c.refused}, got ${j.verdict} ${j.detail}`);
      } else if (j.verdict !== 'agree') problems.push(`${c.name}: ${j.verdict} ${j.detail}`);
      else agreed++;
    }
    expect(problems).toEqual([]);
    expect(agreed).toBeGreaterThan(330);
  });
});
