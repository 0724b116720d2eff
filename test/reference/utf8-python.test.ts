/**
 * The first byte that is not UTF-8, as our decoders report it (core/study decodeStudyBytes, and its copy
 * in electron/text-decode.ts), against Python's codec (Debian /usr/bin/python3: `bytes.decode('utf-8')`
 * raises UnicodeDecodeError whose `start` is the offset of the first ill-formed sequence; CPython follows
 * the Unicode Standard's "maximal subpart" practice, as the WHATWG decoder our TextDecoder implements does).
 */
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { decodeUtf8Text } from '../../electron/text-decode.ts';
import { Rng } from '../support/random.ts';

const PYTHON = '/usr/bin/python3';
const available = spawnSync(PYTHON, ['-c', 'pass']).status === 0;
if (!available && process.env.CI === 'true') throw new Error(`${PYTHON} is missing: install python3 (apt-get install -y python3)`);

const SCRIPT = `
import json, sys
out = []
for s in json.load(sys.stdin):
    b = bytes(s)
    try:
        t = b.decode('utf-8')
        out.append(t[1:] if t.startswith('\\ufeff') else t)
    except UnicodeDecodeError as e:
        out.append(e.start)
json.dump(out, sys.stdout)
`;

describe.runIf(available)('UTF-8 validity against Python', () => {
  it('3,000 seeded byte strings: same text or the same first bad byte', () => {
    const rng = new Rng(11);
    const cases = Array.from({ length: 3000 }, () =>
      Array.from({ length: rng.int(0, 20) }, () => (rng.next() < 0.6 ? rng.int(0x20, 0x7e) : rng.int(0x80, 0xff))));
    // Some well-formed multi-byte text too, so both answers are exercised.
    cases.push([...new TextEncoder().encode('é€😀 ünïcødé')], [0xef, 0xbb, 0xbf, 0x7b, 0x7d]);
    const r = spawnSync(PYTHON, ['-c', SCRIPT], { input: JSON.stringify(cases), encoding: 'utf8', maxBuffer: 1 << 26 });
    expect(r.status, r.stderr).toBe(0);
    const expected = JSON.parse(r.stdout) as (string | number)[];
    let refused = 0;
    cases.forEach((c, i) => {
      const ours = decodeUtf8Text(Uint8Array.from(c));
      if (!ours.ok) refused++;
      expect(ours.ok ? ours.text : ours.byte, c.join(',')).toEqual(expected[i]);
    });
    expect(refused).toBeGreaterThan(100);
    expect(refused).toBeLessThan(cases.length);
  });
});
