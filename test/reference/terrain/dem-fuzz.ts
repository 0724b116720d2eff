/**
 * Seeded mutation fuzzing of the GeoTIFF reader with GDAL as the oracle. Start files are written by GDAL
 * (every codec we read, ZSTD and LERC_ZSTD included, both byte orders, strips and tiles, BigTIFF, a sparse
 * file, pixel- and band-interleaved files of several bands); each mutation
 * damages one in a named way — random bytes, bytes in the directory, truncation, a directory value, a
 * block's offset or byte count, the compressed data, the predictor, a size retyped as a DOUBLE, the no-data
 * text — and `judge` compares our outcome with GDAL's on the same bytes. The work is bounded by the number
 * of mutations, never by time. Used by gdal-fuzz.test.ts (CI) and test/fuzz/dem-fuzz.ts (offline).
 */
import { writeFileSync } from 'node:fs';
import { readFileSync } from 'node:fs';
import { Rng } from '../../support/random.ts';
import { GdalOracle, judge, readOurs, type GdalWrite, type Verdict } from './dem-oracle.ts';
import { TAG, TYPE_BYTES, TiffEditor, retypeAsDouble } from './tiff-edit.ts';

const W = 40, H = 30;

function terrain(seed: number): number[] {
  return Array.from({ length: W * H }, (_, k) => 800 + 70 * Math.sin((k % W) / 5 + seed) + 45 * Math.cos(Math.floor(k / W) / 4) + ((k * 37) % 13) * 0.25);
}

/** The start files: GDAL-written, small, covering the codecs, byte orders and layouts we read. */
export function startFiles(path: (name: string) => string): GdalWrite[] {
  const base = { width: W, height: H, srs: 'EPSG:32633', geotransform: [400000, 2, 0, 5100000, 0, -2] };
  const t = terrain(0);
  const ints = t.map(Math.round);
  const holes = [3, 77, 78, 400, W * H - 2];
  const tiles = ['TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=16'];
  const corner = t.map((v, k) => (k % W < 12 && Math.floor(k / W) < 10 ? v : NaN));
  return [
    { ...base, path: path('s-i16-deflate-p2-le.tif'), type: 'Int16', values: ints.map((v, k) => (holes.includes(k) ? -32768 : v)), nodata: -32768, options: ['COMPRESS=DEFLATE', 'PREDICTOR=2', 'BLOCKYSIZE=8'] },
    { ...base, path: path('s-i16-deflate-p2-be-tiles.tif'), type: 'Int16', values: ints, options: ['COMPRESS=DEFLATE', 'PREDICTOR=2', 'ENDIANNESS=BIG', ...tiles] },
    { ...base, path: path('s-f32-deflate-p3-tiles-nan.tif'), type: 'Float32', values: t, nan: holes, nodata: NaN, options: ['COMPRESS=DEFLATE', 'PREDICTOR=3', ...tiles] },
    { ...base, path: path('s-f32-lzw-p2-be.tif'), type: 'Float32', values: t, nodata: -9999, options: ['COMPRESS=LZW', 'PREDICTOR=2', 'ENDIANNESS=BIG', 'BLOCKYSIZE=7'] },
    { ...base, path: path('s-u16-lzw-tiles.tif'), type: 'UInt16', values: ints, options: ['COMPRESS=LZW', ...tiles] },
    { ...base, path: path('s-i16-packbits-be.tif'), type: 'Int16', values: ints.map((v, k) => (holes.includes(k) ? -9999 : v)), nodata: -9999, options: ['COMPRESS=PACKBITS', 'ENDIANNESS=BIG', 'BLOCKYSIZE=6'] },
    { ...base, path: path('s-f32-lerc-tiles.tif'), type: 'Float32', values: t, nodata: -9999, options: ['COMPRESS=LERC', 'MAX_Z_ERROR=0', ...tiles] },
    { ...base, path: path('s-f32-lerc-deflate-be.tif'), type: 'Float32', values: t, options: ['COMPRESS=LERC_DEFLATE', 'MAX_Z_ERROR=0', 'ENDIANNESS=BIG', 'BLOCKYSIZE=10'] },
    { ...base, path: path('s-f64-none-be.tif'), type: 'Float64', values: t, nodata: -32767, options: ['ENDIANNESS=BIG', 'BLOCKYSIZE=4'] },
    { ...base, path: path('s-f32-sparse-nan.tif'), type: 'Float32', values: corner, nodata: NaN, sparse_blocks: true, options: ['COMPRESS=DEFLATE', ...tiles] },
    { ...base, path: path('s-i32-bigtiff-lzw-p2.tif'), type: 'Int32', values: ints, nodata: -1, options: ['BIGTIFF=YES', 'COMPRESS=LZW', 'PREDICTOR=2', ...tiles] },
    { ...base, path: path('s-byte-none.tif'), type: 'Byte', values: ints.map((v) => v % 256), nodata: 0, options: ['BLOCKYSIZE=5'] },
    { ...base, path: path('s-i16-zstd-p2-strips.tif'), type: 'Int16', values: ints.map((v, k) => (holes.includes(k) ? -32768 : v)), nodata: -32768, options: ['COMPRESS=ZSTD', 'PREDICTOR=2', 'BLOCKYSIZE=8'] },
    { ...base, path: path('s-f32-zstd-p3-be-tiles-nan.tif'), type: 'Float32', values: t, nan: holes, nodata: NaN, options: ['COMPRESS=ZSTD', 'PREDICTOR=3', 'ENDIANNESS=BIG', ...tiles] },
    { ...base, path: path('s-f32-lerc-zstd-tiles.tif'), type: 'Float32', values: t, nodata: -9999, options: ['COMPRESS=LERC_ZSTD', 'MAX_Z_ERROR=0', ...tiles] },
    { ...base, path: path('s-i16-3bands-pixel-deflate.tif'), type: 'Int16', values: ints, nodata: -9999, bands: 3, options: ['INTERLEAVE=PIXEL', 'COMPRESS=DEFLATE', 'PREDICTOR=2', 'BLOCKYSIZE=6'] },
    { ...base, path: path('s-f32-2bands-band-zstd-tiles.tif'), type: 'Float32', values: t, nan: holes, nodata: NaN, bands: 2, options: ['INTERLEAVE=BAND', 'COMPRESS=ZSTD', ...tiles] },
  ];
}

const SPECIAL = [0, 1, 2, 3, 4, 5, 7, 8, 15, 16, 17, 99, 255, 256, 4095, 4096, 32768, 65535, 65536, 2 ** 31, 2 ** 32 - 1];

/** One damaged copy of `base`; `kind` names the damage. */
export function mutate(base: Uint8Array, rng: Rng): { bytes: Uint8Array; kind: string } {
  let bytes: Uint8Array = base.slice();
  const kinds: string[] = [];
  const steps = rng.next() < 0.8 ? 1 : 2;
  for (let s = 0; s < steps; s++) {
    let ed: TiffEditor | null;
    try { ed = new TiffEditor(bytes); } catch { ed = null; }
    const pick = rng.int(0, 9);
    const kind = ['bytes', 'directory-bytes', 'truncate', 'entry', 'block-table', 'data', 'predictor', 'retype', 'nodata', 'bytes'][pick];
    kinds.push(kind);
    if (kind === 'bytes') {
      for (let i = rng.int(1, 8); i > 0; i--) bytes[rng.int(0, bytes.length - 1)] = rng.int(0, 255);
    } else if (kind === 'directory-bytes') {
      const end = Math.min(bytes.length - 1, 700); // GDAL writes the directory and its arrays first
      for (let i = rng.int(1, 4); i > 0; i--) bytes[rng.int(0, end)] = rng.int(0, 255);
    } else if (kind === 'truncate') {
      bytes = bytes.slice(0, rng.int(0, bytes.length - 1));
    } else if (kind === 'entry' && ed && ed.entries.length) {
      const e = ed.entries[rng.int(0, ed.entries.length - 1)];
      if (TYPE_BYTES[e.type] && [3, 4, 16, 12].includes(e.type) && e.dataAt + TYPE_BYTES[e.type] <= bytes.length) {
        const index = rng.int(0, Math.min(e.count, 8) - 1);
        const v = rng.next() < 0.7 ? SPECIAL[rng.int(0, SPECIAL.length - 1)] : rng.int(0, 70000);
        if (e.dataAt + (index + 1) * TYPE_BYTES[e.type] <= bytes.length) ed.set(e.tag, index, v);
      }
    } else if (kind === 'block-table' && ed) {
      const offsets = ed.entry(TAG.StripOffsets) ?? ed.entry(TAG.TileOffsets);
      const counts = ed.entry(TAG.StripByteCounts) ?? ed.entry(TAG.TileByteCounts);
      if (offsets && counts && offsets.count > 0) {
        const i = rng.int(0, offsets.count - 1);
        const which = rng.int(0, 5);
        try {
          if (which === 0) ed.set(counts.tag, i, 0);
          else if (which === 1) ed.set(counts.tag, i, ed.get(counts.tag, i) + rng.int(1, 5000));
          else if (which === 2) ed.set(counts.tag, i, Math.max(0, ed.get(counts.tag, i) - rng.int(1, 64)));
          else if (which === 3) ed.set(offsets.tag, i, 0);
          else if (which === 4) ed.set(offsets.tag, i, rng.int(0, bytes.length + 100));
          else ed.set(counts.tag, i, SPECIAL[rng.int(0, SPECIAL.length - 1)]);
        } catch { /* entry data outside a damaged file */ }
      }
    } else if (kind === 'data' && ed) {
      try {
        const blocks = ed.blocks().filter((b) => b.count > 0 && b.offset + b.count <= bytes.length);
        if (blocks.length) {
          const b = blocks[rng.int(0, blocks.length - 1)];
          for (let i = rng.int(1, 6); i > 0; i--) bytes[b.offset + rng.int(0, b.count - 1)] = rng.int(0, 255);
        }
      } catch { /* damaged directory */ }
    } else if (kind === 'predictor' && ed?.entry(TAG.Predictor)) {
      ed.set(TAG.Predictor, 0, [0, 1, 2, 3, 4, 99, 65535][rng.int(0, 6)]);
    } else if (kind === 'retype' && ed && !ed.big) {
      const tag = [TAG.RowsPerStrip, TAG.TileWidth, TAG.ImageWidth, TAG.ImageLength][rng.int(0, 3)];
      if (ed.entry(tag)) bytes = retypeAsDouble(bytes, tag, [1e-300, 0.5, 7.5, 1e300, -3, NaN][rng.int(0, 5)]);
    } else if (kind === 'nodata' && ed?.entry(TAG.GdalNoData)) {
      const e = ed.entry(TAG.GdalNoData)!;
      const chars = '0123456789-+.eEnaiNfx \0';
      for (let i = rng.int(1, 3); i > 0; i--) {
        const p = e.dataAt + rng.int(0, Math.max(0, e.count - 1));
        if (p < bytes.length) bytes[p] = chars.charCodeAt(rng.int(0, chars.length - 1));
      }
    }
  }
  return { bytes, kind: kinds.join('+') };
}

export interface FuzzTally {
  streams: number;
  counts: Record<Verdict, number>;
  byKind: Record<string, Partial<Record<Verdict, number>>>;
  /** A few examples of every verdict other than agreement or refusal. */
  examples: { verdict: Verdict; kind: string; file: string; detail: string }[];
  slowestOurs_ms: number;
}

/**
 * Runs `perFile` mutations of every start file (seeded by `seed`), GDAL reading each damaged file in
 * batches. `keep(bytes, name)` may save interesting files.
 */
export async function fuzz(oracle: GdalOracle, dir: (name: string) => string, perFile: number, seed: number, batch = 100): Promise<FuzzTally> {
  const files = startFiles(dir);
  for (const f of files) await oracle.write(f);
  const tally: FuzzTally = {
    streams: 0,
    counts: { agree: 0, 'both-refused': 0, 'we-refused': 0, 'we-read-gdal-refused': 0, wrong: 0, crash: 0, unchecked: 0 },
    byKind: {},
    examples: [],
    slowestOurs_ms: 0,
  };
  for (let f = 0; f < files.length; f++) {
    const base = new Uint8Array(readFileSync(files[f].path));
    const rng = new Rng(seed * 7919 + f);
    for (let done = 0; done < perFile; done += batch) {
      const pending: { kind: string; path: string; ours: Awaited<ReturnType<typeof readOurs>> }[] = [];
      for (let i = 0; i < Math.min(batch, perFile - done); i++) {
        const m = mutate(base, rng);
        const path = dir(`m-${f}-${i}.tif`);
        writeFileSync(path, m.bytes);
        const t0 = performance.now();
        const ours = await readOurs(m.bytes);
        tally.slowestOurs_ms = Math.max(tally.slowestOurs_ms, performance.now() - t0); // reported, never asserted
        pending.push({ kind: m.kind, path, ours });
      }
      const gdal = await oracle.read(pending.map((p) => p.path));
      pending.forEach((p, i) => {
        const j = judge(p.ours, gdal[i]);
        tally.streams++;
        tally.counts[j.verdict]++;
        const k = (tally.byKind[p.kind] ??= {});
        k[j.verdict] = (k[j.verdict] ?? 0) + 1;
        if (!['agree', 'both-refused', 'we-refused'].includes(j.verdict) && tally.examples.filter((e) => e.verdict === j.verdict).length < Number(process.env.DEM_FUZZ_EXAMPLES ?? 8)) {
          tally.examples.push({ verdict: j.verdict, kind: p.kind, file: files[f].path.split('/').pop()!, detail: j.detail });
        }
      });
    }
  }
  return tally;
}
