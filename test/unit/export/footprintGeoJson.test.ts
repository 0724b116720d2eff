/**
 * Footprint GeoJSON against the rules of RFC 7946 a test can check (test/support/rfc7946.ts): longitude
 * first, closed rings, right-hand rule (§3.1.6), no `crs` member (§4), null geometry when unlocated (§3.2).
 */
import { describe, expect, it } from 'vitest';
import { propellantRegions, ringArea } from '../../../core/footprint/contours.ts';
import { emptyField, TARGET } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { footprintLonLat } from '../../../core/footprint/georeferencedFootprint.ts';
import { footprintGeoJson, rightHandRule } from '../../../core/export/footprintExport.ts';
import { CAUTION } from '../../../core/study/provenance.ts';
import { makeGrid, terrainLonLat } from '../../../core/terrain/index.ts';
import { rfc7946Violations } from '../../support/rfc7946.ts';

/** 7 × 7 targets, cheapest on a ring around an expensive centre: the region at 225 kg has a hole. */
function ringField() {
  const f = emptyField(makeTargetGrid({ halfWidthEast_m: 300, halfWidthNorth_m: 300, nx: 7, ny: 7 }));
  for (let j = 0; j < 7; j++) {
    for (let i = 0; i < 7; i++) {
      const k = j * 7 + i;
      f.status[k] = TARGET.reachable;
      f.propellant_kg[k] = i === 3 && j === 3 ? 300 : 200 + 10 * Math.hypot(i - 3, j - 3);
    }
  }
  return f;
}

const utmGrid = makeGrid(
  { width: 10, height: 10, pixelSizeX_m: 100, pixelSizeY_m: 100, originEast_m: 400000, originNorth_m: 5000000, georeference: { model: 'projected', geoTransform: [400000, 100, 0, 5000000, 0, -100], projectedEpsg: 32633 } },
  new Float32Array(100),
);

describe('footprint GeoJSON', () => {
  const f = ringField();
  const [reachable] = propellantRegions(f, [225]);
  const contours = propellantRegions(f, [215, 235]);

  it('the RFC 7946 checker itself reports open rings, clockwise exteriors and a crs member', () => {
    const bad = {
      type: 'FeatureCollection',
      crs: { type: 'name' },
      features: [{ type: 'Feature', properties: {}, geometry: { type: 'MultiPolygon', coordinates: [[[[0, 0], [0, 1], [1, 1], [1, 0]]]] } }],
    };
    const v = rfc7946Violations(bad).join('\n');
    expect(v).toMatch(/"crs" member/);
    expect(v).toMatch(/not closed/);
    expect(v).toMatch(/exterior ring is not counterclockwise/);
  });

  it('d3-contour rings are reoriented: exteriors counterclockwise, holes clockwise, in local metres too', () => {
    // d3-contour gives the opposite orientation in a north-up frame; the test field has a hole.
    expect(reachable.geometry.coordinates[0].length).toBe(2);
    expect(ringArea(reachable.geometry.coordinates[0][0])).toBeLessThan(0);
    const fixed = rightHandRule(reachable.geometry);
    expect(ringArea(fixed.coordinates[0][0])).toBeGreaterThan(0);
    expect(ringArea(fixed.coordinates[0][1])).toBeLessThan(0);
    expect(Math.abs(ringArea(fixed.coordinates[0][0]))).toBeCloseTo(Math.abs(ringArea(reachable.geometry.coordinates[0][0])), 9);
  });

  it('with a UTM terrain: lon/lat geometry that passes the RFC 7946 checks, metres kept in properties', () => {
    const lonLat = footprintLonLat(utmGrid, [400500, 4999500], 'custom')!;
    const doc = JSON.parse(JSON.stringify(footprintGeoJson({ contours, reachable, reserve_kg: 20, lonLat, sites: [{ east_m: 150, north_m: -50, properties: { propellant_kg: 212 } }] })));
    expect(rfc7946Violations(doc)).toEqual([]);
    expect(doc.caution).toBe(CAUTION);
    expect(doc.features.map((x: { properties: { kind: string } }) => x.properties.kind)).toEqual(['reachable-with-reserve', 'propellant-contour', 'propellant-contour', 'nominal-target', 'landing-site']);
    // Longitude first: zone 33N (central meridian 15° E) around 45° N.
    const target = doc.features[3];
    expect(target.geometry.coordinates[0]).toBeGreaterThan(13);
    expect(target.geometry.coordinates[0]).toBeLessThan(15);
    expect(target.geometry.coordinates[1]).toBeGreaterThan(44.9);
    expect(target.geometry.coordinates[1]).toBeLessThan(45.2);
    // The nominal target is where the terrain's own conversion puts the placement point.
    const ref = terrainLonLat(utmGrid.georeference)!.toLonLat(400500, 4999500);
    expect(target.geometry.coordinates[0]).toBeCloseTo(ref[0], 9);
    expect(target.geometry.coordinates[1]).toBeCloseTo(ref[1], 9);
    expect(target.properties).toMatchObject({ body: 'earth' });
    expect(target.properties.crs_note).toMatch(/WGS 84.*EPSG:32633.*local_m.*meridian convergence/);
    const site = doc.features[4];
    expect(site.properties).toMatchObject({ rank: 1, propellant_kg: 212, local_m: { type: 'Point', coordinates: [150, -50] } });
    // Same vertex count in both; every lon/lat vertex is the conversion of its local-metre vertex.
    const geo = doc.features[0].geometry.coordinates, local = doc.features[0].properties.local_m.coordinates;
    expect(geo[0][1].length).toBe(local[0][1].length);
    const [lon, lat] = lonLat.toLonLat(local[0][1][2][0], local[0][1][2][1]);
    expect(geo[0][1][2][0]).toBeCloseTo(lon, 9);
    expect(geo[0][1][2][1]).toBeCloseTo(lat, 9);
  });

  it('on another body\'s sphere: lon/lat written, said not to be WGS 84, body named; 0…360° east shifted into ±180°', () => {
    const lonLat = { toLonLat: (e: number, n: number): [number, number] => [200 + e / 1e5, 18 + n / 1e5], wgs84: false, datum: 'a sphere of radius 3396190 m', body: 'mars' };
    const doc = JSON.parse(JSON.stringify(footprintGeoJson({ contours: [], reachable, reserve_kg: 20, lonLat })));
    expect(rfc7946Violations(doc)).toEqual([]);
    expect(doc.features[1].geometry.coordinates).toEqual([-160, 18]);
    expect(doc.features[0].properties.body).toBe('mars');
    expect(doc.features[0].properties.crs_note).toMatch(/on mars, a sphere of radius 3396190 m\. They are not WGS 84 coordinates/);
  });

  it('on a sinusoidal Moon DEM: lon/lat on the Moon\'s sphere, and a note giving the non-conformal linear map', () => {
    // Sinusoidal on a sphere (Snyder 1987, §30): x = R (λ − λ0) cos φ, y = R φ, so one ground metre east is
    // (1, 0) grid metres and one ground metre north is (−(λ − λ0) sin φ, 1); here λ − λ0 = 2°, φ = −40°.
    const R = 1737400;
    const crs = { proj4: `+proj=sinu +lon_0=77 +x_0=0 +y_0=0 +a=${R} +b=${R}`, name: 'user-defined CRS "invented Moon sinusoidal"' };
    const tE = R * 2 * (Math.PI / 180) * Math.cos(-40 * (Math.PI / 180)), tN = R * -40 * (Math.PI / 180);
    const grid = makeGrid(
      { width: 10, height: 10, pixelSizeX_m: 100, pixelSizeY_m: 100, originEast_m: tE - 500, originNorth_m: tN + 500, georeference: { model: 'projected', geoTransform: [tE - 500, 100, 0, tN + 500, 0, -100], projectedCrs: crs } },
      new Float32Array(100),
    );
    const ll = footprintLonLat(grid, [tE, tN], 'moon')!;
    expect(ll.wgs84).toBe(false);
    expect(ll.body).toBe('moon');
    const [lon, lat] = ll.toLonLat(0, 0);
    expect(lon).toBeCloseTo(79, 9);
    expect(lat).toBeCloseTo(-40, 9);
    const shear = -(2 * Math.PI / 180) * Math.sin(-40 * Math.PI / 180);
    expect(ll.note).toContain(`one ground metre east is (1.000000, 0.000000) and one ground metre north is (${shear.toFixed(6)}, 1.000000) grid metres`);
    expect(ll.note).toMatch(/the projection is not conformal/);
    expect(ll.note).toContain(`grid north is ${(Math.atan(shear) * 180 / Math.PI).toFixed(4)}° west of true north`);
  });

  it('without a georeference: null geometry everywhere (§3.2), no crs_note, shapes in local_m', () => {
    const doc = JSON.parse(JSON.stringify(footprintGeoJson({ contours, reachable, reserve_kg: 20, sites: [{ east_m: 1, north_m: 2 }] })));
    expect(rfc7946Violations(doc)).toEqual([]);
    expect(doc.features.every((x: { geometry: unknown }) => x.geometry === null)).toBe(true);
    expect(doc.features[0].properties.crs_note).toBeUndefined();
    expect(ringArea(doc.features[0].properties.local_m.coordinates[0][0])).toBeGreaterThan(0);
  });

  it('footprintLonLat notes a study body that differs from the DEM\'s Earth CRS, and is null without a CRS', () => {
    expect(footprintLonLat(utmGrid, [400500, 4999500], 'mars')!.note).toMatch(/Earth CRS \(WGS 84\) but the study's body is mars/);
    const plain = makeGrid({ width: 2, height: 2, pixelSizeX_m: 1, pixelSizeY_m: 1 }, new Float32Array(4));
    expect(footprintLonLat(plain, [0, 0], 'mars')).toBeNull();
  });
});
