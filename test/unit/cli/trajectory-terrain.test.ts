/**
 * `landreach trajectory --terrain`: clearance above the terrain along the optimal trajectory, against a
 * terrain whose answer is known by construction: flat ground at the target's height with one north–south
 * wall across the approach, built just below or just above the trajectory's own height where it crosses.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';

const DEMO = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'landreach-traj-terrain-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const PIXEL = 50;
const WEST = -3000;
const NORTH = 1000;
const WIDTH = 80; // −3000 … +1000 m east
const HEIGHT = 40; // +1000 … −1000 m north
const WALL_WEST = -1300; // the wall fills the pixels between −1300 and −1200 m east

function dem(wall_m: number): string {
  const heights: number[] = [];
  for (let j = 0; j < HEIGHT; j++) {
    for (let i = 0; i < WIDTH; i++) {
      const east = WEST + (i + 0.5) * PIXEL;
      heights.push(east > WALL_WEST && east < WALL_WEST + 100 ? 250 + wall_m : 250); // flat at 250 m; the target at 250 m
    }
  }
  const path = join(dir, `wall-${wall_m}.json`);
  writeFileSync(path, JSON.stringify({ format: 'landreach-elevation-grid', version: 1, width: WIDTH, height: HEIGHT, pixelSizeX_m: PIXEL, pixelSizeY_m: PIXEL, originEast_m: WEST, originNorth_m: NORTH, heights_m: heights }));
  return path;
}

async function run(args: string[]) {
  const c = captureIo();
  const code = await main(['trajectory', DEMO, '--no-refine', ...args], c.io);
  return { code, out: c.out.join('') };
}

describe('trajectory --terrain', () => {
  it('flags a wall higher than the trajectory where it crosses, and passes one lower', async () => {
    const json = join(dir, 'flat.json');
    const flat = await run(['--json', json, '--terrain', dem(0), '--target-east-m', '0', '--target-north-m', '0']);
    expect(flat.code).toBe(0);
    const r = JSON.parse(readFileSync(json, 'utf8'));
    expect(r.terrain_clearance.ok).toBe(true);
    // The trajectory's height where it crosses the wall's middle (east −1250 m), interpolated between nodes.
    const x: number[] = r.series.x_m;
    const z: number[] = r.series.z_m;
    const k = x.findIndex((e, i) => i > 0 && x[i - 1] <= -1250 && e > -1250);
    expect(k).toBeGreaterThan(0);
    const crossing = z[k - 1] + ((z[k] - z[k - 1]) * (-1250 - x[k - 1])) / (x[k] - x[k - 1]);
    expect(crossing).toBeGreaterThan(200);

    const lowJson = join(dir, 'low.json');
    // A wall 150 m below the crossing height (well clear even over the wall's 100 m width) …
    await run(['--json', lowJson, '--terrain', dem(crossing - 150), '--target-east-m', '0', '--target-north-m', '0']);
    expect(JSON.parse(readFileSync(lowJson, 'utf8')).terrain_clearance.ok).toBe(true);
    // … and one 50 m above it: the trajectory would fly into it.
    const highJson = join(dir, 'high.json');
    const high = await run(['--json', highJson, '--terrain', dem(crossing + 50), '--target-east-m', '0', '--target-north-m', '0']);
    const h = JSON.parse(readFileSync(highJson, 'utf8')).terrain_clearance;
    expect(h.ok).toBe(false);
    expect(h.nodeViolations + h.segmentViolations).toBeGreaterThan(0);
    expect(h.minClearance_m).toBeLessThan(-40);
    expect(high.out).toMatch(/warning: terrain clearance/);
  });

  it('--clearance-m without a number is a usage error naming the option', async () => {
    const c = captureIo();
    const code = await main(['trajectory', DEMO, '--terrain', dem(0), '--clearance-m', 'high'], c.io);
    expect(code).toBe(2);
    expect(c.err.join('')).toMatch(/--clearance-m high/);
  });
});
