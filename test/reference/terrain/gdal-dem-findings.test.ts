/**
 * The damaged and unusual GeoTIFFs that fuzzing found read wrongly or brought the process down, each
 * checked against GDAL 3.6 (python3-gdal) on the same bytes: we must read GDAL's heights and no-data mask,
 * or refuse with a TerrainInputError naming the field, its value and the fix, within the declared size.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { constants, deflateRawSync } from 'node:zlib';
import { TerrainInputError, readGeoTiff } from '../../../core/terrain/index.ts';
import { GdalOracle, gdalPythonAvailable, judge, readOurs, type GdalRead, type GdalWrite } from './dem-oracle.ts';
import { TAG, TiffEditor, append, retypeAsDouble } from './tiff-edit.ts';
import { tempDir } from './gdal.ts';

const W = 64, H = 64;
const terrain = Array.from({ length: W * H }, (_, k) => Math.round(1000 + 60 * Math.sin((k % W) / 6) + 40 * Math.cos(Math.floor(k / W) / 5) - (k % 17)));
const base = { width: W, height: H, srs: 'EPSG:32633', geotransform: [300000, 1, 0, 5000000, 0, -1] };

const available = gdalPythonAvailable();
const tmp = tempDir();
let oracle: GdalOracle;
let n = 0;
beforeAll(() => { if (available) oracle = new GdalOracle(); });
afterAll(() => { oracle?.close(); tmp.cleanup(); });

async function gdalWritten(req: Omit<GdalWrite, 'path' | 'width' | 'height'>): Promise<Uint8Array> {
  const path = tmp.path(`w${n++}.tif`);
  await oracle.write({ ...base, ...req, path });
  return new Uint8Array(readFileSync(path));
}

async function gdalReads(bytes: Uint8Array): Promise<GdalRead> {
  const path = tmp.path(`r${n++}.tif`);
  writeFileSync(path, bytes);
  return (await oracle.read([path]))[0];
}

async function expectAgreement(bytes: Uint8Array) {
  const gdal = await gdalReads(bytes);
  expect(gdal.ok, `GDAL reads it: ${gdal.error}`).toBe(true);
  const j = judge(await readOurs(bytes), gdal);
  expect(j, j.detail).toMatchObject({ verdict: 'agree' });
}

describe.skipIf(!available)('damaged and unusual GeoTIFFs, GDAL as the oracle', () => {
  it('big-endian files with the horizontal predictor (16 and 32-bit integers, float32) read GDAL\'s heights', async () => {
    for (const [type, options] of [['Int16', ['COMPRESS=DEFLATE']], ['UInt32', ['COMPRESS=LZW', 'TILED=YES']], ['Float32', ['COMPRESS=DEFLATE']]] as const) {
      await expectAgreement(await gdalWritten({ type, values: terrain, nodata: -9999, options: [...options, 'ENDIANNESS=BIG', 'PREDICTOR=2'] }));
    }
  });

  it('sparse files (SPARSE_OK): omitted tiles read as no-data when it is set (NaN, −9999), else as 0 m', async () => {
    const corner = (fill: number) => terrain.map((v, k) => (k % W < 20 && Math.floor(k / W) < 20 ? v : fill));
    const tiles = ['TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=16'];
    const nan = await gdalWritten({ type: 'Float32', values: corner(NaN), nodata: NaN, sparse_blocks: true, options: [...tiles, 'COMPRESS=DEFLATE'] });
    expect(new TiffEditor(nan).blocks().filter((b) => b.count === 0).length).toBeGreaterThan(8); // really sparse
    await expectAgreement(nan);
    const g = await readGeoTiff(nan);
    expect(g.noData[W * 40 + 40]).toBe(1); // an omitted tile: no data, not 0 m terrain
    await expectAgreement(await gdalWritten({ type: 'Int16', values: corner(-9999), nodata: -9999, sparse_blocks: true, options: tiles }));
    const none = await gdalWritten({ type: 'Int16', values: corner(0), sparse_blocks: true, options: tiles });
    await expectAgreement(none);
    expect((await readGeoTiff(none)).heights[W * 40 + 40]).toBe(0);
  });

  it('a zero strip byte count reads as no-data (GDAL\'s rule); oversized byte counts read as GDAL reads them or are refused', async () => {
    const strips = await gdalWritten({ type: 'Int16', values: terrain, nodata: -9999, options: ['BLOCKYSIZE=8'] });
    const zero = strips.slice();
    new TiffEditor(zero).set(TAG.StripByteCounts, 2, 0);
    await expectAgreement(zero);
    expect((await readGeoTiff(zero)).noData[W * 20]).toBe(1);
    // Uncompressed: libtiff reads the strip's declared size from its offset, whatever the byte count says.
    const big = strips.slice();
    const ed = new TiffEditor(big);
    ed.set(TAG.StripByteCounts, 7, ed.get(TAG.StripByteCounts, 7) + 4096);
    await expectAgreement(big);
    // Compressed: the byte count is the data; past the end of the file both GDAL and we refuse.
    const deflated = await gdalWritten({ type: 'Int16', values: terrain, nodata: -9999, options: ['BLOCKYSIZE=8', 'COMPRESS=DEFLATE'] });
    const ed2 = new TiffEditor(deflated);
    ed2.set(TAG.StripByteCounts, 7, ed2.get(TAG.StripByteCounts, 7) + 4096);
    expect((await gdalReads(deflated)).ok).toBe(false);
    await expect(readGeoTiff(deflated)).rejects.toThrow(/StripOffsets\[7\] = \d+ with StripByteCounts\[7\] = \d+ runs past the end of the \d+-byte file/);
  });

  it('uncompressed tiles with short byte counts: read as GDAL reads them, refused on the last, partial tile row as GDAL refuses them', async () => {
    // 64 × 64 cells in 16 × 48 tiles (3072 bytes): the last tile row holds 16 of 48 rows (1024 bytes).
    const file = await gdalWritten({ type: 'Float32', values: terrain, options: ['TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=48'] });
    for (const [tile, minus] of [[0, 300], [4, 10], [4, 2200]] as const) {
      const bad = file.slice();
      const ed = new TiffEditor(bad);
      ed.set(TAG.TileByteCounts, tile, ed.get(TAG.TileByteCounts, tile) - minus);
      const gdal = await gdalReads(bad);
      const j = judge(await readOurs(bad), gdal);
      expect(j.verdict, `tile ${tile} − ${minus} bytes: ${j.detail}`).toBe(gdal.ok ? 'agree' : 'both-refused');
      if (!gdal.ok) expect(j.detail).toMatch(new RegExp(`TileByteCounts\\[${tile}\\] = \\d+ is less than the 1024 bytes of the tile's 16 rows inside the image`));
    }
  });

  it('invalid Predictor values (0, 4, 99) on Deflate and LZW data are refused, as GDAL refuses them', async () => {
    for (const compress of ['DEFLATE', 'LZW']) {
      const good = await gdalWritten({ type: 'Int16', values: terrain, options: [`COMPRESS=${compress}`, 'PREDICTOR=2'] });
      for (const p of [0, 4, 99]) {
        const bad = good.slice();
        new TiffEditor(bad).set(TAG.Predictor, 0, p);
        expect((await gdalReads(bad)).ok, `GDAL refuses Predictor ${p}`).toBe(false);
        await expect(readGeoTiff(bad)).rejects.toThrow(new RegExp(`invalid Predictor: ${p} \\(TIFF defines 1 none, 2 horizontal, 3 floating point`));
      }
    }
  });

  it('a Predictor on uncompressed data is ignored, as libtiff ignores it there', async () => {
    const raw = await gdalWritten({ type: 'Int16', values: terrain, options: [] });
    const ed = new TiffEditor(raw);
    expect(ed.entry(TAG.Predictor)).toBeUndefined();
    // Turn the (unused) PlanarConfiguration entry into a Predictor of 2: same bytes, only the tag differs.
    const tagged = raw.slice();
    new DataView(tagged.buffer).setUint16(new TiffEditor(tagged).entry(TAG.PlanarConfiguration)!.at, TAG.Predictor, ed.le);
    // Tags must stay sorted for libtiff; PlanarConfiguration (284) → Predictor (317) keeps the order here.
    await expectAgreement(tagged);
  });

  it('a 4 MB PackBits strip that expands past its block reads within the block (GDAL drops the rest)', async () => {
    const file = await gdalWritten({ type: 'Int16', values: terrain, options: ['COMPRESS=PACKBITS', `BLOCKYSIZE=${H}`] });
    // 2 M pairs (−127, 7): each asks for 128 bytes of 7s — 256 MiB for a block of 8 KiB.
    const bomb = new Uint8Array(4 * 1024 * 1024);
    for (let i = 0; i < bomb.length; i += 2) { bomb[i] = 0x81; bomb[i + 1] = 7; }
    const { bytes, at } = append(file, bomb);
    const ed = new TiffEditor(bytes);
    ed.set(TAG.StripOffsets, 0, at);
    ed.set(TAG.StripByteCounts, 0, bomb.length);
    await expectAgreement(bytes);
    expect((await readGeoTiff(bytes)).heights[0]).toBe(0x0707);
  });

  it('a 1 MB Deflate stream of 1 GiB (a decompression bomb) is refused at its 8 KiB block, without decoding the rest', async () => {
    const file = await gdalWritten({ type: 'Int16', values: terrain, options: ['COMPRESS=DEFLATE', `BLOCKYSIZE=${H}`] });
    // 64 copies of 16 MiB of zeros, each ended by a full flush (so every copy is the same bytes), then a
    // final empty block and the Adler-32 of 2^30 zeros (RFC 1950: a = 1, b = n mod 65521).
    const piece = deflateRawSync(new Uint8Array(16 * 1024 * 1024), { finishFlush: constants.Z_FULL_FLUSH });
    const n = 64 * 16 * 1024 * 1024;
    const stream = new Uint8Array(2 + 64 * piece.length + 2 + 4);
    stream.set([0x78, 0x9c]);
    for (let i = 0; i < 64; i++) stream.set(piece, 2 + i * piece.length);
    const tail = 2 + 64 * piece.length;
    stream.set([0x03, 0x00], tail); // BFINAL, fixed Huffman, end of block
    new DataView(stream.buffer).setUint32(tail + 2, (((n % 65521) << 16) | 1) >>> 0);
    expect(stream.length).toBeLessThan(1.1e6);
    const { bytes, at } = append(file, stream);
    const ed = new TiffEditor(bytes);
    ed.set(TAG.StripOffsets, 0, at);
    ed.set(TAG.StripByteCounts, 0, stream.length);
    await expect(readGeoTiff(bytes)).rejects.toThrow(/strip 0: Deflate data decodes to more than the block's 8192 bytes/);
  });

  it('RowsPerStrip stored as a tiny DOUBLE is refused before any strip is decoded', async () => {
    const file = await gdalWritten({ type: 'Int16', values: terrain, options: ['BLOCKYSIZE=8'] });
    const bad = retypeAsDouble(file, TAG.RowsPerStrip, 1e-300);
    await expect(readGeoTiff(bad)).rejects.toThrow(/tag 278 is stored as TIFF type 12, but TIFF 6.0 requires an unsigned integer type there/);
    await expect(readGeoTiff(bad)).rejects.toThrow(TerrainInputError);
    expect((await gdalReads(bad)).ok).toBe(false); // libtiff: "Incompatible type for RowsPerStrip"
  });

  it('declared block and window sizes are bounded before decoding, with the limit and the fix in the message', async () => {
    const file = await gdalWritten({ type: 'Float32', values: terrain, options: ['TILED=YES', 'BLOCKXSIZE=16', 'BLOCKYSIZE=16'] });
    const huge = file.slice();
    const ed = new TiffEditor(huge);
    ed.set(TAG.TileWidth, 0, 32768);
    ed.set(TAG.TileLength, 0, 32768);
    await expect(readGeoTiff(huge)).rejects.toThrow(/TileWidth × TileLength = 32768 × 32768 pixels of 4 bytes make 4294967296 bytes per block, over the limit of 268435456 \(256 MiB\); re-tile it/);
  });

  describe('ZSTD blocks (RFC 8878) read as GDAL reads them, or refused within the block', () => {
    /** Strip 0 of a one-strip ZSTD file GDAL writes with `rows` rows of the same terrain: a frame of rows × 128 bytes. */
    const gdalFrame = async (rows: number) => {
      const path = tmp.path(`rows${n++}.tif`);
      const values = Array.from({ length: W * rows }, (_, k) => terrain[k % (W * H)]);
      await oracle.write({ ...base, height: rows, path, type: 'Int16', values, options: ['COMPRESS=ZSTD', `BLOCKYSIZE=${rows}`] });
      return strip0(new Uint8Array(readFileSync(path)));
    };
    /** Replaces strip 0 of `file` with `data`. */
    const withStrip0 = (file: Uint8Array, data: Uint8Array) => {
      const { bytes, at } = append(file, data);
      const ed = new TiffEditor(bytes);
      ed.set(TAG.StripOffsets, 0, at);
      ed.set(TAG.StripByteCounts, 0, data.length);
      return bytes;
    };
    const strip0 = (file: Uint8Array) => { const b = new TiffEditor(file).blocks()[0]; return file.slice(b.offset, b.offset + b.count); };

    it('a window over libzstd\'s default 128 MiB limit is refused, as GDAL refuses it', async () => {
      const file = await gdalWritten({ type: 'Int16', values: terrain, options: ['COMPRESS=ZSTD', 'BLOCKYSIZE=8'] });
      const b = new TiffEditor(file).blocks()[0];
      expect(file[b.offset + 4] & 0x20).toBe(0); // GDAL writes a Window_Descriptor (no single segment)
      const bad = file.slice();
      bad[b.offset + 5] = 18 << 3; // Window_Size = 2^(10 + 18) = 256 MiB
      expect((await gdalReads(bad)).ok, 'GDAL refuses a 256 MiB window').toBe(false);
      await expect(readGeoTiff(bad)).rejects.toThrow(/strip 0: ZSTD frame asks for a 268435456-byte window, over libzstd's default limit of 134217728/);
      bad[b.offset + 5] = 17 << 3; // 128 MiB: allowed (GDAL's own ZSTD_LEVEL=22 files use it)
      await expectAgreement(bad);
    });

    it('a frame cut short, or decoding to less than the block, is refused as GDAL refuses it', async () => {
      const file = await gdalWritten({ type: 'Int16', values: terrain, options: ['COMPRESS=ZSTD', `BLOCKYSIZE=${H}`] });
      const cut = file.slice();
      const ed = new TiffEditor(cut);
      ed.set(TAG.StripByteCounts, 0, ed.get(TAG.StripByteCounts, 0) - 3);
      expect((await gdalReads(cut)).ok).toBe(false);
      await expect(readGeoTiff(cut)).rejects.toThrow(/strip 0: ZSTD frame is cut off/);
      const short = withStrip0(file, await gdalFrame(H - 1)); // one row (128 bytes) short of the 8 KiB strip
      expect((await gdalReads(short)).ok).toBe(false); // libtiff: "Not enough data"
      await expect(readGeoTiff(short)).rejects.toThrow(/strip 0: ZSTD data ends after 8064 of the block's 8192 bytes/);
    });

    it('a frame longer than its block is refused, not cut (libtiff would keep the first block\'s worth)', async () => {
      const file = await gdalWritten({ type: 'Int16', values: terrain, options: ['COMPRESS=ZSTD', `BLOCKYSIZE=${H}`] });
      const long = withStrip0(file, await gdalFrame(H + 3));
      expect((await gdalReads(long)).ok).toBe(true);
      await expect(readGeoTiff(long)).rejects.toThrow(/strip 0: ZSTD data is corrupt or decodes to more than the block's 8192 bytes/);
    });

    it('a small frame of many RLE blocks (32 GiB for an 8 KiB strip) is refused when the block is full', async () => {
      const file = await gdalWritten({ type: 'Int16', values: terrain, options: ['COMPRESS=ZSTD', `BLOCKYSIZE=${H}`] });
      const blocks = 262144; // each RLE block: 3 header bytes + 1 byte standing for 128 KiB (RFC 8878 3.1.1.2)
      const frame = new Uint8Array(6 + 4 * blocks);
      frame.set([0x28, 0xb5, 0x2f, 0xfd, 0x00, 7 << 3]); // magic; no content size; Window_Size 128 KiB
      for (let i = 0; i < blocks; i++) {
        const h = (i === blocks - 1 ? 1 : 0) | (1 << 1) | (131072 << 3);
        frame.set([h & 0xff, (h >> 8) & 0xff, (h >> 16) & 0xff, 9], 6 + 4 * i);
      }
      await expect(readGeoTiff(withStrip0(file, frame))).rejects.toThrow(/strip 0: ZSTD data is corrupt or decodes to more than the block's 8192 bytes/);
    });

    it('skippable frames and reserved bits (never written by GDAL) are refused with the reason', async () => {
      const file = await gdalWritten({ type: 'Int16', values: terrain, options: ['COMPRESS=ZSTD', `BLOCKYSIZE=${H}`] });
      const skippable = Uint8Array.from([0x50, 0x2a, 0x4d, 0x18, 0, 0, 0, 0, ...strip0(file)]);
      await expect(readGeoTiff(withStrip0(file, skippable))).rejects.toThrow(/skippable frame/);
      const reserved = strip0(file);
      reserved[4] |= 0x08;
      const bad = withStrip0(file, reserved);
      expect((await gdalReads(bad)).ok).toBe(false);
      await expect(readGeoTiff(bad)).rejects.toThrow(/reserved bit/);
    });
  });
});

