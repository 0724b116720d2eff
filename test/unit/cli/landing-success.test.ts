/**
 * `landreach study landing-success`: the same result bytes for 1 and 2 worker threads (each sample's random
 * stream comes from (seed, index), and each sample starts its solver from the nominal optimum), provenance in
 * the report, bad input refused naming the field.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';
import { DEMO_STUDY_PATH } from '../../support/scenarios.ts';

const dir = mkdtempSync(join(tmpdir(), 'landreach-landing-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const FILES = ['study-landing-success.csv', 'study-landing-success-comparison.csv', 'study-landing-success.json', 'study-landing-success.svg'];
const ARGS = ['--samples', '16', '--seed', '3', '--sites', '3', '--targets', '5x5', '--sigma-position-m', '80'];

describe('landreach study landing-success', () => {
  it('writes the same bytes with 1 and 2 workers, with the seed, the inputs and the interval method in the report', async () => {
    const outputs: Record<string, Buffer>[] = [];
    for (const workers of ['1', '2']) {
      const out = join(dir, `w${workers}`);
      const h = captureIo();
      const code = await main(['study', 'landing-success', DEMO_STUDY_PATH, '--out', out, '--workers', workers, ...ARGS], h.io);
      expect(code, h.err.join('')).toBe(0);
      outputs.push(Object.fromEntries(FILES.map((f) => [f, readFileSync(join(out, f))])));
      expect(h.out.join('')).toMatch(/with divert, closed loop/);
    }
    for (const f of FILES) expect(outputs[1][f].equals(outputs[0][f]), f).toBe(true);
    const report = JSON.parse(outputs[0]['study-landing-success.json'].toString());
    expect(report.format).toBe('landreach-landing-success');
    expect(report.seed).toBe(3);
    expect(report.intervalMethod).toMatch(/Wilson score interval/);
    expect(report.inputs.inputs.ignitionPositionCovariance_m2[0][0]).toBe(6400);
    expect(report.summary.samples).toBe(16);
    expect(report.sites).toHaveLength(3);
    const csv = outputs[0]['study-landing-success.csv'].toString().trim().split('\n');
    expect(csv).toHaveLength(2 + 16);
  });

  it('refuses bad input with the field, the value and the fix (exit 2)', async () => {
    const bad = join(dir, 'bad-inputs.json');
    writeFileSync(bad, JSON.stringify({ ignitionVelocityCovariance_m2ps2: [[4, 5, 0], [5, 4, 0], [0, 0, 4]] }));
    const h = captureIo();
    const code = await main(['study', 'landing-success', DEMO_STUDY_PATH, '--out', join(dir, 'bad'), '--inputs', bad], h.io);
    expect(code).toBe(2);
    expect(h.err.join('')).toMatch(/ignitionVelocityCovariance_m2ps2: .*not positive semi-definite/);
    const h2 = captureIo();
    expect(await main(['study', 'landing-success', DEMO_STUDY_PATH, '--out', join(dir, 'bad'), '--replan-interval-s', '0'], h2.io)).toBe(2);
    expect(h2.err.join('')).toMatch(/replanInterval_s: 0 must be a time from 0.5 to 3600 s/);
  });
});
