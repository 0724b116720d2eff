import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import {
  DEMO_INSET_RASTER, DEMO_SITE_NAME, DEMO_SITE_RASTER, DEMO_TERRAIN_DEFAULTS, HAZARD_ROUGHNESS, HAZARD_SLOPE, craterProfile, demoSiteFeatures, generateDemoTerrain, hazardMap,
  readGeoTiff, renderDemoSite, sampleBilinear, type DemoRaster,
} from '../../../core/terrain/index.ts';

const asset = (name: string) => new URL(`../../../assets/demo/terrain/${name}`, import.meta.url);
const meta = JSON.parse(readFileSync(asset('demo-site.json'), 'utf8'));
const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');
/** The cells (c0, r0)…(c0 + w, r0 + h) of a raster, as a raster of their own. */
const window = (r: DemoRaster, c0: number, r0: number, w: number, h: number): DemoRaster =>
  ({ width: w, height: h, pixelSize_m: r.pixelSize_m, west_m: r.west_m + c0 * r.pixelSize_m, north_m: r.north_m - r0 * r.pixelSize_m });

describe('invented demo terrain', () => {
  const small: DemoRaster = { width: 96, height: 80, pixelSize_m: 5, west_m: -240, north_m: 200 };

  it('is deterministic from its generator value, and different values give different sites', () => {
    const a = generateDemoTerrain({ raster: small, seed: 9, craterCount: 2000 }).grid.heights;
    const b = generateDemoTerrain({ raster: small, seed: 9, craterCount: 2000 }).grid.heights;
    const c = generateDemoTerrain({ raster: small, seed: 10, craterCount: 2000 }).grid.heights;
    expect(b).toEqual(a);
    expect(c).not.toEqual(a);
  });

  it('a window of a raster has the same heights as the same cells of the whole raster', () => {
    const features = demoSiteFeatures({ seed: 3, halfSize_m: 300, craterCount: 400 });
    const whole = renderDemoSite(features, small);
    const part = renderDemoSite(features, window(small, 17, 23, 40, 31));
    for (let r = 0; r < 31; r++) for (let c = 0; c < 40; c++) expect(part.heights[r * 40 + c]).toBe(whole.heights[(r + 23) * 96 + c + 17]);
  });

  it('has one name, labelled invented, in the generator, the DEM metadata and the demo study', () => {
    expect(DEMO_SITE_NAME).toMatch(/\(invented\)$/);
    expect(meta.name).toBe(DEMO_SITE_NAME);
    expect(meta.invented).toBe(true);
    const study = JSON.parse(readFileSync(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url), 'utf8'));
    expect(study.site.name).toBe(DEMO_SITE_NAME);
    expect(study.site.invented).toBe(true);
  });

  it('the shipped DEMs hold the generator\'s heights (npm run gen:terrain): windows at the centre, a corner, the scarp and a boulder field', async () => {
    const features = demoSiteFeatures();
    const scarpRow = Math.round((DEMO_SITE_RASTER.north_m - features.escarpment!.north_m) / 10) - 40;
    const field = features.boulderFields[0];
    const boulderCell = [Math.round((field.east_m - DEMO_INSET_RASTER.west_m) / 2) - 64, Math.round((DEMO_INSET_RASTER.north_m - field.north_m) / 2) - 64];
    const cases = [
      { file: 'demo-site.tif', raster: DEMO_SITE_RASTER, windows: [[936, 936], [0, 0], [1872, scarpRow]] },
      { file: 'demo-inset.tif', raster: DEMO_INSET_RASTER, windows: [[436, 436], boulderCell.map((v) => Math.min(1000 - 128, Math.max(0, v)))] },
    ];
    for (const { file, raster, windows } of cases) {
      const bytes = new Uint8Array(readFileSync(asset(file)));
      // The metadata's hash is of these bytes: the file and demo-site.json were written together.
      expect(meta.rasters.find((r: { file: string }) => r.file === file).sha256).toBe(sha256(bytes));
      const shipped = await readGeoTiff(bytes);
      expect([shipped.width, shipped.height, shipped.pixelSizeX_m, shipped.pixelSizeY_m]).toEqual([raster.width, raster.height, raster.pixelSize_m, raster.pixelSize_m]);
      for (const [c0, r0] of windows) {
        const fresh = renderDemoSite(features, window(raster, c0, r0, 128, 128));
        let worst = 0;
        for (let r = 0; r < 128; r++) for (let c = 0; c < 128; c++) worst = Math.max(worst, Math.abs(shipped.heights[(r0 + r) * raster.width + c0 + c] - fresh.heights[r * 128 + c]));
        // Equal, or one height step apart where Math.sin/exp differ in the last bit on another JS engine.
        expect(worst, `${file} window at column ${c0}, row ${r0}`).toBeLessThanOrEqual(DEMO_TERRAIN_DEFAULTS.heightStep_m);
      }
    }
  });

  it('has every kind of hazard the analysis knows: slopes at crater walls, the scarp and knob fields at 10 m, roughness at 2 m', () => {
    const f = demoSiteFeatures();
    const at = (east: number, north: number, px: number, cells: number): DemoRaster =>
      ({ width: cells, height: cells, pixelSize_m: px, west_m: Math.round(east - (cells * px) / 2), north_m: Math.round(north + (cells * px) / 2) });
    const slopeCells = (r: DemoRaster) => hazardMap(renderDemoSite(f, r)).flags.filter((x) => x & HAZARD_SLOPE).length;
    const big = f.craters[0];
    expect(big.diameter_m).toBeGreaterThan(1000);
    expect(slopeCells(at(big.east_m, big.north_m, 10, 200))).toBeGreaterThan(1000); // its walls
    expect(slopeCells(at(0, f.escarpment!.north_m + f.escarpment!.waveAmplitude_m * Math.sin(f.escarpment!.phase), 10, 60))).toBeGreaterThan(0);
    const knobs = f.knobFields[0];
    expect(slopeCells(at(knobs.east_m, knobs.north_m, 10, 100))).toBeGreaterThan(0);
    const boulders = f.boulderFields[0];
    expect(Math.max(Math.abs(boulders.east_m), Math.abs(boulders.north_m))).toBeLessThan(1000); // inside the inset
    const rough = hazardMap(renderDemoSite(f, at(boulders.east_m, boulders.north_m, 2, 100)));
    expect(rough.roughnessAssessed).toBe(true);
    expect(rough.flags.filter((x) => x & HAZARD_ROUGHNESS).length).toBeGreaterThan(0);
  });

  it('a lone fresh crater has depth/diameter ≈ 0.196 and rim ≈ 0.036 D (Pike 1977, from memory)', () => {
    // Profile: floor −0.196 D, rim crest +0.036 D at r = R, joining the plain at 3R.
    const D = 100, R = 50;
    expect(craterProfile(0, R, 0.196 * D, 0.036 * D)).toBeCloseTo(-19.6, 9);
    expect(craterProfile(R, R, 0.196 * D, 0.036 * D)).toBeCloseTo(3.6, 9);
    expect(craterProfile(3 * R, R, 0.196 * D, 0.036 * D)).toBe(0);
    // In a generated DEM: one crater and nothing else but the rolling plain, which is nearly planar over
    // a crater's width, so (mean height on the rim circle) − floor = depth + rim: the mean of a tilted
    // plane over a circle equals its value at the centre, so the tilt cancels.
    const { grid, features } = generateDemoTerrain({
      raster: { width: 250, height: 250, pixelSize_m: 2, west_m: -250, north_m: 250 },
      halfSize_m: 150, craterCount: 1, largeCrater: false, ridgeCount: 0, knobFieldCount: 0, boulderFieldCount: 0, insetBoulderFields: 0,
      escarpment: false, craterMinDiameter_m: 120, craterMaxDiameter_m: 121, seed: 4,
    });
    const cr = features.craters[0];
    const floor = sampleBilinear(grid, cr.east_m, cr.north_m);
    let rimSum = 0, m = 0;
    for (let t = 0; t < 64; t++) {
      const a = (2 * Math.PI * t) / 64;
      const v = sampleBilinear(grid, cr.east_m + (cr.diameter_m / 2) * Math.cos(a), cr.north_m + (cr.diameter_m / 2) * Math.sin(a));
      if (!Number.isNaN(v)) { rimSum += v; m++; }
    }
    expect(m).toBe(64); // the whole rim lies on the grid
    const relief = rimSum / m - floor;
    expect(relief).toBeGreaterThan(0.95 * (cr.depth_m + cr.rimHeight_m));
    expect(relief).toBeLessThan(1.05 * (cr.depth_m + cr.rimHeight_m));
    expect(cr.depth_m / cr.diameter_m).toBeLessThanOrEqual(0.196 + 1e-12);
  });
});

