/**
 * Agreement with CVXOPT 1.3 (Debian python3-cvxopt, `solvers.conelp`), a general-purpose conic solver used
 * here as the outside reference: on seeded instances whose outcome is known by construction, both solvers
 * must report the same outcome, the optimal values must agree to 1e-6 relative, and our infeasibility
 * certificates must verify against the data.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { solveConic } from '../../../core/conic/index.ts';
import { checkDualInfeasibility, checkOptimality, checkPrimalInfeasibility } from '../../support/conic-checks.ts';
import {
  controlInstance,
  dualInfeasibleInstance,
  feasibleInstance,
  primalInfeasibleInstance,
  type Instance,
} from '../../support/socp-instances.ts';
import { cvxoptAvailable, solveWithCvxopt, type CvxoptResult } from '../cvxopt.ts';

const instances: Instance[] = [];
for (let s = 1; s <= 95; s++) instances.push(feasibleInstance(100 + s, s <= 60 ? 40 : 150));
for (let s = 1; s <= 55; s++) instances.push(primalInfeasibleInstance(300 + s, s <= 35 ? 40 : 120));
for (let s = 1; s <= 50; s++) instances.push(dualInfeasibleInstance(500 + s, s <= 35 ? 40 : 120));
// Block-banded optimal-control instances, ~100 to ~2,000 variables; uMax = 2 < g makes them provably infeasible.
for (const [seed, steps] of [[1, 10], [2, 20], [3, 30], [4, 40], [5, 50], [6, 60], [7, 70], [8, 100], [9, 200]] as const) {
  instances.push(controlInstance(seed, steps));
}
for (const [seed, steps] of [[10, 30], [11, 70], [12, 150]] as const) instances.push(controlInstance(seed, steps, 2));

const CVXOPT_STATUS: Record<Instance['expected'], CvxoptResult['status']> = {
  solved: 'optimal',
  'primal-infeasible': 'primal infeasible',
  'dual-infeasible': 'dual infeasible',
};

let reference: CvxoptResult[] = [];

beforeAll(() => {
  if (!cvxoptAvailable()) return;
  // Tolerances 1e-8 (CVXOPT's own defaults are 1e-7 / 1e-6 / 1e-7) so values can be compared to 1e-6.
  reference = solveWithCvxopt(instances.map((i) => i.problem), { abstol: 1e-8, reltol: 1e-8, feastol: 1e-8 });
}, 300_000);

describe.runIf(cvxoptAvailable())('agreement with CVXOPT conelp', () => {
  it('covers at least 200 instances with a definite reference answer, all three outcomes, up to ~2,000 variables', () => {
    // CVXOPT occasionally stops with 'unknown' (its own iteration or precision limit); such an instance has
    // no reference answer, so it is checked against the data alone and not counted here. At most 2 % may.
    const undecided = reference.filter((r) => r.status === 'unknown').length;
    expect(instances.length - undecided).toBeGreaterThanOrEqual(200);
    expect(undecided).toBeLessThanOrEqual(0.02 * instances.length);
    expect(new Set(instances.map((i) => i.expected)).size).toBe(3);
    expect(Math.max(...instances.map((i) => i.problem.c.length))).toBeGreaterThanOrEqual(2000);
  });

  it.each(instances.map((inst, k) => [inst.name, k] as const))('%s', (_name, k) => {
    const inst = instances[k];
    const ref = reference[k];
    if (ref.status !== 'unknown') {
      expect(ref.status, `CVXOPT on ${inst.name}: ${ref.error ?? ''}`).toBe(CVXOPT_STATUS[inst.expected]);
    }
    const sol = solveConic(inst.problem);
    expect(sol.status).toBe(inst.expected);
    if (inst.expected === 'solved') {
      const refValue = ref.primalObjective as number;
      if (ref.status === 'optimal') expect(Math.abs(sol.info.primalObjective - refValue) / Math.max(1, Math.abs(refValue))).toBeLessThan(1e-6);
      const r = checkOptimality(inst.problem, sol.x, sol.y, sol.z, sol.s);
      expect(Math.max(r.equalityResidual, r.coneResidual, r.dualResidual)).toBeLessThan(1e-7);
      expect(Math.max(r.slackViolation, r.multiplierViolation)).toBeLessThan(1e-9);
      expect(r.relativeGap).toBeLessThan(1e-7);
    } else if (inst.expected === 'primal-infeasible') {
      // Gᵀz + Aᵀy ≈ 0, hᵀz + bᵀy = −1 < 0, z ∈ K*.
      const c = checkPrimalInfeasibility(inst.problem, sol.y, sol.z);
      expect(c.value).toBeCloseTo(-1, 9);
      expect(c.residual).toBeLessThan(1e-7);
      expect(c.coneViolation).toBeLessThan(1e-9);
      expect(sol.info.iterations).toBeLessThan(50);
    } else {
      // Ax ≈ 0, Gx + s ≈ 0 with s ∈ K, cᵀx = −1 < 0.
      const c = checkDualInfeasibility(inst.problem, sol.x, sol.s);
      expect(c.value).toBeCloseTo(-1, 9);
      expect(c.residual).toBeLessThan(1e-7);
      expect(c.coneViolation).toBeLessThan(1e-9);
      expect(sol.info.iterations).toBeLessThan(50);
    }
  });
});
