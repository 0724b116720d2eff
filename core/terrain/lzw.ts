/**
 * A bounded TIFF LZW decoder (TIFF 6.0, Section 13: MSB-first codes of 9–12 bits, Clear = 256,
 * EndOfInformation = 257, "early change" of code width), registered with `geotiff` for Compression 5.
 * It replaces the package's own LZW decoder, which seeded fuzzing showed can grow without bound on
 * corrupt data and crash the process. Output is capped at the block's expected size; invalid codes
 * are errors.
 */
import { BaseDecoder, addDecoder } from 'geotiff';

const CLEAR = 256;
const EOI = 257;

/** Decodes one LZW block; `maxBytes` caps the output. Throws on an invalid code or oversize output. */
export function decodeTiffLzw(input: Uint8Array, maxBytes: number): Uint8Array {
  const prefix = new Int32Array(4096);
  const suffix = new Uint8Array(4096);
  const first = new Uint8Array(4096);
  const length = new Int32Array(4096);
  for (let i = 0; i < 256; i++) { prefix[i] = -1; suffix[i] = i; first[i] = i; length[i] = 1; }
  const out = new Uint8Array(maxBytes);
  let n = 0;
  let next = 258;
  let width = 9;
  let bitPos = 0;
  const totalBits = input.length * 8;
  const read = (): number => {
    if (bitPos + width > totalBits) return EOI; // ran off the end without EOI: stop, as readers commonly do
    let v = 0;
    for (let k = 0; k < width; k++) {
      const p = bitPos + k;
      v = (v << 1) | ((input[p >> 3] >> (7 - (p & 7))) & 1);
    }
    bitPos += width;
    return v;
  };
  const emit = (code: number) => {
    const len = length[code];
    if (n + len > maxBytes) throw new Error(`LZW data decodes to more than the ${maxBytes} bytes the block can hold`);
    let c = code;
    for (let i = n + len - 1; i >= n; i--) { out[i] = suffix[c]; c = prefix[c]; }
    n += len;
  };
  const add = (pre: number, ch: number) => {
    if (next >= 4096) return; // table full: a well-formed stream sends Clear first; tolerate
    prefix[next] = pre;
    suffix[next] = ch;
    first[next] = first[pre];
    length[next] = length[pre] + 1;
    next++;
    if (next + 1 >= 1 << width && width < 12) width++; // early change (TIFF 6.0 §13)
  };
  let old = -1;
  while (true) {
    const code = read();
    if (code === EOI) break;
    if (code === CLEAR) { next = 258; width = 9; old = -1; continue; }
    if (old === -1) {
      if (code > 255) throw new Error(`invalid LZW code ${code} after a Clear code`);
      emit(code);
      old = code;
      continue;
    }
    if (code < next) {
      emit(code);
      add(old, first[code]);
    } else if (code === next && next < 4096) {
      add(old, first[old]);
      emit(code);
    } else {
      throw new Error(`invalid LZW code ${code} (table has ${next} entries)`);
    }
    old = code;
  }
  return out.subarray(0, n);
}

interface DecoderParameters { tileWidth: number; tileHeight: number; bitsPerSample: number | number[]; planarConfiguration: number; samplesPerPixel?: number }

class BoundedLzwDecoder extends BaseDecoder {
  override decodeBlock(buffer: ArrayBufferLike): ArrayBufferLike {
    const p = (this as unknown as { parameters: DecoderParameters }).parameters;
    const bits = Array.isArray(p.bitsPerSample) || ArrayBuffer.isView(p.bitsPerSample)
      ? Array.from(p.bitsPerSample as ArrayLike<number>).reduce((a, b) => a + b, 0)
      : Number(p.bitsPerSample);
    // Upper bound: all samples' bits per pixel (a per-plane block holds fewer, which is still under it).
    const cap = Math.ceil((p.tileWidth * p.tileHeight * bits) / 8);
    if (!Number.isFinite(cap) || cap <= 0 || cap > 1 << 30) throw new Error(`invalid LZW block size ${p.tileWidth} × ${p.tileHeight}`);
    return decodeTiffLzw(new Uint8Array(buffer as ArrayBuffer), cap).slice().buffer;
  }
}

let registered = false;
/** Installs the bounded decoder for Compression 5 (idempotent). */
export function registerBoundedLzw(): void {
  if (registered) return;
  addDecoder(5, async () => BoundedLzwDecoder as never, undefined, false);
  registered = true;
}
