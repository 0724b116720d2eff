/** `landreach hazard DEM --study STUDY.json`: the safe reachable set and ranked sites on the invented demo site. */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';
import { readGeoTiff } from '../../../core/terrain/index.ts';

const DEM = fileURLToPath(new URL('../../../assets/demo/terrain/demo-site.tif', import.meta.url));
const STUDY = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'landreach-hz-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const io = captureIo;

describe('landreach hazard --study', () => {
  it('writes the safe reachable mask and ranks sites that are safe, reachable and within budget', async () => {
    const h = io();
    const out = join(dir, 'a');
    const code = await main(['hazard', DEM, '--out', out, '--study', STUDY, '--targets', '5x5', '--workers', '2', '--sites', '5'], h.io);
    expect(code, h.err.join('')).toBe(0);
    const summary = JSON.parse(readFileSync(join(out, 'hazard-summary.json'), 'utf8'));
    expect(summary.safeReachable.safeReachableCells).toBeLessThanOrEqual(summary.safeReachable.reachableCells);
    expect(summary.safeReachable.safeReachableCells).toBeLessThanOrEqual(summary.results.safeCells);
    expect(summary.sites.length).toBeGreaterThan(0);
    expect(summary.sites.length).toBeLessThanOrEqual(5);
    for (const s of summary.sites) {
      expect(s.propellant_kg).toBeLessThanOrEqual(summary.safeReachable.budget_kg);
      expect(s.hazardDistance_m).toBeGreaterThanOrEqual(0);
    }
    // Ranked cheapest first.
    for (let k = 1; k < summary.sites.length; k++) expect(summary.sites[k].propellant_kg).toBeGreaterThanOrEqual(summary.sites[k - 1].propellant_kg);
    // The mask is a GeoTIFF on the DEM's grid whose ones match the count in the summary.
    const mask = await readGeoTiff(new Uint8Array(readFileSync(join(out, 'safe-reachable.tif'))));
    let ones = 0;
    for (const v of mask.heights) if (v === 1) ones++;
    expect(ones).toBe(summary.safeReachable.safeReachableCells);
  }, 120_000);

  it('rejects study-only options without --study', async () => {
    const h = io();
    expect(await main(['hazard', DEM, '--out', join(dir, 'b'), '--targets', '5x5'], h.io)).toBe(2);
    expect(h.err.join('')).toMatch(/--targets only applies with --study/);
  });
});
