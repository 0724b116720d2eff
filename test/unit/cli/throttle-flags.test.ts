/** The vehicle flags of the command line: --throttle-band and --throttle-rate (study format version 2 fields). */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { main } from '../../../core/cli/main.ts';

const demoPath = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));

function fakeIo() {
  const out: string[] = [];
  const err: string[] = [];
  return { io: { stdout: (t: string) => out.push(t), stderr: (t: string) => err.push(t), interactive: false }, out, err };
}

describe('landreach trajectory with a forbidden throttle band', () => {
  it('returns a band-respecting trajectory beside the certified lower bound, checked between nodes', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'lr-band-'));
    const { io, out } = fakeIo();
    // The demo study is version 1: the flag makes it a version-2 study in memory; the file is untouched.
    const code = await main(['trajectory', demoPath, '--throttle-band', '0.4,0.6', '--no-refine', '--json', join(dir, 'r.json')], io);
    expect(code).toBe(0);
    const json = JSON.parse(readFileSync(join(dir, 'r.json'), 'utf8'));
    expect(['solved', 'relaxation-gap']).toContain(json.status);
    expect(json.problem).toBe('min-propellant-band');
    expect(json.propellant_kg).toBeGreaterThanOrEqual(json.propellant_lower_bound_kg);
    expect(json.band_gap_kg).toBeCloseTo(json.propellant_kg - json.propellant_lower_bound_kg, 4);
    expect(json.band_switches).toHaveLength(2);
    expect(json.between_nodes.band_margin).toBeGreaterThanOrEqual(-1e-3);
    expect(json.between_nodes.violations.filter((v: string) => /band|thrust/.test(v))).toEqual([]);
    expect(out.join('')).toMatch(/band gap\s+[\d.]+ kg/);
    expect(JSON.parse(readFileSync(demoPath, 'utf8')).version).toBe(1);
  }, 120_000);

  it('refuses a band outside the throttle range, naming the study field and the fix (exit 2)', async () => {
    const { io, err } = fakeIo();
    const code = await main(['trajectory', demoPath, '--throttle-band', '0.2,0.6'], io);
    expect(code).toBe(2);
    expect(err.join('')).toMatch(/vehicle\.throttleBands\.0: \[0\.2,0\.6\] — must lie strictly inside \[throttleMin 0\.25, throttleMax 0\.85\]/);
  });

  it('refuses a malformed value (exit 2)', async () => {
    const { io, err } = fakeIo();
    expect(await main(['trajectory', demoPath, '--throttle-rate', 'fast'], io)).toBe(2);
    expect(err.join('')).toMatch(/--throttle-rate fast: must be a positive fraction/);
    expect(await main(['trajectory', demoPath, '--throttle-band', '0.4'], io)).toBe(2);
    expect(err.join('')).toMatch(/--throttle-band 0\.4: must be LO,HI/);
  });
});
