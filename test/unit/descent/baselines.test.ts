import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { flyPolynomial, polynomialGuidance } from '../../../core/descent/baselines/polynomial.ts';
import { gravityTurn } from '../../../core/descent/baselines/gravityTurn.ts';
import { deriveVehicle } from '../../../core/descent/vehicle.ts';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { parseStudyText, studyToDescent } from '../../../core/study/index.ts';
import type { DescentSetup } from '../../../core/descent/setup.ts';

const demo = studyToDescent(parseStudyText(readFileSync(fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url)), 'utf8')));

// Invented, strongly overpowered test vehicle so no thrust limit is ever reached.
const strong: DescentSetup = {
  planet: { name: 'test', gravity: [0, 0, -1.62], rotationRate: [0, 0, 0] },
  vehicle: { wetMass: 1000, dryMass: 500, isp: 300, engineCount: 1, thrustPerEngine: 20000, cantAngle: 0, throttleMin: 0, throttleMax: 1, pointingLimit: Math.PI },
  constraints: { glideSlope: null, maxSpeed: null, gateHeight: 0, gateDescentRate: 0, minAltitude: null },
  nodes: 30,
  hold: 'foh',
};

describe('polynomial guidance (Klumpp 1974 form)', () => {
  it('unsaturated, flies the quadratic-acceleration polynomial through the target state', () => {
    // Independent derivation: a(t) = a0 + a1 t + a2 t² with r(T) = r_f, v(T) = v_f, a(T) = a_f gives the
    // linear system below; its solution must be what the closed-loop law flies.
    const r0 = [-400, 250, 900];
    const v0 = [20, -5, -30];
    const T = 45;
    const ign = { position: r0 as [number, number, number], velocity: v0 as [number, number, number], mass: 1000 };
    const res = flyPolynomial(strong, ign, [0, 0, 0], T, { step: 0.01, cutoffTime: 0.5 });
    expect(res.saturatedFraction).toBe(0);
    for (let i = 0; i < 3; i++) {
      // [T²/2 T³/6 T⁴/12; T T²/2 T³/3; 1 T T²] (a0 a1 a2)ᵀ = (r_f − r0 − v0 T, v_f − v0, a_f)
      const M = [[T * T / 2, T ** 3 / 6, T ** 4 / 12], [T, T * T / 2, T ** 3 / 3], [1, T, T * T]];
      const rhs = [-r0[i] - v0[i] * T, -v0[i], 0];
      const det = (m: number[][]) => m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0]) + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
      const d = det(M);
      const coef = [0, 1, 2].map((c) => det(M.map((row, k) => row.map((v, j) => (j === c ? rhs[k] : v)))) / d);
      for (const s of res.samples.filter((_, k) => k % 500 === 0)) {
        const t = s.t;
        const expected = r0[i] + v0[i] * t + coef[0] * t * t / 2 + coef[1] * t ** 3 / 6 + coef[2] * t ** 4 / 12;
        expect(Math.abs(s.r[i] - expected)).toBeLessThan(0.05);
      }
    }
    expect(res.miss).toBeLessThan(0.05);
  });

  it('costs at least the convex optimum (same vehicle, same target, no extra constraints)', () => {
    const setup: DescentSetup = { ...demo.setup, constraints: { ...demo.setup.constraints, glideSlope: null, maxSpeed: null } };
    const opt = searchFreeFinalTime(new DescentSolver(setup, landreachConicBackend(), demo.ignition), [0, 0, 0], demo.ignition);
    const poly = polynomialGuidance(setup, demo.ignition, [0, 0, 0]);
    expect(opt.status).toBe('solved');
    expect(poly.miss).toBeLessThan(1);
    expect(poly.propellant).toBeGreaterThan(opt.propellant);
  });
});

describe('gravity turn', () => {
  it('says so when the propellant runs out in the air', () => {
    const setup: DescentSetup = { ...strong, vehicle: { ...strong.vehicle, dryMass: 995 } }; // 5 kg of propellant
    const res = gravityTurn(setup, { position: [0, 0, 3000], velocity: [0, 0, -80], mass: 1000 });
    expect(res.outOfPropellant).toBe(true);
  });

  it('on schedule and vertical, matches the constant-deceleration rocket-equation result', () => {
    // Vertical fall starting on the schedule v = √(v_t² + 2 a_s h): constant deceleration a_s for
    // t_b = (v0 − v_t)/a_s with thrust acceleration a_s + g, so m = m0 exp(−α (a_s + g) t_b)
    // (Tsiolkovsky with a constant thrust acceleration).
    const as = 2;
    const vt = 1;
    const h0 = 1200;
    const v0 = Math.sqrt(vt * vt + 2 * as * h0);
    const res = gravityTurn(strong, { position: [0, 0, h0], velocity: [0, 0, -v0], mass: 1000 }, 0, { deceleration: as, touchdownSpeed: vt, step: 0.01 });
    const { alpha } = deriveVehicle(strong.vehicle);
    const tb = (v0 - vt) / as;
    const expected = 1000 * (1 - Math.exp(-alpha * (as + 1.62) * tb));
    expect(Math.abs(res.propellant - expected) / expected).toBeLessThan(2e-3);
    expect(res.touchdownSpeed).toBeLessThan(vt + 0.2);
    expect(Math.hypot(res.landing[0], res.landing[1])).toBeLessThan(1e-9);
  });

  it('lands the demo vehicle softly, away from the target (no targeting)', () => {
    const res = gravityTurn(demo.setup, demo.ignition);
    expect(res.outOfPropellant).toBe(false);
    expect(res.touchdownSpeed).toBeLessThan(2);
    expect(Math.hypot(res.landing[0], res.landing[1])).toBeGreaterThan(100);
  });
});
