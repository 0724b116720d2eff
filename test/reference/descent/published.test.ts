/**
 * Published worked examples of minimum-propellant powered descent, solved with our own conic solver.
 */
import { describe, expect, it } from 'vitest';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { deriveVehicle } from '../../../core/descent/vehicle.ts';
import { G0 } from '../../../core/descent/constants.ts';
import { isPrimalInfeasible } from '../../../core/conic/types.ts';
import { ACIKMESE_2007, BLACKMORE_2010_CASE_1, BLACKMORE_2010_CASE_2, marsSetup } from './marsExamples.ts';

const backend = landreachConicBackend();

describe('mass-flow constant α with canted engines', () => {
  it('follows from full engine thrust burning for the cos φ-reduced useful thrust', () => {
    // Each engine burns ṁ_e = T_e/(Isp g0) for its full thrust T_e, but only T_e cos φ points along
    // the vehicle axis. With ‖T‖ = n T_e cos φ · throttle: ṁ = n T_e throttle/(Isp g0) = ‖T‖/(Isp g0 cos φ).
    // For Isp 225 s and φ = 27° this is 5.086e-4 s/m. The papers' α (5e-4 s/m, second-hand, from memory)
    // is neither this nor 1/(Isp g0) = 4.532e-4 s/m: it corresponds to a cos φ of 0.906 (φ ≈ 25°), so it
    // is not consistent with the stated 27° cant. We keep the derived value; propellant figures below
    // therefore differ a little from the published ones (tolerances below).
    const v = marsSetup({ glideSlope: true, rotation: false }).vehicle;
    const d = deriveVehicle(v);
    expect(G0).toBe(9.80665); // standard gravity, exact by definition (3rd CGPM 1901)
    expect(d.alpha).toBeCloseTo(1 / (225 * 9.80665 * Math.cos((27 * Math.PI) / 180)), 15);
    expect(d.alpha).toBeCloseTo(5.086e-4, 7);
    expect(d.rho1).toBeCloseTo(6 * 3100 * Math.cos((27 * Math.PI) / 180) * 0.3, 9); // 4971.8 N
    expect(d.rho2).toBeCloseTo(6 * 3100 * Math.cos((27 * Math.PI) / 180) * 0.8, 9); // 13258 N
  });
});

describe('Açıkmeşe & Ploen 2007 (JGCD 30(5)) Mars example, free final time, N = 50', () => {
  // Published values quoted second-hand in the brief: about 399.5 kg at t_f ≈ 81 s with the 4° glide
  // slope and about 387.9 kg at t_f ≈ 72 s without. Tolerance ±2 kg on propellant (second-hand
  // values and a different α, see above) and ±4 s on t_f (the propellant is flat in t_f near the optimum:
  // we find 399.4 kg at t_f = 81 s but a slightly lower optimum near 78 s).
  it('with the glide slope: about 399.5 kg', () => {
    const setup = marsSetup({ glideSlope: true, rotation: false });
    const r = searchFreeFinalTime(new DescentSolver(setup, backend, ACIKMESE_2007), [0, 0, 0], ACIKMESE_2007);
    expect(r.status).toBe('solved');
    expect(Math.abs(r.propellant - 399.5)).toBeLessThan(2);
    expect(Math.abs(r.timeOfFlight - 81)).toBeLessThan(4);
    expect(r.trajectory!.diagnostics.lossless).toBe(true);
    expect(r.trajectory!.diagnostics.glideSlopeMargin).toBeGreaterThan(-1e-6);
  });
  it('without the glide slope: about 387.9 kg', () => {
    const setup = marsSetup({ glideSlope: false, rotation: false });
    const r = searchFreeFinalTime(new DescentSolver(setup, backend, ACIKMESE_2007), [0, 0, 0], ACIKMESE_2007);
    expect(r.status).toBe('solved');
    expect(Math.abs(r.propellant - 387.9)).toBeLessThan(2);
    expect(Math.abs(r.timeOfFlight - 72)).toBeLessThan(4);
    expect(r.trajectory!.diagnostics.lossless).toBe(true);
  });
});

describe('Blackmore, Açıkmeşe & Scharf 2010 (JGCD 33(4)) Mars examples with planet rotation', () => {
  it('case 1 (500 m cross-range offset): about 399.4 kg at t_f ≈ 78.4 s', () => {
    // Published values second-hand (brief): 399.4 kg, 78.4 s. Tolerance ±2 kg, ±4 s as above.
    const setup = marsSetup({ glideSlope: true, rotation: true });
    const r = searchFreeFinalTime(new DescentSolver(setup, backend, BLACKMORE_2010_CASE_1), [0, 0, 0], BLACKMORE_2010_CASE_1);
    expect(r.status).toBe('solved');
    expect(Math.abs(r.propellant - 399.4)).toBeLessThan(2);
    expect(Math.abs(r.timeOfFlight - 78.4)).toBeLessThan(4);
    expect(r.trajectory!.diagnostics.lossless).toBe(true);
  });
  it('case 2 (+40 m/s cross-range): unreachable with 400 kg, certificate, miss of a few hundred metres', () => {
    // Published: minimum-propellant problem infeasible; the minimum-landing-error trajectory misses by
    // about 268 m (second-hand). We find about 383 m with the derived α (a larger α than the papers'
    // burns more propellant per m/s, so less divert is left; with α = 5e-4 s/m our miss is about 224 m).
    // The brief asks for "a few hundred metres": we check 150–450 m and that the closest point lies
    // toward the target from the uncontrolled drift (positive miss, landing with dry mass only).
    const setup = marsSetup({ glideSlope: true, rotation: true });
    const r = searchFreeFinalTime(new DescentSolver(setup, backend, BLACKMORE_2010_CASE_2), [0, 0, 0], BLACKMORE_2010_CASE_2);
    expect(r.status).toBe('unreachable');
    expect(r.infeasibleStatuses.length).toBeGreaterThan(0);
    expect(r.infeasibleStatuses.every(isPrimalInfeasible)).toBe(true);
    expect(r.miss).toBeGreaterThan(150);
    expect(r.miss).toBeLessThan(450);
    expect(Math.hypot(r.closestPoint![0], r.closestPoint![1])).toBeCloseTo(r.miss, 6);
    expect(r.propellant).toBeCloseTo(400, 3); // all usable propellant spent getting as close as possible
  });
});
