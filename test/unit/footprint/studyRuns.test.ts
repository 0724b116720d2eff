/** Study steps shared by the CLI and the app (core/footprint/studyRuns.ts, studyWorker.ts). */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { emptyField, TARGET } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { altitudeRowFromField, defaultAltitudes, defaultReserves, dispersedSampleStudy, reachSampleStudies, studyAtAltitude } from '../../../core/footprint/studyRuns.ts';
import { handleStudyJob } from '../../../core/footprint/studyWorker.ts';
import { parseStudyText } from '../../../core/study/index.ts';

const study = parseStudyText(readFileSync(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url), 'utf8'));

/** Propellant 300 + r/10 kg at distance r (the analytic field of studies.test.ts): budget B reaches the disc r ≤ 10 (B − 300). */
function radialField() {
  const grid = makeTargetGrid({ halfWidthEast_m: 2000, halfWidthNorth_m: 2000, nx: 81, ny: 81 });
  const f = emptyField(grid);
  for (let j = 0; j < 81; j++) {
    for (let i = 0; i < 81; i++) {
      f.status[j * 81 + i] = TARGET.reachable;
      f.propellant_kg[j * 81 + i] = 300 + Math.hypot(grid.east[i], grid.north[j]) / 10;
    }
  }
  return f;
}

describe('study steps', () => {
  it('defaults: round reserves up to half the usable propellant; five altitudes 0.6 … 1.4 × the study’s', () => {
    // Round steps (issue 15 bug 9): 500 / 10 = 50 kg is itself 5 × 10^1, so 0, 50 … 250 (half of 500).
    expect(defaultReserves(500)).toEqual([0, 50, 100, 150, 200, 250]);
    // 400 / 10 = 40 → the largest of 10, 20, 25, 50 not above it is 25, up to 200; 3.7 / 10 = 0.37 → 0.25, up to 1.85.
    expect(defaultReserves(400)).toEqual([0, 25, 50, 75, 100, 125, 150, 175, 200]);
    expect(defaultReserves(3.7)).toEqual([0, 0.25, 0.5, 0.75, 1, 1.25, 1.5, 1.75]);
    expect(defaultAltitudes(1800)).toEqual([1080, 1440, 1800, 2160, 2520]);
  });

  it('moves the ignition state with the rule and leaves the rest of the study alone', () => {
    const at = studyAtAltitude(study, 1000, { kind: 'fixed-flight-path-angle' });
    // Along v = (90, −10, −70) m/s from (−2500, 400, 1800) m: 800 m lower is 800/70 s earlier on the line.
    expect(at.ignition.position_m[0]).toBeCloseTo(-2500 + (90 * 800) / 70, 9);
    expect(at.ignition.position_m[2]).toBe(1000);
    expect(at.vehicle).toBe(study.vehicle);
    expect(study.ignition.position_m[2]).toBe(1800);
  });

  it('row from a footprint: the disc radius of the analytic field, and the nominal target’s propellant', () => {
    const row = altitudeRowFromField(radialField(), 1500, 400);
    expect(Math.abs(row.divertRadius_m - 1000)).toBeLessThan(30);
    expect(row.nominalPropellant_kg).toBe(300);
    expect(Math.abs(row.area_m2 - Math.PI * 1e6) / (Math.PI * 1e6)).toBeLessThan(0.02);
  });

  it('dispersed sample studies: a heavier sample carries more propellant; its budget keeps the reserve', () => {
    const heavy = dispersedSampleStudy(study, { ignition: { position: [0, 0, 1800], velocity: [0, 0, -70], mass: 2110 }, thrustScale: 1.02, isp_s: 231 });
    expect(heavy.study.vehicle.wetMass_kg).toBe(2110);
    expect(heavy.budget_kg).toBe(2110 - 1600 - 150); // the demo's dry mass and reserve
    expect(heavy.study.vehicle.thrustPerEngine_N).toBeCloseTo(3300 * 1.02, 9);
    const draws = reachSampleStudies(study, { position_m: 10, velocity_mps: 0, mass_kg: 0, thrustFraction: 0, ispFraction: 0 }, 3, 7);
    expect(draws).toHaveLength(3);
    expect(new Set(draws.map((d) => d.study.ignition.position_m[0])).size).toBe(3);
  });

  it('worker handler: an altitude by the reach boundary, radius growing with altitude (demo study, 4 directions)', () => {
    const row = (h: number) => {
      const r = handleStudyJob({ kind: 'altitude', study: studyAtAltitude(study, h, { kind: 'fixed-velocity' }), altitude_m: h, budget_kg: 230, directions: 4, nodes: 20 }).result;
      if (r.kind !== 'altitude') throw new Error('expected an altitude row');
      return r.row;
    };
    const [low, high] = [row(900), row(1800)];
    expect(low.altitude_m).toBe(900);
    expect(high.divertRadius_m).toBeGreaterThan(low.divertRadius_m);
  }, 60_000);
});
