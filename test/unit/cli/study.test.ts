/** `landreach study reserve|ignition-altitude` on the invented demo study (small grids). */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';
import { lowPropellantDemo } from '../../support/scenarios.ts';

const DEMO = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'landreach-st-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const io = captureIo;

describe('landreach study', () => {
  it('reserve: area and divert radius shrink as the reserve grows', async () => {
    const h = io();
    const code = await main(['study', 'reserve', DEMO, '--out', dir, '--grid', '7x7', '--extent-m', '3000', '--reserves', '0,200,300', '--workers', '2'], h.io);
    expect(code, h.err.join('')).toBe(0);
    const report = JSON.parse(readFileSync(join(dir, 'study-reserve.json'), 'utf8'));
    expect(report).toMatchObject({ format: 'landreach-study-result', version: 1, study: 'reserve' });
    expect(report.caution).toMatch(/not flight software/);
    const areas = report.rows.map((r: { area_m2: number }) => r.area_m2);
    expect(areas[0]).toBeGreaterThanOrEqual(areas[1]);
    expect(areas[1]).toBeGreaterThanOrEqual(areas[2]);
    expect(readFileSync(join(dir, 'study-reserve.csv'), 'utf8')).toMatch(/^# Preliminary design/);
  }, 120_000);

  it('ignition-altitude: reports the radius per altitude and the lowest altitude meeting a requirement', async () => {
    const h = io();
    const code = await main(
      ['study', 'ignition-altitude', DEMO, '--out', dir, '--method', 'grid', '--grid', '5x5', '--extent-m', '1500', '--altitudes', '1200,1800', '--required-radius-m', '100', '--workers', '2'],
      h.io,
    );
    expect(code, h.err.join('')).toBe(0);
    const report = JSON.parse(readFileSync(join(dir, 'study-ignition-altitude.json'), 'utf8'));
    expect(report.rows).toHaveLength(2);
    // From ignition 1800 m up the demo lander reaches the whole ±1500 m grid (see the footprint test).
    expect(report.rows[1].divertRadius_m).toBeGreaterThan(100);
    const meets = report.rows.map((r: { divertRadius_m: number }) => r.divertRadius_m >= 100);
    expect(report.minimumAltitude.altitude_m).toBeLessThanOrEqual(meets[0] ? 1200 : 1800);
    expect(report.minimumAltitude.bracketed).toBe(!meets[0]);
    expect(h.out.join('')).toMatch(/lowest ignition altitude|no sampled altitude/);
  }, 120_000);

  it('ignition-altitude by directions: the divert radius grows with ignition altitude on the demo study', async () => {
    const h = io();
    const code = await main(['study', 'ignition-altitude', DEMO, '--out', dir, '--altitudes', '900,1800', '--directions', '8', '--reserve-kg', '250'], h.io);
    expect(code, h.err.join('')).toBe(0);
    const report = JSON.parse(readFileSync(join(dir, 'study-ignition-altitude.json'), 'utf8'));
    expect(report.method).toBe('directions');
    expect(report.rows[1].divertRadius_m).toBeGreaterThan(report.rows[0].divertRadius_m);
    expect(report.rows[0].divertRadius_m).toBeGreaterThan(0);
  }, 120_000);

  it('dispersion: writes the landing points and the ellipse; bad sigmas are named', async () => {
    const h = io();
    const code = await main(['study', 'dispersion', DEMO, '--out', dir, '--samples', '100', '--seed', '5', '--sigma-thrust', '0', '--grid', '7x7', '--workers', '2'], h.io);
    expect(code, h.err.join('')).toBe(0);
    const report = JSON.parse(readFileSync(join(dir, 'study-dispersion.json'), 'utf8'));
    expect(report.rows[0].probability).toBe(0.997);
    expect(report.rows[0].semiMajor_m).toBeGreaterThanOrEqual(report.rows[0].semiMinor_m);
    expect(readFileSync(join(dir, 'study-dispersion.csv'), 'utf8').trim().split('\n')).toHaveLength(102);
    // The report map: footprint bands, the reserve boundary and the ellipse with its axes' ratio.
    const svg = readFileSync(join(dir, 'study-dispersion.svg'), 'utf8');
    expect(svg).toContain('99.7 % ellipse');
    expect(svg).toContain('Caution: Preliminary design');
    expect(svg).toContain(report.inputsHash.slice(0, 16));
    const el = /<ellipse cx="[\d.-]+" cy="[\d.-]+" rx="([\d.]+)" ry="([\d.]+)"/.exec(svg)!;
    const ratio = Number(el[1]) / Number(el[2]);
    expect(Math.abs(ratio / (report.rows[0].semiMajor_m / report.rows[0].semiMinor_m) - 1)).toBeLessThan(0.02);
    const g = io();
    expect(await main(['study', 'dispersion', DEMO, '--out', dir, '--sigma-mass-kg', '-3'], g.io)).toBe(2);
    expect(g.err.join('')).toMatch(/--sigma-mass-kg -3: must be zero or a positive mass in kg/);
  }, 60_000);

  it('dispersion with --reach-samples: the probability-of-reach map is 1 at the nominal target, 0 far out', async () => {
    // Our low-propellant scenario (250 kg usable), so the ±3500 m grid has an edge.
    const { study } = lowPropellantDemo();
    const path = join(dir, 'low.study.json');
    writeFileSync(path, JSON.stringify(study));
    const h = io();
    const code = await main(['study', 'dispersion', path, '--out', dir, '--samples', '20', '--reach-samples', '2', '--grid', '5x5', '--extent-m', '3500', '--workers', '2'], h.io);
    expect(code, h.err.join('')).toBe(0);
    const rows = readFileSync(join(dir, 'study-dispersion-reach.csv'), 'utf8').trim().split('\n').slice(3).map((l) => l.split(',').map(Number));
    expect(rows).toHaveLength(25);
    for (const [, , p] of rows) expect(p === 0 || p === 0.5 || p === 1).toBe(true);
    expect(rows.find(([e, n]) => e === 0 && n === 0)?.[2]).toBe(1);
    expect(rows.find(([e, n]) => e === 3500 && n === 3500)?.[2]).toBe(0);
  }, 120_000);

  it('ignition-altitude: an altitude below the gate is an input error naming it, before anything is computed', async () => {
    // The demo's gate is 20 m above the target: an ignition at 10 m would have to climb to its gate.
    const h = io();
    const code = await main(['study', 'ignition-altitude', DEMO, '--out', dir, '--altitudes', '10,1800', '--workers', '1'], h.io);
    expect(code).toBe(2);
    expect(h.err.join('')).toMatch(/--altitudes 10: .*constraints\.gateHeight_m .*above the ignition altitude 10 m/);
  });

  it('rejects an unknown study and options of the other study', async () => {
    const h = io();
    expect(await main(['study', 'dispersal', DEMO, '--out', dir], h.io)).toBe(2);
    expect(h.err.join('')).toMatch(/unknown study 'dispersal': choose reserve, ignition-altitude, dispersion or landing-success/);
    const g = io();
    expect(await main(['study', 'reserve', DEMO, '--out', dir, '--altitudes', '100'], g.io)).toBe(2);
    expect(g.err.join('')).toMatch(/unknown option '--altitudes' for the reserve study/);
  });
});
