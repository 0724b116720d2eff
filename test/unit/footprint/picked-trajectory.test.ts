/**
 * A picked target's optimal trajectory and its polynomial-guidance baseline. The optimum is a lower
 * bound on the propellant of any trajectory that lands on the target within the same constraints
 * (minimum-propellant optimality, Açıkmeşe & Ploen 2007); the baseline (Klumpp 1974 guidance flown in an
 * RK4 simulation) must land there too and so cost at least as much, up to the discretisation difference
 * between N nodes and the simulation (allowed: 1 % of the optimum).
 */
import { describe, expect, it } from 'vitest';
import { BASELINE_SAMPLES, solvePickedTrajectory } from '../../../core/footprint/pickedTrajectory.ts';
import { demoStudy } from '../../support/scenarios.ts';

describe('picked trajectory', () => {
  it('comes with a polynomial-guidance baseline to the same target that costs more propellant', () => {
    const study = demoStudy();
    const r = solvePickedTrajectory({ study: { ...study, discretisation: { ...study.discretisation, nodes: 30 } }, east_m: 600, north_m: -400 });
    expect(r.status).toBe('solved');
    const b = r.baseline!;
    expect(b.method).toBe('polynomial guidance');
    expect(b.miss_m).toBeLessThan(1);
    expect(b.propellant_kg).toBeGreaterThan(0.99 * r.propellant_kg);
    expect(b.time_s.length).toBeLessThanOrEqual(BASELINE_SAMPLES);
    expect(b.position_m.length).toBe(3 * b.time_s.length);
    // Starts at the ignition point, ends at the gate above the target.
    expect(b.position_m[0]).toBeCloseTo(study.ignition.position_m[0], 6);
    const last = b.position_m.length - 3;
    expect(Math.hypot(b.position_m[last] - 600, b.position_m[last + 1] + 400)).toBeLessThan(5);
  }, 60_000);

  it('starts from a time-of-flight guess when given one (from a footprint), with the same optimum', () => {
    const study = demoStudy();
    const job = { study: { ...study, discretisation: { ...study.discretisation, nodes: 30 } }, east_m: 600, north_m: -400 };
    const cold = solvePickedTrajectory(job);
    // A guess 1.5 s off, as a footprint's interpolated time of flight might be.
    const warm = solvePickedTrajectory({ ...job, tfGuess_s: cold.timeOfFlight_s + 1.5 });
    expect(warm.status).toBe('solved');
    expect(Math.abs(warm.propellant_kg - cold.propellant_kg)).toBeLessThan(0.02);
    expect(solvePickedTrajectory({ ...job, tfGuess_s: NaN }).propellant_kg).toBeCloseTo(cold.propellant_kg, 6);
  }, 60_000);
});
