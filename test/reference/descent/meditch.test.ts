/**
 * Meditch (1964), "On the problem of optimal thrust programming for a lunar soft landing", IEEE TAC
 * AC-9(4): for a vertical landing with bounded thrust 0 ≤ T ≤ T_max, the minimum-propellant control is
 * free fall followed by a full-thrust arc that ends at h = 0, v = 0.
 *
 * Derivation used here: free fall from (h0, v0) for a time t_s gives h = h0 + v0 t_s − g t_s²/2,
 * v = v0 − g t_s. The full-thrust arc, ḣ = v, v̇ = T_max/m − g, ṁ = −T_max/(Isp g0), is integrated
 * numerically (classical RK4, 1 ms steps) until v returns to 0; the switch time t_s is the root of
 * h(at v = 0) = 0, found by bisection. The propellant is then T_max/(Isp g0) × burn time.
 * The convex solver (no thrust lower bound: ρ1 = 0, free final time) must converge to it as N grows.
 */
import { describe, expect, it } from 'vitest';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import type { DescentSetup, IgnitionState } from '../../../core/descent/setup.ts';

const g = 1.62; // invented test case on a Moon-like body
const m0 = 1000;
const isp = 300;
const tMax = 4000;
const h0 = 1500;
const v0 = -40;
const mdot = tMax / (isp * 9.80665);

function fullThrustArc(h: number, v: number): { hAtStop: number; burn: number } {
  let m = m0;
  let t = 0;
  const dt = 1e-3;
  const f = (s: [number, number, number]): [number, number, number] => [s[1], tMax / s[2] - g, -mdot];
  let s: [number, number, number] = [h, v, m];
  while (s[1] < 0) {
    const k1 = f(s);
    const k2 = f([s[0] + (dt / 2) * k1[0], s[1] + (dt / 2) * k1[1], s[2] + (dt / 2) * k1[2]]);
    const k3 = f([s[0] + (dt / 2) * k2[0], s[1] + (dt / 2) * k2[1], s[2] + (dt / 2) * k2[2]]);
    const k4 = f([s[0] + dt * k3[0], s[1] + dt * k3[1], s[2] + dt * k3[2]]);
    const next: [number, number, number] = [0, 1, 2].map((i) => s[i] + (dt / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i])) as [number, number, number];
    if (next[1] >= 0) {
      // Linear interpolation to v = 0 inside the last step.
      const frac = -s[1] / (next[1] - s[1]);
      return { hAtStop: s[0] + frac * (next[0] - s[0]), burn: t + frac * dt };
    }
    s = next;
    t += dt;
    m = s[2];
  }
  void m;
  return { hAtStop: s[0], burn: t };
}

function analyticPropellant(): { propellant: number; switchTime: number; burn: number } {
  let lo = 0;
  let hi = (v0 + Math.sqrt(v0 * v0 + 2 * g * h0)) / g; // free fall all the way: crashes
  const at = (ts: number) => fullThrustArc(h0 + v0 * ts - 0.5 * g * ts * ts, v0 - g * ts);
  expect(at(lo).hAtStop).toBeGreaterThan(0); // burning at once stops above ground: a coast exists
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (lo + hi);
    if (at(mid).hAtStop > 0) lo = mid;
    else hi = mid;
  }
  const { burn } = at(lo);
  return { propellant: mdot * burn, switchTime: lo, burn };
}

function setup(nodes: number): DescentSetup {
  return {
    planet: { name: 'test', gravity: [0, 0, -g], rotationRate: [0, 0, 0] },
    vehicle: { wetMass: m0, dryMass: 600, isp, engineCount: 1, thrustPerEngine: tMax, cantAngle: 0, throttleMin: 0, throttleMax: 1, pointingLimit: Math.PI },
    constraints: { glideSlope: null, maxSpeed: null, gateHeight: 0, gateDescentRate: 0, minAltitude: null },
    nodes,
    hold: 'foh',
  };
}

describe('Meditch 1964 vertical soft landing', () => {
  it('free fall then full thrust: the discretised optimum converges to the analytic propellant', () => {
    const exact = analyticPropellant();
    expect(exact.switchTime).toBeGreaterThan(1);
    const ign: IgnitionState = { position: [0, 0, h0], velocity: [0, 0, v0], mass: m0 };
    const errors: number[] = [];
    for (const n of [20, 40, 80]) {
      const r = searchFreeFinalTime(new DescentSolver(setup(n), landreachConicBackend(), ign), [0, 0, 0], ign, { tfTolerance: 0.01 });
      expect(r.status).toBe('solved');
      errors.push(r.propellant - exact.propellant);
      // The control found is coast then full thrust: throttle near 0 early, near 1 at the end.
      const th = r.trajectory!.series.throttle;
      expect(th[1]).toBeLessThan(0.05);
      expect(th[n - 2]).toBeGreaterThan(0.95);
      expect(Math.abs(r.timeOfFlight - (exact.switchTime + exact.burn))).toBeLessThan((3 * r.timeOfFlight) / (n - 1));
    }
    // Piecewise-linear thrust cannot switch instantly, so the discrete optimum costs a little more and
    // the excess shrinks as the step shrinks.
    expect(Math.abs(errors[1])).toBeLessThan(Math.abs(errors[0]));
    expect(Math.abs(errors[2])).toBeLessThan(Math.abs(errors[1]));
    for (const e of errors) expect(e).toBeGreaterThan(0);
    expect(Math.abs(errors[2]) / exact.propellant).toBeLessThan(5e-4);
  });
});
