import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { DEMO_SITE_NAME, craterProfile, generateDemoTerrain, readGeoTiff, sampleBilinear } from '../../../core/terrain/index.ts';

describe('invented demo terrain', () => {
  it('is deterministic from its seed, and seeds differ', () => {
    const a = generateDemoTerrain({ width: 96, height: 80, seed: 9 }).grid.heights;
    const b = generateDemoTerrain({ width: 96, height: 80, seed: 9 }).grid.heights;
    const c = generateDemoTerrain({ width: 96, height: 80, seed: 10 }).grid.heights;
    expect(b).toEqual(a);
    expect(c).not.toEqual(a);
  });

  it('the shipped asset is what the generator makes (npm run gen:terrain) and is labelled invented', async () => {
    const url = new URL('../../../assets/demo/terrain/demo-site.tif', import.meta.url);
    const shipped = await readGeoTiff(new Uint8Array(readFileSync(url)));
    const fresh = generateDemoTerrain().grid;
    expect([shipped.width, shipped.height, shipped.pixelSizeX_m]).toEqual([fresh.width, fresh.height, fresh.pixelSizeX_m]);
    let worst = 0;
    for (let k = 0; k < fresh.heights.length; k++) worst = Math.max(worst, Math.abs(shipped.heights[k] - fresh.heights[k]));
    expect(worst).toBeLessThan(1e-3); // m; Math.sin/exp may differ in the last bit between engines
    const meta = JSON.parse(readFileSync(new URL('../../../assets/demo/terrain/demo-site.json', import.meta.url), 'utf8'));
    expect(meta.invented).toBe(true);
    expect(meta.name).toBe(DEMO_SITE_NAME);
    expect(DEMO_SITE_NAME).toMatch(/invented/);
  });

  it('a lone fresh crater has depth/diameter ≈ 0.196 and rim ≈ 0.036 D (Pike 1977, from memory)', () => {
    // Profile: floor −0.196 D, rim crest +0.036 D at r = R, joining the plain at 3R.
    const D = 100, R = 50;
    expect(craterProfile(0, R, 0.196 * D, 0.036 * D)).toBeCloseTo(-19.6, 9);
    expect(craterProfile(R, R, 0.196 * D, 0.036 * D)).toBeCloseTo(3.6, 9);
    expect(craterProfile(3 * R, R, 0.196 * D, 0.036 * D)).toBe(0);
    // In a generated DEM: one crater, no ridges/boulders/escarpment; the rolling plain is nearly
    // planar over a crater's width, so (mean height on the rim circle) − floor = depth + rim: the
    // mean of a tilted plane over a circle equals its value at the centre, so the tilt cancels.
    const { grid, features } = generateDemoTerrain({ craterCount: 1, ridgeCount: 0, boulderFieldCount: 0, escarpment: false, craterMinDiameter_m: 120, craterMaxDiameter_m: 121, seed: 4 });
    const cr = features.craters[0];
    const floor = sampleBilinear(grid, cr.east_m, cr.north_m);
    let rimSum = 0, m = 0;
    for (let t = 0; t < 64; t++) {
      const a = (2 * Math.PI * t) / 64;
      const v = sampleBilinear(grid, cr.east_m + (cr.diameter_m / 2) * Math.cos(a), cr.north_m + (cr.diameter_m / 2) * Math.sin(a));
      if (!Number.isNaN(v)) { rimSum += v; m++; }
    }
    expect(m).toBe(64); // the whole rim lies on the grid for this seed
    const relief = rimSum / m - floor;
    expect(relief).toBeGreaterThan(0.95 * (cr.depth_m + cr.rimHeight_m));
    expect(relief).toBeLessThan(1.05 * (cr.depth_m + cr.rimHeight_m));
    expect(cr.depth_m / cr.diameter_m).toBeLessThanOrEqual(0.196 + 1e-12);
  });
});
