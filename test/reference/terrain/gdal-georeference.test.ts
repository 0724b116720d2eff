/**
 * Terrain frame → longitude/latitude (core/terrain/georeference.ts, projection.ts) checked against PROJ through GDAL 3.6's
 * gdaltransform (Debian gdal-bin), on GeoTIFFs written by gdal_translate:
 *   1. exact representation: points of the DEM's frame against GDAL's own pixel/line → lon/lat;
 *   2. UTM on WGS 84 across a zone against PROJ's transverse Mercator;
 *   3. the footprint's local metres against true ground offsets from the nominal target (PROJ's azimuthal
 *      equidistant projection centred there), within the error the flat frame is expected to make.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { cellEast, cellNorth, makeProjection, readGeoTiff, terrainLonLat, type ElevationGrid } from '../../../core/terrain/index.ts';
import { footprintLonLat } from '../../../core/footprint/georeferencedFootprint.ts';
import { gdal, gdalAvailable, tempDir, writeAsciiGrid } from './gdal.ts';

const tmp = tempDir();
afterAll(() => tmp.cleanup());
const DEG = Math.PI / 180;
const W = 40, H = 30;

/** A GDAL-written Float32 GeoTIFF (from an ASCII grid) with the given CRS and corners. */
function gdalTif(name: string, srs: string, ullr: [number, number, number, number]): string {
  const asc = tmp.path(`${name}.asc`);
  writeAsciiGrid(asc, W, H, Float64Array.from({ length: W * H }, (_, k) => 100 + (k % 7)));
  const tif = tmp.path(`${name}.tif`);
  gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', srs, '-a_ullr', ...ullr.map(String), asc, tif]);
  return tif;
}

/** gdaltransform over stdin lines "x y", returning [x, y] pairs. */
function transform(args: string[], points: number[][]): number[][] {
  const out = gdal('gdaltransform', ['-output_xy', ...args], points.map((p) => p.join(' ')).join('\n') + '\n');
  return out.trim().split('\n').map((l) => l.trim().split(/\s+/).map(Number));
}

/** Pixel/line positions (corners, centre, fractional) in the DEM and our frame's metres for them. */
function framePoints(grid: ElevationGrid) {
  const pixels = [[0.5, 0.5], [W - 0.5, 0.5], [0.5, H - 0.5], [W - 0.5, H - 0.5], [W / 2, H / 2], [3.25, 17.75]];
  return pixels.map(([px, ln]) => ({
    pixel: [px, ln],
    local: [cellEast(grid, px - 0.5), cellNorth(grid, ln - 0.5)] as [number, number],
  }));
}

/**
 * Reads the GeoTIFF, maps its frame points to lon/lat with our conversion and with GDAL's gdaltransform
 * (pixel/line → EPSG:4326), and requires them to agree within `tolerance_deg`. Returns our conversion.
 */
async function expectFrameMatchesGdal(tif: string, tolerance_deg: number) {
  const grid = await readGeoTiff(new Uint8Array(readFileSync(tif)));
  const ref = terrainLonLat(grid.georeference)!;
  const pts = framePoints(grid);
  const gdalLonLat = transform(['-t_srs', 'EPSG:4326', tif], pts.map((p) => p.pixel));
  pts.forEach((p, i) => {
    const [lon, lat] = ref.toLonLat(...p.local);
    expect(Math.abs(lon - gdalLonLat[i][0])).toBeLessThan(tolerance_deg);
    expect(Math.abs(lat - gdalLonLat[i][1])).toBeLessThan(tolerance_deg);
  });
  return ref;
}

describe.runIf(gdalAvailable())('terrain frame → lon/lat against GDAL/PROJ', () => {
  it('EPSG:4326 DEM: frame points come back at GDAL\'s pixel/line → lon/lat (exact map, < 1e-9°)', async () => {
    // Same affine map from the geotransform on both sides: only rounding differs.
    await expectFrameMatchesGdal(gdalTif('geo', 'EPSG:4326', [7, 45.015, 7.04, 44.985]), 1e-9);
  });

  it('UTM 33N DEM: frame points against GDAL, and UTM points across the zone against PROJ (< 1e-8° ≈ 1 mm)', async () => {
    const ref = await expectFrameMatchesGdal(gdalTif('utm', 'EPSG:32633', [350000, 4800000, 350000 + 25 * W, 4800000 - 25 * H]), 1e-8);
    // Across the zone (± 3° and beyond at the equator) and from the equator to 80° N. Ours is proj4js's
    // ellipsoidal transverse Mercator (Poder/Engsager series, core/terrain/projection.ts); PROJ's is good to
    // nanometres.
    const utm = [];
    for (const E of [170000, 330000, 500000, 640000, 830000]) for (const N of [0, 1500000, 4500000, 7000000, 8880000]) utm.push([E, N]);
    const proj = transform(['-s_srs', 'EPSG:32633', '-t_srs', 'EPSG:4326'], utm);
    utm.forEach(([E, N], i) => {
      const [lon, lat] = ref.toLonLat(E, N);
      expect(Math.abs(lon - proj[i][0])).toBeLessThan(1e-8);
      expect(Math.abs(lat - proj[i][1])).toBeLessThan(1e-8);
    });
    // Southern hemisphere zone (false northing 10 000 km).
    const south = terrainLonLat({ model: 'projected', geoTransform: [0, 1, 0, 0, 0, -1], projectedEpsg: 32719 })!;
    const sPts = [[250000, 6000000], [500000, 9990000], [760000, 1200000]];
    transform(['-s_srs', 'EPSG:32719', '-t_srs', 'EPSG:4326'], sPts).forEach(([lon, lat], i) => {
      const [ourLon, ourLat] = south.toLonLat(sPts[i][0], sPts[i][1]);
      expect(Math.abs(ourLon - lon)).toBeLessThan(1e-8);
      expect(Math.abs(ourLat - lat)).toBeLessThan(1e-8);
    });
  });

  it('EPSG:2227 DEM (Lambert conformal conic, US survey feet): metres in the frame, the projection against PROJ, lon/lat export refused', async () => {
    // GDAL-written file in feet: our frame is metres (1 US survey foot = 1200/3937 m, its definition).
    const ft = 1200 / 3937;
    const tif = gdalTif('lcc', 'EPSG:2227', [6000000, 2100000, 6000000 + 30 * W, 2100000 - 30 * H]);
    const grid = await readGeoTiff(new Uint8Array(readFileSync(tif)));
    expect(grid.pixelSizeX_m).toBeCloseTo(30 * ft, 12);
    expect(grid.originEast_m).toBeCloseTo(6000000 * ft, 6);
    // Our frame (metres) → lon/lat on the CRS's own datum, against PROJ's EPSG:2227 → EPSG:4269 (NAD83, the
    // same datum: no shift) on the same points in feet.
    const p = makeProjection(grid.georeference!.projectedCrs!);
    const feet = [[6000000, 2100000], [5800000, 1900000], [6300000, 2400000]];
    transform(['-s_srs', 'EPSG:2227', '-t_srs', 'EPSG:4269'], feet).forEach(([lon, lat], i) => {
      const [ourLon, ourLat] = p.inverse(feet[i][0] * ft, feet[i][1] * ft);
      expect(Math.abs(ourLon - lon)).toBeLessThan(1e-8);
      expect(Math.abs(ourLat - lat)).toBeLessThan(1e-8);
    });
    // NAD83 is not WGS 84 and no datum shift is made: GeoJSON longitude/latitude are refused, naming the CRS.
    expect(() => terrainLonLat(grid.georeference, 'lcc.tif')).toThrow(/lcc\.tif: projected CRS EPSG:2227 cannot be converted to longitude\/latitude on WGS 84/);
  });

  /**
   * Ground error (m) between our lon/lat of footprint offsets (e, n) and PROJ's azimuthal equidistant
   * projection centred on the nominal target (true distance and bearing from it, i.e. local ground metres).
   */
  function groundErrors(lonLat: (e: number, n: number) => [number, number], aeqdTo: string, offsets: number[][]): number[] {
    const truth = transform(['-s_srs', aeqdTo, '-t_srs', aeqdTo.replace(/\+proj=aeqd \+lat_0=\S+ \+lon_0=\S+/, '+proj=longlat')], offsets);
    return offsets.map(([e, n], i) => {
      const [lon, lat] = lonLat(e, n);
      const [tLon, tLat] = truth[i];
      const dLon = ((((lon - tLon) % 360) + 540) % 360) - 180; // PROJ may return 200° E as −160°
      // Metres on the local sphere/ellipsoid radius: differences are a few metres at most, so a flat metric suffices.
      return Math.hypot(dLon * DEG * Math.cos(lat * DEG), (lat - tLat) * DEG) * radiusOf(aeqdTo);
    });
  }
  const radiusOf = (srs: string) => Number(/\+R=(\d+)/.exec(srs)?.[1] ?? 6378137);
  const D = 5000; // footprint half-width, m
  const offsets = [[D, 0], [-D, 0], [0, D], [0, -D], [D, D], [-D, D], [D, -D], [-D, -D], [1200, -3400]];

  it('Mars-sized sphere DEM (no EPSG code): local metres vs true ground offsets, within (|e·n| + e²/2)·tan φ0 / R', async () => {
    // Invented DEM on a sphere of radius 3 396 190 m (a Mars-sized body, value from memory), about 18.4° N.
    const R = 3396190;
    const tif = gdalTif('sphere', `+proj=longlat +R=${R} +no_defs`, [200, 18.55, 200.4, 18.25]);
    const grid = await readGeoTiff(new Uint8Array(readFileSync(tif)));
    const lf = grid.georeference!.localFrame!;
    expect(lf.bodyRadius_m).toBe(R);
    const centre: [number, number] = [grid.originEast_m + (W * grid.pixelSizeX_m) / 2, grid.originNorth_m - (H * grid.pixelSizeY_m) / 2];
    const ll = footprintLonLat(grid, centre, 'mars')!;
    expect(ll.wgs84).toBe(false);
    expect(ll.body).toBe('mars');
    const [lon0, lat0] = ll.toLonLat(0, 0);
    const errors = groundErrors(ll.toLonLat, `+proj=aeqd +lat_0=${lat0} +lon_0=${lon0} +R=${R} +units=m`, offsets);
    const tan = Math.tan(lat0 * DEG);
    offsets.forEach(([e, n], i) => {
      // Equirectangular frame about the target: the east scale drifts by n·tan φ0/R (meridians converge), and
      // a straight east line is a parallel, which bends north of the great circle by e²·tan φ0/(2R); third-
      // order terms (d³/R² ≈ 0.01 m here) are covered by the 1.1 factor and 0.02 m.
      const bound = 1.1 * ((Math.abs(e * n) + (e * e) / 2) * tan) / R + 0.02;
      expect(errors[i]).toBeLessThan(bound);
    });
    // The frame is not exact: the error really is of that size (2.5 m at the corners here), not zero.
    expect(Math.max(...errors)).toBeGreaterThan(1);
  });

  it('EPSG:4326 DEM: the reader\'s sphere of radius a adds |1 − M/a|·|n| + |1 − N/a|·|e| against WGS 84 ground metres', async () => {
    const tif = gdalTif('geo45', 'EPSG:4326', [14.9, 45.1, 15.1, 44.9]);
    const grid = await readGeoTiff(new Uint8Array(readFileSync(tif)));
    const centre: [number, number] = [grid.originEast_m + (W * grid.pixelSizeX_m) / 2, grid.originNorth_m - (H * grid.pixelSizeY_m) / 2];
    const ll = footprintLonLat(grid, centre, 'custom')!;
    const [lon0, lat0] = ll.toLonLat(0, 0);
    const a = 6378137, e2 = (1 / 298.257223563) * (2 - 1 / 298.257223563); // WGS 84 (NIMA TR8350.2)
    const s2 = Math.sin(lat0 * DEG) ** 2;
    const M = (a * (1 - e2)) / (1 - e2 * s2) ** 1.5; // meridian radius of curvature
    const N = a / Math.sqrt(1 - e2 * s2); // prime vertical radius of curvature
    const errors = groundErrors(ll.toLonLat, `+proj=aeqd +lat_0=${lat0} +lon_0=${lon0} +ellps=WGS84 +units=m`, offsets);
    const tan = Math.tan(lat0 * DEG);
    offsets.forEach(([e, n], i) => {
      const bound = 1.1 * ((Math.abs(e * n) + (e * e) / 2) * tan / a + Math.abs(n) * Math.abs(1 - M / a) + Math.abs(e) * Math.abs(1 - N / a)) + 0.02;
      expect(errors[i]).toBeLessThan(bound);
    });
  });

  it('UTM DEM: ground metres are rotated by the meridian convergence and scaled onto the grid; the export\'s note gives both', async () => {
    // Target at 14° E, 45° N in zone 33 (central meridian 15° E).
    const [[tE, tN]] = transform(['-s_srs', 'EPSG:4326', '-t_srs', 'EPSG:32633'], [[14, 45]]);
    const tif = gdalTif('utm45', 'EPSG:32633', [tE - 25 * W * 10, tN + 25 * H * 10, tE + 25 * W * 10, tN - 25 * H * 10]);
    const grid = await readGeoTiff(new Uint8Array(readFileSync(tif)));
    const ll = footprintLonLat(grid, [tE, tN], 'custom')!;
    // Convergence from PROJ: the grid direction of true north (a 1e-4° step north of the target).
    const [[nE, nN]] = transform(['-s_srs', 'EPSG:4326', '-t_srs', 'EPSG:32633'], [[14, 45.0001]]);
    const gamma = Math.atan2(nE - tE, nN - tN); // true north is γ east of grid north, i.e. grid north is −γ
    const [, angle, side, scale] = /grid north is ([\d.]+)° (east|west) of true north.*grid metres are ([\d.]+) × ground/.exec(ll.note!)!;
    expect(Number(angle) * (side === 'west' ? 1 : -1)).toBeCloseTo(gamma / DEG, 4);
    // Point scale from PROJ: grid distance of that step over its ground length (WGS 84 meridian arc M·Δφ).
    const a = 6378137, e2 = (1 / 298.257223563) * (2 - 1 / 298.257223563);
    const M = (a * (1 - e2)) / (1 - e2 * Math.sin(45 * DEG) ** 2) ** 1.5;
    const k = Math.hypot(nE - tE, nN - tN) / (M * 1e-4 * DEG);
    expect(Number(scale)).toBeCloseTo(k, 6);
    const errors = groundErrors(ll.toLonLat, `+proj=aeqd +lat_0=45 +lon_0=14 +ellps=WGS84 +units=m`, offsets);
    offsets.forEach(([e, n], i) => {
      // γ and k are applied at the target, so what remains is their change across the footprint: second
      // order in d/a. (Unrotated, the error would be d·√(γ² + (1 − 1/k)²), tens of metres at 5 km here.)
      const d = Math.hypot(e, n);
      expect(errors[i]).toBeLessThan((d * d) / a + 0.02);
      expect(errors[i]).toBeLessThan(0.1 * d * Math.hypot(gamma, 1 - 1 / k) + 0.02);
    });
  });
});
