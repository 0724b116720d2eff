import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { addPngText, crc32, itxtChunk, pngSize, readChunks, readPngText } from '../../../../renderer/export/png-metadata.ts';
import { captionLines, captionMetadata, inputsHash } from '../../../../renderer/export/caption.ts';
import { CAUTION_LINE } from '../../../../renderer/caution.ts';
import { tinyPng } from './tiny-png.ts';

describe('PNG metadata', () => {
  it('computes the standard CRC-32 check value: crc32("123456789") = 0xCBF43926', () => {
    // Check value of CRC-32/ISO-HDLC, the CRC the PNG specification uses (Annex D).
    expect(crc32(new TextEncoder().encode('123456789'))).toBe(0xcbf43926);
  });

  it('inserts UTF-8 text after IHDR, keeps the image chunks byte-identical and every CRC valid', () => {
    const png = tinyPng(3, 2, [10, 20, 30, 255]);
    const out = addPngText(png, { Title: 'Cratère rim — trade A', Disclaimer: CAUTION_LINE });
    const types = readChunks(out).map((c) => c.type);
    expect(types).toEqual(['IHDR', 'iTXt', 'iTXt', 'IDAT', 'IEND']);
    expect(readPngText(out)).toEqual({ Title: 'Cratère rim — trade A', Disclaimer: CAUTION_LINE });
    const idat = (p: Uint8Array) => {
      const c = readChunks(p).find((x) => x.type === 'IDAT')!;
      return Buffer.from(p.subarray(c.offset, c.offset + 12 + c.length)).toString('hex');
    };
    expect(idat(out)).toBe(idat(png));
    expect(pngSize(out)).toEqual({ width: 3, height: 2 });
  });

  it('rejects keywords the spec forbids and bytes that are not PNG', () => {
    expect(() => itxtChunk('', 'x')).toThrow(/invalid PNG keyword/);
    expect(() => itxtChunk('x'.repeat(80), 'x')).toThrow(/invalid PNG keyword/);
    expect(() => addPngText(new Uint8Array([1, 2, 3]), {})).toThrow(/missing signature/);
    const broken = tinyPng(1, 1, [0, 0, 0, 255]);
    broken[20] ^= 0xff; // inside IHDR data
    expect(() => readChunks(broken)).toThrow(/IHDR at 8 has a bad CRC/);
  });
});

describe('caption', () => {
  it('hashes the inputs with SHA-256 (checked against node:crypto)', async () => {
    const text = '{"format":"landreach-study"}';
    expect(await inputsHash(text)).toBe(createHash('sha256').update(text).digest('hex').slice(0, 12));
  });

  it('stamps name, hash, version, UTC date and the caution', () => {
    const facts = { studyName: 'Rim (invented)', inputsHash: 'abc123def456', appVersion: '0.1.0', date: new Date('2026-03-04T05:06:07.890Z') };
    expect(captionLines(facts)).toEqual(['Rim (invented) · inputs abc123def456 · Landreach 0.1.0 · 2026-03-04T05:06:07Z', CAUTION_LINE]);
    expect(captionMetadata(facts)).toMatchObject({ Title: 'Rim (invented)', Software: 'Landreach 0.1.0', Disclaimer: CAUTION_LINE });
  });
});
