/**
 * End-to-end check of the exact discretisation: the optimal thrust profile (piecewise linear between
 * nodes for FOH) is replayed through the continuous rotating-frame equations of motion
 *   r̈ = u + g − 2ω×ṙ − ω×(ω×r),  ż = −α σ
 * with classical RK4 at 200 sub-steps per interval — written here from the equations, independent of
 * the matrix exponential — and must land where the optimiser says, with the mass it says.
 */
import { describe, expect, it } from 'vitest';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { deriveVehicle } from '../../../core/descent/vehicle.ts';
import { BLACKMORE_2010_CASE_1, marsSetup } from './marsExamples.ts';
import { SCENARIOS } from './scenarios.ts';

const cross = (a: number[], b: number[]) => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];

const cases = [
  { name: 'Blackmore 2010 case 1 (Mars rotation, glide slope)', setup: marsSetup({ glideSlope: true, rotation: true }), ignition: BLACKMORE_2010_CASE_1, target: [0, 0, 0] as [number, number, number] },
  { name: SCENARIOS[0].name, setup: SCENARIOS[0].setup, ignition: SCENARIOS[0].ignition, target: SCENARIOS[0].target },
];

describe('replaying the optimal thrust through the continuous dynamics', () => {
  for (const c of cases) {
    it(c.name, () => {
      const r = searchFreeFinalTime(new DescentSolver(c.setup, landreachConicBackend(), c.ignition), c.target, c.ignition);
      expect(r.status).toBe('solved');
      const s = r.trajectory!.series;
      const N = s.t.length;
      const w = c.setup.planet.rotationRate as unknown as number[];
      const g = c.setup.planet.gravity as unknown as number[];
      const { alpha } = deriveVehicle(c.setup.vehicle);
      // Thrust acceleration u = T/m and σ = ‖u‖ at the nodes (lossless), interpolated linearly (FOH).
      const u = (k: number) => [s.thrustX[k] / s.mass[k], s.thrustY[k] / s.mass[k], s.thrustZ[k] / s.mass[k]];
      const f = (y: number[], uu: number[], sig: number) => {
        const v = y.slice(3, 6);
        const cor = cross(w, v);
        const cen = cross(w, cross(w, y.slice(0, 3)));
        return [v[0], v[1], v[2], ...[0, 1, 2].map((i) => uu[i] + g[i] - 2 * cor[i] - cen[i]), -alpha * sig];
      };
      let y = [s.x[0], s.y[0], s.z[0], s.vx[0], s.vy[0], s.vz[0], Math.log(s.mass[0])];
      const sub = 200;
      let maxPosErr = 0;
      for (let k = 0; k + 1 < N; k++) {
        const dt = s.t[k + 1] - s.t[k];
        const h = dt / sub;
        const u0 = u(k);
        const u1 = u(k + 1);
        const at = (tau: number) => {
          const uu = [0, 1, 2].map((i) => u0[i] + ((u1[i] - u0[i]) * tau) / dt);
          return { uu, sig: Math.hypot(u0[0], u0[1], u0[2]) + ((Math.hypot(u1[0], u1[1], u1[2]) - Math.hypot(u0[0], u0[1], u0[2])) * tau) / dt };
        };
        for (let j = 0; j < sub; j++) {
          const t = j * h;
          const a0 = at(t), a1 = at(t + h / 2), a2 = at(t + h);
          const k1 = f(y, a0.uu, a0.sig);
          const k2 = f(y.map((v, i) => v + (h / 2) * k1[i]), a1.uu, a1.sig);
          const k3 = f(y.map((v, i) => v + (h / 2) * k2[i]), a1.uu, a1.sig);
          const k4 = f(y.map((v, i) => v + h * k3[i]), a2.uu, a2.sig);
          y = y.map((v, i) => v + (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]));
        }
        maxPosErr = Math.max(maxPosErr, Math.hypot(y[0] - s.x[k + 1], y[1] - s.y[k + 1], y[2] - s.z[k + 1]));
      }
      // The FOH model is exact for this control, so only RK4 and solver round-off remain.
      expect(maxPosErr).toBeLessThan(1e-3);
      const gate = [c.target[0], c.target[1], c.target[2] + c.setup.constraints.gateHeight];
      expect(Math.hypot(y[0] - gate[0], y[1] - gate[1], y[2] - gate[2])).toBeLessThan(1e-3);
      expect(Math.hypot(y[3], y[4], y[5] + c.setup.constraints.gateDescentRate)).toBeLessThan(1e-4);
      expect(Math.abs(Math.exp(y[6]) - s.mass[N - 1])).toBeLessThan(1e-4);
    });
  }
});
