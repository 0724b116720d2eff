/**
 * PNG text metadata. Chunks follow the PNG specification (ISO/IEC 15948, W3C PNG 2nd ed.): each is
 * length (4 bytes, big-endian) · type · data · CRC-32 of type and data. Text goes in iTXt chunks
 * (UTF-8, uncompressed) placed right after IHDR, with the spec's predefined keywords where one fits
 * (Title, Software, Creation Time, Description, Disclaimer).
 */

const SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

// CRC-32 as the PNG spec defines it: one implementation, shared with the PNG heightmap reader.
import { crc32 } from '../../core/terrain/png-reader.ts';
export { crc32 };

export function isPng(bytes: Uint8Array): boolean {
  return bytes.length >= 8 && SIGNATURE.every((b, i) => bytes[i] === b);
}

function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  view.setUint32(8 + data.length, crc32(out, 4, 8 + data.length));
  return out;
}

/** An iTXt chunk: keyword (Latin-1, 1–79 bytes) NUL, compression flag 0, method 0, empty language and translated keyword, UTF-8 text. */
export function itxtChunk(keyword: string, text: string): Uint8Array {
  if (!/^[\x20-\x7e]{1,79}$/.test(keyword) || keyword.startsWith(' ') || keyword.endsWith(' ')) {
    throw new Error(`invalid PNG keyword: ${JSON.stringify(keyword)} (1–79 printable characters, no leading/trailing space)`);
  }
  const key = new TextEncoder().encode(keyword);
  const body = new TextEncoder().encode(text);
  const data = new Uint8Array(key.length + 5 + body.length);
  data.set(key, 0);
  // key NUL, compression flag 0, compression method 0, language tag "" NUL, translated keyword "" NUL
  data.set([0, 0, 0, 0, 0], key.length);
  data.set(body, key.length + 5);
  return chunk('iTXt', data);
}

export interface PngChunkInfo {
  type: string;
  offset: number;
  length: number;
}

/** List the chunks of a PNG, checking every CRC. */
export function readChunks(png: Uint8Array): PngChunkInfo[] {
  if (!isPng(png)) throw new Error('not a PNG: missing signature');
  const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
  const chunks: PngChunkInfo[] = [];
  let offset = 8;
  while (offset + 12 <= png.length) {
    const length = view.getUint32(offset);
    const type = String.fromCharCode(...png.subarray(offset + 4, offset + 8));
    if (offset + 12 + length > png.length) throw new Error(`PNG chunk ${type} at ${offset} runs past the end`);
    if (view.getUint32(offset + 8 + length) !== crc32(png, offset + 4, offset + 8 + length)) throw new Error(`PNG chunk ${type} at ${offset} has a bad CRC`);
    chunks.push({ type, offset, length });
    offset += 12 + length;
    if (type === 'IEND') break;
  }
  return chunks;
}

/** Insert iTXt chunks after IHDR. Returns a new array; the image data is untouched. */
export function addPngText(png: Uint8Array, entries: Record<string, string>): Uint8Array {
  const chunks = readChunks(png);
  if (chunks[0]?.type !== 'IHDR') throw new Error('not a PNG: the first chunk is not IHDR');
  const cut = chunks[0].offset + 12 + chunks[0].length;
  const extra = Object.entries(entries).map(([k, v]) => itxtChunk(k, v));
  const size = png.length + extra.reduce((n, c) => n + c.length, 0);
  const out = new Uint8Array(size);
  out.set(png.subarray(0, cut), 0);
  let at = cut;
  for (const c of extra) {
    out.set(c, at);
    at += c.length;
  }
  out.set(png.subarray(cut), at);
  return out;
}

/** Read back the iTXt entries (keyword → text). */
export function readPngText(png: Uint8Array): Record<string, string> {
  const out: Record<string, string> = {};
  for (const c of readChunks(png)) {
    if (c.type !== 'iTXt') continue;
    const data = png.subarray(c.offset + 8, c.offset + 8 + c.length);
    const nul = data.indexOf(0);
    const keyword = new TextDecoder('latin1').decode(data.subarray(0, nul));
    // Skip flag, method, then the two NUL-terminated strings.
    let p = nul + 3;
    p = data.indexOf(0, p) + 1;
    p = data.indexOf(0, p) + 1;
    out[keyword] = new TextDecoder().decode(data.subarray(p));
  }
  return out;
}

/** Width and height from IHDR. */
export function pngSize(png: Uint8Array): { width: number; height: number } {
  const chunks = readChunks(png);
  if (chunks[0]?.type !== 'IHDR') throw new Error('not a PNG: the first chunk is not IHDR');
  const view = new DataView(png.buffer, png.byteOffset + chunks[0].offset + 8, 8);
  return { width: view.getUint32(0), height: view.getUint32(4) };
}
