import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DescentProgram } from '../../../core/descent/program.ts';
import { cscSamePattern } from '../../../core/linalg/csc.ts';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { DEG } from '../../../core/descent/constants.ts';
import { MOON } from '../../../core/descent/planet.ts';
import type { DescentSetup, IgnitionState } from '../../../core/descent/setup.ts';
import { validateSetup } from '../../../core/descent/setup.ts';

// Invented vehicle (not a real one) at an invented site.
const setup: DescentSetup = {
  planet: MOON,
  vehicle: { wetMass: 1200, dryMass: 900, isp: 305, engineCount: 3, thrustPerEngine: 1500, cantAngle: 8 * DEG, throttleMin: 0.2, throttleMax: 1, pointingLimit: 70 * DEG },
  constraints: { glideSlope: 10 * DEG, maxSpeed: 80, gateHeight: 10, gateDescentRate: 1, minAltitude: 0 },
  nodes: 25,
  hold: 'foh',
};
const ign: IgnitionState = { position: [-1500, 300, 1500], velocity: [40, 0, -25], mass: 1200 };

describe('DescentProgram pattern', () => {
  it('changing time of flight, target and ignition changes values only, and matches a fresh build', () => {
    const a = new DescentProgram(setup, 'min-propellant', { timeOfFlight: 50, target: [0, 0, 0], ignition: ign });
    const data = { timeOfFlight: 71.3, target: [120, -40, 7] as const, ignition: { ...ign, position: [-1400, 250, 1600] as const, mass: 1150 } };
    a.update(data);
    const b = new DescentProgram(setup, 'min-propellant', data, a.scales);
    expect(cscSamePattern(a.problem.A, b.problem.A)).toBe(true);
    expect(cscSamePattern(a.problem.G, b.problem.G)).toBe(true);
    expect(Array.from(a.problem.A.values)).toEqual(Array.from(b.problem.A.values));
    expect(Array.from(a.problem.G.values)).toEqual(Array.from(b.problem.G.values));
    expect(Array.from(a.problem.h)).toEqual(Array.from(b.problem.h));
    expect(Array.from(a.problem.b)).toEqual(Array.from(b.problem.b));
    expect(a.problem.cones).toEqual(b.problem.cones);
  });
  it('orders G rows orthant first, then cones that add up to the row count', () => {
    const p = new DescentProgram(setup, 'min-landing-error', { timeOfFlight: 50, target: [0, 0, 0], ignition: ign }).problem;
    const socRows = p.cones.secondOrder.reduce((s, q) => s + q, 0);
    expect(p.cones.nonnegative + socRows).toBe(p.G.m);
  });
  it('rejects bad setups naming the field', () => {
    expect(() => validateSetup({ ...setup, nodes: 3 })).toThrow(/nodes: 3/);
    expect(() => validateSetup({ ...setup, vehicle: { ...setup.vehicle, dryMass: 1300 } })).toThrow(/vehicle.dryMass: 1300/);
    expect(() => validateSetup({ ...setup, vehicle: { ...setup.vehicle, throttleMin: 0.9, throttleMax: 0.5 } })).toThrow(/throttle/);
    expect(() => validateSetup({ ...setup, constraints: { ...setup.constraints, glideSlope: 95 * DEG } })).toThrow(/glideSlope/);
  });
});

describe('properties of solved descents (fast-check)', () => {
  it('mass never increases, thrust stays within the throttle range, losslessness gap ~0', () => {
    const solver = new DescentSolver(setup, landreachConicBackend(), ign);
    let solved = 0;
    fc.assert(
      fc.property(
        fc.double({ min: -300, max: 300, noNaN: true }),
        fc.double({ min: -300, max: 300, noNaN: true }),
        fc.double({ min: -10, max: 10, noNaN: true }),
        (tx, ty, dvx) => {
          const ignition: IgnitionState = { ...ign, velocity: [ign.velocity[0] + dvx, 0, ign.velocity[2]] };
          const r = searchFreeFinalTime(solver, [tx, ty, 0], ignition);
          if (r.status !== 'solved') return;
          solved++;
          const s = r.trajectory!.series;
          for (let k = 1; k < s.mass.length; k++) expect(s.mass[k]).toBeLessThanOrEqual(s.mass[k - 1] * (1 + 1e-12));
          for (let k = 0; k < s.mass.length; k++) {
            expect(s.throttle[k]).toBeGreaterThanOrEqual(setup.vehicle.throttleMin - 1e-6);
            expect(s.throttle[k]).toBeLessThanOrEqual(setup.vehicle.throttleMax + 1e-6);
          }
          expect(r.trajectory!.diagnostics.losslessnessGapRelative).toBeLessThan(1e-4);
          expect(r.trajectory!.diagnostics.maxTilt).toBeLessThanOrEqual(setup.vehicle.pointingLimit + 1e-6);
        },
      ),
      { numRuns: 8, seed: 20261201 },
    );
    expect(solved).toBeGreaterThan(4);
  });
});
