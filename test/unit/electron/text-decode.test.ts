/**
 * The main process's UTF-8 decoding (electron/text-decode.ts) is a copy of core/study's decodeStudyBytes
 * (electron/ cannot import core/ at run time): both must take and refuse the same bytes and name the
 * same first bad byte. Vectors: well-formed and ill-formed sequences of the Unicode Standard, ch. 3,
 * Table 3-7 (well-formed UTF-8 byte sequences) — overlong forms, surrogates, lone continuation bytes,
 * truncated sequences, bytes above F4.
 */
import { describe, expect, it } from 'vitest';
import { decodeUtf8Text } from '../../../electron/text-decode.ts';
import { decodeStudyBytes, StudyError } from '../../../core/study/index.ts';
import { Rng } from '../../support/random.ts';

const text = (s: string) => [...new TextEncoder().encode(s)];
const VECTORS: { name: string; bytes: number[]; ok: string | number }[] = [
  { name: 'ASCII', bytes: text('{"name":"a"}'), ok: '{"name":"a"}' },
  { name: 'byte-order mark dropped', bytes: [0xef, 0xbb, 0xbf, ...text('{}')], ok: '{}' },
  { name: 'two, three and four-byte forms', bytes: text('é€😀'), ok: 'é€😀' },
  { name: 'lone continuation byte', bytes: [...text('ab'), 0x80, ...text('c')], ok: 2 },
  { name: 'overlong "/" (C0 AF)', bytes: [...text('a'), 0xc0, 0xaf], ok: 1 },
  { name: 'surrogate D800 (ED A0 80)', bytes: [...text('abc'), 0xed, 0xa0, 0x80], ok: 3 },
  { name: 'truncated three-byte form then a quote', bytes: [...text('x'), 0xe2, 0x82, ...text('"')], ok: 1 },
  { name: 'truncated at the end', bytes: [...text('xy'), 0xf0, 0x9f, 0x98], ok: 2 },
  { name: 'byte above F4', bytes: [...text('\n\n'), 0xff], ok: 2 },
  { name: 'Latin-1 é on line 3', bytes: [...text('a\nb\nc'), 0xe9], ok: 5 },
];

function core(bytes: Uint8Array): string | number {
  try {
    return decodeStudyBytes(bytes);
  } catch (error) {
    expect(error).toBeInstanceOf(StudyError);
    return Number(/^byte (\d+)/.exec((error as StudyError).problems[0].value)![1]);
  }
}

function main(bytes: Uint8Array): string | number {
  const r = decodeUtf8Text(bytes);
  return r.ok ? r.text : r.byte;
}

describe('UTF-8 decoding in the main process and in core/study', () => {
  it.each(VECTORS)('$name', ({ bytes, ok }) => {
    const b = Uint8Array.from(bytes);
    expect(main(b)).toEqual(ok);
    expect(core(b)).toEqual(ok);
  });

  it('agree on 2,000 random byte strings (seeded), lines included', () => {
    const rng = new Rng(7);
    for (let n = 0; n < 2000; n++) {
      const b = Uint8Array.from({ length: rng.int(0, 24) }, () => (rng.next() < 0.7 ? rng.int(0x0a, 0x7e) : rng.int(0x80, 0xff)));
      expect(main(b), Array.from(b).join(',')).toEqual(core(b));
      const r = decodeUtf8Text(b);
      if (!r.ok) {
        let line = 1;
        for (let i = 0; i < r.byte; i++) if (b[i] === 0x0a) line++;
        expect(r.line).toBe(line);
      }
    }
  });
});
