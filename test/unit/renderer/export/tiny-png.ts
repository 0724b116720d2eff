/** A minimal valid RGBA PNG made with Node's zlib, for tests (filter byte 0 per row, ISO/IEC 15948). */
import { deflateSync } from 'node:zlib';
import { crc32 } from '../../../../renderer/export/png-metadata.ts';

export function tinyPng(width: number, height: number, rgba: [number, number, number, number]): Uint8Array {
  const raw = new Uint8Array(height * (1 + 4 * width));
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) raw.set(rgba, y * (1 + 4 * width) + 1 + 4 * x);
  const chunk = (type: string, data: Uint8Array) => {
    const out = new Uint8Array(12 + data.length);
    const view = new DataView(out.buffer);
    view.setUint32(0, data.length);
    out.set(new TextEncoder().encode(type), 4);
    out.set(data, 8);
    view.setUint32(8 + data.length, crc32(out, 4, 8 + data.length));
    return out;
  };
  const ihdr = new Uint8Array(13);
  new DataView(ihdr.buffer).setUint32(0, width);
  new DataView(ihdr.buffer).setUint32(4, height);
  ihdr.set([8, 6, 0, 0, 0], 8); // 8-bit, colour type 6 (RGBA), deflate, adaptive filtering, no interlace
  const parts = [new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(raw)), chunk('IEND', new Uint8Array())];
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}
