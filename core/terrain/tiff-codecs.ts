/**
 * Bounded decoders for one TIFF strip or tile: each returns exactly the block's declared size in bytes or
 * throws, and none of them can allocate or work past that size (plus a fixed margin), whatever the input
 * says. Where data is damaged they follow libtiff, the library GDAL reads GeoTIFFs with, so a block is
 * either read as GDAL reads it or refused:
 * - too little data for the block is an error (libtiff: "Not enough data");
 * - data beyond the block is ignored (libtiff stops decoding when the block is full).
 * Decompression itself is done by libraries: pako (a port of zlib) for Deflate, lerc (Esri's decoder) for
 * LERC, libzstd (zstddec, WebAssembly) for ZSTD behind the frame checks of zstd.ts; LZW (lzw.ts) and PackBits are small enough to
 * hold here with libtiff's rules.
 */
import { Inflate } from 'pako';
import Lerc from 'lerc';
import { decodeTiffLzw } from './lzw.ts';
import { zstdExactly, zstdUpTo } from './zstd.ts';

/** TIFF Compression codes read, with their names. */
export const TIFF_COMPRESSIONS: Readonly<Record<number, string>> = { 1: 'none', 5: 'LZW', 8: 'Deflate', 32946: 'Deflate', 32773: 'PackBits', 34887: 'LERC', 50000: 'ZSTD' };

/** Codecs that take a Predictor (libtiff sets up the predictor for LZW, Deflate, ZSTD and LZMA only). */
export function codecUsesPredictor(compression: number): boolean {
  return compression === 5 || compression === 8 || compression === 32946 || compression === 50000;
}

/** What a block decoder needs to know about the block besides its bytes. */
export interface BlockCodecContext {
  compression: number;
  /** Decoded size of the block in bytes (declared by the file's tags). */
  expectedBytes: number;
  /** LERC: block width and height in pixels, samples per pixel in the block, TIFF sample type. */
  width: number;
  height: number;
  samples: number;
  sampleFormat: number;
  bitsPerSample: number;
  /** LERC: the LercParameters tag ([version, additional compression]). */
  lercParameters?: readonly number[];
}

export function decodeBlock(input: Uint8Array, ctx: BlockCodecContext): Uint8Array {
  switch (ctx.compression) {
    case 1:
      // libtiff reads an uncompressed block's declared size from its offset, whatever its byte count says
      // (TIFFReadEncodedStrip / TIFFReadEncodedTile): the caller passes the bytes from the offset on.
      if (input.length < ctx.expectedBytes) throw new Error(`uncompressed block needs ${ctx.expectedBytes} bytes but the file ends after ${input.length}`);
      return input.subarray(0, ctx.expectedBytes);
    case 5:
      return decodeTiffLzw(input, ctx.expectedBytes);
    case 8:
    case 32946:
      return inflateExactly(input, ctx.expectedBytes, 'Deflate');
    case 32773:
      return decodePackBits(input, ctx.expectedBytes);
    case 34887:
      return decodeLerc(input, ctx);
    case 50000:
      return zstdExactly(input, ctx.expectedBytes);
    default:
      throw new Error(`compression ${ctx.compression} is not decoded`);
  }
}

/**
 * zlib stream → exactly `expectedBytes` (libtiff's ZIPDecode): the output buffer is the block plus one
 * byte, so decoding stops there whatever the stream says. A stream that ends short is an error (libtiff:
 * "Not enough data"); so is one that goes on past the block, because GDAL's libtiff (with libdeflate)
 * leaves the block's tail unspecified then — measured: it reads other values than the stream holds.
 * `windowBits: 15` keeps pako to the zlib format, as libtiff's inflateInit does (no gzip).
 */
export function inflateExactly(input: Uint8Array, expectedBytes: number, what: string): Uint8Array {
  const inflater = new Inflate({ windowBits: 15, chunkSize: expectedBytes + 1 });
  let out: Uint8Array | null = null;
  const over = new Error(`${what} data decodes to more than the block's ${expectedBytes} bytes`);
  inflater.onData = (chunk) => {
    if (chunk.length > expectedBytes) throw over; // stop at once: nothing past the block is decoded
    out = chunk;
  };
  inflater.push(input, true);
  const got = out as Uint8Array | null;
  if (inflater.err) throw new Error(`${what} data is corrupt (${inflater.msg || `zlib status ${inflater.err}`})`);
  if (got !== null && got.length === expectedBytes) {
    if (inflater.ended) return got;
    throw new Error(`${what} stream is cut off after the block's data (no end of stream)`);
  }
  throw new Error(`${what} data ends after ${got?.length ?? 0} of the block's ${expectedBytes} bytes`);
}

/**
 * PackBits (TIFF 6.0, Section 9) with libtiff's rules (tif_packbits.c): header n ≥ 0 copies n + 1 bytes,
 * n in −127…−1 repeats the next byte 1 − n times, −128 is a no-op; output past the block is dropped.
 */
export function decodePackBits(input: Uint8Array, expectedBytes: number): Uint8Array {
  const out = new Uint8Array(expectedBytes);
  let i = 0;
  let n = 0;
  while (i < input.length && n < expectedBytes) {
    let h = input[i++];
    if (h >= 128) h -= 256;
    if (h === -128) continue;
    if (h < 0) {
      if (i >= input.length) break;
      const count = Math.min(1 - h, expectedBytes - n);
      out.fill(input[i++], n, n + count);
      n += count;
    } else {
      const count = Math.min(h + 1, expectedBytes - n);
      if (i + h + 1 > input.length) break; // libtiff stops: "lack of data"
      out.set(input.subarray(i, i + count), n);
      n += count;
      i += h + 1;
    }
  }
  if (n < expectedBytes) throw new Error(`PackBits data ends after ${n} of the block's ${expectedBytes} bytes`);
  return out;
}

/** LERC2 pixel type codes (Lerc2::DataType) by TIFF sample type. */
function lercType(sampleFormat: number, bits: number): number {
  if (sampleFormat === 3) return bits === 32 ? 6 : bits === 64 ? 7 : -1;
  const signed = sampleFormat === 2;
  return bits === 8 ? (signed ? 0 : 1) : bits === 16 ? (signed ? 2 : 3) : bits === 32 ? (signed ? 4 : 5) : -1;
}

/**
 * One LERC2 blob (GDAL's LERC codec), optionally wrapped in Deflate (LercParameters[1] = 1, LERC_DEFLATE)
 * or ZSTD (2, LERC_ZSTD). The blob's
 * header is checked against the block before decoding, because the decoder sizes its output from it.
 * Masked pixels of float blocks read as NaN, as GDAL's codec writes them; others keep the decoded value.
 */
function decodeLerc(input: Uint8Array, ctx: BlockCodecContext): Uint8Array {
  const extra = ctx.lercParameters?.[1] ?? 0;
  let blob = input;
  // A LERC blob is at most its raw pixels plus a mask and headers; twice the block plus 64 KiB bounds it.
  const blobLimit = 2 * ctx.expectedBytes + 65536;
  if (extra === 1) blob = inflateUpTo(input, blobLimit, 'LERC_DEFLATE');
  else if (extra === 2) blob = zstdUpTo(input, blobLimit, 'LERC_ZSTD');
  else if (extra !== 0) throw new Error(`LERC with additional compression ${extra} (GDAL writes 0 none, 1 Deflate, 2 ZSTD) is not read; re-save with -co COMPRESS=LERC`);
  const view = new DataView(blob.buffer, blob.byteOffset, blob.byteLength);
  if (blob.length < 66 || String.fromCharCode(...blob.subarray(0, 6)) !== 'Lerc2 ') throw new Error('LERC block does not start with a Lerc2 header');
  const version = view.getInt32(6, true);
  if (version < 2 || version > 5) throw new Error(`LERC2 version ${version} is not read`);
  let p = version >= 3 ? 14 : 10;
  const height = view.getUint32(p, true);
  const width = view.getUint32(p + 4, true);
  const dims = version >= 4 ? view.getUint32(p + 8, true) : 1;
  p += version >= 4 ? 12 : 8;
  const blobSize = view.getInt32(p + 8, true);
  const type = view.getInt32(p + 12, true);
  if (width !== ctx.width || height !== ctx.height || dims !== ctx.samples || type !== lercType(ctx.sampleFormat, ctx.bitsPerSample)) {
    throw new Error(`LERC block is ${width} × ${height} × ${dims} of type ${type}, but the file declares ${ctx.width} × ${ctx.height} × ${ctx.samples} of type ${lercType(ctx.sampleFormat, ctx.bitsPerSample)}`);
  }
  // GDAL writes one blob per block and refuses blocks whose bytes disagree with it: so do we.
  if (blobSize !== blob.length) throw new Error(`LERC blob declares ${blobSize} bytes but the block holds ${blob.length}`);
  const own = blob.slice(0, blobSize).buffer;
  let decoded;
  try {
    decoded = Lerc.decode(own, { returnPixelInterleavedDims: true });
  } catch (err) {
    throw new Error(`LERC data is corrupt (${err instanceof Error ? err.message : String(err)})`, { cause: err });
  }
  const pixels = decoded.pixels[0] as unknown as ArrayLike<number> & { buffer: ArrayBufferLike; byteOffset: number; byteLength: number };
  if (!pixels || pixels.byteLength !== ctx.expectedBytes) throw new Error(`LERC block decodes to ${pixels?.byteLength ?? 0} bytes, expected ${ctx.expectedBytes}`);
  const mask = decoded.mask;
  if (mask && ctx.sampleFormat === 3) {
    const values = pixels as unknown as Float32Array | Float64Array;
    for (let k = 0; k < mask.length; k++) {
      if (!mask[k]) for (let d = 0; d < ctx.samples; d++) values[k * ctx.samples + d] = NaN;
    }
  }
  return new Uint8Array(pixels.buffer, pixels.byteOffset, pixels.byteLength);
}

/** zlib stream of unknown decoded size, refused past `limit` bytes (the stream must end within it). */
function inflateUpTo(input: Uint8Array, limit: number, what: string): Uint8Array {
  const chunks: Uint8Array[] = [];
  let total = 0;
  const inflater = new Inflate({ windowBits: 15, chunkSize: 65536 });
  inflater.onData = (chunk) => {
    total += chunk.length;
    if (total > limit) throw new Error(`${what} data decodes to more than ${limit} bytes, more than the block can hold`);
    chunks.push(chunk.slice());
  };
  inflater.push(input, true);
  if (inflater.err || !inflater.ended) throw new Error(`${what} data is corrupt or truncated (${inflater.msg || 'no end of stream'})`);
  const out = new Uint8Array(total);
  let o = 0;
  for (const c of chunks) { out.set(c, o); o += c.length; }
  return out;
}
