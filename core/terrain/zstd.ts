/**
 * Zstandard (RFC 8878) for TIFF blocks (Compression 50000, GDAL's ZSTD) and LERC_ZSTD blobs, bounded by
 * the block. Decompression is done by fzstd (pure JavaScript, so it also runs in the app's worker, whose
 * content policy allows no fetch of inline WebAssembly); fzstd neither reports how much it wrote nor
 * bounds its own work, so the frame is checked first by `zstdFrame` (RFC 8878, 3.1.1):
 * - one Zstandard frame: skippable frames, content checksums and dictionaries are refused (GDAL's writer,
 *   libtiff's tif_zstd.c and tif_lerc.c, writes none of them); bytes after the frame are ignored, as
 *   libtiff ignores them (it stops at the end of the first frame);
 * - the reserved header bit and reserved block type are refused (RFC 8878 3.1.1.1.1, 3.1.1.2.2);
 * - Window_Size at most 2^27 = 128 MiB: libzstd's default limit for streaming decompression
 *   (ZSTD_WINDOWLOG_LIMIT_DEFAULT), which is how GDAL's libtiff decodes, so GDAL refuses larger windows too.
 *   No window is allocated here: the frame is decoded in one pass into the block's buffer (the block plus
 *   128 KiB, see decodeSized);
 * - every block's size at most Block_Maximum_Size = min(Window_Size, 128 KiB) (RFC 8878 3.1.1.2.4);
 * - Frame_Content_Size, when present, equals the block's size (ZSTD) or fits the LERC bound;
 * - the most a frame can decode to — raw and RLE blocks their size, compressed blocks Block_Maximum_Size
 *   each — is at most MAX_ZSTD_WORK_FACTOR × the block + 128 KiB. fzstd keeps decoding past the end of the
 *   buffer (and drops those bytes), so this bounds its time by the block size. GDAL's level-22 files
 *   measured 3.75× at most (libzstd's block splitter makes many small blocks; 1024² Float32 terrain).
 */
import { decompress } from 'fzstd';

/** libzstd's default window limit for streaming decompression (zstd.h, ZSTD_WINDOWLOG_LIMIT_DEFAULT = 27). */
export const MAX_ZSTD_WINDOW_BYTES = 2 ** 27;
/** Block_Maximum_Size cap (RFC 8878 3.1.1.2.4). */
const MAX_ZSTD_BLOCK = 128 * 1024;
/** A frame may declare at most this many times the block (plus 128 KiB) of output; see above. */
export const MAX_ZSTD_WORK_FACTOR = 32;

export interface ZstdFrame {
  /** Frame_Content_Size, or null when the frame does not declare it. */
  contentSize: number | null;
  windowSize: number;
  /** Offset just past the frame (its last block). */
  end: number;
  /** Upper bound of the decoded size from the block headers. */
  maxOutput: number;
}

/** Parses and checks one Zstandard frame's header and block headers (RFC 8878 3.1.1); throws on any problem. */
export function zstdFrame(input: Uint8Array, expectedBytes: number): ZstdFrame {
  const n = input.length;
  if (n < 4) throw new Error(`ZSTD data is ${n} bytes long, too short for a frame`);
  const magic = (input[0] | (input[1] << 8) | (input[2] << 16) | (input[3] << 24)) >>> 0;
  if ((magic & 0xfffffff0) === 0x184d2a50) throw new Error('ZSTD data starts with a skippable frame, which GDAL never writes in a TIFF block');
  if (magic !== 0xfd2fb528) throw new Error(`ZSTD data does not start with the Zstandard magic number (0x${magic.toString(16)})`);
  if (n < 6) throw new Error('ZSTD frame header is cut off');
  const fhd = input[4];
  const fcsFlag = fhd >> 6, singleSegment = (fhd >> 5) & 1, reserved = (fhd >> 3) & 1, checksum = (fhd >> 2) & 1, didFlag = fhd & 3;
  if (reserved) throw new Error('ZSTD frame header has its reserved bit set (RFC 8878 3.1.1.1.1)');
  if (checksum) throw new Error('ZSTD frame has a content checksum, which GDAL never writes in a TIFF block and this reader does not verify');
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
  const workLimit = MAX_ZSTD_WORK_FACTOR * expectedBytes + MAX_ZSTD_BLOCK;
  let maxOutput = 0;
  for (;;) {
    if (p + 3 > n) throw new Error(`ZSTD frame is cut off after ${p} of its bytes (no last block)`);
    const h = input[p] | (input[p + 1] << 8) | (input[p + 2] << 16);
    p += 3;
    const last = h & 1, type = (h >> 1) & 3, size = h >>> 3;
    if (type === 3) throw new Error('ZSTD block of the reserved type 3 (RFC 8878 3.1.1.2.2)');
    if (size > blockMax) throw new Error(`ZSTD block of ${size} bytes is over the frame's Block_Maximum_Size of ${blockMax} (RFC 8878 3.1.1.2.4)`);
    p += type === 1 ? 1 : size;
    if (p > n) throw new Error('ZSTD frame is cut off inside a block');
    maxOutput += type === 2 ? blockMax : size;
    if (maxOutput > workLimit) {
      throw new Error(`ZSTD frame's blocks may decode to more than ${workLimit} bytes (${MAX_ZSTD_WORK_FACTOR} times the block's ${expectedBytes} plus 128 KiB); re-save the file with a lower ZSTD_LEVEL or DEFLATE`);
    }
    if (last) break;
  }
  return { contentSize, windowSize, end: p, maxOutput };
}

/**
 * Decodes one checked frame into a buffer of `size` bytes plus Block_Maximum_Size (128 KiB); returns the
 * first `size` bytes, or null when the frame's output ends before them.
 */
function decodeSized(frame: Uint8Array, size: number): Uint8Array | null {
  // fzstd writes the frame's output as one run from the start of the buffer (dropping what falls past
  // its end), but parks each block's literals at the buffer's end before moving them into place: with
  // 128 KiB to spare past `size`, nothing but the output itself lands before `size`. Whether the output
  // reached the last byte is told by a marker there, checked with two different markers (a written
  // byte may equal one of them; decoding is deterministic, so it writes the same byte both times).
  const out = new Uint8Array(size + MAX_ZSTD_BLOCK);
  for (const marker of [0xa5, 0x5a]) {
    out.fill(0);
    out[size - 1] = marker;
    decompress(frame, out);
    if (out[size - 1] !== marker) return out.subarray(0, size);
  }
  return null;
}

function fzstdError(err: unknown): Error {
  return new Error(`ZSTD data is corrupt (${err instanceof Error ? err.message : String(err)})`, { cause: err });
}

/**
 * A TIFF block's ZSTD data → exactly `expectedBytes`. Too little data is an error (libtiff: "Not enough
 * data"); data past the block is dropped, as libtiff stops when the block is full.
 */
export function zstdExactly(input: Uint8Array, expectedBytes: number): Uint8Array {
  const f = zstdFrame(input, expectedBytes);
  if (f.contentSize !== null && f.contentSize !== expectedBytes) {
    throw new Error(`ZSTD frame declares ${f.contentSize} bytes of content, but the block holds ${expectedBytes}`);
  }
  if (f.maxOutput < expectedBytes) throw new Error(`ZSTD data decodes to at most ${f.maxOutput} of the block's ${expectedBytes} bytes`);
  let out: Uint8Array | null;
  try {
    out = decodeSized(input.subarray(0, f.end), expectedBytes);
  } catch (err) {
    throw fzstdError(err);
  }
  if (!out) throw new Error(`ZSTD data ends before filling the block's ${expectedBytes} bytes`);
  return out;
}

/**
 * A ZSTD frame of at most `limit` bytes whose size the frame declares (LERC_ZSTD: GDAL's tif_lerc.c
 * compresses the LERC blob with ZSTD_compress, which always writes Frame_Content_Size).
 */
export function zstdUpTo(input: Uint8Array, limit: number, what: string): Uint8Array {
  const f = zstdFrame(input, limit);
  if (f.contentSize === null) throw new Error(`${what} frame does not declare its content size (GDAL's writer always does)`);
  const size = f.contentSize;
  if (size > limit) throw new Error(`${what} frame declares ${size} bytes, more than the block can hold (${limit})`);
  if (size === 0 || f.maxOutput < size) throw new Error(`${what} frame declares ${size} bytes but its blocks hold at most ${f.maxOutput}`);
  let out: Uint8Array | null;
  try {
    out = decodeSized(input.subarray(0, f.end), size);
  } catch (err) {
    throw fzstdError(err);
  }
  if (!out) throw new Error(`${what} frame ends before its declared ${size} bytes`);
  return out;
}
