/**
 * tiff-writer's CRS and geotransform paths that GDAL checks in test/reference/export/: copied GeoKeys come
 * back as written, a key whose type the writer does not know is refused (a wrong type would make GDAL read
 * another CRS), and a turned grid is written as a ModelTransformation (which our reader refuses, as GDAL-style
 * rotated DEMs are refused, so the tag's presence shows).
 */
import { describe, expect, it } from 'vitest';
import { readGeoTiff } from '../../../core/terrain/index.ts';
import { writeGeoTiff } from '../../../core/terrain/tiff-writer.ts';

// Keys as GDAL writes a user-defined Moon south polar stereographic CRS (IAU_2015:30135), read by geotiff.js.
const MOON_SOUTH_POLAR = {
  GTModelTypeGeoKey: 1,
  GTCitationGeoKey: 'Moon (2015) - Sphere / Ocentric / South Polar',
  GeographicTypeGeoKey: 32767,
  GeogCitationGeoKey: 'GCS Name = Moon (2015) - Sphere / Ocentric|Datum = Moon (2015) - Sphere|',
  GeogGeodeticDatumGeoKey: 32767,
  GeogAngularUnitsGeoKey: 9102,
  GeogEllipsoidGeoKey: 32767,
  GeogSemiMajorAxisGeoKey: 1737400,
  GeogSemiMinorAxisGeoKey: 1737400,
  GeogPrimeMeridianLongGeoKey: 0,
  ProjectedCSTypeGeoKey: 32767,
  ProjectionGeoKey: 32767,
  ProjCoordTransGeoKey: 15,
  ProjLinearUnitsGeoKey: 9001,
  ProjNatOriginLatGeoKey: -90,
  ProjFalseEastingGeoKey: 0,
  ProjFalseNorthingGeoKey: 0,
  ProjScaleAtNatOriginGeoKey: 1,
  ProjStraightVertPoleLongGeoKey: 0,
};

describe('writeGeoTiff CRS', () => {
  it('copies user-defined GeoKeys (doubles, codes and citations) so the reader gets the same CRS back', async () => {
    const bytes = writeGeoTiff({ width: 2, height: 2, data: new Float32Array(4), georeference: { geoTransform: [-40000, 100, 0, 50000, 0, -100], geoKeys: MOON_SOUTH_POLAR } });
    const grid = await readGeoTiff(bytes, { sourceName: 'm.tif' });
    expect(grid.georeference?.projectedCrs?.geoKeys).toEqual(MOON_SOUTH_POLAR);
    expect(grid.georeference?.projectedCrs?.proj4).toMatch(/\+proj=stere \+lat_0=-90/);
  });

  it('refuses a GeoKey it cannot type, and a geotransform that cannot be inverted', () => {
    expect(() => writeGeoTiff({ width: 1, height: 1, data: new Uint8Array(1), georeference: { geoTransform: [0, 1, 0, 0, 0, -1], geoKeys: { NotAGeoKey: 3 } } })).toThrow(/unknown GeoKey NotAGeoKey/);
    expect(() => writeGeoTiff({ width: 1, height: 1, data: new Uint8Array(1), georeference: { geoTransform: [0, 1, 2, 0, 0.5, 1], geoKeys: MOON_SOUTH_POLAR } })).toThrow(/not invertible/);
  });

  it('writes a turned grid as a ModelTransformation', async () => {
    const c = Math.cos(0.3), s = Math.sin(0.3);
    const bytes = writeGeoTiff({ width: 2, height: 2, data: new Float32Array(4), georeference: { geoTransform: [1000, 100 * c, 100 * s, 2000, 100 * s, -100 * c], geoKeys: MOON_SOUTH_POLAR } });
    await expect(readGeoTiff(bytes, { sourceName: 'r.tif' })).rejects.toThrow(/rotated or sheared ModelTransformation/);
  });
});
