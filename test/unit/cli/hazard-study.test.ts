/** `landreach hazard DEM --study STUDY.json`: the safe reachable set and ranked sites on the invented demo site. */
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';
import { makeProjection, projectedCrsFromEpsg, readGeoTiff, writeGeoTiff } from '../../../core/terrain/index.ts';
import { rfc7946Violations } from '../../support/rfc7946.ts';

// The invented demo site's 2 m inset (2 km around the nominal target); the tests read its central 1 km
// (--window) so the hazard map stays as small as before the site grew.
const DEM = fileURLToPath(new URL('../../../assets/demo/terrain/demo-inset.tif', import.meta.url));
const WINDOW = '250,250,750,750';
const STUDY = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'landreach-hz-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const io = captureIo;

describe('landreach hazard --study', () => {
  it('writes the safe reachable mask and ranks sites that are safe, reachable and within budget', async () => {
    const h = io();
    const out = join(dir, 'a');
    const code = await main(['hazard', DEM, '--window', WINDOW, '--out', out, '--study', STUDY, '--targets', '5x5', '--workers', '2', '--sites', '5'], h.io);
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
    // footprint.geojson: the demo DEM is equirectangular on a Mars-sized sphere (demo-site.json), so the
    // geometry is longitude/latitude on that body. Reference: the spherical equirectangular inverse (Snyder
    // 1987, Map Projections — A Working Manual, eqs. 12-3, 12-4), λ = λ0 + x / (R cos φ1), φ = y / R, at
    // each site's cell centre from the window's geotransform (2 m cells; the window starts 250 cells in).
    const info = JSON.parse(readFileSync(fileURLToPath(new URL('../../../assets/demo/terrain/demo-site.json', import.meta.url)), 'utf8'));
    const inset = info.rasters.find((r: { file: string }) => r.file === 'demo-inset.tif');
    const { bodyRadius_m: R, standardParallel_deg: lat1, centralMeridian_deg: lon0, centreEasting_m: E0, centreNorthing_m: N0 } = info.crs;
    const doc = JSON.parse(readFileSync(join(out, 'footprint.geojson'), 'utf8'));
    expect(rfc7946Violations(doc)).toEqual([]);
    const sites = doc.features.filter((f: { properties: { kind: string } }) => f.properties.kind === 'landing-site');
    expect(sites.map((f: { properties: { local_m: { coordinates: number[] } } }) => f.properties.local_m.coordinates)).toEqual(summary.sites.map((s: { east_m: number; north_m: number }) => [s.east_m, s.north_m]));
    sites.forEach((f: { geometry: { coordinates: number[] } }, k: number) => {
      const s = summary.sites[k];
      const x = E0 + inset.west_m + (250 + s.col + 0.5) * 2;
      const y = N0 + inset.north_m - (250 + s.row + 0.5) * 2;
      const deg = 180 / Math.PI;
      expect(f.geometry.coordinates[0]).toBeCloseTo(lon0 + (x / (R * Math.cos(lat1 / deg))) * deg, 8);
      expect(f.geometry.coordinates[1]).toBeCloseTo((y / R) * deg, 8);
    });
    expect(doc.features[0].properties.crs_note).toMatch(/Orvessa Plain \(invented\)/);
  }, 120_000);

  it('on a UTM DEM, footprint.geojson has WGS 84 lon/lat geometry; sites sit at their UTM position', async () => {
    // Invented flat DEM, 60 × 60 cells of 10 m in UTM zone 33N (EPSG:32633).
    const dem = join(dir, 'utm.tif');
    writeFileSync(dem, writeGeoTiff({ width: 60, height: 60, data: new Float32Array(3600).fill(50), georeference: { geoTransform: [400000, 10, 0, 5000000, 0, -10], projectedEpsg: 32633 } }));
    const h = io();
    const out = join(dir, 'utm');
    const code = await main(['hazard', dem, '--out', out, '--study', STUDY, '--targets', '5x5', '--workers', '2', '--sites', '3', '--lander-diameter-m', '20'], h.io);
    expect(code, h.err.join('')).toBe(0);
    const summary = JSON.parse(readFileSync(join(out, 'hazard-summary.json'), 'utf8'));
    const doc = JSON.parse(readFileSync(join(out, 'footprint.geojson'), 'utf8'));
    expect(rfc7946Violations(doc)).toEqual([]);
    const [tE, tN] = summary.safeReachable.nominalTargetOnDem_m;
    const utm = makeProjection(projectedCrsFromEpsg(32633, 'test')); // checked against PROJ in test/reference/terrain
    const sites = doc.features.filter((f: { properties: { kind: string } }) => f.properties.kind === 'landing-site');
    expect(sites.length).toBe(summary.sites.length);
    expect(sites.length).toBeGreaterThan(0);
    const scale = Number(/grid metres are ([\d.]+) × ground metres/.exec(doc.features[0].properties.crs_note)![1]);
    sites.forEach((f: { geometry: { coordinates: number[] } }, k: number) => {
      // The site's cell centre in UTM, from the DEM's geotransform (400000 E, 5000000 N, 10 m cells).
      const s = summary.sites[k];
      const E = 400000 + (s.col + 0.5) * 10;
      const N = 5000000 - (s.row + 0.5) * 10;
      const [lon, lat] = utm.inverse(E, N);
      expect(f.geometry.coordinates[0]).toBeCloseTo(lon, 8);
      expect(f.geometry.coordinates[1]).toBeCloseTo(lat, 8);
      // The summary gives the site in ground metres from the target: the grid offset rotated back by the
      // meridian convergence and divided by the point scale, so its length is the grid length / k.
      expect(Math.hypot(s.east_m, s.north_m)).toBeCloseTo(Math.hypot(E - tE, N - tN) / scale, 3);
    });
    expect(doc.features[0].properties.crs_note).toMatch(/UTM zone 33N \(EPSG:32633\)/);
  }, 120_000);

  it('on a DEM whose CRS has no lon/lat conversion, still writes everything: null geometry and a note naming the CRS', async () => {
    const dem = join(dir, 'ft.tif');
    writeFileSync(dem, writeGeoTiff({ width: 40, height: 40, data: new Float32Array(1600).fill(50), georeference: { geoTransform: [6000000, 10, 0, 2000000, 0, -10], projectedEpsg: 2227 } }));
    const h = io();
    const out = join(dir, 'ft');
    expect(await main(['hazard', dem, '--out', out, '--study', STUDY, '--targets', '3x3', '--workers', '2', '--sites', '2', '--lander-diameter-m', '20'], h.io), h.err.join('')).toBe(0);
    expect(h.err.join('')).toMatch(/footprint\.geojson has null geometry.*EPSG:2227 cannot be converted/);
    const doc = JSON.parse(readFileSync(join(out, 'footprint.geojson'), 'utf8'));
    expect(rfc7946Violations(doc)).toEqual([]);
    expect(doc.features.every((f: { geometry: unknown }) => f.geometry === null)).toBe(true);
    expect(existsSync(join(out, 'safe-reachable.tif'))).toBe(true);
  }, 120_000);

  it('rejects study-only options without --study', async () => {
    const h = io();
    expect(await main(['hazard', DEM, '--window', WINDOW, '--out', join(dir, 'b'), '--targets', '5x5'], h.io)).toBe(2);
    expect(h.err.join('')).toMatch(/--targets only applies with --study/);
  });
});
