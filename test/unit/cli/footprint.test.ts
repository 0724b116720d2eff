/**
 * `landreach footprint` end to end on the invented demo study (small grid), and its input errors.
 * The per-target values are checked against independent single-target searches.
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';
import { lowPropellantDemo } from '../../support/scenarios.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { parseStudyText, studyToDescent } from '../../../core/study/index.ts';

const DEMO = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'landreach-fp-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const io = captureIo;

describe('landreach footprint', () => {
  it('writes the four result files for the demo study, and the targets agree with single-target searches', async () => {
    const h = io();
    const out = join(dir, 'demo');
    const code = await main(['footprint', DEMO, '--out', out, '--grid', '5x5', '--extent-m', '2000', '--workers', '2'], h.io);
    expect(code, h.err.join('')).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['footprint.csv', 'footprint.geojson', 'footprint.json', 'footprint.manifest.json', 'footprint.svg']);
    const report = JSON.parse(readFileSync(join(out, 'footprint.json'), 'utf8'));
    expect(report.format).toBe('landreach-footprint');
    expect(report.caution).toMatch(/not flight software/);
    expect(report.inputsHash).toMatch(/^[0-9a-f]{64}$/);
    expect(report.summary.targets).toBe(25);
    expect(report.summary.reachable + report.summary.unreachable + report.summary.failed).toBe(25);
    expect(h.out.join('')).toMatch(/targets: +\d+ reachable/);
    // Node 20 has WebAssembly with SIMD: the summary says the workers ran the WebAssembly iteration.
    expect(h.out.join('')).toMatch(/solver: +WebAssembly iteration/);
    // Independent check: three targets re-solved alone with the bracketing search, same nodes and dry mass.
    const study = parseStudyText(readFileSync(DEMO, 'utf8'));
    const d = studyToDescent(study);
    const setup = { ...d.setup, nodes: report.inputs.nodes, vehicle: { ...d.setup.vehicle, dryMass: study.vehicle.dryMass_kg } };
    const solver = new DescentSolver(setup, landreachConicBackend(), d.ignition);
    for (const k of [0, 12, 19]) {
      const e = report.grid.east_m[k % 5];
      const n = report.grid.north_m[Math.floor(k / 5)];
      const r = searchFreeFinalTime(solver, [e, n, 0], d.ignition, { decode: false, tfTolerance: 0.02 });
      expect(report.grid.status[k]).toBe(r.status === 'solved' ? 'reachable' : 'unreachable');
      if (r.status === 'solved') expect(Math.abs(report.grid.propellant_kg[k] - r.propellant)).toBeLessThan(0.06);
    }
    const svg = readFileSync(join(out, 'footprint.svg'), 'utf8');
    expect(svg).toContain('Caution: Preliminary design');
    const csv = readFileSync(join(out, 'footprint.csv'), 'utf8').trim().split('\n');
    expect(csv).toHaveLength(27);
  }, 120_000);

  it.each([
    [['--grid', '5by5'], /--grid 5by5: expected NXxNY/],
    [['--reserve-kg', '900'], /--reserve-kg 900: must be below the usable propellant, 500 kg/],
    [['--workers', '0'], /--workers 0: must be a whole number from 1 to 64/],
    [['--levels', '100,abc'], /--levels 100,abc: must be positive masses in kg/],
    [['--refine-boundary', '1'], /--refine-boundary 1: must be a whole number from 2 to 8/],
    [['--reachable-only', '--levels', '100,495'], /--levels: 495 kg above the budget \d+ kg cannot be drawn with --reachable-only/],
  ])('rejects %s with a message naming the option and the fix, writing nothing', async (extra, message) => {
    const h = io();
    const out = join(dir, `bad-${String(extra[0]).slice(2)}`);
    const code = await main(['footprint', DEMO, '--out', out, ...extra], h.io);
    expect(code).toBe(2);
    expect(h.err.join('')).toMatch(message);
    expect(existsSync(join(out, 'footprint.json'))).toBe(false);
  });

  it('without --extent-m, sizes the grid from the reach boundary so the footprint shows its edge', async () => {
    const { study } = lowPropellantDemo();
    const path = join(dir, 'low.study.json');
    writeFileSync(path, JSON.stringify(study));
    const h = io();
    const out = join(dir, 'auto');
    expect(await main(['footprint', path, '--out', out, '--grid', '7x7', '--workers', '2'], h.io), h.err.join('')).toBe(0);
    const report = JSON.parse(readFileSync(join(out, 'footprint.json'), 'utf8'));
    expect(report.inputs.grid.extent_m % 100).toBe(0);
    expect(h.err.join('')).toMatch(/grid extent ±\d+ m \(farthest reach \d+ m along 16 directions\)/);
    // 10 % beyond the farthest reach: the grid's corners lie outside the reachable set.
    expect(report.summary.unreachable).toBeGreaterThan(0);
    expect(report.summary.divertRadiusLimitedByGrid).toBe(false);
  }, 120_000);

  it('with --reachable-only, stops targets certainly over the budget and keeps the reachable region', async () => {
    const run = async (name: string, extra: string[]) => {
      const h = io();
      const out = join(dir, name);
      const args = ['footprint', DEMO, '--out', out, '--grid', '7x7', '--extent-m', '3000', '--reserve-kg', '220', '--workers', '2', ...extra];
      expect(await main(args, h.io), h.err.join('')).toBe(0);
      return JSON.parse(readFileSync(join(out, 'footprint.json'), 'utf8'));
    };
    const full = await run('full', []);
    const pruned = await run('pruned', ['--reachable-only']);
    const budget = pruned.summary.budget_kg;
    expect(pruned.summary.overBudget).toBeGreaterThan(0);
    expect(full.summary.reachableArea_m2).toBeGreaterThan(0);
    pruned.grid.status.forEach((s: string, k: number) => {
      if (s === 'over-budget') {
        expect(full.grid.status[k]).toBe('reachable');
        expect(full.grid.propellant_kg[k]).toBeGreaterThan(budget);
        expect(pruned.grid.propellant_kg[k]).toBeGreaterThan(budget);
      } else if (full.grid.propellant_kg[k] <= budget) {
        expect(s).toBe('reachable');
      }
    });
    // The budget contour interpolates between a target inside and one outside; with an upper bound in place
    // of the exact cost outside, it moves inward (the safe side) by less than a grid cell.
    expect(pruned.summary.reachableArea_m2).toBeLessThanOrEqual(full.summary.reachableArea_m2 + 1);
    expect(pruned.summary.reachableArea_m2).toBeGreaterThan(0.5 * full.summary.reachableArea_m2);
  }, 180_000);

  it('with --refine-boundary, re-solves the cells the budget boundary crosses and reports the refined area', async () => {
    const { study } = lowPropellantDemo();
    const path = join(dir, 'low-refine.study.json');
    writeFileSync(path, JSON.stringify(study));
    const h = io();
    const out = join(dir, 'refined');
    const args = ['footprint', path, '--out', out, '--grid', '7x7', '--extent-m', '3500', '--workers', '2', '--refine-boundary', '2'];
    expect(await main(args, h.io), h.err.join('')).toBe(0);
    const report = JSON.parse(readFileSync(join(out, 'footprint.json'), 'utf8'));
    const r = report.summary.boundaryRefinement;
    expect(r.factor).toBe(2);
    expect(r.complete).toBe(true);
    // Some but not all of the 120 extra targets of a full 13 × 13 grid.
    expect(r.extraTargets).toBeGreaterThan(0);
    expect(r.extraTargets).toBeLessThan(120);
    expect(report.summary.reachableArea_m2).not.toBe(r.unrefinedArea_m2);
    expect(Math.abs(report.summary.reachableArea_m2 / r.unrefinedArea_m2 - 1)).toBeLessThan(0.3);
    expect(h.out.join('')).toMatch(/boundary refined 2×: \d+ more targets/);
  }, 180_000);

  it('requires --out', async () => {
    const h = io();
    expect(await main(['footprint', DEMO], h.io)).toBe(2);
    expect(h.err.join('')).toMatch(/missing --out DIR/);
  });
});
