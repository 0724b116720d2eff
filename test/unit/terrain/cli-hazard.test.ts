import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../../core/cli/main.ts';
import { gridFromFunction, readGeoTiff, writeGeoTiff, writeJsonGrid } from '../../../core/terrain/index.ts';
import { encodeGreyPng } from './png-encode.ts';

const dir = mkdtempSync(join(tmpdir(), 'landreach-hazard-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function io() {
  const out = { stdout: '', stderr: '' };
  return { out, io: { stdout: (t: string) => { out.stdout += t; }, stderr: (t: string) => { out.stderr += t; }, interactive: false } };
}

// A 12° plane in the west half, flat in the east half, at 1 m pixels.
const DEG = Math.PI / 180;
const dem = gridFromFunction({ width: 40, height: 20, pixelSizeX_m: 1, pixelSizeY_m: 1 }, (x) => (x < 20 ? Math.tan(12 * DEG) * (20 - x) : 0));
const demPath = join(dir, 'plane.json');
writeFileSync(demPath, writeJsonGrid(dem));

describe('landreach hazard', () => {
  it('writes slope, roughness and hazard GeoTIFFs and a JSON summary', async () => {
    const { out, io: cio } = io();
    const code = await main(['hazard', demPath, '--out', join(dir, 'a'), '--max-slope-deg', '10', '--lander-diameter-m', '4'], cio);
    expect(code).toBe(0);
    const summary = JSON.parse(readFileSync(join(dir, 'a', 'hazard-summary.json'), 'utf8'));
    expect(summary.limits.maxSlope_deg).toBe(10);
    expect(summary.limits.defaulted).toContain('maxRoughness_m');
    expect(summary.caution).toMatch(/not flight software/);
    expect(summary.input.width).toBe(40);
    expect(summary.results.slopeHazardCells).toBeGreaterThan(0);
    expect(out.stdout).toMatch(/safe fraction/);
    const slope = await readGeoTiff(new Uint8Array(readFileSync(join(dir, 'a', 'slope.tif'))));
    expect(slope.heights[10 * 40 + 5]).toBeCloseTo(12, 3); // degrees
    const fp = await readGeoTiff(new Uint8Array(readFileSync(join(dir, 'a', 'footprint-slope.tif'))));
    expect(fp.heights[10 * 40 + 5]).toBeCloseTo(12, 3);
    const hazard = await readGeoTiff(new Uint8Array(readFileSync(join(dir, 'a', 'hazard.tif'))));
    expect(hazard.heights[10 * 40 + 5]).toBe(1); // slope hazard
    expect(hazard.heights[10 * 40 + 30]).toBe(0); // flat and safe
    expect(summary.results.safeCells).toBe(Array.from(hazard.heights).filter((v) => v === 0).length);
  });

  it('refuses to overwrite without --overwrite, and exits 2 on bad options with a clear message', async () => {
    const run = async (...args: string[]) => { const x = io(); const code = await main(['hazard', ...args], x.io); return { code, err: x.out.stderr }; };
    expect((await run(demPath, '--out', join(dir, 'a'))).err).toMatch(/already exists; pass --overwrite/);
    expect((await run(demPath, '--out', join(dir, 'a'), '--overwrite')).code).toBe(0);
    expect(await run(demPath, '--out', join(dir, 'b'), '--max-slope-deg', 'steep')).toMatchObject({ code: 2, err: expect.stringMatching(/--max-slope-deg: 'steep' is not a number/) });
    expect(await run(demPath, '--out', join(dir, 'b'), '--max-slope-deg', '120')).toMatchObject({ code: 2, err: expect.stringMatching(/invalid maxSlope_deg: 120/) });
    expect(await run(demPath)).toMatchObject({ code: 2, err: expect.stringMatching(/--out DIR is required/) });
    expect(await run(demPath, '--out', join(dir, 'b'), '--study', 's.json')).toMatchObject({ code: 2, err: expect.stringMatching(/cannot read study file 's.json'/) });
    expect(await run(join(dir, 'missing.tif'), '--out', join(dir, 'b'))).toMatchObject({ code: 2, err: expect.stringMatching(/cannot read DEM .*ENOENT/) });
    expect(existsSync(join(dir, 'b', 'slope.tif'))).toBe(false);
  });

  it('reads a 16-bit PNG heightmap only with a pixel size and height scale', async () => {
    const png = join(dir, 'flat.png');
    writeFileSync(png, encodeGreyPng(20, 20, new Array(400).fill(5000), 16));
    const x = io();
    expect(await main(['hazard', png, '--out', join(dir, 'p')], x.io)).toBe(2);
    expect(x.out.stderr).toMatch(/give --pixel-size-m and --height-scale-m/);
    const y = io();
    expect(await main(['hazard', png, '--out', join(dir, 'p'), '--pixel-size-m', '1', '--height-scale-m', '0.01'], y.io)).toBe(0);
    const summary = JSON.parse(readFileSync(join(dir, 'p', 'hazard-summary.json'), 'utf8'));
    expect(summary.input.format).toBe('png-heightmap');
    expect(summary.results.safeCells).toBe(16 * 16); // flat: all but the 2-cell unknown ring
  });

  it('a GeoTIFF with a 1e-4 m pixel size is refused with a clear message (exit 2), not run out of memory', async () => {
    const tif = join(dir, 'tiny-pixels.tif');
    writeFileSync(tif, writeGeoTiff({ width: 64, height: 64, data: new Float32Array(64 * 64).fill(50), georeference: { geoTransform: [0, 1e-4, 0, 0, 0, -1e-4], projectedEpsg: 32633 } }));
    const x = io();
    const code = await main(['hazard', tif, '--out', join(dir, 'tiny')], x.io);
    expect(code).toBe(2);
    expect(x.out.stderr).toMatch(/landerDiameter_m 4 spans 40001 × 40001 DEM pixels of 0.0001 × 0.0001 m, over the limit of 65536 cells/);
    expect(existsSync(join(dir, 'tiny', 'hazard.tif'))).toBe(false);
  });
});
