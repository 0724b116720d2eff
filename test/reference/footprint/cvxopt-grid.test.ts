/**
 * The footprint against CVXOPT 1.3 (Debian python3-cvxopt, conelp) on an 11 × 11 grid of one of our own
 * scenarios (the invented demo lander with less propellant, so the grid holds reachable and unreachable
 * targets). For every target the cone program at the footprint's time of flight is re-solved by CVXOPT:
 * - reachable targets: CVXOPT finds the same minimum propellant, to 1e-4 relative;
 * - unreachable targets: CVXOPT finds the minimum-propellant problem infeasible at the closest-approach time
 *   of flight, and the same minimum landing error (to 1 % or 1 m).
 * (The time-of-flight search itself is checked against the bracketing search in test/unit/descent.)
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { footprintInProcess, lowPropellantDemo } from '../../support/scenarios.ts';
import { NODE, DescentProgram, chooseScales } from '../../../core/descent/program.ts';
import { TARGET, type FootprintField } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { cvxoptAvailable, solveWithCvxopt } from '../cvxopt.ts';
import { CVXOPT_DESCENT_OPTIONS } from '../descent/cvxoptBackend.ts';

const { ctx } = lowPropellantDemo();
let field: FootprintField;

beforeAll(async () => {
  if (!cvxoptAvailable()) return;
  const grid = makeTargetGrid({ halfWidthEast_m: 2500, halfWidthNorth_m: 2500, nx: 11, ny: 11 });
  field = await footprintInProcess(grid, ctx);
}, 600_000);

describe.runIf(cvxoptAvailable())('footprint agrees with CVXOPT on an 11 × 11 grid', () => {
  it('has both reachable and unreachable targets and no failures', () => {
    const codes = Array.from(field.status);
    expect(codes.filter((c) => c === TARGET.reachable).length).toBeGreaterThan(10);
    expect(codes.filter((c) => c === TARGET.unreachable).length).toBeGreaterThan(10);
    expect(codes.filter((c) => c === TARGET.failed || c === TARGET.pending).length).toBe(0);
  });

  it('same reachable set and the same propellant (1e-4) / landing error (1 %) target by target', () => {
    const scales = chooseScales(ctx.setup, Math.hypot(...ctx.ignition.position));
    const N = ctx.setup.nodes;
    const jobs: { k: number; kind: 'min-propellant' | 'min-landing-error'; program: DescentProgram; target: [number, number, number] }[] = [];
    for (let j = 0; j < field.ny; j++) {
      for (let i = 0; i < field.nx; i++) {
        const k = j * field.nx + i;
        const target: [number, number, number] = [field.east[i], field.north[j], 0];
        const data = { timeOfFlight: field.timeOfFlight_s[k], target, ignition: ctx.ignition };
        jobs.push({ k, kind: 'min-propellant', program: new DescentProgram(ctx.setup, 'min-propellant', data, scales), target });
        if (field.status[k] === TARGET.unreachable) {
          jobs.push({ k, kind: 'min-landing-error', program: new DescentProgram(ctx.setup, 'min-landing-error', data, scales), target });
        }
      }
    }
    const results = solveWithCvxopt(jobs.map((q) => q.program.problem), CVXOPT_DESCENT_OPTIONS);
    let compared = 0;
    jobs.forEach((q, idx) => {
      const r = results[idx];
      const reachable = field.status[q.k] === TARGET.reachable;
      if (q.kind === 'min-propellant') {
        if (reachable) {
          expect(r.status, `target ${q.target}`).toBe('optimal');
          const zf = q.program.value(r.x!, (N - 1) * NODE.size + NODE.z);
          const cvx = ctx.ignition.mass - Math.exp(zf);
          expect(Math.abs(cvx - field.propellant_kg[q.k]) / cvx, `target ${q.target}`).toBeLessThan(1e-4);
          compared++;
        } else {
          expect(r.status, `target ${q.target}`).toBe('primal infeasible');
        }
      } else {
        expect(r.status).toBe('optimal');
        const o = (N - 1) * NODE.size + NODE.r;
        const miss = Math.hypot(q.program.value(r.x!, o) - q.target[0], q.program.value(r.x!, o + 1) - q.target[1]);
        expect(Math.abs(miss - field.miss_m[q.k])).toBeLessThan(Math.max(1, 0.01 * miss));
        compared++;
      }
    });
    expect(compared).toBe(121);
  });
});
