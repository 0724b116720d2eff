/**
 * Problems whose optimum is known in closed form; each derivation is given beside its test.
 */
import { describe, expect, it } from 'vitest';
import { ConicWorkspace, solveConic } from '../../../core/conic/index.ts';
import { cscEmpty, cscFromDense } from '../../../core/linalg/csc.ts';
import { denseSolve, matMul, matVec, norm2, transpose } from '../../support/dense.ts';
import { Rng } from '../../support/random.ts';

const f64 = (v: number[]) => Float64Array.from(v);

/** min t s.t. ‖x − a‖ ≤ t, x ∈ Q³: the distance from a to the cone. Variables (x0, x1, x2, t). */
function projectionProblem(a: number[]) {
  const G = cscFromDense([
    [0, 0, 0, -1],
    [-1, 0, 0, 0],
    [0, -1, 0, 0],
    [0, 0, -1, 0],
    [-1, 0, 0, 0],
    [0, -1, 0, 0],
    [0, 0, -1, 0],
  ]);
  return {
    c: f64([0, 0, 0, 1]),
    A: cscEmpty(0, 4),
    b: f64([]),
    G,
    h: f64([0, -a[0], -a[1], -a[2], 0, 0, 0]),
    cones: { nonnegative: 0, secondOrder: [4, 3] },
  };
}

/** Projection onto Q (e.g. Boyd & Vandenberghe 2004, Convex Optimization, exercise 8.3(c)). */
function projectOntoCone(a: number[]): number[] {
  const t = a[0];
  const u = Math.hypot(a[1], a[2]);
  if (u <= t) return a;
  if (u <= -t) return [0, 0, 0];
  const k = (t + u) / 2;
  return [k, (k * a[1]) / u, (k * a[2]) / u];
}

describe('closed-form optima', () => {
  it('distance to the second-order cone (three regimes: inside, polar side, general)', () => {
    for (const a of [
      [3, 1, 2],
      [-3, 1, 1],
      [1, 3, -4],
      [0, 2, 0],
      [-0.5, 0.3, 1.7],
    ]) {
      const sol = solveConic(projectionProblem(a));
      expect(sol.status).toBe('solved');
      const p = projectOntoCone(a);
      const dist = Math.hypot(a[0] - p[0], a[1] - p[1], a[2] - p[2]);
      expect(sol.info.primalObjective).toBeCloseTo(dist, 7);
      // The objective is quadratically flat at its minimiser (a distance), so a point within ε of the optimal
      // value is only within about √ε of the minimiser: the point is checked at tightened tolerances.
      const tight = solveConic(projectionProblem(a), { gapAbsoluteTolerance: 1e-12, gapRelativeTolerance: 1e-12, feasibilityTolerance: 1e-11 });
      expect(tight.status).toBe('solved');
      for (let i = 0; i < 3; i++) expect(Math.abs(tight.x[i] - p[i])).toBeLessThan(1e-5);
    }
  });

  it('minimum-norm point of an affine set: x* = Aᵀ(AAᵀ)⁻¹b, ‖x*‖ = √(bᵀ(AAᵀ)⁻¹b)', () => {
    const rng = new Rng(9);
    for (let trial = 0; trial < 10; trial++) {
      const n = rng.int(3, 9);
      const p = rng.int(1, n - 1);
      const Ad = Array.from({ length: p }, () => Array.from({ length: n }, () => rng.normal()));
      const b = Array.from({ length: p }, () => rng.normal());
      // Variables (x, t): Ax = b; (t, x) ∈ Q^{n+1}.
      const A = cscFromDense(Ad.map((row) => [...row, 0]));
      const G = cscFromDense(Array.from({ length: n + 1 }, (_, i) => Array.from({ length: n + 1 }, (_, j) => (i === 0 ? (j === n ? -1 : 0) : j === i - 1 ? -1 : 0))));
      const c = new Float64Array(n + 1);
      c[n] = 1;
      const sol = solveConic({ c, A, b: f64(b), G, h: new Float64Array(n + 1), cones: { nonnegative: 0, secondOrder: [n + 1] } });
      expect(sol.status).toBe('solved');
      const w = denseSolve(matMul(Ad, transpose(Ad)), b);
      const xStar = matVec(transpose(Ad), w);
      expect(sol.info.primalObjective).toBeCloseTo(norm2(xStar), 7);
      xStar.forEach((v, i) => expect(sol.x[i]).toBeCloseTo(v, 6));
    }
  });

  it('linear cost over the unit ball: min cᵀx s.t. ‖x‖ ≤ 1 is −‖c‖ at x = −c/‖c‖ (Cauchy–Schwarz)', () => {
    const c = [3, -4, 12];
    const G = cscFromDense([
      [0, 0, 0],
      [-1, 0, 0],
      [0, -1, 0],
      [0, 0, -1],
    ]);
    const sol = solveConic({ c: f64(c), A: cscEmpty(0, 3), b: f64([]), G, h: f64([1, 0, 0, 0]), cones: { nonnegative: 0, secondOrder: [4] } });
    expect(sol.status).toBe('solved');
    expect(sol.info.primalObjective).toBeCloseTo(-13, 8);
    c.forEach((ci, i) => expect(sol.x[i]).toBeCloseTo(-ci / 13, 7));
  });

  it('linear cost over the simplex: min cᵀx s.t. Σx = 1, x ≥ 0 is min cᵢ', () => {
    const c = [4, 2.5, 7, 3, 9];
    const n = c.length;
    const G = cscFromDense(Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? -1 : 0))));
    const sol = solveConic({ c: f64(c), A: cscFromDense([c.map(() => 1)]), b: f64([1]), G, h: new Float64Array(n), cones: { nonnegative: n, secondOrder: [] } });
    expect(sol.status).toBe('solved');
    expect(sol.info.primalObjective).toBeCloseTo(2.5, 8);
    expect(sol.x[1]).toBeCloseTo(1, 7);
  });

  it('certifies primal infeasibility: x ≥ 0 with Σx = −1 (Farkas: y = 1, z = 1 shows it)', () => {
    const n = 4;
    const G = cscFromDense(Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? -1 : 0))));
    const A = cscFromDense([[1, 1, 1, 1]]);
    const sol = solveConic({ c: f64([1, 2, 3, 4]), A, b: f64([-1]), G, h: new Float64Array(n), cones: { nonnegative: n, secondOrder: [] } });
    expect(sol.status).toBe('primal-infeasible');
    // Certificate: Aᵀy + Gᵀz = 0, bᵀy + hᵀz = −1, z ≥ 0.
    expect(-sol.y[0]).toBeCloseTo(-1, 8);
    for (let j = 0; j < n; j++) {
      expect(sol.y[0] - sol.z[j]).toBeCloseTo(0, 8);
      expect(sol.z[j]).toBeGreaterThanOrEqual(-1e-12);
    }
  });

  it('certifies unboundedness: min −x₁ − x₂ s.t. x₁ − x₂ = 0, x ≥ 0 (direction (1, 1))', () => {
    const G = cscFromDense([
      [-1, 0],
      [0, -1],
    ]);
    const sol = solveConic({ c: f64([-1, -1]), A: cscFromDense([[1, -1]]), b: f64([0]), G, h: f64([0, 0]), cones: { nonnegative: 2, secondOrder: [] } });
    expect(sol.status).toBe('dual-infeasible');
    expect(sol.x[0]).toBeCloseTo(0.5, 8);
    expect(sol.x[1]).toBeCloseTo(0.5, 8);
  });

  it('re-solves new data on the same pattern without a new analysis, matching a fresh solve', () => {
    const ws = new ConicWorkspace(projectionProblem([1, 3, -4]));
    const first = ws.solve();
    ws.update({ h: projectionProblem([3, 1, 2]).h });
    const inside = ws.solve();
    expect(inside.info.primalObjective).toBeCloseTo(0, 7);
    ws.update({ h: projectionProblem([1, 3, -4]).h });
    const again = ws.solve();
    expect(again.info.primalObjective).toBeCloseTo(first.info.primalObjective, 10);
    expect(again.info.iterations).toBe(first.info.iterations);
  });
});

describe('warm start', () => {
  it('from a neighbouring optimum reaches the same optimum as a cold start', () => {
    const ws = new ConicWorkspace(projectionProblem([1, 3, -4]));
    const near = ws.solve();
    ws.update({ h: projectionProblem([1.1, 2.9, -4.1]).h });
    const cold = ws.solve();
    const warm = ws.solve({ x: near.x, y: near.y, z: near.z, s: near.s });
    expect(warm.status).toBe('solved');
    expect(warm.info.primalObjective).toBeCloseTo(cold.info.primalObjective, 7);
  });

  it('skips the cold start only when the start is complete, with the same optimum either way', () => {
    const ws = new ConicWorkspace(projectionProblem([1, 3, -4]));
    const near = ws.solve();
    ws.update({ h: projectionProblem([1.2, 2.7, -4.3]).h });
    const cold = ws.solve();
    const complete = ws.solve({ x: near.x, y: near.y, z: near.z, s: near.s });
    const partial = ws.solve({ x: near.x, s: near.s });
    // One factorisation per step, plus the cold start's own when any part of the point is missing.
    expect(complete.info.factorisations).toBe(complete.info.iterations);
    expect(partial.info.factorisations).toBe(partial.info.iterations + 1);
    expect(cold.info.factorisations).toBe(cold.info.iterations + 1);
    for (const r of [complete, partial]) {
      expect(r.status).toBe('solved');
      expect(r.info.primalObjective).toBeCloseTo(cold.info.primalObjective, 7);
    }
  });

  it('rejects a start of the wrong size, naming the part', () => {
    const ws = new ConicWorkspace(projectionProblem([1, 3, -4]));
    expect(() => ws.solve({ x: new Float64Array(2) })).toThrow(/invalid start.x: expected a finite Float64Array of length 4/);
  });
});
