/**
 * Forbidden throttle bands in the free-final-time search: the statuses (solved / relaxation-gap / undecided),
 * the lower bound below the band-respecting cost, and how footprints and exports name them.
 * (The checks against outside references are in test/reference/descent/throttle-band.test.ts.)
 */
import { describe, expect, it } from 'vitest';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { alternatingRanges, seedStructure, structureOf, structureRanges } from '../../../core/descent/band.ts';
import { validateSetup, type DescentSetup, type IgnitionState } from '../../../core/descent/setup.ts';
import { countByStatus, emptyField, TARGET } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { footprintCsv } from '../../../core/export/footprintExport.ts';

const DEG = Math.PI / 180;
// Invented lander on an invented body (g = 1.9 m/s²).
const setup: DescentSetup = {
  planet: { name: 'invented body', gravity: [0, 0, -1.9], rotationRate: [0, 0, 0] },
  vehicle: {
    wetMass: 1600, dryMass: 1200, isp: 225, engineCount: 4, thrustPerEngine: 2000, cantAngle: 15 * DEG,
    throttleMin: 0.3, throttleMax: 0.8, pointingLimit: Math.PI, throttleBands: [[0.4, 0.7]],
  },
  constraints: { glideSlope: null, maxSpeed: null, gateHeight: 0, gateDescentRate: 0, minAltitude: 0 },
  nodes: 12,
  hold: 'zoh',
};
const ignition: IgnitionState = { position: [-2000, 0, 300], velocity: [20, 0, -30], mass: 1600 };

describe('throttle band in the search', () => {
  it('refuses a band with first-order hold, naming the fix', () => {
    expect(() => validateSetup({ ...setup, hold: 'foh' })).toThrow(/hold: foh \(must be 'zoh' with forbidden throttle bands/);
  });

  it('returns a band-respecting trajectory above the certified lower bound, and undecided when only the bound fits the budget', () => {
    const solver = new DescentSolver(setup, landreachConicBackend(), ignition);
    const r = searchFreeFinalTime(solver, [0, 0, 0], ignition);
    expect(r.kind).toBe('min-propellant-band');
    expect(r.propellant).toBeGreaterThanOrEqual(r.propellantLowerBound);
    expect(r.bandGap_kg).toBeCloseTo(r.propellant - r.propellantLowerBound, 9);
    // The band costs here (coarse grid: the switch intervals cannot hold an in-band level).
    expect(r.bandGap_kg).toBeGreaterThan(0.01);
    expect(r.status).toBe('relaxation-gap');
    expect(r.bandSolves).toBeGreaterThan(0);
    // Every hold interval's throttle lies in an allowed range (at its start; between nodes: verify.ts).
    for (const rho of r.trajectory!.series.throttle) expect(rho <= 0.4 + 1e-6 || rho >= 0.7 - 1e-6).toBe(true);

    // A budget between the lower bound and the band-respecting cost: neither proven.
    const budget = 0.5 * (r.propellant + r.propellantLowerBound);
    const u = searchFreeFinalTime(new DescentSolver(setup, landreachConicBackend(), ignition), [0, 0, 0], ignition, { propellantBudget_kg: budget });
    expect(u.status).toBe('undecided');
    expect(u.propellantLowerBound).toBeLessThanOrEqual(budget);
  }, 120_000);

  it('seeds the max–min–max switches from a throttle profile and keeps the low arc in the nearest lower range', () => {
    const ranges: [number, number][] = [[0.2, 0.3], [0.4, 0.5], [0.6, 0.9]];
    const profile = Float64Array.of(0.9, 0.9, 0.45, 0.25, 0.3, 0.62, 0.9);
    // Below the middle of the highest band (0.55): intervals 2 … 4.
    expect(seedStructure(profile, ranges)).toEqual({ i1: 2, i2: 5 });
    expect(Array.from(structureRanges({ i1: 2, i2: 5 }, ranges, profile))).toEqual([0.6, 0.9, 0.6, 0.9, 0.4, 0.5, 0.2, 0.3, 0.2, 0.3, 0.6, 0.9, 0.6, 0.9]);
    // A profile that never goes low: everything in the top range.
    expect(seedStructure(Float64Array.of(0.9, 0.8), ranges)).toEqual({ i1: 2, i2: 2 });
  });
});

describe('alternating assignment (sigma–delta rounding)', () => {
  it('alternates an in-band arc between the ranges either side, keeping its mean, and leaves in-range intervals alone', () => {
    const ranges: [number, number][] = [[0.3, 0.4], [0.6, 0.8]];
    // An arc at 0.5 (inside the band 0.4–0.6): the edges 0.6, 0.4, 0.6, 0.4 have the mean 0.5 (by hand).
    const out = alternatingRanges(Float64Array.of(0.8, 0.5, 0.5, 0.5, 0.5, 0.35), ranges)!;
    const pick = Array.from({ length: 6 }, (_, k) => (out[2 * k] === 0.6 ? 'H' : 'L')).join('');
    expect(pick).toBe('HHLHLL');
    expect(alternatingRanges(Float64Array.of(0.8, 0.35, 0.7), ranges)).toBeNull();
    // HHLHLL is not max–min–max; rounding only a switch interval (HHLLHH) is.
    expect(structureOf(out, ranges)).toBeNull();
    const switchOnly = alternatingRanges(Float64Array.of(0.8, 0.5, 0.35, 0.35, 0.7, 0.8), ranges)!;
    expect(structureOf(switchOnly, ranges)).toEqual({ i1: 2, i2: 4 });
  });
});

describe('undecided targets in footprints and exports', () => {
  it('is its own code, counted apart and named in the CSV, never within the budget', () => {
    const f = emptyField(makeTargetGrid({ halfWidthEast_m: 100, halfWidthNorth_m: 100, nx: 2, ny: 2 }));
    f.status[0] = TARGET.reachable;
    f.propellant_kg[0] = 100;
    f.status[1] = TARGET.undecided;
    f.propellant_kg[1] = 300;
    expect(countByStatus(f)).toMatchObject({ reachable: 1, undecided: 1 });
    const rows = footprintCsv(f, 250).trim().split('\n').filter((l) => !l.startsWith('#'));
    expect(rows[2].split(',')[2]).toBe('undecided');
    expect(rows[2].split(',')[8]).toBe('');
  });
});
