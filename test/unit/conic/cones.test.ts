import { describe, expect, it } from 'vitest';
import { NonnegativeCone } from '../../../core/conic/cones/nonnegative.ts';
import { SecondOrderCone } from '../../../core/conic/cones/secondOrder.ts';
import type { Cone } from '../../../core/conic/cones/cone.ts';
import { Rng } from '../../support/random.ts';

function interior(rng: Rng, q: number): Float64Array {
  const v = Float64Array.from({ length: q }, () => rng.normal());
  let nrm = 0;
  for (let i = 1; i < q; i++) nrm += v[i] * v[i];
  v[0] = Math.sqrt(nrm) + rng.uniform(0.05, 2);
  return v;
}

function denseBlock(cone: Cone): number[][] {
  const q = cone.dim;
  const pattern = cone.blockPattern();
  const vals = new Float64Array(pattern.length);
  cone.writeKktBlock(vals, Int32Array.from(pattern, (_, k) => k), 0);
  const M = Array.from({ length: q }, () => new Array<number>(q).fill(0));
  pattern.forEach(([i, j], k) => {
    M[i][j] = -vals[k];
    M[j][i] = -vals[k];
  });
  return M;
}

describe('second-order cone (Nesterov–Todd scaling)', () => {
  const rng = new Rng(42);
  for (const q of [1, 2, 3, 4, 7]) {
    it(`dimension ${q}: W z = W⁻¹ s = λ, W² block equals W·W, Jordan division inverts the product`, () => {
      for (let trial = 0; trial < 20; trial++) {
        const s = interior(rng, q);
        const z = interior(rng, q);
        const cone = new SecondOrderCone(0, q);
        const lambda = new Float64Array(q);
        expect(cone.updateScaling(s, z, lambda)).toBe(true);
        const wz = new Float64Array(q);
        const winvS = new Float64Array(q);
        cone.mulW(z, wz);
        cone.mulWinv(s, winvS);
        for (let i = 0; i < q; i++) {
          expect(wz[i]).toBeCloseTo(lambda[i], 10);
          expect(winvS[i]).toBeCloseTo(lambda[i], 10);
        }
        // W W⁻¹ v = v
        const v = Float64Array.from({ length: q }, () => rng.normal());
        const t1 = new Float64Array(q);
        const t2 = new Float64Array(q);
        cone.mulWinv(v, t1);
        cone.mulW(t1, t2);
        for (let i = 0; i < q; i++) expect(t2[i]).toBeCloseTo(v[i], 10);
        // W² block against applying W twice to unit vectors.
        const W2 = denseBlock(cone);
        for (let j = 0; j < q; j++) {
          const e = new Float64Array(q);
          e[j] = 1;
          cone.mulW(e, t1);
          cone.mulW(t1, t2);
          for (let i = 0; i < q; i++) expect(W2[i][j]).toBeCloseTo(t2[i], 9);
        }
        // λ ∘ (λ \ v) = v
        cone.jordanDivide(lambda, v, t1);
        cone.jordanProduct(lambda, t1, t2);
        for (let i = 0; i < q; i++) expect(t2[i]).toBeCloseTo(v[i], 9);
      }
    });
  }

  it('step length lands exactly on the boundary', () => {
    for (let trial = 0; trial < 50; trial++) {
      const q = rng.int(1, 6);
      const cone = new SecondOrderCone(0, q);
      const x = interior(rng, q);
      const d = Float64Array.from({ length: q }, () => rng.normal() * 3);
      const a = cone.stepLength(x, d);
      if (!Number.isFinite(a)) {
        // d itself must then be a direction of the cone: x + αd stays inside for a huge α.
        const far = x.map((v, i) => v + 1e6 * d[i]);
        expect(cone.violation(far)).toBeLessThanOrEqual(1e-6 * 1e6);
        continue;
      }
      const at = x.map((v, i) => v + a * d[i]);
      expect(Math.abs(cone.violation(at))).toBeLessThan(1e-9 * (1 + Math.abs(at[0])));
      const before = x.map((v, i) => v + 0.999 * a * d[i]);
      expect(cone.violation(before)).toBeLessThan(0);
    }
  });

  it('rejects points outside the cone for scaling', () => {
    const cone = new SecondOrderCone(0, 3);
    expect(cone.updateScaling(Float64Array.from([1, 1, 1]), Float64Array.from([2, 0, 0]), new Float64Array(3))).toBe(false);
  });
});

describe('non-negative orthant', () => {
  it('scales with w = √(s/z) and steps to the nearest blocking coordinate', () => {
    const cone = new NonnegativeCone(1, 3);
    const s = Float64Array.from([9, 4, 1, 9]);
    const z = Float64Array.from([9, 1, 4, 1]);
    const lambda = new Float64Array(4);
    expect(cone.updateScaling(s, z, lambda)).toBe(true);
    expect(Array.from(lambda.subarray(1))).toEqual([2, 2, 3]);
    const out = new Float64Array(4);
    cone.mulW(z, out);
    expect(Array.from(out.subarray(1))).toEqual([2, 2, 3]);
    expect(cone.stepLength(Float64Array.from([0, 1, 2, 3]), Float64Array.from([-100, -1, 1, -6]))).toBe(0.5);
    expect(cone.violation(Float64Array.from([-100, 1, -2, 3]))).toBe(2);
  });
});
