/**
 * Test-only greyscale PNG encoder (node:zlib for deflate), written independently of the reader from
 * the PNG specification (W3C PNG 2nd ed., §9 filters, §5 chunks). Row r uses filter type r mod 5 so
 * every filter is exercised.
 */
import { deflateSync } from 'node:zlib';

function crc32(bytes: Uint8Array): number {
  let c = ~0;
  for (const b of bytes) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = (c >>> 1) ^ (0xedb88320 & -(c & 1));
  }
  return ~c >>> 0;
}

function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const v = new DataView(out.buffer);
  v.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  v.setUint32(8 + data.length, crc32(out.subarray(4, 8 + data.length)));
  return out;
}

export function encodeGreyPng(width: number, height: number, samples: ArrayLike<number>, depth: 8 | 16, transparent?: number): Uint8Array {
  const bpp = depth / 8;
  const rowBytes = width * bpp;
  const raw = new Uint8Array(height * rowBytes);
  for (let k = 0; k < width * height; k++) {
    if (depth === 16) { raw[2 * k] = samples[k] >> 8; raw[2 * k + 1] = samples[k] & 0xff; } else raw[k] = samples[k];
  }
  const filtered = new Uint8Array(height * (rowBytes + 1));
  for (let r = 0; r < height; r++) {
    const type = r % 5;
    filtered[r * (rowBytes + 1)] = type;
    for (let i = 0; i < rowBytes; i++) {
      const x = raw[r * rowBytes + i];
      const a = i >= bpp ? raw[r * rowBytes + i - bpp] : 0;
      const b = r > 0 ? raw[(r - 1) * rowBytes + i] : 0;
      const c = r > 0 && i >= bpp ? raw[(r - 1) * rowBytes + i - bpp] : 0;
      const p = a + b - c;
      const pr = Math.abs(p - a) <= Math.abs(p - b) && Math.abs(p - a) <= Math.abs(p - c) ? a : Math.abs(p - b) <= Math.abs(p - c) ? b : c;
      const pred = [0, a, b, (a + b) >> 1, pr][type];
      filtered[r * (rowBytes + 1) + 1 + i] = (x - pred) & 0xff;
    }
  }
  const ihdr = new Uint8Array(13);
  const v = new DataView(ihdr.buffer);
  v.setUint32(0, width);
  v.setUint32(4, height);
  ihdr[8] = depth; // bit depth
  ihdr[9] = 0; // greyscale
  const parts = [new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr)];
  if (transparent !== undefined) parts.push(chunk('tRNS', new Uint8Array([transparent >> 8, transparent & 0xff])));
  parts.push(chunk('IDAT', new Uint8Array(deflateSync(filtered))), chunk('IEND', new Uint8Array(0)));
  const total = parts.reduce((n, p) => n + p.length, 0);
  const out = new Uint8Array(total);
  let o = 0;
  for (const p of parts) { out.set(p, o); o += p.length; }
  return out;
}
