/**
 * TIFF strips and tiles → sample values, with every size checked against documented limits BEFORE any
 * block is decoded (TIFF 6.0; BigTIFF). The `geotiff` package parses the directory and the GeoTIFF keys;
 * reading the blocks is done here because GeoTIFFs from other tools must read as GDAL reads them:
 * - byte order: samples and the horizontal predictor (Predictor 2) are handled in the file's byte order;
 *   the floating-point predictor (Predictor 3) works on byte planes, most significant first, whatever the
 *   byte order (libtiff tif_predict.c, fpAcc);
 * - Predictor is only read for the codecs libtiff applies it to (LZW, Deflate, ZSTD); values other than 1, 2, 3
 *   are refused there, as libtiff refuses them;
 * - a block whose byte count is 0 was never written (GDAL's SPARSE_OK files): it reads as the no-data value
 *   cast to the sample type if there is one, else 0 — GDAL's rule (GTiffRasterBand::NullBlock);
 * - a byte count or offset running past the end of the file, a zero offset with data, too little data for
 *   a block, and non-integer or zero block sizes are refused.
 */
import type { GeoTIFFImage } from 'geotiff';
import { TerrainInputError } from './grid.ts';
import { TIFF_COMPRESSIONS, codecUsesPredictor, decodeBlock } from './tiff-codecs.ts';
import { zstdReady } from './zstd.ts';
import type { ByteSource } from './byte-source.ts';

/**
 * Largest decoded strip or tile: 256 MiB. Above it a file is refused before decoding (re-tile it:
 * gdal_translate -co TILED=YES). GDAL writes 256 × 256 tiles or strips of a few rows.
 */
export const MAX_BLOCK_BYTES = 256 * 1024 * 1024;
/**
 * Most bytes of blocks decoded for one read: 1 GiB. A window that cuts across blocks much wider or taller
 * than itself decodes the whole blocks; above the limit the read is refused before decoding.
 */
export const MAX_DECODED_BYTES = 1024 * 1024 * 1024;

export interface TiffLayout {
  width: number;
  height: number;
  tiled: boolean;
  /** Tile size, or (image width, rows per strip clamped to the image height) for strips. */
  blockWidth: number;
  blockHeight: number;
  samplesPerPixel: number;
  planar: 1 | 2;
  bitsPerSample: number;
  sampleFormat: number;
  littleEndian: boolean;
  compression: number;
  /** 1 when the codec takes no predictor (libtiff ignores the tag there). */
  predictor: number;
  lercParameters?: readonly number[];
}

function fail(source: string, message: string): never {
  throw new TerrainInputError(`${source}: ${message}`);
}

function wholeNumber(source: string, name: string, v: unknown, fix: string): number {
  if ((Array.isArray(v) || ArrayBuffer.isView(v)) && (v as ArrayLike<number>).length !== 1) {
    fail(source, `${name} has ${(v as ArrayLike<number>).length} values (TIFF 6.0 allows exactly one; GDAL refuses it too); ${fix}`);
  }
  const x = typeof v === 'bigint' ? Number(v) : Array.isArray(v) || ArrayBuffer.isView(v) ? Number((v as ArrayLike<number>)[0]) : Number(v);
  if (!Number.isInteger(x) || x < 1 || x > 2 ** 32 - 1) fail(source, `invalid ${name}: ${String(v)} (must be a whole number from 1 to 4294967295); ${fix}`);
  return x;
}

function allSame(source: string, name: string, v: unknown): number | undefined {
  if (v === undefined || v === null) return undefined;
  const list = typeof v === 'number' ? [v] : Array.from(v as ArrayLike<number>, Number);
  if (list.length === 0) return undefined;
  if (list.some((x) => x !== list[0])) fail(source, `${name} differs between bands (${list.join(', ')}); this reader needs one sample type`);
  return list[0];
}

/** Checks the directory's layout tags; every error names the tag, its value and the fix. */
export function tiffLayout(image: GeoTIFFImage, source: string): TiffLayout {
  const fd = image.getFileDirectory();
  const get = (name: string) => (fd.hasTag(name as never) ? fd.getValue(name as never) : undefined);
  const resave = 're-save the file with GDAL (gdal_translate)';
  const width = wholeNumber(source, 'ImageWidth', get('ImageWidth'), resave);
  const height = wholeNumber(source, 'ImageLength', get('ImageLength'), resave);
  const samplesPerPixel = get('SamplesPerPixel') === undefined ? 1 : wholeNumber(source, 'SamplesPerPixel', get('SamplesPerPixel'), resave);
  const planarTag = Number(get('PlanarConfiguration') ?? 1);
  if (planarTag !== 1 && planarTag !== 2) fail(source, `invalid PlanarConfiguration: ${planarTag} (must be 1 or 2); ${resave}`);
  const compression = Number(get('Compression') ?? 1);
  if (!(compression in TIFF_COMPRESSIONS)) {
    fail(source, `uses TIFF compression ${compression}, which this reader does not decode (it reads none, LZW, Deflate, PackBits, LERC and ZSTD); re-save it, e.g. gdal_translate -co COMPRESS=DEFLATE`);
  }
  // libtiff reads these per-sample tags with one value, or at least one per sample (TIFFReadDirEntryPersampleShort).
  for (const name of ['BitsPerSample', 'SampleFormat']) {
    const v = get(name);
    const count = v === undefined || typeof v === 'number' ? 1 : (v as ArrayLike<number>).length;
    if (count !== 1 && count < samplesPerPixel) fail(source, `${name} has ${count} values for ${samplesPerPixel} samples per pixel (TIFF 6.0 wants one per sample; GDAL refuses it too); re-save the file from its source`);
  }
  const bitsPerSample = allSame(source, 'BitsPerSample', get('BitsPerSample')) ?? 1;
  const sampleFormat = allSame(source, 'SampleFormat', get('SampleFormat')) ?? 1;
  const supported = (sampleFormat === 1 || sampleFormat === 2) ? [8, 16, 32].includes(bitsPerSample) : sampleFormat === 3 && (bitsPerSample === 32 || bitsPerSample === 64);
  if (!supported) {
    fail(source, `unsupported sample type (SampleFormat ${sampleFormat}, ${bitsPerSample} bits); use 8/16/32-bit integers or 32/64-bit floats, e.g. gdal_translate -ot Float32`);
  }
  const tiled = !fd.hasTag('StripOffsets' as never);
  let blockWidth: number;
  let blockHeight: number;
  if (tiled) {
    if (!fd.hasTag('TileOffsets' as never)) fail(source, 'has neither StripOffsets nor TileOffsets, so its pixels cannot be found; re-save it with GDAL');
    blockWidth = wholeNumber(source, 'TileWidth', get('TileWidth'), resave);
    blockHeight = wholeNumber(source, 'TileLength', get('TileLength'), resave);
  } else {
    blockWidth = width;
    // TIFF 6.0: RowsPerStrip defaults to 2^32 − 1 (one strip); values past the image height mean one strip.
    const rows = get('RowsPerStrip');
    blockHeight = Math.min(height, rows === undefined ? height : wholeNumber(source, 'RowsPerStrip', rows, resave));
  }
  const bytesPerPixel = (bitsPerSample / 8) * (planarTag === 1 ? samplesPerPixel : 1);
  const blockBytes = blockWidth * blockHeight * bytesPerPixel;
  if (blockBytes > MAX_BLOCK_BYTES) {
    const what = tiled ? `TileWidth × TileLength = ${blockWidth} × ${blockHeight}` : `ImageWidth × RowsPerStrip = ${blockWidth} × ${blockHeight}`;
    fail(source, `${what} pixels of ${bytesPerPixel} bytes make ${blockBytes} bytes per block, over the limit of ${MAX_BLOCK_BYTES} (256 MiB); re-tile it: gdal_translate -co TILED=YES`);
  }
  let predictor = 1;
  if (codecUsesPredictor(compression)) {
    predictor = Number(get('Predictor') ?? 1);
    if (predictor !== 1 && predictor !== 2 && predictor !== 3) {
      fail(source, `invalid Predictor: ${String(get('Predictor'))} (TIFF defines 1 none, 2 horizontal, 3 floating point; GDAL refuses others too); re-save the file from its source`);
    }
    // libtiff 4.5 (GDAL 3.6) does not read back its own big-endian Float64 files with the floating-point
    // predictor (measured: gdal_translate -ot Float64 -co ENDIANNESS=BIG -co PREDICTOR=3 then ReadAsArray
    // gives 1e-314 for -500000), so what such a file holds is ambiguous: refuse it.
    if (predictor === 3 && bitsPerSample === 64 && !image.littleEndian) {
      fail(source, 'is big-endian Float64 with the floating-point predictor (Predictor 3), which GDAL 3.6 itself misreads, so its heights are ambiguous; re-save it from its source as little-endian or without the predictor (gdal_translate -co ENDIANNESS=LITTLE)');
    }
    if (predictor === 3 && sampleFormat !== 3) fail(source, `Predictor 3 (floating point) on SampleFormat ${sampleFormat} data is invalid (GDAL refuses it too); re-save the file from its source`);
  }
  const lerc = get('LercParameters');
  return {
    width, height, tiled, blockWidth, blockHeight, samplesPerPixel, planar: planarTag as 1 | 2, bitsPerSample, sampleFormat,
    littleEndian: image.littleEndian, compression, predictor,
    ...(lerc !== undefined ? { lercParameters: Array.from(lerc as ArrayLike<number>, Number) } : {}),
  };
}

/** GDAL's cast of a double no-data value to the sample type (GDALCopyWords: NaN → 0, clamped, rounded). */
export function noDataAsSample(noData: number | null, layout: TiffLayout): number {
  if (noData === null) return 0;
  const { sampleFormat: f, bitsPerSample: b } = layout;
  if (f === 3) {
    if (b === 64 || !Number.isFinite(noData)) return noData;
    const max = 3.4028234663852886e38;
    return noData > max ? max : noData < -max ? -max : Math.fround(noData);
  }
  if (Number.isNaN(noData)) return 0;
  const min = f === 2 ? -(2 ** (b - 1)) : 0;
  const max = f === 2 ? 2 ** (b - 1) - 1 : 2 ** b - 1;
  const r = noData < 0 ? -Math.floor(-noData + 0.5) : Math.floor(noData + 0.5);
  return Math.min(max, Math.max(min, r));
}

type SampleReader = (view: DataView, byteOffset: number, littleEndian: boolean) => number;

function sampleReader(layout: TiffLayout): SampleReader {
  const { sampleFormat: f, bitsPerSample: b } = layout;
  if (f === 3) return b === 32 ? (v, o, le) => v.getFloat32(o, le) : (v, o, le) => v.getFloat64(o, le);
  if (b === 8) return f === 2 ? (v, o) => v.getInt8(o) : (v, o) => v.getUint8(o);
  if (b === 16) return f === 2 ? (v, o, le) => v.getInt16(o, le) : (v, o, le) => v.getUint16(o, le);
  return f === 2 ? (v, o, le) => v.getInt32(o, le) : (v, o, le) => v.getUint32(o, le);
}

/** Undoes Predictor 2 in place, row by row, in the file's byte order (libtiff horAcc8/16/32/64). */
function undoHorizontal(block: Uint8Array, rows: number, rowSamples: number, stride: number, bytes: number, le: boolean): void {
  const v = new DataView(block.buffer, block.byteOffset, block.byteLength);
  for (let r = 0; r < rows; r++) {
    const base = r * rowSamples * bytes;
    for (let i = stride; i < rowSamples; i++) {
      const o = base + i * bytes, p = o - stride * bytes;
      if (bytes === 1) block[o] = (block[o] + block[p]) & 0xff;
      else if (bytes === 2) v.setUint16(o, (v.getUint16(o, le) + v.getUint16(p, le)) & 0xffff, le);
      else if (bytes === 4) v.setUint32(o, (v.getUint32(o, le) + v.getUint32(p, le)) >>> 0, le);
      else v.setBigUint64(o, BigInt.asUintN(64, v.getBigUint64(o, le) + v.getBigUint64(p, le)), le);
    }
  }
}

/**
 * Undoes Predictor 3 in place (libtiff fpAcc): per row, byte differences with the pixel stride, then the
 * byte planes (most significant first) are interleaved back into words — stored big-endian here.
 */
function undoFloatingPoint(block: Uint8Array, rows: number, rowSamples: number, stride: number, bytes: number): void {
  const rowBytes = rowSamples * bytes;
  const tmp = new Uint8Array(rowBytes);
  for (let r = 0; r < rows; r++) {
    const row = block.subarray(r * rowBytes, (r + 1) * rowBytes);
    for (let i = stride; i < rowBytes; i++) row[i] = (row[i] + row[i - stride]) & 0xff;
    tmp.set(row);
    for (let w = 0; w < rowSamples; w++) for (let b = 0; b < bytes; b++) row[w * bytes + b] = tmp[b * rowSamples + w];
  }
}

async function indexed(image: GeoTIFFImage, tag: string, index: number): Promise<number> {
  const v = await image.getFileDirectory().loadValueIndexed(tag as never, index);
  return typeof v === 'bigint' ? Number(v) : Number(v);
}

/** What one readWindow call did: counted by the reader itself, for the memory figures of a read. */
export interface BlockReadStats {
  /** Blocks decoded (read from the file and decompressed), one at a time. */
  blocksDecoded: number;
  /** Blocks never written (byte count 0, GDAL SPARSE_OK): no bytes read, filled with the null value. */
  blocksSparse: number;
  /** Bytes of block data fetched from the source. */
  bytesRead: number;
  /** Largest decoded block, bytes: with its compressed bytes and a predictor copy, the per-block working set. */
  largestBlockBytes: number;
}

export function emptyBlockStats(): BlockReadStats {
  return { blocksDecoded: 0, blocksSparse: 0, bytesRead: 0, largestBlockBytes: 0 };
}

/**
 * Reads sample `band` (0-based) over the window [c0, r0, c1, r1) and hands each value to
 * `put(col, row, value)` with (col, row) relative to the window's corner. Values of never-written blocks are
 * `nullValue`. Only the blocks the window intersects are read, one at a time, from `file`.
 */
export async function readWindow(
  image: GeoTIFFImage,
  file: ByteSource,
  layout: TiffLayout,
  window: readonly [number, number, number, number],
  band: number,
  nullValue: number,
  put: (col: number, row: number, value: number) => void,
  source: string,
  stats: BlockReadStats = emptyBlockStats(),
): Promise<void> {
  const [c0, r0, c1, r1] = window;
  const { blockWidth: bw, blockHeight: bh, bitsPerSample, samplesPerPixel: spp, planar, littleEndian } = layout;
  const bytes = bitsPerSample / 8;
  const across = Math.ceil(layout.width / bw);
  const down = Math.ceil(layout.height / bh);
  const pixelSamples = planar === 1 ? spp : 1;
  const bx0 = Math.floor(c0 / bw), bx1 = Math.ceil(c1 / bw), by0 = Math.floor(r0 / bh), by1 = Math.ceil(r1 / bh);
  const rowsOf = (by: number) => (layout.tiled ? bh : Math.min(bh, layout.height - by * bh));
  let total = 0;
  for (let by = by0; by < by1; by++) total += (bx1 - bx0) * bw * rowsOf(by) * pixelSamples * bytes;
  if (total > MAX_DECODED_BYTES) {
    fail(source, `reading window [${c0}, ${r0}, ${c1}, ${r1}] would decode ${total} bytes of ${layout.tiled ? 'tiles' : 'strips'}, over the limit of ${MAX_DECODED_BYTES} (1 GiB); read a smaller window, build overviews so a coarse read decodes less (gdaladdo -r average FILE 2 4 8 16 32), or re-tile the file (gdal_translate -co TILED=YES)`);
  }
  if (layout.compression === 50000 || (layout.compression === 34887 && layout.lercParameters?.[1] === 2)) {
    try {
      await zstdReady();
    } catch (err) {
      fail(source, `is ZSTD-compressed, but ${err instanceof Error ? err.message : String(err)}; re-save it with gdal_translate -co COMPRESS=DEFLATE`);
    }
  }
  const offsetsTag = layout.tiled ? 'TileOffsets' : 'StripOffsets';
  const countsTag = layout.tiled ? 'TileByteCounts' : 'StripByteCounts';
  const read = sampleReader(layout);
  const valueLe = layout.predictor === 3 ? false : littleEndian;
  const sampleInPixel = planar === 1 ? band : 0;
  const planeOffset = planar === 2 ? band * across * down : 0;
  for (let by = by0; by < by1; by++) {
    const rows = rowsOf(by);
    for (let bx = bx0; bx < bx1; bx++) {
      const index = planeOffset + by * across + bx;
      const offset = await indexed(image, offsetsTag, index);
      const count = await indexed(image, countsTag, index);
      const at = `${countsTag}[${index}]`;
      if (!Number.isInteger(count) || count < 0) fail(source, `invalid ${at}: ${count} (the directory is corrupt or too short); re-save the file with GDAL`);
      const cx0 = Math.max(c0, bx * bw), cx1 = Math.min(c1, (bx + 1) * bw, layout.width);
      const ry0 = Math.max(r0, by * bh), ry1 = Math.min(r1, by * bh + rows);
      if (count === 0) {
        stats.blocksSparse++;
        for (let r = ry0; r < ry1; r++) for (let c = cx0; c < cx1; c++) put(c - c0, r - r0, nullValue);
        continue;
      }
      const expectedBytes = bw * rows * pixelSamples * bytes;
      // GDAL 3.6 reads an uncompressed tile of the last, partial tile row through libtiff's decoder for its
      // valid rows only, and refuses it when the byte count is below them ("DumpModeDecode: Not enough
      // data"); other uncompressed blocks are read at their declared size (measured with gdal_create tiles
      // of 40 × 30 pixels, 16 × 16 tiles: short counts on full tiles and on strips read).
      const validRows = Math.min(bh, layout.height - by * bh);
      if (layout.compression === 1 && layout.tiled && validRows < bh && count < bw * validRows * pixelSamples * bytes) {
        fail(source, `${at} = ${count} is less than the ${bw * validRows * pixelSamples * bytes} bytes of the tile's ${validRows} rows inside the image (GDAL refuses it too); the file is truncated or corrupt`);
      }
      // Uncompressed blocks are read at their declared size, as libtiff does; others by their byte count.
      const end = layout.compression === 1 ? offset + expectedBytes : offset + count;
      if (!Number.isInteger(offset) || offset <= 0 || offset > file.byteLength || end > file.byteLength) {
        fail(source, `${offsetsTag}[${index}] = ${offset} with ${at} = ${count} runs past the end of the ${file.byteLength}-byte file (truncated or corrupt); re-save the file from its source`);
      }
      const stored = await file.read(offset, end - offset);
      stats.blocksDecoded++;
      stats.bytesRead += stored.byteLength;
      stats.largestBlockBytes = Math.max(stats.largestBlockBytes, expectedBytes);
      let block: Uint8Array;
      try {
        block = decodeBlock(stored, {
          compression: layout.compression, expectedBytes, width: bw, height: rows, samples: pixelSamples,
          sampleFormat: layout.sampleFormat, bitsPerSample, lercParameters: layout.lercParameters,
        });
      } catch (err) {
        fail(source, `${layout.tiled ? 'tile' : 'strip'} ${index}: ${err instanceof Error ? err.message : String(err)}; the file is corrupt or truncated`);
      }
      if (layout.predictor !== 1) {
        block = block.slice(); // never change the caller's bytes
        if (layout.predictor === 2) undoHorizontal(block, rows, bw * pixelSamples, pixelSamples, bytes, littleEndian);
        else undoFloatingPoint(block, rows, bw * pixelSamples, pixelSamples, bytes);
      }
      const view = new DataView(block.buffer, block.byteOffset, block.byteLength);
      for (let r = ry0; r < ry1; r++) {
        const rowBase = (r - by * bh) * bw;
        for (let c = cx0; c < cx1; c++) {
          put(c - c0, r - r0, read(view, ((rowBase + c - bx * bw) * pixelSamples + sampleInPixel) * bytes, valueLe));
        }
      }
    }
  }
}

/** Layout tags that must hold unsigned integers (libtiff: "Incompatible type" otherwise). */
const INTEGER_TAGS = new Set([256, 257, 258, 259, 273, 277, 278, 279, 284, 317, 322, 323, 324, 325, 339]);

/** Bytes per value of the TIFF field types (TIFF 6.0 Section 2; BigTIFF adds 16–18). */
const FIELD_TYPE_BYTES: Record<number, number> = { 1: 1, 2: 1, 3: 2, 4: 4, 5: 8, 6: 1, 7: 1, 8: 2, 9: 4, 10: 8, 11: 4, 12: 8, 13: 4, 16: 8, 17: 8, 18: 8 };

/** The file's byte order and TIFF flavour, from its 16-byte header. */
export interface TiffHeader {
  littleEndian: boolean;
  bigTiff: boolean;
  /** Offset of the first image directory. */
  firstDirectory: number;
}

function u64(v: DataView, at: number, le: boolean): number {
  return Number(v.getBigUint64(at, le));
}

/** Reads and checks the header (TIFF 6.0 Section 2; BigTIFF). */
export async function readTiffHeader(file: ByteSource, source: string): Promise<TiffHeader> {
  const head = await file.read(0, 16);
  const v = new DataView(head.buffer, head.byteOffset, head.byteLength);
  const le = head[0] === 0x49;
  const magic = v.getUint16(2, le);
  const big = magic === 43;
  if (magic !== 42 && !big) fail(source, `not a TIFF file (version ${magic}, expected 42 or 43 for BigTIFF)`);
  if (big && (file.byteLength < 16 || v.getUint16(4, le) !== 8 || v.getUint16(6, le) !== 0)) fail(source, 'BigTIFF header is corrupt; re-save the file with GDAL');
  return { littleEndian: le, bigTiff: big, firstDirectory: big ? u64(v, 8, le) : v.getUint32(4, le) };
}

/**
 * Checks one image directory before the `geotiff` package parses it: its entries, and every value stored
 * outside an entry, must lie inside the file. This bounds what parsing allocates by the file's size (a
 * corrupt count cannot ask for gigabytes). Returns the offset of the next directory (0: none).
 */
export async function checkDirectoryAt(file: ByteSource, header: TiffHeader, at: number, source: string, which = 'first image directory'): Promise<number> {
  const { littleEndian: le, bigTiff: big } = header;
  const size = file.byteLength;
  const countBytes = big ? 8 : 2;
  const entryBytes = big ? 20 : 12;
  const inline = big ? 8 : 4;
  if (!(at >= 8 && at + countBytes <= size)) fail(source, `${which} offset ${at} is outside the ${size}-byte file (truncated or corrupt)`);
  const countView = await file.read(at, countBytes);
  const cv = new DataView(countView.buffer, countView.byteOffset, countView.byteLength);
  const entries = big ? u64(cv, 0, le) : cv.getUint16(0, le);
  if (entries < 1 || at + countBytes + entries * entryBytes > size) {
    fail(source, `image directory at ${at} declares ${entries} entries, which do not fit in the ${size}-byte file (truncated or corrupt)`);
  }
  const tableBytes = entries * entryBytes + (big ? 8 : 4);
  const table = await file.read(at + countBytes, tableBytes);
  const v = new DataView(table.buffer, table.byteOffset, table.byteLength);
  for (let e = 0; e < entries; e++) {
    const p = e * entryBytes;
    const tagId = v.getUint16(p, le);
    const type = v.getUint16(p + 2, le);
    const bytesPer = FIELD_TYPE_BYTES[type];
    if (bytesPer === undefined) continue; // unknown field types are skipped by readers (TIFF 6.0)
    const count = big ? u64(v, p + 4, le) : v.getUint32(p + 4, le);
    if (INTEGER_TAGS.has(tagId) && ![1, 3, 4, 16].includes(type)) {
      fail(source, `tag ${tagId} is stored as TIFF type ${type}, but TIFF 6.0 requires an unsigned integer type there (GDAL refuses it too); re-save the file with GDAL`);
    }
    const length = count * bytesPer;
    if (length <= inline) continue;
    const offset = big ? u64(v, p + 12, le) : v.getUint32(p + 8, le);
    if (offset + length > size) {
      fail(source, `directory entry for tag ${tagId} declares ${count} values (${length} bytes) at offset ${offset}, past the end of the ${size}-byte file (truncated or corrupt)`);
    }
  }
  // The next-directory offset follows the entries; a table cut by the end of the file has none.
  const nextAt = entries * entryBytes;
  if (table.byteLength < nextAt + (big ? 8 : 4)) return 0;
  return big ? u64(v, nextAt, le) : v.getUint32(nextAt, le);
}
