/**
 * The shipped invented demo DEMs (assets/demo/terrain/) as GDAL 3.6 / PROJ read them: the CRS gdalinfo
 * shows, where gdaltransform puts the site centre (against the equirectangular formulas, derived below),
 * that our longitude/latitude agrees with GDAL's, and that GDAL decodes the same heights as our reader
 * (the writer's Deflate, floating-point predictor and tiles are read back by libtiff).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { DEMO_SITE_CRS, readGeoTiff, terrainLonLat } from '../../../core/terrain/index.ts';
import { gdal, gdalAvailable, gdalinfoJson } from './gdal.ts';

const path = (name: string) => fileURLToPath(new URL(`../../../assets/demo/terrain/${name}`, import.meta.url));
const SITE = path('demo-site.tif');
const INSET = path('demo-inset.tif');

describe.runIf(gdalAvailable())('invented demo DEMs against GDAL/PROJ', () => {
  it('gdalinfo shows the equirectangular CRS on a Mars-sized sphere, 2000 × 2000 at 10 m, tiled, Deflate', () => {
    const info = gdalinfoJson(SITE) as unknown as Record<string, unknown> & { size: number[]; geoTransform: number[]; coordinateSystem: { wkt: string } };
    expect(info.size).toEqual([2000, 2000]);
    expect(info.geoTransform).toEqual([-10000, 10, 0, 1100654, 0, -10]);
    const wkt = info.coordinateSystem.wkt;
    expect(wkt).toMatch(/METHOD\["Equidistant Cylindrical"/);
    expect(wkt).toMatch(/ELLIPSOID\["Mars sphere",3396190,0/);
    expect(wkt).toMatch(/"Latitude of 1st standard parallel",18\.4,/);
    expect(wkt).toMatch(/"Longitude of natural origin",-141\.7,/);
    expect(wkt).toMatch(/Orvessa Plain \(invented\)/);
    expect(JSON.stringify(info.metadata)).toMatch(/"COMPRESSION":"DEFLATE".*"PREDICTOR":"3"|"PREDICTOR":"3".*"COMPRESSION":"DEFLATE"/);
  });

  it('the body radius is the IAU_2015 Mars sphere\'s (gdalsrsinfo IAU_2015:49900)', () => {
    expect(gdal('gdalsrsinfo', ['IAU_2015:49900', '-o', 'proj4'])).toContain(`+R=${DEMO_SITE_CRS.bodyRadius_m} `);
  });

  it('the site centre is at 141.7° W, 18.4° N (to the metre): GDAL against the equirectangular formulas, and ours against GDAL', async () => {
    // Pixel/line (1000, 1000) is the corner shared by the four central pixels: easting 0, northing 1 090 654 m.
    const [lon, lat] = gdal('gdaltransform', ['-output_xy', '-t_srs', '+proj=longlat +R=3396190 +no_defs', SITE], '1000 1000\n0.5 0.5\n').trim().split('\n').map((l) => l.trim().split(/\s+/).map(Number));
    // Equirectangular on a sphere (Snyder 1987, Map Projections — A Working Manual, eqs. 12-1, 12-2):
    // x = R (λ − λ0) cos φ1, y = R φ; so the centre's λ = λ0 and φ = y / R.
    const R = 3396190, phi1 = (18.4 * Math.PI) / 180;
    expect(lon[0]).toBeCloseTo(-141.7, 9);
    expect(lon[1]).toBeCloseTo((1090654 / R) * (180 / Math.PI), 9);
    expect(Math.abs(lon[1] - 18.4) * (Math.PI / 180) * R).toBeLessThan(1); // within a metre of 18.4° N
    // The north-west pixel's centre: x = −9995 m, y = 1 100 649 m.
    expect(lat[0]).toBeCloseTo(-141.7 + (-9995 / (R * Math.cos(phi1))) * (180 / Math.PI), 9);
    expect(lat[1]).toBeCloseTo((1100649 / R) * (180 / Math.PI), 9);
    // Our reader's longitude/latitude (proj4js) at the same two points.
    const grid = await readGeoTiff(new Uint8Array(readFileSync(SITE)));
    const ours = terrainLonLat(grid.georeference)!;
    for (const [[e, n], ref] of [[[0, 1090654], lon], [[-9995, 1100649], lat]] as const) {
      const [l, p] = ours.toLonLat(e, n);
      expect(Math.abs(l - ref[0])).toBeLessThan(1e-9);
      expect(Math.abs(p - ref[1])).toBeLessThan(1e-9);
    }
  });

  it('GDAL decodes the same heights as our reader (both files, pixels in every tile column and row, edge tiles too)', async () => {
    for (const [file, size] of [[SITE, 2000], [INSET, 1000]] as const) {
      const grid = await readGeoTiff(new Uint8Array(readFileSync(file)));
      const pixels: [number, number][] = [];
      for (let i = 0; i < 24; i++) pixels.push([Math.floor(((i * 97) % 24) * (size / 24)) + (i % 7), Math.floor(i * (size / 24)) + ((i * 13) % 11)]);
      pixels.push([size - 1, size - 1], [0, size - 1], [size - 1, 0]);
      const out = gdal('gdallocationinfo', ['-valonly', file], pixels.map(([c, r]) => `${c} ${r}`).join('\n') + '\n').trim().split('\n').map(Number);
      pixels.forEach(([c, r], k) => expect(grid.heights[r * size + c], `${file} (${c}, ${r})`).toBe(Math.fround(out[k])));
    }
  });
});
