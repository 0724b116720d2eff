/**
 * Property tests (fast-check) over seeded random instances whose outcome is known by construction
 * (test/support/socp-instances.ts): every answer is checked against the data, not against the solver.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ConicWorkspace, solveConic } from '../../../core/conic/index.ts';
import { checkDualInfeasibility, checkOptimality, checkPrimalInfeasibility } from '../../support/conic-checks.ts';
import { dualInfeasibleInstance, feasibleInstance, primalInfeasibleInstance } from '../../support/socp-instances.ts';

const seed = fc.integer({ min: 1, max: 2 ** 31 - 1 });

describe('solver properties', () => {
  it('feasible instances: the point satisfies the constraints and the gap closes', () => {
    fc.assert(
      fc.property(seed, (s) => {
        const { problem } = feasibleInstance(s, 30);
        const sol = solveConic(problem);
        expect(sol.status).toBe('solved');
        const r = checkOptimality(problem, sol.x, sol.y, sol.z, sol.s);
        expect(r.equalityResidual).toBeLessThan(1e-7);
        expect(r.coneResidual).toBeLessThan(1e-7);
        expect(r.dualResidual).toBeLessThan(1e-7);
        expect(r.slackViolation).toBeLessThan(1e-9);
        expect(r.multiplierViolation).toBeLessThan(1e-9);
        expect(r.relativeGap).toBeLessThan(1e-7);
      }),
      { numRuns: 60, seed: 20261201 },
    );
  });

  it('primal-infeasible instances: the returned (y, z) is a valid Farkas certificate', () => {
    fc.assert(
      fc.property(seed, (s) => {
        const { problem } = primalInfeasibleInstance(s, 30);
        const sol = solveConic(problem);
        expect(sol.status).toBe('primal-infeasible');
        const c = checkPrimalInfeasibility(problem, sol.y, sol.z);
        expect(c.value).toBeCloseTo(-1, 9);
        expect(c.residual).toBeLessThan(1e-7);
        expect(c.coneViolation).toBeLessThan(1e-9);
      }),
      { numRuns: 40, seed: 7 },
    );
  });

  it('dual-infeasible instances: the returned x is a valid recession direction', () => {
    fc.assert(
      fc.property(seed, (s) => {
        const { problem } = dualInfeasibleInstance(s, 30);
        const sol = solveConic(problem);
        expect(sol.status).toBe('dual-infeasible');
        const c = checkDualInfeasibility(problem, sol.x, sol.s);
        expect(c.value).toBeCloseTo(-1, 9);
        expect(c.residual).toBeLessThan(1e-7);
        expect(c.coneViolation).toBeLessThan(1e-9);
      }),
      { numRuns: 40, seed: 11 },
    );
  });

  it('a workspace re-solved with another instance of the same pattern gives the fresh answer', () => {
    fc.assert(
      fc.property(seed, fc.double({ min: 0.5, max: 2, noNaN: true }), (s, factor) => {
        const { problem } = feasibleInstance(s, 25);
        const ws = new ConicWorkspace(problem);
        ws.solve();
        // Same pattern, new values: scale A, G and move b, h, c consistently with a new feasible point.
        const scaled = {
          ...problem,
          A: { ...problem.A, values: problem.A.values.map((v) => v * factor) },
          G: { ...problem.G, values: problem.G.values.map((v) => v * factor) },
          b: problem.b.map((v) => v * factor),
          h: problem.h.map((v) => v * factor),
        };
        ws.update({ AValues: scaled.A.values, GValues: scaled.G.values, b: scaled.b, h: scaled.h });
        const reused = ws.solve();
        const fresh = solveConic(scaled);
        expect(reused.status).toBe(fresh.status);
        expect(reused.info.primalObjective).toBeCloseTo(fresh.info.primalObjective, 7);
      }),
      { numRuns: 25, seed: 3 },
    );
  });
});
