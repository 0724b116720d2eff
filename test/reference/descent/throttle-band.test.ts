/**
 * Forbidden throttle band (core/descent/band.ts) against references outside the project.
 *
 * 1. Brute force (test/reference/py/descent_reference.py, Debian python3-cvxopt, written from the equations
 *    in its own variables): at a fixed time of flight with N = 9 nodes (8 zero-order-hold intervals), EVERY
 *    assignment of the intervals to the two allowed throttle ranges (2^8 = 256 problems) is solved and the
 *    cheapest kept: the optimum of the band-respecting discrete problem, with no structure assumed.
 *    Checks: (a) our band-respecting trajectory is feasible for that problem, so it cannot beat it:
 *    ours ≥ brute force − 1e-6 relative (the solvers' agreement, see independent-model.test.ts); (b) our
 *    lower bound (the relaxation ignoring the band) ≤ brute force; (c) the brute-force optimum has the
 *    max–min–max structure (the published structure result, Açıkmeşe & Ploen 2007: at most two switches),
 *    and then our local search over exactly that structure family must find it: ours ≤ brute force +
 *    1e-6 relative (a stated gap of zero beyond solver tolerance for this scenario).
 * 2. A vertical landing, analytic (derived below): with free final time the minimum-propellant landing is
 *    the minimum-time one, fall at the LOWEST thrust then brake at the HIGHEST (one switch; Meditch 1964,
 *    IEEE TAC AC-9(4); see vertical-min-max.test.ts, items 1–3). It uses only the throttle bounds, so a
 *    band strictly inside (throttleMin, throttleMax) costs nothing in continuous time. At a fixed t_f every
 *    vertical programme that lands costs the rocket-equation propellant P(t_f) = m0(1 − e^{−(g t_f − v0)/c})
 *    (c = Isp g0 cos φ), exactly for the discrete problem too (it integrates σ exactly). Hence the
 *    band-respecting answer equals P at its own t_f, and its t_f exceeds the relaxed one only by the
 *    discretisation of the switch instant: with zero-order hold the relaxation may hold an intermediate
 *    level over the one interval containing the switch, which the band forbids; rounding that interval
 *    to the lower or upper range moves the landing by at most one step Δt, so
 *    0 ≤ t_band − t_relaxed ≤ Δt and 0 ≤ P_band − P_relaxed ≤ P'(t) Δt = (m0 − P) g Δt / c.
 *    (The same two facts show that in a vertical landing the band can never cost propellant at a given
 *    t_f, only make a t_f infeasible: a case where it binds needs a second dimension, and item 1's
 *    exhaustive reference is that case.)
 * 3. A Mars example (Açıkmeşe & Ploen 2007, parameters second-hand: marsExamples.ts): the relaxed
 *    optimum's throttle is max–min–max (at most two switches between the top range and the lower one),
 *    and the band-respecting trajectory meets the band at every node and between the nodes (dense RK4
 *    re-simulation, verify.ts).
 */
import { describe, expect, it } from 'vitest';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { bandRespectingNear, intervalThrottles } from '../../../core/descent/band.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { verifyBetweenNodes } from '../../../core/descent/verify.ts';
import type { DescentSetup, IgnitionState } from '../../../core/descent/setup.ts';
import { referenceToolsReady } from '../../support/reference-tools.ts';
import { runReference, toIgnition, toSetup } from './independentReference.ts';
import type { PhysicalScenario } from './independentReference.ts';
import { ACIKMESE_2007, marsSetup } from './marsExamples.ts';
import { decodeTrajectory } from '../../../core/descent/trajectory.ts';
import type { FixedTimeSolve } from '../../../core/descent/solver.ts';
import type { Vec3 } from '../../../core/descent/constants.ts';

const AGREEMENT = 1e-6;
const G0 = 9.80665; // standard gravity, exact by definition (3rd CGPM 1901)
const DEG = Math.PI / 180;

/** Number of switches between "top range" and "below it" along a throttle profile. */
function switches(throttles: ArrayLike<number>, threshold: number): number {
  let n = 0;
  for (let k = 1; k < throttles.length; k++) if ((throttles[k] >= threshold) !== (throttles[k - 1] >= threshold)) n++;
  return n;
}

describe.runIf(referenceToolsReady('cvxopt', 'numpy'))('forbidden throttle band: brute force over every interval assignment (CVXOPT)', () => {
  const band: [number, number] = [0.4, 0.7];
  const scenario: PhysicalScenario = {
    id: 'band-brute-force', planet: { gravity: [0, 0, -1.9], rotationRate: [0, 0, 0] },
    vehicle: { wetMass_kg: 1600, dryMass_kg: 1200, isp_s: 225, engineCount: 4, thrustPerEngine_N: 2000, cantAngle_deg: 15, throttleMin: 0.3, throttleMax: 0.8, pointingLimit_deg: null },
    constraints: { glideSlope_deg: null, maxSpeed_mps: null, gateHeight_m: 0, gateDescentRate_mps: 0, minAltitude_m: 0 },
    ignition: { position_m: [-2000, 0, 300], velocity_mps: [20, 0, -30], mass_kg: 1600 }, target_m: [0, 0, 0], nodes: 9, hold: 'zoh',
  };
  const TF = 55;

  it('our band-respecting answer equals the exhaustive optimum; our lower bound is below it', () => {
    const [brute] = runReference([{ ...scenario, timeOfFlight_s: TF, bruteForceBands: [band] }]);
    expect(brute.status).toBe('optimal');
    expect(brute.solves).toBe(2 ** 8);
    // (c) The exhaustive optimum is max–min–max: top range (1), then the lower one (0), then the top again.
    expect(brute.assignment!.join('')).toMatch(/^1*0+1*$/);
    const base = toSetup(scenario);
    const setup: DescentSetup = { ...base, vehicle: { ...base.vehicle, throttleBands: [band] } };
    const ignition = toIgnition(scenario);
    const solver = new DescentSolver(setup, landreachConicBackend(), ignition);
    const relaxed = solver.solveFixed('min-propellant', TF, scenario.target_m, ignition);
    expect(relaxed.status).toBe('solved');
    // (b) the relaxation ignoring the band bounds the band-respecting optimum from below, and binds: the band costs.
    expect(relaxed.propellant).toBeLessThan(brute.propellant_kg! * (1 - 100 * AGREEMENT));
    const band3 = bandRespectingNear(solver, relaxed, scenario.target_m, ignition, { lower: TF, upper: TF }, { fixedTime: true });
    expect(band3.best).not.toBeNull();
    const ours = band3.best!.propellant;
    // (a) feasible for the brute-force problem, so never below its optimum; (c) and found.
    expect(ours).toBeGreaterThanOrEqual(brute.propellant_kg! * (1 - AGREEMENT));
    expect(ours).toBeLessThanOrEqual(brute.propellant_kg! * (1 + AGREEMENT));
    // Our assignment is the brute force's.
    const s = band3.structure!;
    expect(Array.from({ length: 8 }, (_, k) => (k >= s.i1 && k < s.i2 ? 0 : 1)).join('')).toBe(brute.assignment!.join(''));
    // At every node and between the nodes (dense re-simulation, ZOH) the thrust stays out of the band.
    const report = verifyBetweenNodes(setup, decode(solver, band3.best!, scenario.target_m), scenario.target_m);
    expect(report.violations).toEqual([]);
    expect(report.bandMargin).toBeGreaterThanOrEqual(-1e-3);
  }, 180_000);
});

function decode(solver: DescentSolver, r: FixedTimeSolve, target: Vec3) {
  return decodeTrajectory(solver.program(r.kind), r.solution.x, r.timeOfFlight, target);
}

describe('forbidden throttle band: vertical landing, analytic (free final time: the band costs nothing)', () => {
  // An invented lander on an invented body (g = 1.62 m/s²), as in vertical-min-max.test.ts.
  const g = 1.62;
  const m0 = 1000;
  const isp = 300;
  const engines = 3;
  const thrustPerEngine = 1500;
  const cant = 20 * DEG;
  const throttleMin = 0.3;
  const throttleMax = 1.0;
  const band: [number, number] = [0.35, 0.8];
  const c = isp * G0 * Math.cos(cant);
  const full = engines * thrustPerEngine * Math.cos(cant);
  const v0 = -20;
  const ignition: IgnitionState = { position: [0, 0, 1200], velocity: [0, 0, v0], mass: m0 };
  const nodes = 40;
  const setup: DescentSetup = {
    planet: { name: 'invented body', gravity: [0, 0, -g], rotationRate: [0, 0, 0] },
    vehicle: { wetMass: m0, dryMass: 600, isp, engineCount: engines, thrustPerEngine, cantAngle: cant, throttleMin, throttleMax, pointingLimit: 1 * DEG, throttleBands: [band] },
    constraints: { glideSlope: null, maxSpeed: null, gateHeight: 0, gateDescentRate: 0, minAltitude: null },
    nodes,
    hold: 'zoh',
  };
  const rocketPropellant = (tf: number) => m0 * (1 - Math.exp(-(g * tf - v0) / c));

  it('band-respecting: rocket-equation propellant at its t_f, within one step of the relaxed optimum, one switch from the lowest to the highest range', () => {
    // Premises of the derivation: the lowest thrust cannot hold the vehicle (it falls), the highest can;
    // the hover thrust at ignition lies INSIDE the band.
    expect(full * throttleMin).toBeLessThan(m0 * g);
    expect(full * throttleMax).toBeGreaterThan(m0 * g);
    const hover = (m0 * g) / full;
    expect(hover).toBeGreaterThan(band[0]);
    expect(hover).toBeLessThan(band[1]);
    const solver = new DescentSolver(setup, landreachConicBackend(), ignition);
    const r = searchFreeFinalTime(solver, [0, 0, 0], ignition, { propellantTolerance: 1e-3 });
    expect(['solved', 'relaxation-gap']).toContain(r.status);
    expect(r.kind).toBe('min-propellant-band');
    const dt = r.timeOfFlight / (nodes - 1);
    // Exact at any t_f for a vertical programme (item 1 of vertical-min-max.test.ts): to solver accuracy.
    expect(Math.abs(r.propellant - rocketPropellant(r.timeOfFlight)) / r.propellant).toBeLessThan(AGREEMENT);
    // Lower bound ≤ band-respecting ≤ lower bound + P'(t) Δt (plus the certified search tolerance, 1e-3 kg).
    const slope = ((m0 - r.propellant) * g) / c;
    expect(r.propellant).toBeGreaterThanOrEqual(r.propellantLowerBound - 1e-3);
    expect(r.propellant - r.propellantLowerBound).toBeLessThanOrEqual(slope * dt + 1e-3);
    // Min then max: the low arc starts at the first interval and ends at one switch.
    expect(r.bandStructure!.i1).toBe(0);
    const throttles = r.trajectory!.series.throttle;
    expect(switches(throttles, 0.5 * (band[0] + band[1]))).toBe(1);
    const report = verifyBetweenNodes(setup, r.trajectory!, [0, 0, 0]);
    expect(report.violations).toEqual([]);
  }, 120_000);
});

describe('forbidden throttle band: Mars example (Açıkmeşe & Ploen 2007), max–min–max', () => {
  it('the relaxed throttle switches at most twice; the band-respecting trajectory meets the band between nodes', () => {
    const base = marsSetup({ glideSlope: true, rotation: false, nodes: 40, hold: 'zoh' });
    const band: [number, number] = [0.4, 0.7];
    const setup: DescentSetup = { ...base, vehicle: { ...base.vehicle, throttleBands: [band] } };
    const solver = new DescentSolver(setup, landreachConicBackend(), ACIKMESE_2007);
    const r = searchFreeFinalTime(solver, [0, 0, 0], ACIKMESE_2007);
    expect(['solved', 'relaxation-gap']).toContain(r.status);
    // The relaxed optimum at the band-respecting t_f: the structure theorem says max–min–max.
    const relaxed = solver.solveFixed('min-propellant', r.timeOfFlight, [0, 0, 0], ACIKMESE_2007);
    const mid = 0.5 * (band[0] + band[1]);
    const relaxedThrottles = intervalThrottles(solver, relaxed);
    expect(switches(relaxedThrottles, mid)).toBeLessThanOrEqual(2);
    expect(relaxedThrottles[0]).toBeGreaterThan(mid);
    expect(relaxedThrottles[relaxedThrottles.length - 1]).toBeGreaterThan(mid);
    const report = verifyBetweenNodes(setup, r.trajectory!, [0, 0, 0]);
    // The thrust constraints hold between the nodes; (the glide slope, imposed at the nodes only, can be
    // cut between them on this coarse grid: a known limit of the model, README "between nodes").
    expect(report.violations.filter((v) => /thrust|band/.test(v))).toEqual([]);
    expect(report.bandMargin).toBeGreaterThanOrEqual(-1e-3);
    expect(r.propellant).toBeGreaterThanOrEqual(r.propellantLowerBound - 0.01);
  }, 120_000);
});
