/** Trade-study exports (core/export/studyExport.ts): CSV columns with units, the caution line, the report envelope. */
import { describe, expect, it } from 'vitest';
import { altitudeStudyCsvLines, dispersionCsvLines, reachMapCsv, reserveStudyCsvLines, studyReportObject } from '../../../core/export/studyExport.ts';
import { CAUTION } from '../../../core/study/provenance.ts';

describe('study exports', () => {
  it('reserve CSV: one row per reserve, area rounded to m², radius to 0.1 m, grid flag as 0/1', () => {
    const lines = reserveStudyCsvLines([{ reserve_kg: 50, budget_kg: 450, area_m2: 1234567.6, divertRadius_m: 812.345, limitedByGrid: true }]);
    expect(lines[0]).toBe(`# ${CAUTION}`);
    expect(lines[1]).toBe('reserve_kg,budget_kg,reachable_area_m2,guaranteed_divert_radius_m,limited_by_grid');
    expect(lines[2]).toBe('50,450,1234568,812.3,1');
  });

  it('ignition-altitude CSV: an unreachable nominal target leaves its propellant empty', () => {
    const lines = altitudeStudyCsvLines([{ altitude_m: 1200, divertRadius_m: 0, limitedByGrid: false, nominalPropellant_kg: NaN, area_m2: 0 }]);
    expect(lines[2]).toBe('1200,0,0,,0');
  });

  it('dispersion CSV and reach map: rows in sample order and south-to-north grid order', () => {
    const d = dispersionCsvLines({ landingEast_m: Float64Array.of(1.234, -5), landingNorth_m: Float64Array.of(2, 3.456), samples: 2 });
    expect(d.slice(1)).toEqual(['sample,landing_east_m,landing_north_m', '0,1.23,2', '1,-5,3.46']);
    const r = reachMapCsv({ nx: 2, ny: 2, east: [-10, 10], north: [-20, 20] }, Float32Array.of(1, 0.5, 0.25, 0), 4, 20).trim().split('\n');
    expect(r[1]).toBe('# fraction of 4 dispersed samples reaching each target with 20 kg in reserve');
    expect(r.slice(3)).toEqual(['-10,-20,1', '10,-20,0.5', '-10,20,0.25', '10,20,0']);
  });

  it('report: versioned envelope with the caution, the hash and the rows; extra figures spread in', () => {
    const o = studyReportObject({ kind: 'ignition-altitude', inputs: { a: 1 }, inputsHash: 'ab', cancelled: false, extra: { minimumAltitude: null }, rows: [1], createdAt: 'T' });
    expect(o).toEqual({ format: 'landreach-study-result', version: 1, study: 'ignition-altitude', caution: CAUTION, appVersion: expect.any(String), createdAt: 'T', inputsHash: 'ab', inputs: { a: 1 }, cancelled: false, minimumAltitude: null, rows: [1] });
  });
});
