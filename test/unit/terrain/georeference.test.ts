/**
 * Terrain frame → longitude/latitude (core/terrain/georeference.ts, projection.ts: proj4js through
 * geotiff-geokeys-to-proj4). Outside sources: the GDAL geotransform convention (pixel-centre coordinates),
 * Snyder's worked example of the ellipsoidal transverse Mercator, and the UTM zone definition. GDAL/PROJ
 * itself is the reference in test/reference/terrain/gdal-georeference.test.ts and gdal-projections.test.ts.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  TerrainInputError, cellEast, cellNorth, geographicToLocal, localToGeographic, makeProjection, projectedCrsFromEpsg, projectedCrsFromGeoKeys, readGeoTiff,
  terrainLonLat, writeGeoTiff, type GridGeoreference,
} from '../../../core/terrain/index.ts';

describe('geographic DEM frame', () => {
  it('localToGeographic is the inverse of geographicToLocal (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -80, max: 80, noNaN: true }),
        fc.double({ min: -179, max: 179, noNaN: true }),
        fc.double({ min: 1e5, max: 7e6, noNaN: true }),
        fc.double({ min: -0.5, max: 0.5, noNaN: true }),
        fc.double({ min: -0.5, max: 0.5, noNaN: true }),
        (lat0, lon0, R, dLon, dLat) => {
          const frame = { originLatitude_deg: lat0, originLongitude_deg: lon0, bodyRadius_m: R };
          const [e, n] = geographicToLocal(frame, lon0 + dLon, lat0 + dLat);
          const [lon, lat] = localToGeographic(frame, e, n);
          expect(Math.abs(lon - (lon0 + dLon))).toBeLessThan(1e-9);
          expect(Math.abs(lat - (lat0 + dLat))).toBeLessThan(1e-9);
        },
      ),
    );
  });

  it('EPSG:4326 file from our writer: pixel centres come back at the geotransform\'s longitude/latitude', async () => {
    // GDAL geotransform convention: pixel (c, r) centre at (x0 + (c + ½)dx, y0 − (r + ½)dy).
    const W = 12, H = 9, x0 = 7.25, y0 = 45.1, dx = 0.0004, dy = 0.0003;
    const tif = writeGeoTiff({ width: W, height: H, data: new Float32Array(W * H).fill(10), georeference: { geoTransform: [x0, dx, 0, y0, 0, -dy], geographicEpsg: 4326 } });
    const grid = await readGeoTiff(tif);
    const ref = terrainLonLat(grid.georeference)!;
    expect(ref.wgs84).toBe(true);
    expect(ref.sourceCrs).toBe('EPSG:4326');
    for (const [c, r] of [[0, 0], [W - 1, 0], [0, H - 1], [W - 1, H - 1], [5, 4]]) {
      const [lon, lat] = ref.toLonLat(cellEast(grid, c), cellNorth(grid, r));
      expect(lon).toBeCloseTo(x0 + (c + 0.5) * dx, 10);
      expect(lat).toBeCloseTo(y0 - (r + 0.5) * dy, 10);
    }
  });
});

describe('transverse Mercator through proj4js', () => {
  it('matches Snyder\'s ellipsoidal worked example (Clarke 1866, φ 40°30′ N, λ 73°30′ W, λ0 75° W, k0 0.9996)', () => {
    // Snyder (1987), Map Projections — A Working Manual, USGS Prof. Paper 1395, numerical example for the
    // ellipsoidal transverse Mercator: x = 127 106.5 m, y = 4 484 124.4 m (values quoted from memory; PROJ
    // itself holds the projection in the reference tests).
    const p = makeProjection({ proj4: '+proj=tmerc +lat_0=0 +lon_0=-75 +k_0=0.9996 +x_0=0 +y_0=0 +ellps=clrk66 +no_defs', name: 'Snyder example' });
    const [x, y] = p.forward(-73.5, 40.5);
    expect(x).toBeCloseTo(127106.5, 0);
    expect(y).toBeCloseTo(4484124.4, 0);
    const [lon, lat] = p.inverse(x, y);
    expect(Math.abs(lon + 73.5)).toBeLessThan(1e-9);
    expect(Math.abs(lat - 40.5)).toBeLessThan(1e-9);
  });

  it('inverse undoes forward across a UTM zone, both hemispheres (property, < 1e-9° ≈ 0.1 mm)', () => {
    const zones = [
      { p: makeProjection(projectedCrsFromEpsg(32633, 'test')), cm: 15, north: true },
      { p: makeProjection(projectedCrsFromEpsg(32719, 'test')), cm: -69, north: false },
    ];
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1 }), fc.double({ min: -3.5, max: 3.5, noNaN: true }), fc.double({ min: 0, max: 80, noNaN: true }), (z, dLon, absLat) => {
        const { p, cm, north } = zones[z];
        const lat = north ? absLat : -absLat;
        const [E, N] = p.forward(cm + dLon, lat);
        const [lon, back] = p.inverse(E, N);
        expect(Math.abs(lon - (cm + dLon))).toBeLessThan(1e-9);
        expect(Math.abs(back - lat)).toBeLessThan(1e-9);
      }),
    );
  });

  it('UTM zones by EPSG code: 326zz / 327zz (UTM definition, NIMA TM8358.2)', () => {
    // Zone z: central meridian 6z − 183°, k0 0.9996, E0 500 km, N0 0 (north) / 10 000 km (south). On the
    // central meridian at the equator: E = 500 000 m, N = N0; 1° east of it the easting grows.
    for (const [code, cm, N0] of [[32633, 15, 0], [32701, -177, 10000000], [32760, 177, 10000000], [32601, -177, 0]]) {
      const p = makeProjection(projectedCrsFromEpsg(code, 'test'));
      const [E, N] = p.forward(cm, 0);
      expect(E).toBeCloseTo(500000, 6);
      expect(N).toBeCloseTo(N0, 6);
      expect(p.forward(cm + 1, 0)[0]).toBeGreaterThan(500000);
      // k0: a short step along the central meridian at the equator is 0.9996 × its ground length (the
      // WGS 84 meridian radius there, a(1 − e²)).
      const a = 6378137, e2 = (1 / 298.257223563) * (2 - 1 / 298.257223563);
      const step = p.forward(cm, 1e-4)[1] - N;
      expect(step / (a * (1 - e2) * 1e-4 * (Math.PI / 180))).toBeCloseTo(0.9996, 8);
    }
  });
});

describe('terrainLonLat', () => {
  const geoTransform = [0, 1, 0, 0, 0, -1] as const;

  it('null without a georeference; UTM on WGS 84 converts; the datum is named', () => {
    expect(terrainLonLat(undefined)).toBeNull();
    expect(terrainLonLat({ model: 'none', geoTransform })).toBeNull();
    const utm = terrainLonLat({ model: 'projected', geoTransform, projectedEpsg: 32633 })!;
    expect(utm.wgs84).toBe(true);
    expect(utm.datum).toMatch(/WGS 84.*UTM zone 33N \(EPSG:32633\)/);
    const [lon, lat] = utm.toLonLat(500000, 0);
    expect(lon).toBeCloseTo(15, 12);
    expect(lat).toBeCloseTo(0, 12);
  });

  it('a sphere without an EPSG code: its own longitude/latitude, said not to be WGS 84', () => {
    const g: GridGeoreference = { model: 'geographic', geoTransform, localFrame: { originLatitude_deg: 18, originLongitude_deg: 200, bodyRadius_m: 3396190, maxEastScaleError: 0 } };
    const ref = terrainLonLat(g)!;
    expect(ref.wgs84).toBe(false);
    expect(ref.datum).toMatch(/sphere of radius 3396190 m \(not WGS 84\)/);
    expect(ref.toLonLat(0, 0)).toEqual([200, 18]);
    // One degree of latitude on that sphere is R·π/180 metres.
    expect(ref.toLonLat(0, (3396190 * Math.PI) / 180)[1]).toBeCloseTo(19, 12);
  });

  it.each([
    // EPSG:2227 is Lambert conformal conic on NAD83 (in US survey feet): another Earth datum, no datum shift here.
    [{ model: 'projected', geoTransform, projectedEpsg: 2227 }, /projected CRS EPSG:2227 cannot be converted to longitude\/latitude on WGS 84.*another Earth datum.*gdalwarp -t_srs EPSG:4326/],
    [{ model: 'projected', geoTransform }, /projected CRS without an EPSG code or projection parameters cannot be converted/],
    // EPSG:3857 is a projection method not checked against PROJ here (Mercator): refused, naming it.
    [{ model: 'projected', geoTransform, projectedEpsg: 3857 }, /projected CRS EPSG:3857 uses the projection "merc".*not among those checked/],
    [{ model: 'projected', geoTransform, projectedCrs: { proj4: '+proj=robin +R=3396190', name: 'user-defined CRS "invented"' } }, /user-defined CRS "invented" uses the projection "robin"/],
    [{ model: 'geographic', geoTransform, geographicEpsg: 4269, localFrame: { originLatitude_deg: 0, originLongitude_deg: 0, bodyRadius_m: 6378137, maxEastScaleError: 0 } }, /geographic CRS EPSG:4269 is not WGS 84.*gdalwarp -t_srs EPSG:4326/],
  ] as [GridGeoreference, RegExp][])('refuses %o with an error naming the CRS and the fix', (g, message) => {
    expect(() => terrainLonLat(g, 'dem.tif')).toThrow(TerrainInputError);
    expect(() => terrainLonLat(g, 'dem.tif')).toThrow(message);
  });
});

describe('planetocentric latitudes on an ellipsoid', () => {
  // GeoKeys as GDAL writes them for IAU_2015:49912 (Mars ellipsoid, planetocentric; test/reference/terrain/
  // gdal-projections.test.ts reads such files against GDAL): only the citations say "Ocentric".
  const keys = {
    GTModelTypeGeoKey: 1, GTCitationGeoKey: 'Mars (2015) / Ocentric / Equirectangular, clon = 0', GeographicTypeGeoKey: 32767,
    GeogCitationGeoKey: 'GCS Name = Mars (2015) / Ocentric|Datum = Mars (2015)|Ellipsoid = Mars (2015)|Primem = Reference Meridian|',
    GeogGeodeticDatumGeoKey: 32767, GeogAngularUnitsGeoKey: 9102, GeogEllipsoidGeoKey: 32767, GeogSemiMajorAxisGeoKey: 3396190,
    GeogInvFlatteningGeoKey: 169.8944472236118, ProjectedCSTypeGeoKey: 32767, ProjectionGeoKey: 32767, ProjCoordTransGeoKey: 17,
    ProjLinearUnitsGeoKey: 9001, ProjStdParallel1GeoKey: 0, ProjFalseEastingGeoKey: 0, ProjFalseNorthingGeoKey: 0, ProjCenterLongGeoKey: 0, ProjCenterLatGeoKey: 0,
  };

  it('are recognised from the citation and converted: tan ψ = (b²/a²) tan φ (Snyder 1987, eq. 3-28)', () => {
    const crs = projectedCrsFromGeoKeys(keys, 'mars.tif');
    expect(crs.planetocentric).toBe(true);
    const centric = makeProjection(crs);
    const ographic = makeProjection({ ...crs, planetocentric: false });
    const q = (centric.b / centric.a) ** 2;
    for (const phi of [-80, -30, 0, 12.5, 50.5, 89]) {
      const [E, N] = ographic.forward(20, phi); // geodetic latitude φ
      const [, psi] = centric.inverse(E, N);
      expect(psi).toBeCloseTo(Math.atan(q * Math.tan(phi * Math.PI / 180)) * 180 / Math.PI, 10);
      const back = centric.forward(20, psi);
      expect(back[0]).toBeCloseTo(E, 6);
      expect(back[1]).toBeCloseTo(N, 6);
    }
    expect(terrainLonLat({ model: 'projected', geoTransform: [0, 1, 0, 0, 0, -1], projectedCrs: crs })!.datum).toMatch(/planetocentric latitude/);
  });

  it('on a sphere the flag is not set (the two latitudes are one)', () => {
    const sphere = { ...keys, GeogInvFlatteningGeoKey: undefined, GeogSemiMinorAxisGeoKey: 3396190 };
    expect(projectedCrsFromGeoKeys(sphere, 'mars.tif').planetocentric).toBeUndefined();
  });
});
