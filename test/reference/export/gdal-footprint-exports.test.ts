/**
 * `landreach footprint --terrain DEM` on another body: the exports in the DEM's own CRS, read by GDAL 3.6 /
 * PROJ from Debian (the outside reference).
 *
 * DEMs are made by GDAL (`gdal_translate -a_srs IAU_2015:… / a PROJ string`) on a Mars-sized and a
 * Moon-sized sphere, as test/reference/terrain does. For each:
 * - GeoTIFFs: `gdalsrsinfo` reads the propellant and mask rasters with the DEM's very CRS (the same WKT);
 *   `gdalinfo -json` gives Float32 / Byte bands, their nodata and size; and at every target's position
 *   computed by PROJ alone — PROJ's azimuthal equidistant projection about the nominal target (true ground
 *   distance and azimuth) taken into the DEM's CRS by `gdaltransform` — `gdallocationinfo -geoloc` returns
 *   the target's pixel and the propellant the run wrote to footprint.csv (nodata where it wrote none).
 *   The ground frame's linear map departs from PROJ's by about d²/R (0.2 m at 600 m on the Moon), far inside
 *   the 150 m half-pixel, so the pixel found is the target's whatever the rounding.
 * - JSON-FG (GDAL 3.6 has no JSON-FG driver, `ogrinfo --formats`): `ogrinfo` reads the file as GeoJSON (every
 *   feature, null geometry off Earth); the members are checked against OGC 21-045r1 §7 (conformsTo, coordRefSys,
 *   place, featureType, time); `coordRefSys`'s code, given to `gdalsrsinfo`, is the DEM's CRS (same PROJ
 *   parameters); the nominal target's `place` is the DEM's centre (its geotransform); every `place` vertex,
 *   taken to longitude/latitude by `gdaltransform`, is where the RFC 7946 file puts it, to 1 cm on the ground.
 */
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';
import { rfc7946Violations } from '../../support/rfc7946.ts';
import { gdal, gdalAvailable, gdalinfoJson, tempDir, writeAsciiGrid } from '../terrain/gdal.ts';

const DEMO = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));
const tmp = tempDir();
afterAll(() => tmp.cleanup());
const DEG = Math.PI / 180;
const MARS_R = 3396190; // `gdalsrsinfo IAU_2015:49910`
const MOON_R = 1737400; // `gdalsrsinfo IAU_2015:30135`
const HALF = 3000; // DEM half-width, m: covers the ±600 m grid
const NX = 5, NY = 5, EXTENT = 600;

function transform(args: string[], points: number[][]): number[][] {
  const out = gdal('gdaltransform', ['-output_xy', ...args], points.map((p) => p.join(' ')).join('\n') + '\n');
  return out.trim().split('\n').map((l) => l.trim().split(/\s+/).map(Number));
}

/** PROJ string parameters as a map (+R spelt a = b = R, +k spelt k_0), for comparing two definitions. */
function projParams(def: string): Map<string, string> {
  const m = new Map<string, string>();
  for (const tok of def.trim().split(/\s+/)) {
    const [k, v = ''] = tok.replace(/^\+/, '').split('=');
    if (k === 'R') { m.set('a', v); m.set('b', v); } else if (k === 'k') m.set('k_0', v); else if (!['no_defs', 'type'].includes(k)) m.set(k, v);
  }
  return m;
}

interface Case {
  name: string; srs: string; R: number; lon: number; lat: number; uri: RegExp | null;
  /** The target grid is turned or sheared in the DEM's CRS (a ModelTransformation, not north-up). */
  rotated: boolean;
  /** Earth (WGS 84): the figure for PROJ, and JSON-FG then has a WGS 84 fallback geometry. */
  wgs84?: boolean;
}
const cases: Case[] = [
  { name: 'Mars, IAU_2015:49910 equirectangular', srs: 'IAU_2015:49910', R: MARS_R, lon: 137.4, lat: -4.6, uri: /^http:\/\/www\.opengis\.net\/def\/crs\/IAU\/2015\/49910$/, rotated: false },
  // Away from the central meridian meridian convergence turns the target grid: a rotated geotransform.
  { name: 'Moon, IAU_2015:30135 south polar stereographic', srs: 'IAU_2015:30135', R: MOON_R, lon: -60, lat: -88.5, uri: /^http:\/\/www\.opengis\.net\/def\/crs\/IAU\/2015\/30135$/, rotated: true },
  // Sinusoidal east of its central meridian shears the grid (meridians lean).
  { name: 'Moon-sized sphere, user-defined sinusoidal (no registered code)', srs: `+proj=sinu +lon_0=77 +x_0=1000 +y_0=-2000 +R=${MOON_R} +units=m +no_defs`, R: MOON_R, lon: 77.3, lat: 20, uri: null, rotated: true },
  // Earth, for the EPSG path and the WGS 84 fallback geometry: UTM zone 33 N, 1.5° east of its central meridian.
  { name: 'Earth, EPSG:32633 (UTM zone 33 N)', srs: 'EPSG:32633', R: 6378137, lon: 16.5, lat: 45, uri: /^http:\/\/www\.opengis\.net\/def\/crs\/EPSG\/0\/32633$/, rotated: true, wgs84: true },
];

describe.runIf(gdalAvailable())('footprint exports in the DEM\'s CRS, read by GDAL/PROJ', () => {
  it.each(cases.map((c, i) => [c.name, c, i] as const))('%s', async (_name, c, i) => {
    const figure = c.wgs84 ? '+datum=WGS84' : `+R=${c.R}`;
    const geog = `+proj=longlat ${figure} +no_defs`;
    const [[x, y]] = transform(['-s_srs', geog, '-t_srs', c.srs], [[c.lon, c.lat]]);
    const asc = tmp.path(`dem${i}.asc`);
    writeAsciiGrid(asc, 30, 30, new Float64Array(900).fill(-1500));
    const dem = tmp.path(`dem${i}.tif`);
    gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', c.srs, '-a_ullr', String(x - HALF), String(y + HALF), String(x + HALF), String(y - HALF), asc, dem]);
    const out = tmp.path(`out${i}`);
    const h = captureIo();
    const code = await main(['footprint', DEMO, '--out', out, '--grid', `${NX}x${NY}`, '--extent-m', String(EXTENT), '--workers', '1', '--terrain', dem], h.io);
    expect(code, h.err.join('')).toBe(0);
    const propTif = `${out}/footprint-propellant.tif`;
    const maskTif = `${out}/footprint-reachable.tif`;

    // 1. The rasters carry the DEM's CRS as GDAL reads it.
    const demWkt = gdal('gdalsrsinfo', ['-o', 'wkt2', dem]);
    expect(gdal('gdalsrsinfo', ['-o', 'wkt2', propTif])).toBe(demWkt);
    expect(gdal('gdalsrsinfo', ['-o', 'wkt2', maskTif])).toBe(demWkt);
    const info = gdalinfoJson(propTif);
    const mask = gdalinfoJson(maskTif);
    expect(info.size).toEqual([NX, NY]);
    expect(info.bands[0].type).toBe('Float32');
    expect(info.bands[0].noDataValue).toBe('NaN');
    expect(mask.bands[0].type).toBe('Byte');
    expect(mask.bands[0].noDataValue).toBe(255);
    const gt = info.geoTransform as number[];
    expect(gt[2] !== 0 || gt[4] !== 0).toBe(c.rotated);

    // 2. Every target, placed by PROJ alone, falls in its own pixel with the run's propellant.
    const [[tLon, tLat]] = transform(['-s_srs', c.srs, '-t_srs', geog], [[x, y]]);
    const aeqd = `+proj=aeqd +lat_0=${tLat} +lon_0=${tLon} ${figure} +units=m +no_defs`;
    const csv = readFileSync(`${out}/footprint.csv`, 'utf8').split('\n').filter((l) => l && !l.startsWith('#')).slice(1).map((l) => l.split(','));
    expect(csv.length).toBe(NX * NY);
    const local = csv.map((r) => [Number(r[0]), Number(r[1])]);
    const where = transform(['-s_srs', aeqd, '-t_srs', c.srs], local);
    // gdallocationinfo reads the query points from stdin, one "X Y" per line, and reports each in turn.
    const points = where.map((p) => p.join(' ')).join('\n') + '\n';
    const reports = gdal('gdallocationinfo', ['-geoloc', propTif], points).split('Report:').slice(1);
    const maskValues = gdal('gdallocationinfo', ['-valonly', '-geoloc', maskTif], points).trim().split('\n');
    expect(reports.length).toBe(NX * NY);
    let reachable = 0;
    csv.forEach((r, k) => {
      const i = k % NX, j = Math.floor(k / NX);
      expect(reports[k], `target ${r[0]}, ${r[1]}`).toContain(`Location: (${i}P,${NY - 1 - j}L)`);
      const value = /Value: (\S+)/.exec(reports[k])![1];
      if (r[2] === 'reachable') {
        reachable++;
        // footprint.csv prints 3 decimals (±0.0005 kg); the raster holds the Float32 value (≤ 1.5e-5 kg apart at 250 kg).
        expect(Math.abs(Number(value) - Number(r[3]))).toBeLessThanOrEqual(0.0005 + 1.5e-5);
      } else expect(value.toLowerCase()).toBe('nan');
      // The mask: footprint.csv's within_budget (empty where not established: nodata 255).
      expect(maskValues[k].trim()).toBe(r[8] === '' ? '255' : r[8]);
    });
    expect(reachable).toBeGreaterThan(0);

    // 3. JSON-FG beside the RFC 7946 file.
    const fg = JSON.parse(readFileSync(`${out}/footprint.fg.json`, 'utf8'));
    const geojson = JSON.parse(readFileSync(`${out}/footprint.geojson`, 'utf8'));
    expect(rfc7946Violations(fg)).toEqual([]);
    const ogr = gdal('ogrinfo', ['-ro', '-al', '-so', `${out}/footprint.fg.json`]);
    expect(ogr).toMatch(new RegExp(`Feature Count: ${fg.features.length}\\b`));
    // OGC 21-045r1 §7: conformance classes (Core; Feature Types and Schemas for featureType), a CRS for place.
    expect(fg.conformsTo).toEqual(expect.arrayContaining(['http://www.opengis.net/spec/json-fg-1/1.0/conf/core', 'http://www.opengis.net/spec/json-fg-1/1.0/conf/types-schemas']));
    for (const f of fg.features) {
      expect(Object.keys(f)).toEqual(expect.arrayContaining(['type', 'time', 'place', 'geometry', 'properties', 'featureType']));
      expect(f.place).not.toBeNull();
      // Off Earth there is no WGS 84 geometry to give: geometry is null (§7.2, "Use of geometry and/or place");
      // on WGS 84 it is the fallback, the RFC 7946 file's geometry.
      if (c.wgs84) expect(f.geometry).toEqual(geojson.features[fg.features.indexOf(f)].geometry);
      else expect(f.geometry).toBeNull();
    }
    let demProj4: string;
    if (c.uri) {
      expect(fg.coordRefSys).toMatch(c.uri);
      const [, auth, version, code] = /\/def\/crs\/(\w+)\/([\w.]+)\/(\d+)$/.exec(fg.coordRefSys)!;
      demProj4 = gdal('gdalsrsinfo', ['-o', 'proj4', dem]).trim();
      // The OGC register's /def/crs/EPSG/0/N is PROJ's EPSG:N; /def/crs/IAU/2015/N is IAU_2015:N.
      const projCode = auth === 'EPSG' ? `EPSG:${code}` : `${auth}_${version}:${code}`;
      expect(projParams(gdal('gdalsrsinfo', ['-o', 'proj4', projCode]).trim())).toEqual(projParams(demProj4));
    } else {
      expect(fg.coordRefSys.type).toBe('PROJ');
      demProj4 = gdal('gdalsrsinfo', ['-o', 'proj4', dem]).trim();
      // The definition carried by value is the DEM's: PROJ gives the same parameters for both.
      expect(projParams(gdal('gdalsrsinfo', ['-o', 'proj4', fg.coordRefSys.value]).trim())).toEqual(projParams(demProj4));
    }
    const target = fg.features.find((f: { featureType: string }) => f.featureType === 'nominal-target');
    expect(target.place.coordinates[0]).toBeCloseTo(x, 3);
    expect(target.place.coordinates[1]).toBeCloseTo(y, 3);
    // place vertices → PROJ's longitude/latitude, against the RFC 7946 file's for the same vertices (1 cm).
    const fgRing = fg.features[0].place.coordinates[0][0] as number[][];
    const gjRing = geojson.features[0].geometry.coordinates[0][0] as number[][];
    expect(fgRing.length).toBe(gjRing.length);
    const lonLat = transform(['-s_srs', c.srs, '-t_srs', geog], fgRing);
    lonLat.forEach(([lon, lat], k) => {
      const dLon = ((((lon - gjRing[k][0]) % 360) + 540) % 360) - 180;
      // On the sphere R; on WGS 84 the largest radius of curvature, a²/b < 6 400 km, bounds it from above.
      const gap = (c.wgs84 ? 6.4e6 : c.R) * Math.hypot(dLon * DEG * Math.cos(lat * DEG), (lat - gjRing[k][1]) * DEG);
      expect(gap, `vertex ${k}`).toBeLessThan(0.01);
    });
    expect(existsSync(`${out}/footprint.manifest.json`)).toBe(true);
  }, 300_000);
});
