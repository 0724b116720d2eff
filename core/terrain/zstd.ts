/**
 * Zstandard (RFC 8878) for TIFF blocks (Compression 50000, GDAL's ZSTD) and LERC_ZSTD blobs, bounded by
 * the block. Decompression is done by libzstd itself — the library GDAL's libtiff decodes ZSTD with —
 * compiled to WebAssembly (the zstddec package, also what the `geotiff` package uses), in one pass into a
 * buffer of the block's size: libzstd refuses to write past it, checks every block and bitstream, and
 * reports a short frame by the size it returns. A pure-JavaScript decoder (fzstd 0.1.1) was tried first:
 * on 2,000 single-byte corruptions of a ZSTD strip it read 417 that libzstd (and so GDAL) refuses as
 * corrupt. The frame is checked before decoding (`zstdFrame`, RFC 8878 3.1.1), for GDAL's behaviour where
 * one-pass decoding differs from libtiff's streaming decoding, and for clear messages:
 * - one Zstandard frame: a leading skippable frame and dictionaries are refused (GDAL's writers, libtiff's
 *   tif_zstd.c and tif_lerc.c, write neither); bytes after the frame are ignored in a ZSTD block, as
 *   libtiff ignores them (it stops at the end of the first frame), and refused in a LERC_ZSTD block (GDAL's
 *   one-pass ZSTD_decompress reads them as a further frame and fails);
 * - the reserved header bit and the reserved block type are refused (RFC 8878 3.1.1.1.1, 3.1.1.2.2);
 * - Window_Size at most 2^27 = 128 MiB: libzstd's default limit for streaming decompression
 *   (ZSTD_WINDOWLOG_LIMIT_DEFAULT, zstd.h — value from memory, confirmed against GDAL by
 *   gdal-dem-findings.test.ts: a 256 MiB window is refused, 128 MiB read), which is how GDAL's libtiff
 *   decodes, so GDAL refuses larger windows too.
 *   One-pass decoding allocates no window: memory is the block (and the compressed bytes) only;
 * - every block's size at most Block_Maximum_Size = min(Window_Size, 128 KiB) (RFC 8878 3.1.1.2.4);
 * - Frame_Content_Size, when present, equals the block's size (ZSTD) or fits the LERC bound.
 * A frame that decodes to more than its block is refused (libtiff would keep the first block's worth).
 */
import { ZSTDDecoder } from 'zstddec';

/** libzstd's default window limit for streaming decompression (zstd.h, ZSTD_WINDOWLOG_LIMIT_DEFAULT = 27). */
export const MAX_ZSTD_WINDOW_BYTES = 2 ** 27;
/** Block_Maximum_Size cap (RFC 8878 3.1.1.2.4). */
const MAX_ZSTD_BLOCK = 128 * 1024;

export interface ZstdFrame {
  /** Frame_Content_Size, or null when the frame does not declare it. */
  contentSize: number | null;
  windowSize: number;
  /** Offset just past the frame (its last block and checksum). */
  end: number;
}

let decoder: ZSTDDecoder | null = null;
let starting: Promise<void> | null = null;

/** Starts the WebAssembly decoder once (it is compiled from bytes held in the package); await before decoding. */
export async function zstdReady(): Promise<void> {
  if (decoder) return;
  const d = new ZSTDDecoder();
  starting ??= d.init();
  try {
    await starting;
  } catch (err) {
    starting = null;
    throw new Error(`the ZSTD decoder (WebAssembly) could not start: ${err instanceof Error ? err.message : String(err)}`, { cause: err });
  }
  decoder = d;
}

/** Parses and checks one Zstandard frame's header and block headers (RFC 8878 3.1.1); throws on any problem. */
export function zstdFrame(input: Uint8Array): ZstdFrame {
  const n = input.length;
  if (n < 4) throw new Error(`ZSTD data is ${n} bytes long, too short for a frame`);
  const magic = (input[0] | (input[1] << 8) | (input[2] << 16) | (input[3] << 24)) >>> 0;
  if ((magic & 0xfffffff0) === 0x184d2a50) throw new Error('ZSTD data starts with a skippable frame, which GDAL never writes in a TIFF block');
  if (magic !== 0xfd2fb528) throw new Error(`ZSTD data does not start with the Zstandard magic number (0x${magic.toString(16)})`);
  if (n < 6) throw new Error('ZSTD frame header is cut off');
  const fhd = input[4];
  const fcsFlag = fhd >> 6, singleSegment = (fhd >> 5) & 1, reserved = (fhd >> 3) & 1, checksum = (fhd >> 2) & 1, didFlag = fhd & 3;
  if (reserved) throw new Error('ZSTD frame header has its reserved bit set (RFC 8878 3.1.1.1.1)');
  let p = 5;
  let windowSize = 0;
  if (!singleSegment) {
    const wd = input[p++];
    const windowLog = 10 + (wd >> 3);
    windowSize = 2 ** windowLog + (2 ** windowLog / 8) * (wd & 7);
  }
  const didBytes = [0, 1, 2, 4][didFlag];
  const fcsBytes = [singleSegment, 2, 4, 8][fcsFlag];
  if (p + didBytes + fcsBytes > n) throw new Error('ZSTD frame header is cut off');
  let dictionary = 0;
  for (let i = didBytes - 1; i >= 0; i--) dictionary = dictionary * 256 + input[p + i];
  p += didBytes;
  if (dictionary !== 0) throw new Error(`ZSTD frame needs dictionary ${dictionary}; TIFF blocks are written without one`);
  let contentSize: number | null = null;
  if (fcsBytes > 0) {
    let v = 0;
    for (let i = fcsBytes - 1; i >= 0; i--) v = v * 256 + input[p + i];
    contentSize = fcsBytes === 2 ? v + 256 : v;
    p += fcsBytes;
  }
  if (singleSegment) windowSize = contentSize as number;
  if (windowSize > MAX_ZSTD_WINDOW_BYTES) {
    throw new Error(`ZSTD frame asks for a ${windowSize}-byte window, over libzstd's default limit of ${MAX_ZSTD_WINDOW_BYTES} (128 MiB) that GDAL decodes with`);
  }
  const blockMax = Math.min(windowSize, MAX_ZSTD_BLOCK);
  for (;;) {
    if (p + 3 > n) throw new Error(`ZSTD frame is cut off after ${p} of its bytes (no last block)`);
    const h = input[p] | (input[p + 1] << 8) | (input[p + 2] << 16);
    p += 3;
    const last = h & 1, type = (h >> 1) & 3, size = h >>> 3;
    if (type === 3) throw new Error('ZSTD block of the reserved type 3 (RFC 8878 3.1.1.2.2)');
    if (size > blockMax) throw new Error(`ZSTD block of ${size} bytes is over the frame's Block_Maximum_Size of ${blockMax} (RFC 8878 3.1.1.2.4)`);
    p += type === 1 ? 1 : size;
    if (p > n) throw new Error('ZSTD frame is cut off inside a block');
    if (last) break;
  }
  if (checksum) {
    p += 4; // Content_Checksum (XXH64, low 4 bytes), verified by libzstd
    if (p > n) throw new Error('ZSTD frame is cut off in its checksum');
  }
  return { contentSize, windowSize, end: p };
}

/** One checked frame → exactly `size` bytes, or an error saying how it differs. */
function decodeSized(frame: Uint8Array, size: number, what: string): Uint8Array {
  if (!decoder) throw new Error('the ZSTD decoder was not started (call zstdReady first)');
  // zstddec hands libzstd's size_t result back as a signed 32-bit number: an error code is negative and
  // gives an empty result (checked: a corrupt frame decodes to 0 bytes).
  const out = decoder.decode(frame, size);
  if (out.length === size) return out;
  if (out.length === 0) throw new Error(`${what} data is corrupt or decodes to more than the block's ${size} bytes (libzstd refuses it)`);
  throw new Error(`${what} data ends after ${out.length} of the block's ${size} bytes`);
}

/**
 * A TIFF block's ZSTD data → exactly `expectedBytes`. Too little data is an error (libtiff: "Not enough
 * data"); so is more (see above).
 */
export function zstdExactly(input: Uint8Array, expectedBytes: number): Uint8Array {
  const f = zstdFrame(input);
  if (f.contentSize !== null && f.contentSize !== expectedBytes) {
    throw new Error(`ZSTD frame declares ${f.contentSize} bytes of content, but the block holds ${expectedBytes}`);
  }
  return decodeSized(input.subarray(0, f.end), expectedBytes, 'ZSTD');
}

/**
 * A ZSTD frame of at most `limit` bytes whose size the frame declares (LERC_ZSTD: GDAL's tif_lerc.c
 * compresses the LERC blob with ZSTD_compress, which always writes Frame_Content_Size).
 */
export function zstdUpTo(input: Uint8Array, limit: number, what: string): Uint8Array {
  const f = zstdFrame(input);
  // GDAL's LERC codec decodes the whole block with ZSTD_decompress, which reads any bytes after the frame
  // as another frame: GDAL refuses such a block, so do we.
  if (f.end !== input.length) throw new Error(`${what} block holds ${input.length - f.end} bytes after its ZSTD frame`);
  if (f.contentSize === null) throw new Error(`${what} frame does not declare its content size (GDAL's writer always does)`);
  const size = f.contentSize;
  if (size > limit) throw new Error(`${what} frame declares ${size} bytes, more than the block can hold (${limit})`);
  if (size === 0) throw new Error(`${what} frame is empty`);
  return decodeSized(input.subarray(0, f.end), size, what);
}
