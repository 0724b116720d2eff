import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { propellantRegions } from '../../../core/footprint/contours.ts';
import { emptyField, TARGET } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { footprintCsv, footprintGeoJson, footprintReport } from '../../../core/export/footprintExport.ts';
import { footprintSvg } from '../../../core/export/footprintSvg.ts';
import { APP_VERSION, CAUTION, canonicalJson, inputsHash, sha256Hex } from '../../../core/study/provenance.ts';

function smallField() {
  const grid = makeTargetGrid({ halfWidthEast_m: 100, halfWidthNorth_m: 100, nx: 3, ny: 3 });
  const f = emptyField(grid);
  for (let k = 0; k < 9; k++) {
    f.status[k] = k === 8 ? TARGET.unreachable : TARGET.reachable;
    f.propellant_kg[k] = k === 8 ? NaN : 200 + 10 * k;
    f.timeOfFlight_s[k] = k === 8 ? NaN : 40;
    f.peakTilt_deg[k] = k === 8 ? NaN : 12.5;
    f.miss_m[k] = k === 8 ? 35.5 : 0;
    f.solves[k] = 4;
  }
  return f;
}

describe('provenance', () => {
  it('SHA-256 matches the FIPS 180-2 test vector for "abc"', async () => {
    expect(await sha256Hex(new TextEncoder().encode('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('hashes inputs independently of key order', async () => {
    expect(canonicalJson({ b: 1, a: { d: 2, c: [3] } })).toBe('{"a":{"c":[3],"d":2},"b":1}');
    expect(await inputsHash({ x: 1, y: 2 })).toBe(await inputsHash({ y: 2, x: 1 }));
    expect(await inputsHash({ x: 1 })).not.toBe(await inputsHash({ x: 2 }));
  });

  it('keeps the app version equal to package.json', () => {
    const pkg = JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8'));
    expect(APP_VERSION).toBe(pkg.version);
  });
});

describe('footprint exports', () => {
  it('CSV: units in the header, one row per target, budget flag, the caution first', () => {
    const csv = footprintCsv(smallField(), 250).trim().split('\n');
    expect(csv[0]).toBe(`# ${CAUTION}`);
    expect(csv[1]).toBe('east_m,north_m,status,propellant_kg,time_of_flight_s,peak_tilt_deg,miss_m,solves,within_budget,between_nodes');
    expect(csv).toHaveLength(11);
    expect(csv[2]).toBe('-100,-100,reachable,200,40,12.5,0,4,1,');
    expect(csv[8]).toBe('-100,100,reachable,260,40,12.5,0,4,0,');
    expect(csv[10]).toBe('100,100,unreachable,,,,35.5,4,0,');
  });

  it('CSV of a partial field (a run stopped early) says so under the caution, counting the targets not computed', () => {
    const f = smallField();
    for (let k = 6; k < 9; k++) f.status[k] = TARGET.pending;
    const csv = footprintCsv(f, 250).trim().split('\n');
    expect(csv[0]).toBe(`# ${CAUTION}`);
    expect(csv[1]).toBe('# STOPPED EARLY: partial result; 3 of 9 targets not computed (status pending)');
    expect(csv[2]).toMatch(/^east_m,/);
    expect(csv).toHaveLength(12);
  });

  it('GeoJSON (RFC 7946): null geometry without a georeference, lon/lat with one, metres in properties', () => {
    const f = smallField();
    const [reachable] = propellantRegions(f, [250]);
    const plain = footprintGeoJson({ contours: propellantRegions(f, [220, 240]), reachable, reserve_kg: 20 });
    expect(plain.type).toBe('FeatureCollection');
    expect(plain.features.every((x) => x.geometry === null)).toBe(true);
    expect(plain.features[0].properties).toMatchObject({ kind: 'reachable-with-reserve', reserve_kg: 20, level_kg: 250 });
    expect((plain.features[0].properties as { local_m: { type: string } }).local_m.type).toBe('MultiPolygon');
    const geo = footprintGeoJson({ contours: [], reachable, reserve_kg: 20, toLonLat: (e, n) => [10 + e / 1e5, 20 + n / 1e5] });
    const g = geo.features[0].geometry as { type: string; coordinates: number[][][][] };
    expect(g.type).toBe('MultiPolygon');
    for (const [lon, lat] of g.coordinates[0][0]) {
      expect(lon).toBeGreaterThan(9.99);
      expect(lat).toBeLessThan(20.01);
    }
  });

  it('JSON report: versioned, with caution, app version, inputs hash and the grid as named arrays', () => {
    const f = smallField();
    const report = JSON.parse(
      footprintReport({
        studyName: 'test',
        inputsHash: 'abc123',
        inputs: { a: 1 },
        summary: { cancelled: false } as never,
        field: f,
        contourLevels_kg: [220],
      }),
    );
    expect(report).toMatchObject({ format: 'landreach-footprint', version: 2, caution: CAUTION, appVersion: APP_VERSION, inputsHash: 'abc123', stoppedEarly: false });
    // Nothing that varies between runs of the same inputs (the CLI's manifest keeps the date and time).
    expect(report).not.toHaveProperty('createdAt');
    expect(report.grid.status[8]).toBe('unreachable');
    expect(report.grid.propellant_kg[8]).toBeNull();
    expect(report.grid.propellant_kg[1]).toBe(210);
  });

  it('SVG map: a well-formed figure with legend, scale bar and the caution', () => {
    const f = smallField();
    const bands = propellantRegions(f, [220, 240]);
    const [reachable] = propellantRegions(f, [250]);
    const svg = footprintSvg({
      title: 'Test & check',
      bounds_m: [-100, -100, 100, 100],
      bands,
      reachable,
      budget_kg: 250,
      colormap: (t) => [t, t, t],
      divertRadius_m: 50,
      caption: ['line one'],
    });
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg).toContain('Test &amp; check');
    expect(svg).toContain('propellant (kg)');
    expect(svg).toMatch(/>\d+ m</);
    expect(svg).toContain('Caution: Preliminary design');
    expect(svg.match(/<path /g)?.length).toBe(2 * bands.length + 2);
    expect(svg.trim().endsWith('</svg>')).toBe(true);
  });
});
