/**
 * Footprint JSON-FG (OGC 21-045r1) and the DEM-CRS rasters, on a UTM DEM (Earth, EPSG code) and on
 * Mars-sized equirectangular DEMs (an IAU_2015 CRS named as GDAL writes it, and one without a registered code).
 * Checks follow the standard's text: §7.2 (geometry is WGS 84 or null; `place` carries the CRS's shape), §7.5
 * (`coordRefSys` applies to `place`; URIs in the OGC register's form), the Feature Types and Schemas class
 * (`featureType`). GDAL's reading of the same files is in test/reference/export/.
 */
import { describe, expect, it } from 'vitest';
import { propellantRegions } from '../../../core/footprint/contours.ts';
import { emptyField, TARGET } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { footprintLonLat, footprintPlace } from '../../../core/footprint/georeferencedFootprint.ts';
import { footprintGeoJson } from '../../../core/export/footprintExport.ts';
import { footprintJsonFg, JSON_FG_CONFORMANCE } from '../../../core/export/footprintJsonFg.ts';
import { footprintPropellantTiff, footprintRasterGeoreference, footprintReachableTiff } from '../../../core/export/footprintRasters.ts';
import { crsIdentity } from '../../../core/terrain/crsIdentity.ts';
import { makeGrid, readGeoTiff } from '../../../core/terrain/index.ts';
import type { GridGeoreference } from '../../../core/terrain/grid.ts';
import { rfc7946Violations } from '../../support/rfc7946.ts';

function field() {
  const f = emptyField(makeTargetGrid({ halfWidthEast_m: 300, halfWidthNorth_m: 200, nx: 7, ny: 5 }));
  for (let j = 0; j < 5; j++) {
    for (let i = 0; i < 7; i++) {
      const k = j * 7 + i;
      const far = Math.hypot(i - 3, j - 2);
      f.status[k] = far > 3.1 ? TARGET.unreachable : TARGET.reachable;
      f.propellant_kg[k] = far > 3.1 ? NaN : 200 + 10 * far + i; // i: tells columns apart
    }
  }
  return f;
}

const grid = (georeference: GridGeoreference) =>
  makeGrid({ width: 10, height: 10, pixelSizeX_m: 100, pixelSizeY_m: 100, originEast_m: georeference.geoTransform[0], originNorth_m: georeference.geoTransform[3], georeference }, new Float32Array(100));

const MARS_NAME = 'Mars (2015) - Sphere / Ocentric / Equirectangular, clon = 0';
/** A Mars DEM as the reader gives GDAL's IAU_2015:49910 GeoTIFF: user-defined keys, the CRS name as citation. */
const marsGeoreference = (proj4: string): GridGeoreference => ({
  model: 'projected',
  geoTransform: [8142000, 100, 0, -272000, 0, -100],
  projectedCrs: { proj4, name: `user-defined CRS "${MARS_NAME}"`, geoKeys: { GTModelTypeGeoKey: 1, GTCitationGeoKey: MARS_NAME, ProjectedCSTypeGeoKey: 32767, ProjCoordTransGeoKey: 17, GeogSemiMajorAxisGeoKey: 3396190, GeogSemiMinorAxisGeoKey: 3396190, ProjLinearUnitsGeoKey: 9001 } },
});
const MARS_PROJ = '+proj=eqc +lat_0=0 +lon_0=0 +x_0=0 +y_0=0 +a=3396190 +b=3396190 +no_defs +lat_ts=0';

describe('CRS identity', () => {
  it('an EPSG code gives the OGC register URI; an IAU_2015 name with matching parameters its IAU URI', () => {
    expect(crsIdentity({ model: 'projected', geoTransform: [0, 1, 0, 0, 0, -1], projectedEpsg: 32633 })).toEqual({ code: 'EPSG:32633', uri: 'http://www.opengis.net/def/crs/EPSG/0/32633' });
    expect(crsIdentity(marsGeoreference(MARS_PROJ))).toEqual({ code: 'IAU_2015:49910', uri: 'http://www.opengis.net/def/crs/IAU/2015/49910' });
  });

  it('a name whose parameters differ from the registered ones, or no name, is not identified', () => {
    expect(crsIdentity(marsGeoreference(MARS_PROJ.replace('+lon_0=0', '+lon_0=10')))).toBeNull();
    expect(crsIdentity(marsGeoreference(MARS_PROJ.replace('+a=3396190 +b=3396190', '+a=3396190 +b=3376200')))).toBeNull();
    expect(crsIdentity(marsGeoreference(MARS_PROJ.replace('+x_0=0', '+x_0=250')))).toBeNull();
    expect(crsIdentity({ model: 'projected', geoTransform: [0, 1, 0, 0, 0, -1], projectedCrs: { proj4: MARS_PROJ, name: 'user-defined CRS' } })).toBeNull();
    expect(crsIdentity({ model: 'geographic', geoTransform: [0, 1, 0, 0, 0, -1], geographicEpsg: 4326 })).toBeNull();
  });
});

describe('footprint JSON-FG', () => {
  const f = field();
  const [reachable] = propellantRegions(f, [225]);
  const contours = propellantRegions(f, [215, 235]);

  it('on Mars: place in the DEM CRS under an IAU URI, null geometry, conformance classes and feature types', () => {
    const dem = grid(marsGeoreference(MARS_PROJ));
    const target: [number, number] = [8142500, -272500];
    const place = footprintPlace(dem, target)!;
    const doc = footprintJsonFg({ contours, reachable, reserve_kg: 50, place, lonLat: footprintLonLat(dem, target, 'mars') });
    expect(rfc7946Violations(doc)).toEqual([]);
    expect(doc.conformsTo).toEqual([...JSON_FG_CONFORMANCE]);
    expect(doc.coordRefSys).toBe('http://www.opengis.net/def/crs/IAU/2015/49910');
    expect(doc.features.map((x) => x.featureType)).toEqual(['reachable-with-reserve', 'propellant-contour', 'propellant-contour', 'nominal-target']);
    for (const x of doc.features) {
      expect(x.geometry).toBeNull();
      expect(x.time).toBeNull();
    }
    expect(doc.features[3].place).toEqual({ type: 'Point', coordinates: target });
    expect(doc.crs_note).toMatch(/geometry: null, because the shapes are on mars/);
  });

  it('on Mars without a registered code: coordRefSys carries the PROJ definition', () => {
    const proj = MARS_PROJ.replace('+lon_0=0', '+lon_0=137');
    const dem = grid({ ...marsGeoreference(proj), projectedCrs: { proj4: proj, name: 'user-defined CRS' } });
    const doc = footprintJsonFg({ contours, reachable, reserve_kg: 50, place: footprintPlace(dem, [8142500, -272500])! });
    expect(doc.coordRefSys).toEqual({ type: 'PROJ', value: proj, name: 'user-defined CRS' });
    expect(doc.crs_note).toMatch(/no registered code/);
  });

  it('on a UTM DEM: EPSG URI, and geometry the WGS 84 fallback equal to the RFC 7946 file\'s', () => {
    const dem = grid({ model: 'projected', geoTransform: [400000, 100, 0, 5000000, 0, -100], projectedEpsg: 32633 });
    const target: [number, number] = [400500, 4999500];
    const lonLat = footprintLonLat(dem, target, 'earth')!;
    const doc = footprintJsonFg({ contours, reachable, reserve_kg: 50, place: footprintPlace(dem, target)!, lonLat });
    const plain = footprintGeoJson({ contours, reachable, reserve_kg: 50, lonLat });
    expect(doc.coordRefSys).toBe('http://www.opengis.net/def/crs/EPSG/0/32633');
    doc.features.forEach((x, k) => expect(x.geometry).toEqual(plain.features[k].geometry));
    expect(rfc7946Violations(doc)).toEqual([]);
  });
});

describe('footprint rasters in the DEM CRS', () => {
  it('one pixel centred on each target, rows north first; nodata where no minimum; mask from the budget', async () => {
    const f = field();
    const dem = grid(marsGeoreference(MARS_PROJ));
    const place = footprintPlace(dem, [8142500, -272500])!;
    const gt = footprintRasterGeoreference(f, place).geoTransform;
    // Pixel (col, row) centre = target (col, ny − 1 − row): the local → DEM map at the target, J = diag(1/cos 0°, 1) = I at the equator ±.
    const [a, b, c, d] = place.jacobian;
    for (const [col, row] of [[0, 0], [6, 4], [3, 2]]) {
      const X = gt[0] + gt[1] * (col + 0.5) + gt[2] * (row + 0.5);
      const Y = gt[3] + gt[4] * (col + 0.5) + gt[5] * (row + 0.5);
      const e = f.east[col], n = f.north[f.ny - 1 - row];
      expect(X).toBeCloseTo(8142500 + a * e + b * n, 6);
      expect(Y).toBeCloseTo(-272500 + c * e + d * n, 6);
    }
    const read = await readGeoTiff(footprintPropellantTiff(f, place, 'test'), { sourceName: 'p.tif' });
    // The DEM's GeoKeys are copied (the raster type is written as PixelIsArea).
    expect(read.georeference?.projectedCrs?.geoKeys).toEqual(dem.georeference?.projectedCrs?.geoKeys);
    for (let row = 0; row < f.ny; row++) {
      for (let col = 0; col < f.nx; col++) {
        const k = (f.ny - 1 - row) * f.nx + col;
        const v = read.heights[row * f.nx + col];
        if (f.status[k] === TARGET.reachable) expect(v).toBe(f.propellant_kg[k]);
        else expect(v).toBeNaN();
      }
    }
    const mask = await readGeoTiff(footprintReachableTiff(f, 220, place, 'test'), { sourceName: 'm.tif' });
    const k0 = 2 * 7 + 3; // the centre target: 200 + 3 = 203 kg ≤ 220
    expect(mask.heights[(f.ny - 1 - 2) * f.nx + 3]).toBe(1);
    expect(f.propellant_kg[k0]).toBe(203);
    expect(mask.heights[0]).toBe(0); // north-west corner target (0, 4): unreachable → 0
  });
});
