/**
 * The app's exports in the DEM's CRS (renderer/compute/footprint-exports.ts): offered only for a footprint
 * computed over a projected DEM, the same writers as the CLI (core/export), bytes for the GeoTIFFs (a TIFF
 * header, TIFF 6.0 §2) and JSON-FG text naming the DEM's CRS.
 */
import { describe, expect, it } from 'vitest';
import { emptyField, TARGET } from '../../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../../core/footprint/grid.ts';
import { footprintFigures } from '../../../../core/footprint/studyFootprint.ts';
import { parseStudyText } from '../../../../core/study/index.ts';
import { readFileSync } from 'node:fs';
import type { GridGeoreference } from '../../../../core/terrain/grid.ts';
import { footprintExportData, footprintPlacement, type FootprintResult } from '../../../../renderer/compute/footprint-exports.ts';

const study = parseStudyText(readFileSync(new URL('../../../../assets/demo/demo-lander.study.json', import.meta.url), 'utf8'));
const MARS_NAME = 'Mars (2015) - Sphere / Ocentric / Equirectangular, clon = 0';
const mars: GridGeoreference = {
  model: 'projected',
  geoTransform: [8142000, 100, 0, -272000, 0, -100],
  projectedCrs: { proj4: '+proj=eqc +lat_0=0 +lon_0=0 +x_0=0 +y_0=0 +a=3396190 +b=3396190 +no_defs +lat_ts=0', name: `user-defined CRS "${MARS_NAME}"`, geoKeys: { GTModelTypeGeoKey: 1, GTCitationGeoKey: MARS_NAME } },
};

function result(placement: FootprintResult['placement']): FootprintResult {
  const field = emptyField(makeTargetGrid({ halfWidthEast_m: 400, halfWidthNorth_m: 400, nx: 5, ny: 5 }));
  field.status.fill(TARGET.reachable);
  field.propellant_kg.forEach((_, k) => (field.propellant_kg[k] = 200 + 5 * k));
  const figures = footprintFigures(field, { usable_kg: 300, reserve_kg: 50 }, { cancelled: false });
  const inputs = { study, grid: { nx: 5, ny: 5, extent_m: 400 }, nodes: 30, reserve_kg: 50 };
  return { study, field, figures, inputs, inputsHash: 'ab'.repeat(32), appVersion: '0.0.0', placement };
}

describe('app exports in the DEM CRS', () => {
  it('have a placement only over a projected DEM', () => {
    expect(footprintPlacement(null, [0, 0], 'mars')).toBeNull();
    expect(footprintPlacement({ model: 'none', geoTransform: [0, 1, 0, 0, 0, -1] }, [0, 0], 'mars')).toBeNull();
    const p = footprintPlacement(mars, [8142500, -272500], 'mars');
    expect(p?.place.identity?.code).toBe('IAU_2015:49910');
    expect(p?.lonLat?.wgs84).toBe(false);
  });

  it('are refused without a placement and written with one: JSON-FG text, GeoTIFF bytes', () => {
    expect(() => footprintExportData('jsonfg', result(null))).toThrow(/not computed over a projected DEM/);
    const r = result(footprintPlacement(mars, [8142500, -272500], 'mars'));
    const fg = JSON.parse(footprintExportData('jsonfg', r) as string);
    expect(fg.coordRefSys).toBe('http://www.opengis.net/def/crs/IAU/2015/49910');
    expect(fg.caution).toMatch(/not flight software/);
    for (const kind of ['propellant-tif', 'reachable-tif'] as const) {
      const bytes = footprintExportData(kind, r) as Uint8Array;
      expect(Array.from(bytes.subarray(0, 4))).toEqual([0x49, 0x49, 42, 0]);
    }
    expect(typeof footprintExportData('csv', r)).toBe('string');
  });
});
