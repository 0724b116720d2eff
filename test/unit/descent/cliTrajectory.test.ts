import { describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, writeFileSync, readdirSync } from 'node:fs';
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

describe('landreach trajectory', () => {
  it('solves the demo study and writes JSON and CSV', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'lr-traj-'));
    const { io, out } = fakeIo();
    const code = await main(['trajectory', demoPath, '--target', '300,-150', '--json', join(dir, 'r.json'), '--csv', join(dir, 'r.csv'), '--no-refine', '--baselines'], io);
    expect(code).toBe(0);
    expect(out.join('')).toMatch(/status\s+solved/);
    expect(out.join('')).toMatch(/not flight software/);
    const json = JSON.parse(readFileSync(join(dir, 'r.json'), 'utf8'));
    expect(json.status).toBe('solved');
    expect(json.nodes).toBe(50);
    expect(json.inputsHash).toMatch(/^[0-9a-f]{64}$/);
    expect(json.solves).toBeGreaterThan(0);
    expect(json.target_m).toEqual([300, -150, 0]);
    expect(json.series.t_s).toHaveLength(50);
    expect(json.series.t_s[49]).toBeCloseTo(json.tf_s, 4);
    // Touches down at the target (plus the study's 20 m gate height).
    expect(json.series.x_m[49]).toBeCloseTo(300, 3);
    expect(json.series.z_m[49]).toBeCloseTo(20, 3);
    expect(json.propellant_kg).toBeCloseTo(json.series.mass_kg[0] - json.series.mass_kg[49], 3);
    expect(json.baselines.polynomial.propellant_kg).toBeGreaterThan(0);
    expect(json.baselines.gravity_turn.touchdown_speed_mps).toBeLessThan(2);
    expect(out.join('')).toMatch(/polynomial .* kg/);
    const csv = readFileSync(join(dir, 'r.csv'), 'utf8').trim().split('\n');
    expect(csv).toHaveLength(52); // caution comment, header, 50 nodes
    expect(readdirSync(dir).sort()).toEqual(['r.csv', 'r.json']); // no temporary files left
  });

  it('rejects a bad study naming the field, the value and the fix, and writes nothing', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'lr-traj-'));
    const demo = JSON.parse(readFileSync(demoPath, 'utf8'));
    demo.vehicle.throttleMax = 1.4;
    writeFileSync(join(dir, 'bad.json'), JSON.stringify(demo));
    const { io, err } = fakeIo();
    const code = await main(['trajectory', join(dir, 'bad.json'), '--json', join(dir, 'out.json')], io);
    expect(code).toBe(2);
    expect(err.join('')).toMatch(/vehicle\.throttleMax: 1\.4 — must be between 0 and 1/);
    expect(existsSync(join(dir, 'out.json'))).toBe(false);
  });

  it('reports an unreachable target with the closest reachable point and the miss', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'lr-traj-'));
    const { io, out } = fakeIo();
    const code = await main(['trajectory', demoPath, '--target', '12000,0', '--json', join(dir, 'r.json')], io);
    expect(code).toBe(0);
    expect(out.join('')).toMatch(/status\s+unreachable/);
    const json = JSON.parse(readFileSync(join(dir, 'r.json'), 'utf8'));
    expect(json.status).toBe('unreachable');
    expect(json.problem).toBe('min-landing-error');
    expect(json.miss_m).toBeGreaterThan(100);
    // The nominal target (0, 0), which the demo reaches, is 12 km from this one: the closest reachable point
    // is at least that close, downrange toward the target, and the miss is its distance.
    expect(json.miss_m).toBeLessThan(12000);
    expect(json.closest_point_m[0]).toBeGreaterThan(0);
    expect(Math.hypot(12000 - json.closest_point_m[0], json.closest_point_m[1])).toBeCloseTo(json.miss_m, 3);
    expect(json.infeasibility_certificates.length).toBeGreaterThan(0);
    expect(json.discretisation_check).toBeNull();
  });

  it('rejects a bad --target and a missing file', async () => {
    const a = fakeIo();
    expect(await main(['trajectory', demoPath, '--target', '12'], a.io)).toBe(2);
    expect(a.err.join('')).toMatch(/--target: '12' \(must be X,Y/);
    const b = fakeIo();
    expect(await main(['trajectory', '/nonexistent/study.json'], b.io)).toBe(2);
    expect(b.err.join('')).toMatch(/cannot read study file/);
  });
});
