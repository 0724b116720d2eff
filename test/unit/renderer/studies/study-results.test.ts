/** Study result views (renderer/studies/study-results.ts): verdicts, tables, scene ellipse, reach drape, exports. */
import { describe, expect, it } from 'vitest';
import type { AltitudeStudyResult, DispersionStudyResult, ReserveStudyResult } from '../../../../renderer/compute/study-session.ts';
import { minimumAltitudeText, reachDrape, reachSummary, sceneEllipse, studyExport, studyTable } from '../../../../renderer/studies/study-results.ts';
import { ellipsePositions } from '../../../../renderer/scene/markers.ts';

const study = { name: 'Test', vehicle: { propellantReserve_kg: 20 } } as unknown as ReserveStudyResult['study'];
const row = (altitude_m: number, divertRadius_m: number) => ({ altitude_m, divertRadius_m, limitedByGrid: false, nominalPropellant_kg: 210, area_m2: 1e6 });
const altitudeResult = (required: number | null, minimum: AltitudeStudyResult['minimum']): AltitudeStudyResult => ({
  kind: 'ignition-altitude',
  study,
  grid: null,
  nodes: 30,
  cancelled: false,
  inputs: { altitudes_m: [1000, 2000], rule: { kind: 'fixed-velocity' }, reserve_kg: 250, requiredRadius_m: required, method: 'directions', directions: 6 },
  rows: [row(1000, 400), row(2000, 800)],
  minimum,
});

describe('study result views', () => {
  it('says whether the requirement is met, interpolated, or not met in the swept range', () => {
    expect(minimumAltitudeText(altitudeResult(600, { altitude_m: 1500, bracketed: true }))).toBe('Minimum ignition altitude for a 600 m divert radius: 1500 m (with 250 kg in reserve; interpolated between sampled altitudes).');
    expect(minimumAltitudeText(altitudeResult(300, { altitude_m: 1000, bracketed: false }))).toMatch(/: at most 1000 m \(the lowest altitude swept already meets it/);
    expect(minimumAltitudeText(altitudeResult(900, null))).toBe('Requirement not met in the swept range: no altitude up to 2000 m gives a 900 m divert radius with 250 kg in reserve.');
    expect(minimumAltitudeText(altitudeResult(null, null))).toMatch(/^No required divert radius given/);
  });

  it('tables carry units in the column names and flag grid-limited radii', () => {
    const reserve: ReserveStudyResult = { kind: 'reserve', study, grid: { side: 5, halfWidth_m: 3000 }, nodes: 30, cancelled: false, usable_kg: 500, inputs: { reserves_kg: [0] }, rows: [{ reserve_kg: 0, budget_kg: 500, area_m2: 2.5e6, divertRadius_m: 1200.4, limitedByGrid: true }] };
    expect(studyTable(reserve)).toEqual({ columns: ['Reserve (kg)', 'Budget (kg)', 'Area (km²)', 'Divert radius (m)'], rows: [['0.0', '500.0', '2.500', '1200 (grid-limited)']] });
    expect(studyTable(altitudeResult(600, null)).rows[0]).toEqual(['1000', '400', '210.0', '1.000']);
  });

  it('scene ellipse: orientation counter-clockwise from east becomes azimuth clockwise from north, same points', () => {
    const e = { centreEast_m: 30, centreNorth_m: -20, semiMajor_m: 200, semiMinor_m: 80, orientation_deg: 30, probability: 0.997 };
    const s = sceneEllipse(e);
    expect(s.azimuth_deg).toBeCloseTo(60, 12);
    // The scene's first point is the major-axis tip: centre + a·(cos 30°, sin 30°) in (east, north).
    const p = ellipsePositions(s.centreEast_m!, s.centreNorth_m!, s.semiMajor_m, s.semiMinor_m, s.azimuth_deg, 8, () => 0);
    expect(p[0]).toBeCloseTo(30 + 200 * Math.cos(Math.PI / 6), 3);
    expect(p[1]).toBeCloseTo(-20 + 200 * Math.sin(Math.PI / 6), 3);
    expect(sceneEllipse({ ...e, orientation_deg: 120 }).azimuth_deg).toBeCloseTo(330, 12);
  });

  it('reach drape: percent on the terrain samples, rows flipped to north-first', () => {
    // A 2 × 2 target grid at ±100 m; the terrain samples are the same four points.
    const reach = { field: { nx: 2, ny: 2, east: Float64Array.of(-100, 100), north: Float64Array.of(-100, 100) }, probability: Float32Array.of(1, 0.5, 0.25, 0), samples: 4 };
    const terrain = { width: 2, height: 2, pixelSize_m: 200, west_m: -100, north_m: 100 } as unknown as Parameters<typeof reachDrape>[1];
    const d = reachDrape(reach, terrain);
    // Terrain row 0 is the north row: field row 1 (0.25, 0), then the south row (1, 0.5).
    expect(Array.from(d.values)).toEqual([25, 0, 100, 50]);
    expect(d.range).toEqual([0, 100]);
    expect(d.title).toBe('Probability of reach (%)');
  });

  it('reach summary: shares of targets reached by every sample, by half of them, by any', () => {
    const reach = { field: { nx: 2, ny: 2, east: Float64Array.of(0, 1), north: Float64Array.of(0, 1) }, probability: Float32Array.of(1, 0.5, 0.25, 0), samples: 4 };
    expect(reachSummary(reach)).toEqual([
      { label: 'Reach-map samples', value: '4' },
      { label: 'Reached by every sample', value: '25 % of 4 targets' },
      { label: 'Reached by ≥ 50 %', value: '50 % of 4 targets' },
      { label: 'Reached by any sample', value: '75 % of 4 targets' },
    ]);
  });

  it('exports through core/study’s writers: CSV per study, report with the study’s figures, reach map only with a map', () => {
    const p = { inputs: { x: 1 }, inputsHash: 'f'.repeat(64), appVersion: '0.1.0', createdAt: '2026-01-01T00:00:00Z' };
    const csv = studyExport('csv', altitudeResult(600, { altitude_m: 1500, bracketed: true }), p);
    expect(csv.suffix).toBe('study-ignition-altitude');
    expect(csv.text.split('\n')[2]).toBe('1000,400,0,210,1000000');
    const json = JSON.parse(studyExport('json', altitudeResult(600, { altitude_m: 1500, bracketed: true }), p).text);
    expect(json).toMatchObject({ format: 'landreach-study-result', study: 'ignition-altitude', method: 'directions', directions: 6, requiredRadius_m: 600, minimumAltitude: { altitude_m: 1500 }, inputsHash: p.inputsHash });
    const dispersion = {
      kind: 'dispersion', study, grid: null, nodes: 30, cancelled: false, reach: null,
      inputs: { samples: 10, seed: 1, probability: 0.9, sigmas: {}, reachSamples: 0 },
      dispersion: { nominalPropellant_kg: 200, nominalTimeOfFlight_s: 40, result: { samples: 1, landingEast_m: Float64Array.of(1), landingNorth_m: Float64Array.of(2), ellipse: { semiMajor_m: 3 } } },
    } as unknown as DispersionStudyResult;
    expect(JSON.parse(studyExport('json', dispersion, p).text).rows).toEqual([{ semiMajor_m: 3 }]);
    expect(() => studyExport('reach-csv', dispersion, p)).toThrow(/no probability-of-reach map/);
  });
});
