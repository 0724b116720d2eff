/**
 * `landreach footprint --terrain DEM`: a georeferenced DEM gives footprint.geojson longitude/latitude
 * geometry. Outside checks: the DEM's geotransform (the target at its centre), the haversine distance on
 * the DEM's sphere against the local metres, and RFC 7946's structural rules.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { writeGeoTiff } from '../../../core/terrain/index.ts';
import { captureIo } from '../../support/cli-io.ts';
import { rfc7946Violations } from '../../support/rfc7946.ts';

const DEMO = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'landreach-fpt-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const R = 6378137; // the reader's sphere for EPSG:4326 (WGS 84 semi-major axis)
const DEG = Math.PI / 180;

/** Great-circle distance on a sphere of radius R (the haversine formula). */
function haversine(lon1: number, lat1: number, lon2: number, lat2: number): number {
  const h = Math.sin(((lat2 - lat1) * DEG) / 2) ** 2 + Math.cos(lat1 * DEG) * Math.cos(lat2 * DEG) * Math.sin(((lon2 - lon1) * DEG) / 2) ** 2;
  return 2 * R * Math.asin(Math.sqrt(h));
}

/** A flat 60 × 60 DEM of 0.001° pixels centred on 7° E, 45° N (invented). */
function writeDem(name: string, georeference: Parameters<typeof writeGeoTiff>[0]['georeference']): string {
  const path = join(dir, name);
  writeFileSync(path, writeGeoTiff({ width: 60, height: 60, data: new Float32Array(3600).fill(100), georeference }));
  return path;
}

describe('landreach footprint --terrain', () => {
  it('EPSG:4326 DEM: lon/lat geometry around the DEM centre, local metres in properties, RFC 7946 rules hold', async () => {
    const dem = writeDem('geo.tif', { geoTransform: [6.97, 0.001, 0, 45.03, 0, -0.001], geographicEpsg: 4326 });
    const out = join(dir, 'geo');
    const h = captureIo();
    const code = await main(['footprint', DEMO, '--out', out, '--grid', '3x3', '--extent-m', '600', '--workers', '2', '--terrain', dem], h.io);
    expect(code, h.err.join('')).toBe(0);
    const doc = JSON.parse(readFileSync(join(out, 'footprint.geojson'), 'utf8'));
    expect(rfc7946Violations(doc)).toEqual([]);
    const target = doc.features.find((f: { properties: { kind: string } }) => f.properties.kind === 'nominal-target');
    // Default placement: the DEM's centre, 6.97 + 0.03 = 7° E, 45.03 − 0.03 = 45° N (its geotransform).
    expect(target.geometry.coordinates[0]).toBeCloseTo(7, 9);
    expect(target.geometry.coordinates[1]).toBeCloseTo(45, 9);
    expect(target.properties.crs_note).toMatch(/WGS 84.*EPSG:4326/);
    expect(target.properties.crs_note).toMatch(/study's body is mars/);
    const region = doc.features[0];
    expect(region.properties.kind).toBe('reachable-with-reserve');
    expect(region.geometry.type).toBe('MultiPolygon');
    const local = region.properties.local_m.coordinates[0][0] as number[][];
    const geo = region.geometry.coordinates[0][0] as number[][];
    expect(geo.length).toBe(local.length);
    expect(geo.length).toBeGreaterThan(3);
    // Distance from the target, local metres vs the haversine on the reader's sphere: the flat frame's
    // error is about |e·n|·tan φ0 / R ≤ 600² / 6.4e6 ≈ 0.06 m here; allow 0.1 m.
    geo.forEach(([lon, lat], k) => {
      expect(Math.abs(haversine(7, 45, lon, lat) - Math.hypot(local[k][0], local[k][1]))).toBeLessThan(0.1);
    });
    const report = JSON.parse(readFileSync(join(out, 'footprint.json'), 'utf8'));
    expect(report.inputs.terrain.nominalTargetOnDem_m).toEqual([expect.any(Number), expect.any(Number)]);
  }, 120_000);

  it('refuses a DEM in a CRS it cannot convert, naming the CRS, before computing and writing nothing', async () => {
    const dem = writeDem('ft.tif', { geoTransform: [6000000, 10, 0, 2000000, 0, -10], projectedEpsg: 2227 });
    const out = join(dir, 'ft');
    const h = captureIo();
    expect(await main(['footprint', DEMO, '--out', out, '--grid', '3x3', '--extent-m', '600', '--terrain', dem], h.io)).toBe(2);
    expect(h.err.join('')).toMatch(/projected CRS EPSG:2227 cannot be converted to longitude\/latitude.*gdalwarp/);
    expect(existsSync(join(out, 'footprint.geojson'))).toBe(false);
  });

  it('refuses a DEM without a CRS, a target off the DEM, and placement flags without --terrain', async () => {
    const plain = writeDem('plain.tif', { geoTransform: [0, 2, 0, 0, 0, -2] });
    const utm = writeDem('utm.tif', { geoTransform: [400000, 10, 0, 5000000, 0, -10], projectedEpsg: 32633 });
    const cases: [string[], RegExp][] = [
      [['--terrain', plain], /has no georeference \(no CRS\)/],
      [['--terrain', utm, '--target-east-m', '0'], /--target-east-m 0, --target-north-m 4999700: the nominal target is outside the DEM/],
      [['--target-east-m', '5'], /--target-east-m only applies with --terrain DEM/],
      [['--terrain', DEMO], /--terrain .*demo-lander\.study\.json: not a GeoTIFF/],
    ];
    for (const [extra, message] of cases) {
      const h = captureIo();
      expect(await main(['footprint', DEMO, '--out', join(dir, 'bad'), '--grid', '3x3', '--extent-m', '600', ...extra], h.io)).toBe(2);
      expect(h.err.join('')).toMatch(message);
    }
  });
});
