/**
 * Throttle-rate limit |dρ/dt| ≤ R against the independent reference (test/reference/py/descent_reference.py,
 * Debian python3-cvxopt), which writes the limit from the equations in its own variables (its docstring:
 * |T_{k+1} − T_k| ≤ R F Δt made linear in σ with the mass bounds). Invented lander and body.
 *
 * Tolerances, from the methods (as in independent-model.test.ts): both programs model the same discrete
 * problem, so their optima agree to the solvers' stopping tolerances (1e-8 here, 1e-9 in CVXOPT): 1e-6
 * relative. The limit binds when leaving it out moves the reference optimum by more than 100 × that.
 */
import { describe, expect, it } from 'vitest';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { relativeLosslessnessGap } from '../../../core/descent/flyable.ts';
import { decodeTrajectory, LOSSLESS_TOLERANCE } from '../../../core/descent/trajectory.ts';
import { verifyBetweenNodes } from '../../../core/descent/verify.ts';
import { validateSetup } from '../../../core/descent/setup.ts';
import { referenceToolsReady } from '../../support/reference-tools.ts';
import { runReference, toIgnition, toSetup } from './independentReference.ts';
import type { PhysicalScenario } from './independentReference.ts';

const AGREEMENT = 1e-6;
const lander: PhysicalScenario['vehicle'] = {
  wetMass_kg: 1600, dryMass_kg: 1200, isp_s: 225, engineCount: 4, thrustPerEngine_N: 2000, cantAngle_deg: 15,
  throttleMin: 0.3, throttleMax: 0.8, pointingLimit_deg: null, throttleRate_perS: 0.02,
};
const scenario = (hold: 'foh' | 'zoh'): PhysicalScenario => ({
  id: `rate-${hold}`, planet: { gravity: [0, 0, -1.9], rotationRate: [0, 0, 0] }, vehicle: lander,
  constraints: { glideSlope_deg: null, maxSpeed_mps: null, gateHeight_m: 0, gateDescentRate_mps: 0, minAltitude_m: 0 },
  ignition: { position_m: [-2000, 0, 300], velocity_mps: [20, 0, -30], mass_kg: 1600 }, target_m: [0, 0, 0], nodes: 40, hold,
});
const TF = 55;

describe.runIf(referenceToolsReady('cvxopt', 'numpy'))('throttle-rate limit against the independent reference', () => {
  it.each(['foh', 'zoh'] as const)('binds, agrees with the reference and stays lossless (%s)', (hold) => {
    const sc = scenario(hold);
    const [limited, free] = runReference([{ ...sc, timeOfFlight_s: TF }, { ...sc, timeOfFlight_s: TF, relax: ['rate'] }]);
    expect(limited.status).toBe('optimal');
    expect(limited.tolerance!).toBeLessThanOrEqual(1e-8);
    // It binds: without it the min–max–min thrust switches within one node step and costs less.
    expect((limited.propellant_kg! - free.propellant_kg!) / free.propellant_kg!).toBeGreaterThan(100 * AGREEMENT);
    const setup = toSetup(sc);
    const ignition = toIgnition(sc);
    const solver = new DescentSolver(setup, landreachConicBackend(), ignition);
    const r = solver.solveFixed('min-propellant', TF, sc.target_m, ignition);
    expect(r.status).toBe('solved');
    expect(Math.abs(r.propellant - limited.propellant_kg!) / limited.propellant_kg!).toBeLessThan(AGREEMENT);
    // Losslessness still holds here (checked, not assumed: the search reports relaxation-gap otherwise).
    expect(relativeLosslessnessGap(solver, r, ignition)).toBeLessThan(LOSSLESS_TOLERANCE);
    // The flown thrust meets the limit over every window of one node step (dense re-simulation).
    const between = verifyBetweenNodes(setup, decodeTrajectory(solver.program('min-propellant'), r.solution.x, TF, sc.target_m), sc.target_m);
    expect(between.violations).toEqual([]);
    expect(between.throttleRateMargin_perS).toBeGreaterThanOrEqual(0);
  }, 120_000);
});

describe('throttle-rate limit input', () => {
  it('refuses a rate at or below the mass-loss drift at full thrust, naming the field and the fix', () => {
    const setup = toSetup({ ...scenario('foh'), vehicle: { ...lander, throttleRate_perS: 1e-4 } });
    expect(() => validateSetup(setup)).toThrow(/vehicle\.throttleRate: 0\.0001 per s \(must be above [\d.e-]+ per s/);
  });
});
