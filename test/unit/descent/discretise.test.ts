/**
 * Exact discretisation checked against closed forms and an independent numerical integration.
 */
import { describe, expect, it } from 'vitest';
import { expm } from '../../../core/descent/expm.ts';
import { continuousDynamics, discretise } from '../../../core/descent/discretise.ts';
import type { Vec3 } from '../../../core/descent/constants.ts';

describe('expm', () => {
  it('matches Rodrigues’ formula for a rotation generator', () => {
    // exp(θ K) = I + sin θ K + (1 − cos θ) K² for a unit-axis skew matrix K (Rodrigues 1840).
    const axis = [1, 2, 2].map((v) => v / 3);
    const K = [0, -axis[2], axis[1], axis[2], 0, -axis[0], -axis[1], axis[0], 0];
    const theta = 2.3;
    const E = expm(Float64Array.from(K.map((v) => v * theta)), 3);
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        let k2 = 0;
        for (let k = 0; k < 3; k++) k2 += K[i * 3 + k] * K[k * 3 + j];
        const expected = (i === j ? 1 : 0) + Math.sin(theta) * K[i * 3 + j] + (1 - Math.cos(theta)) * k2;
        expect(E[i * 3 + j]).toBeCloseTo(expected, 13);
      }
    }
  });
  it('handles a large norm by scaling and squaring (scalar exp)', () => {
    expect(expm(Float64Array.of(12.5), 1)[0] / Math.exp(12.5)).toBeCloseTo(1, 12);
    expect(() => expm(Float64Array.of(NaN), 1)).toThrow(/finite/);
  });
});

describe('discretise', () => {
  it('gives the double-integrator closed form without rotation (FOH: Δt²/3 and Δt²/6)', () => {
    const dt = 1.7;
    const d = discretise([0, 0, 0], [0, 0, -3], dt, 'foh');
    for (let i = 0; i < 3; i++) {
      expect(d.phi[i * 6 + 3 + i]).toBeCloseTo(dt, 14);
      expect(d.uNow[i * 3 + i]).toBeCloseTo((dt * dt) / 3, 14);
      expect(d.uNext[i * 3 + i]).toBeCloseTo((dt * dt) / 6, 14);
      expect(d.uNow[(3 + i) * 3 + i]).toBeCloseTo(dt / 2, 14);
      expect(d.uNext[(3 + i) * 3 + i]).toBeCloseTo(dt / 2, 14);
    }
    expect(d.gravityTerm[2]).toBeCloseTo((-3 * dt * dt) / 2, 13);
    expect(d.gravityTerm[5]).toBeCloseTo(-3 * dt, 13);
    const z = discretise([0, 0, 0], [0, 0, -3], dt, 'zoh');
    expect(z.uNow[0]).toBeCloseTo((dt * dt) / 2, 14);
    expect(z.uNext.every((v) => v === 0)).toBe(true);
  });

  it('matches RK4 integration of the rotating-frame dynamics with a linearly varying control', () => {
    const omega: Vec3 = [3e-3, -2e-3, 5e-3]; // exaggerated rotation so the terms are visible
    const g: Vec3 = [0.1, 0, -1.62];
    const dt = 4;
    const x0 = [100, -50, 800, 5, 2, -20];
    const u0 = [0.3, -0.1, 2.0];
    const u1 = [-0.2, 0.4, 1.5];
    const A = continuousDynamics(omega);
    const f = (t: number, x: number[]) => {
      const u = u0.map((v, i) => v + ((u1[i] - v) * t) / dt);
      return x.map((_, i) => {
        let s = 0;
        for (let j = 0; j < 6; j++) s += A[i * 6 + j] * x[j];
        return s + (i >= 3 ? u[i - 3] + g[i - 3] : 0);
      });
    };
    let x = x0.slice();
    const steps = 4000;
    const h = dt / steps;
    for (let s = 0; s < steps; s++) {
      const t = s * h;
      const k1 = f(t, x);
      const k2 = f(t + h / 2, x.map((v, i) => v + (h / 2) * k1[i]));
      const k3 = f(t + h / 2, x.map((v, i) => v + (h / 2) * k2[i]));
      const k4 = f(t + h, x.map((v, i) => v + h * k3[i]));
      x = x.map((v, i) => v + (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]));
    }
    const d = discretise(omega, g, dt, 'foh');
    for (let i = 0; i < 6; i++) {
      let v = d.gravityTerm[i];
      for (let j = 0; j < 6; j++) v += d.phi[i * 6 + j] * x0[j];
      for (let j = 0; j < 3; j++) v += d.uNow[i * 3 + j] * u0[j] + d.uNext[i * 3 + j] * u1[j];
      expect(v).toBeCloseTo(x[i], 8);
    }
  });
  it('rejects a bad step', () => {
    expect(() => discretise([0, 0, 0], [0, 0, -1], 0, 'foh')).toThrow(/time step 0/);
  });
});
