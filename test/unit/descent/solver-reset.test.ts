/**
 * DescentSolver.reset (and ConicWorkspace.reset under it): after a reset, solves give the same bits as on a
 * new solver, whatever was solved before. Reproducible footprints rest on this (engine.ts): a worker resets
 * its solver at the start of every row. Exact equality, so no tolerance is involved.
 */
import { describe, expect, it } from 'vitest';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { DEG } from '../../../core/descent/constants.ts';
import { MOON } from '../../../core/descent/planet.ts';
import type { DescentSetup, IgnitionState } from '../../../core/descent/setup.ts';
import { DescentSolver, type FixedTimeSolve } from '../../../core/descent/solver.ts';

// Invented vehicle (not a real one) at an invented site.
const setup: DescentSetup = {
  planet: MOON,
  vehicle: { wetMass: 1200, dryMass: 900, isp: 305, engineCount: 3, thrustPerEngine: 1500, cantAngle: 8 * DEG, throttleMin: 0.2, throttleMax: 1, pointingLimit: 70 * DEG },
  constraints: { glideSlope: 10 * DEG, maxSpeed: 80, gateHeight: 10, gateDescentRate: 1, minAltitude: 0 },
  nodes: 20,
  hold: 'foh',
};
const ign: IgnitionState = { position: [-1500, 300, 1500], velocity: [40, 0, -25], mass: 1200 };

const bits = (r: FixedTimeSolve) => ({
  status: r.status,
  iterations: r.solution.info.iterations,
  x: Buffer.from(r.solution.x.buffer, r.solution.x.byteOffset, r.solution.x.byteLength).toString('hex'),
  z: Buffer.from(r.solution.z.buffer, r.solution.z.byteOffset, r.solution.z.byteLength).toString('hex'),
});

describe('DescentSolver.reset', () => {
  it('solves after a reset give the same bits as a new solver, for both problem kinds', () => {
    const used = new DescentSolver(setup, landreachConicBackend(), ign);
    // Earlier work that leaves warm starts and a continued equilibration behind.
    for (const [tf, e] of [[48, 0], [52, 300], [55, -600], [60, 900]] as const) {
      used.solveFixed('min-propellant', tf, [e, 100, 0], ign);
      used.solveFixed('min-landing-error', tf, [e + 4000, 0, 0], ign);
    }
    used.reset();
    const fresh = new DescentSolver(setup, landreachConicBackend(), ign);
    for (const [kind, target] of [['min-propellant', [150, -200, 0]], ['min-landing-error', [5000, 0, 0]], ['min-propellant', [180, -200, 0]]] as const) {
      const a = used.solveFixed(kind, 51.5, [...target], ign);
      const b = fresh.solveFixed(kind, 51.5, [...target], ign);
      expect(a.status).toBe('solved');
      expect(bits(a)).toEqual(bits(b));
    }
  });

  it('without the reset, the earlier work does change the bits (the test above is not empty)', () => {
    const used = new DescentSolver(setup, landreachConicBackend(), ign);
    used.solveFixed('min-propellant', 48, [0, 100, 0], ign);
    used.solveFixed('min-propellant', 60, [900, 100, 0], ign);
    const fresh = new DescentSolver(setup, landreachConicBackend(), ign);
    expect(bits(used.solveFixed('min-propellant', 51.5, [150, -200, 0], ign))).not.toEqual(bits(fresh.solveFixed('min-propellant', 51.5, [150, -200, 0], ign)));
  });
});
