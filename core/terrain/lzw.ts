/**
 * A bounded TIFF LZW decoder (TIFF 6.0, Section 13: MSB-first codes of 9–12 bits, Clear = 256,
 * EndOfInformation = 257, "early change" of code width). It writes into a buffer of the block's declared
 * size and stops when that is full, so neither memory nor time can grow past the declared size.
 *
 * Where a stream is damaged it follows libtiff (tif_lzw.c), the decoder GDAL reads with, so that we read
 * what GDAL reads or refuse: the first code must be Clear; a code past the table's next entry, or a
 * non-literal code right after Clear, is an error; the table may run up to 1024 entries past the 4096
 * codes can name before it is an error; output beyond the block is ignored; a stream that ends (EOI or
 * no more bits) before the block is full is an error. Old-style (pre-TIFF 6.0, LSB-first) LZW, which
 * libtiff recognises by its first two bytes, is refused rather than decoded.
 */

const CLEAR = 256;
const EOI = 257;
/** libtiff's table size: MAXCODE(12) + 1024 (tif_lzw.c, CSIZE). */
const TABLE_LIMIT = 4095 + 1024;

/**
 * Decodes one LZW block into exactly `expectedBytes` bytes. Throws an Error (message for the user) on an
 * invalid code, too little data, or an old-style stream.
 */
export function decodeTiffLzw(input: Uint8Array, expectedBytes: number): Uint8Array {
  if (input.length >= 2 && input[0] === 0 && (input[1] & 1) === 1) {
    throw new Error('old-style (pre-TIFF 6.0) LZW data is not read; re-save the file, e.g. gdal_translate -co COMPRESS=LZW');
  }
  const prefix = new Int32Array(4096);
  const suffix = new Uint8Array(4096);
  const first = new Uint8Array(4096);
  const length = new Int32Array(4096);
  for (let i = 0; i < 256; i++) { prefix[i] = -1; suffix[i] = i; first[i] = i; length[i] = 1; }
  const out = new Uint8Array(expectedBytes);
  const scratch = new Uint8Array(4096);
  let n = 0;
  let next = 258;
  let width = 9;
  let bitPos = 0;
  const totalBits = input.length * 8;
  const read = (): number => {
    if (bitPos + width > totalBits) return EOI; // out of bits: stop (too little data is caught below)
    let v = 0;
    for (let k = 0; k < width; k++) {
      const p = bitPos + k;
      v = (v << 1) | ((input[p >> 3] >> (7 - (p & 7))) & 1);
    }
    bitPos += width;
    return v;
  };
  /** Writes the code's string; returns false once the block is full (the rest is ignored, as libtiff does). */
  const emit = (code: number): boolean => {
    const len = length[code];
    const room = expectedBytes - n;
    if (len <= room) {
      let c = code;
      for (let i = n + len - 1; i >= n; i--) { out[i] = suffix[c]; c = prefix[c]; }
      n += len;
      return n < expectedBytes;
    }
    let c = code;
    for (let i = len - 1; i >= 0; i--) { scratch[i] = suffix[c]; c = prefix[c]; }
    out.set(scratch.subarray(0, room), n);
    n = expectedBytes;
    return false;
  };
  const add = (pre: number, ch: number) => {
    if (next >= TABLE_LIMIT) throw new Error(`corrupt LZW data (code table overflows ${TABLE_LIMIT} entries without a Clear code)`);
    if (next < 4096) {
      prefix[next] = pre;
      suffix[next] = ch;
      first[next] = first[pre];
      length[next] = length[pre] + 1;
    }
    next++;
    if (next + 1 >= 1 << width && width < 12) width++; // early change (TIFF 6.0 §13)
  };
  let old = -1;
  let started = false;
  while (n < expectedBytes) {
    const code = read();
    if (code === EOI) break;
    if (code === CLEAR) { next = 258; width = 9; old = -1; started = true; continue; }
    if (!started) throw new Error('corrupt LZW data (the stream does not start with a Clear code)');
    if (old === -1) {
      if (code > 255) throw new Error(`corrupt LZW data (code ${code} right after a Clear code)`);
      old = code;
      if (!emit(code)) break;
      continue;
    }
    if (code < next && code < 4096) {
      add(old, first[code]);
      old = code;
      if (!emit(code)) break;
    } else if (code === next && next < 4096) {
      add(old, first[old]);
      old = code;
      if (!emit(code)) break;
    } else {
      throw new Error(`corrupt LZW data (code ${code}, but the table has ${Math.min(next, 4096)} entries)`);
    }
  }
  if (n < expectedBytes) throw new Error(`LZW data ends after ${n} of the block's ${expectedBytes} bytes`);
  return out;
}
