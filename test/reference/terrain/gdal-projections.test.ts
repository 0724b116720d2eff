/**
 * Planetary projected DEMs (core/terrain/projection.ts, georeference.ts, groundFrame.ts) against PROJ
 * through GDAL 3.6's tools (Debian gdal-bin). For every projection family planetary DEMs use —
 * equirectangular, sinusoidal, polar stereographic (variants A and B), transverse Mercator, orthographic,
 * and Lambert conformal conic —
 * on a Mars-sized sphere (R = 3 396 190 m) and a Moon-sized sphere (R = 1 737 400 m) — and on Mars's IAU
 * ellipsoid with planetographic and planetocentric latitudes — GeoTIFFs are written
 * by gdal_translate -a_srs, both from a PROJ string (user-defined GeoKeys) and from an IAU_2015 code (the
 * GeoKeys GDAL writes for it). The radii are the IAU_2015 spheres as `gdalsrsinfo IAU_2015:49910 / 30110`
 * prints them here. For each file:
 *   1. points of the local east/north frame at the nominal target, over ±10 km, are taken to longitude/
 *      latitude by our ground frame and projection and by GDAL (pixel/line of the same DEM point → the
 *      body's longitude/latitude); they agree to < 1 cm on the ground (the issue's requirement);
 *   2. GDAL's longitude/latitude come back through our inverse to the local point to < 1 cm;
 *   3. the ground frame itself (east and north ground metres → DEM metres, from the projection's local
 *      derivatives) matches PROJ's image of true 10 m ground steps (azimuthal equidistant about the target)
 *      to within its linearisation error.
 * A projection outside the checked families (Robinson, as GDAL writes it for a PROJ string and for
 * IAU_2015:49950) is refused when read, naming it.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { TerrainInputError, groundFrameOnDem, readGeoTiff, terrainLonLat } from '../../../core/terrain/index.ts';
import { gdal, gdalAvailable, tempDir, writeAsciiGrid } from './gdal.ts';

const tmp = tempDir();
afterAll(() => tmp.cleanup());
const DEG = Math.PI / 180;
const W = 40, H = 40;
const HALF = 12000; // DEM half-width, m: covers the ±10 km of local points
const MARS_R = 3396190;
const MOON_R = 1737400;
const MARS_B = 3376200;

/** gdaltransform over stdin lines "x y", returning [x, y] pairs. */
function transform(args: string[], points: number[][]): number[][] {
  const out = gdal('gdaltransform', ['-output_xy', ...args], points.map((p) => p.join(' ')).join('\n') + '\n');
  return out.trim().split('\n').map((l) => l.trim().split(/\s+/).map(Number));
}

/** Longitude/latitude on a sphere of radius R, or on an ellipsoid (geodetic latitude, or planetocentric with +geoc). */
const lonLatOf = (R: number, b = R, centric = false) => `+proj=longlat ${b === R ? `+R=${R}` : `+a=${R} +b=${b}`}${centric ? ' +geoc' : ''} +no_defs`;

/** A GDAL-written Float32 GeoTIFF in `srs`, centred on the projection of (lon, lat) given in `geog`, ±HALF metres. */
function gdalTif(name: string, srs: string, geog: string, lon: number, lat: number): { tif: string; centre: [number, number] } {
  const [[x, y]] = transform(['-s_srs', geog, '-t_srs', srs], [[lon, lat]]);
  const asc = tmp.path(`${name}.asc`);
  writeAsciiGrid(asc, W, H, Float64Array.from({ length: W * H }, (_, k) => 100 + (k % 5)));
  const tif = tmp.path(`${name}.tif`);
  gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', srs, '-a_ullr', String(x - HALF), String(y + HALF), String(x + HALF), String(y - HALF), asc, tif]);
  return { tif, centre: [x, y] };
}

/**
 * Ground distance (m) between two longitude/latitude points a few centimetres apart, bounded from above by
 * using the largest radius of curvature of the body, a²/b (the meridian radius at the pole; R on a sphere).
 */
function groundGap(a: number, b: number, [lon1, lat1]: number[], [lon2, lat2]: number[]): number {
  const dLon = ((((lon1 - lon2) % 360) + 540) % 360) - 180; // PROJ may return 200° E as −160°
  return ((a * a) / b) * Math.hypot(dLon * DEG * Math.cos(lat1 * DEG), (lat1 - lat2) * DEG);
}

interface Case {
  name: string; srs: string; R: number; lon: number; lat: number;
  /** Ellipsoidal bodies: semi-minor axis, and whether the CRS's latitudes are planetocentric. */
  b?: number; centric?: boolean;
}

const userDefined = (body: string, R: number): Case[] => [
  { name: `${body} equirectangular, standard parallel −4.5°, false origin`, srs: `+proj=eqc +lat_ts=-4.5 +lon_0=137.4 +x_0=250000 +y_0=-125000 +R=${R} +units=m +no_defs`, R, lon: 137.6, lat: -4.6 },
  { name: `${body} sinusoidal (false origin 1 km E, −2 km N)`, srs: `+proj=sinu +lon_0=77 +x_0=1000 +y_0=-2000 +R=${R} +units=m +no_defs`, R, lon: 77.3, lat: 20 },
  { name: `${body} south polar stereographic (variant A, k at the pole)`, srs: `+proj=stere +lat_0=-90 +lon_0=45 +k=1 +R=${R} +units=m +no_defs`, R, lon: 30, lat: -85 },
  { name: `${body} south polar stereographic (variant B, true scale at −80°)`, srs: `+proj=stere +lat_0=-90 +lat_ts=-80 +lon_0=0 +R=${R} +units=m +no_defs`, R, lon: -60, lat: -88.5 },
  { name: `${body} north polar stereographic (k 0.994, λ0 −20°)`, srs: `+proj=stere +lat_0=90 +lon_0=-20 +k=0.994 +R=${R} +units=m +no_defs`, R, lon: 40, lat: 87 },
  { name: `${body} transverse Mercator (φ0 10°, λ0 20°, k 0.9999, false origin)`, srs: `+proj=tmerc +lat_0=10 +lon_0=20 +k=0.9999 +x_0=100 +y_0=200 +R=${R} +units=m +no_defs`, R, lon: 20.4, lat: 12 },
  { name: `${body} Lambert conformal conic (standard parallels 20°, 60°)`, srs: `+proj=lcc +lat_0=40 +lon_0=10 +lat_1=20 +lat_2=60 +R=${R} +units=m +no_defs`, R, lon: 14, lat: 35 },
  { name: `${body} orthographic (centre −60°, 30°, false origin)`, srs: `+proj=ortho +lat_0=-60 +lon_0=30 +x_0=-300 +y_0=700 +R=${R} +units=m +no_defs`, R, lon: 31, lat: -59 },
];

const iau: Case[] = [
  { name: 'IAU_2015:49910 Mars equirectangular', srs: 'IAU_2015:49910', R: MARS_R, lon: 137.4, lat: -4.6 },
  { name: 'IAU_2015:49920 Mars sinusoidal', srs: 'IAU_2015:49920', R: MARS_R, lon: 60, lat: -30 },
  { name: 'IAU_2015:49930 Mars north polar stereographic', srs: 'IAU_2015:49930', R: MARS_R, lon: 40, lat: 87 },
  { name: 'IAU_2015:49935 Mars south polar stereographic', srs: 'IAU_2015:49935', R: MARS_R, lon: -60, lat: -88.5 },
  { name: 'IAU_2015:49960 Mars transverse Mercator', srs: 'IAU_2015:49960', R: MARS_R, lon: 5, lat: 10 },
  { name: 'IAU_2015:49965 Mars orthographic', srs: 'IAU_2015:49965', R: MARS_R, lon: -8, lat: 15 },
  { name: 'IAU_2015:49975 Mars Lambert conformal conic', srs: 'IAU_2015:49975', R: MARS_R, lon: -20, lat: 45 },
  // Mars on its ellipsoid (a 3 396 190 m, b 3 376 200 m as `gdalsrsinfo IAU_2015:49901` prints them), with
  // planetographic (geodetic) and planetocentric latitudes: 0.33° apart at 50°, told apart only by the names.
  { name: 'IAU_2015:49911 Mars ellipsoid, planetographic, equirectangular', srs: 'IAU_2015:49911', R: MARS_R, b: MARS_B, lon: 16.9, lat: 50.5 },
  { name: 'IAU_2015:49912 Mars ellipsoid, planetocentric, equirectangular', srs: 'IAU_2015:49912', R: MARS_R, b: MARS_B, centric: true, lon: 16.9, lat: 50.2 },
  { name: 'IAU_2015:49962 Mars ellipsoid, planetocentric, transverse Mercator', srs: 'IAU_2015:49962', R: MARS_R, b: MARS_B, centric: true, lon: 3, lat: -40 },
  { name: 'IAU_2015:49936 Mars ellipsoid, planetographic, south polar stereographic', srs: 'IAU_2015:49936', R: MARS_R, b: MARS_B, lon: 120, lat: -84 },
  { name: 'IAU_2015:30110 Moon equirectangular', srs: 'IAU_2015:30110', R: MOON_R, lon: -3, lat: 25 },
  { name: 'IAU_2015:30120 Moon sinusoidal', srs: 'IAU_2015:30120', R: MOON_R, lon: 60, lat: -30 },
  { name: 'IAU_2015:30130 Moon north polar stereographic', srs: 'IAU_2015:30130', R: MOON_R, lon: 40, lat: 87 },
  { name: 'IAU_2015:30135 Moon south polar stereographic', srs: 'IAU_2015:30135', R: MOON_R, lon: -60, lat: -88.5 },
  { name: 'IAU_2015:30160 Moon transverse Mercator', srs: 'IAU_2015:30160', R: MOON_R, lon: 5, lat: 10 },
  { name: 'IAU_2015:30170 Moon orthographic', srs: 'IAU_2015:30170', R: MOON_R, lon: 175, lat: 5 },
];

const cases = [...userDefined('Mars-sized', MARS_R), ...userDefined('Moon-sized', MOON_R), ...iau];

/** Local points (east, north of the target, m): a 5 × 5 lattice over ±10 km and two odd ones. */
const LOCAL: [number, number][] = [];
for (const e of [-10000, -5000, 0, 5000, 10000]) for (const n of [-10000, -5000, 0, 5000, 10000]) LOCAL.push([e, n]);
LOCAL.push([1234.5, -8765.4], [-9999, 321]);

describe.runIf(gdalAvailable())('planetary projected DEMs against GDAL/PROJ (< 1 cm over ±10 km)', () => {
  it.each(cases.map((c, i) => [c.name, c, i] as const))('%s', async (_name, c, i) => {
    const b = c.b ?? c.R;
    const geog = lonLatOf(c.R, b, c.centric);
    const { tif, centre } = gdalTif(`case${i}`, c.srs, geog, c.lon, c.lat);
    const grid = await readGeoTiff(new Uint8Array(readFileSync(tif)), { sourceName: `case${i}.tif` });
    expect(grid.georeference?.model).toBe('projected');
    const ref = terrainLonLat(grid.georeference, 'dem')!;
    expect(ref.wgs84).toBe(false);
    const ground = groundFrameOnDem(grid.georeference, centre, 'dem');
    const gt = grid.georeference!.geoTransform;

    // 1. local → DEM (our ground frame) → lon/lat: ours against GDAL's for the same DEM point.
    const dem = LOCAL.map(([e, n]) => ground.toDem(e, n));
    const pixels = dem.map(([E, N]) => [(E - gt[0]) / gt[1], (gt[3] - N) / -gt[5]]);
    const gdalLonLat = transform(['-t_srs', geog, tif], pixels);
    let worst = 0;
    dem.forEach(([E, N], k) => {
      const gap = groundGap(c.R, b, ref.toLonLat(E, N), gdalLonLat[k]);
      worst = Math.max(worst, gap);
      expect(gap, `local ${LOCAL[k]}`).toBeLessThan(0.01);
    });

    // 2. GDAL's lon/lat → our DEM frame → local: back at the local point.
    gdalLonLat.forEach(([lon, lat], k) => {
      const [e, n] = ground.fromDem(...ref.fromLonLat(lon, lat));
      expect(Math.hypot(e - LOCAL[k][0], n - LOCAL[k][1]), `local ${LOCAL[k]}`).toBeLessThan(0.01);
    });

    // 3. The ground frame: true ground steps of d = 10 m east and north of the target — PROJ's azimuthal
    // equidistant projection centred on it (true geodesic distance and azimuth), taken into the DEM's CRS by
    // PROJ — against the frame's linear map. The linear map's error is second order, about d²·|∇k| ≲ d²/R
    // (scale gradients are of order 1/R in these projections near their use): 2·d²/R ≈ 0.1 mm for the
    // Moon, with 1 µm for PROJ's and our rounding.
    // The CRS is the file's as GDAL reads it back: GeoKeys cannot carry an axis direction, so the IAU
    // planetographic Mars CRSs, whose definitions count eastings westward (e.g. IAU_2015:49911), are written
    // to GeoTIFF east-positive, and GDAL, like us, reads the file that way.
    const fileSrs = tmp.path(`case${i}.wkt`);
    writeFileSync(fileSrs, gdal('gdalsrsinfo', ['-o', 'wkt2', tif]));
    const d = 10;
    const [[tLon, tLat]] = transform(['-s_srs', fileSrs, '-t_srs', lonLatOf(c.R, b)], [centre]);
    const aeqd = `+proj=aeqd +lat_0=${tLat} +lon_0=${tLon} ${b === c.R ? `+R=${c.R}` : `+a=${c.R} +b=${b}`} +units=m +no_defs`;
    const steps = [[d, 0], [0, d], [-d, 0], [0, -d]] as const;
    const truth = transform(['-s_srs', aeqd, '-t_srs', fileSrs], steps.map(([e, n]) => [e, n]));
    steps.forEach(([e, n], k) => {
      const [E, N] = ground.toDem(e, n);
      expect(Math.hypot(E - truth[k][0], N - truth[k][1]), `step ${e}, ${n}`).toBeLessThan((2 * d * d) / b + 1e-6);
    });
    console.log(`${c.name}: worst ground gap to GDAL over ±10 km ${(worst * 1000).toExponential(2)} mm`);
  });

  it.each([
    ['a Robinson PROJ string', `+proj=robin +R=${MARS_R} +units=m +no_defs`, /projection "robin"/],
    ['IAU_2015:49950 (Mars Robinson)', 'IAU_2015:49950', /Mars \(2015\) - Sphere \/ Ocentric \/ Robinson.*projection "robin"/],
    // GDAL cannot write Mollweide as GeoKeys: it writes a user-defined model type and the CRS as text.
    ['IAU_2015:49940 (Mars Mollweide)', 'IAU_2015:49940', /GTModelTypeGeoKey 32767 \(user-defined model, CRS "Mars \(2015\) - Sphere \/ Ocentric \/ Mollweide/],
  ])('refuses %s when read, naming the CRS and the projection', async (_name, srs, message) => {
    const asc = tmp.path('r.asc');
    writeAsciiGrid(asc, 4, 4, new Float64Array(16).fill(1));
    const tif = tmp.path('r.tif');
    gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', srs, '-a_ullr', '0', '4000', '4000', '0', asc, tif]);
    const read = readGeoTiff(new Uint8Array(readFileSync(tif)), { sourceName: 'site.tif' });
    await expect(read).rejects.toThrow(TerrainInputError);
    await expect(readGeoTiff(new Uint8Array(readFileSync(tif)), { sourceName: 'site.tif' })).rejects.toThrow(message);
    await expect(readGeoTiff(new Uint8Array(readFileSync(tif)), { sourceName: 'site.tif' })).rejects.toThrow(/^site\.tif: .*(projected CRS|GTModelTypeGeoKey).*gdalwarp -t_srs/);
  });
});
