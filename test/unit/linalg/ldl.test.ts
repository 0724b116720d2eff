import { describe, expect, it } from 'vitest';
import { cscFromTriplets, type CscMatrix } from '../../../core/linalg/csc.ts';
import { LdlFactor, ldlSymbolic, symmetricUpperMul } from '../../../core/linalg/ldl.ts';
import { invertPermutation, minimumDegreeOrdering } from '../../../core/linalg/ordering.ts';
import { denseSolve, quasiDefinite } from '../../support/dense.ts';
import { Rng } from '../../support/random.ts';

/** Random quasi-definite matrix (test/support/dense.ts), as dense and as upper CSC. */
function quasiDefiniteWithUpper(rng: Rng, n1: number, n2: number, density: number) {
  const M = quasiDefinite(rng, n1, n2, density);
  return { M, U: upper(M) };
}

function upper(M: number[][]): CscMatrix {
  const r: number[] = [];
  const c: number[] = [];
  const v: number[] = [];
  M.forEach((row, i) =>
    row.forEach((x, j) => {
      if (i <= j && (x !== 0 || i === j)) {
        r.push(i);
        c.push(j);
        v.push(x);
      }
    }),
  );
  return cscFromTriplets(M.length, M.length, r, c, v);
}

function permuteSymmetric(M: number[][], perm: Int32Array): number[][] {
  return Array.from(perm, (pi) => Array.from(perm, (pj) => M[pi][pj]));
}

describe('sparse LDLᵀ', () => {
  it('solves quasi-definite systems like dense Gaussian elimination', () => {
    const rng = new Rng(11);
    for (let trial = 0; trial < 20; trial++) {
      const { M } = quasiDefiniteWithUpper(rng, rng.int(2, 15), rng.int(1, 10), 0.3);
      const perm = minimumDegreeOrdering(upper(M));
      const P = permuteSymmetric(M, perm);
      const U = upper(P);
      const f = new LdlFactor(ldlSymbolic(U));
      expect(f.refactor(U, null, 0, 0)).toBe(true);
      const b = P.map(() => rng.normal());
      const x = Float64Array.from(b);
      f.solveInPlace(x);
      const ref = denseSolve(P, b);
      ref.forEach((v, i) => expect(x[i]).toBeCloseTo(v, 9));
      // and the symmetric product of the upper triangle reproduces b
      const y = new Float64Array(x.length);
      symmetricUpperMul(U, x, y);
      b.forEach((v, i) => expect(y[i]).toBeCloseTo(v, 9));
    }
  });

  it('refactors new values on the same pattern without new analysis', () => {
    const rng = new Rng(3);
    const { M, U } = quasiDefiniteWithUpper(rng, 8, 5, 0.4);
    const f = new LdlFactor(ldlSymbolic(U));
    f.refactor(U, null, 0, 0);
    const scaled = { ...U, values: U.values.map((v) => 2 * v) };
    f.refactor(scaled, null, 0, 0);
    const b = M.map(() => 1);
    const x = Float64Array.from(b);
    f.solveInPlace(x);
    denseSolve(M.map((r) => r.map((v) => 2 * v)), b).forEach((v, i) => expect(x[i]).toBeCloseTo(v, 9));
  });

  it('applies dynamic regularisation to pivots of the wrong sign', () => {
    // [[1, 1], [1, 1]] is singular; with expected signs (+, −) the second pivot 0 is replaced by −δ.
    const U = cscFromTriplets(2, 2, [0, 0, 1], [0, 1, 1], [1, 1, 1]);
    const f = new LdlFactor(ldlSymbolic(U));
    expect(f.refactor(U, Int8Array.from([1, -1]), 1e-13, 1e-7)).toBe(true);
    expect(f.regularisedPivots).toBe(1);
    expect(f.D[1]).toBe(-1e-7);
    expect(f.refactor(U, null, 0, 0)).toBe(false);
  });

  it('rejects entries below the diagonal and missing diagonals', () => {
    expect(() => ldlSymbolic(cscFromTriplets(2, 2, [1, 0], [0, 1], [1, 1]))).toThrow(/upper triangular/);
    expect(() => ldlSymbolic(cscFromTriplets(2, 2, [0], [1], [1]))).toThrow(/no diagonal/);
  });
});

describe('minimum-degree ordering', () => {
  it('returns a permutation', () => {
    const rng = new Rng(5);
    const { U } = quasiDefiniteWithUpper(rng, 30, 20, 0.1);
    const perm = minimumDegreeOrdering(U);
    expect(Array.from(perm).sort((a, b) => a - b)).toEqual(Array.from({ length: 50 }, (_, i) => i));
    const pinv = invertPermutation(perm);
    perm.forEach((p, k) => expect(pinv[p]).toBe(k));
  });

  it('avoids the fill of an arrow matrix eliminated hub first', () => {
    // Arrow: node 0 joined to all others. Natural order fills the whole factor (n(n−1)/2 entries);
    // any order that leaves the hub last has no fill at all (n − 1 entries) — a textbook case
    // (George & Liu 1981, §1.2).
    const n = 40;
    const r = [0];
    const c = [0];
    for (let j = 1; j < n; j++) {
      r.push(0, j);
      c.push(j, j);
    }
    const U = cscFromTriplets(n, n, r, c, r.map(() => 1));
    expect(ldlSymbolic(U).nnzL).toBe((n * (n - 1)) / 2);
    const perm = minimumDegreeOrdering(U);
    const pinv = invertPermutation(perm);
    const rp = r.map((_, k) => Math.min(pinv[r[k]], pinv[c[k]]));
    const cp = r.map((_, k) => Math.max(pinv[r[k]], pinv[c[k]]));
    expect(ldlSymbolic(cscFromTriplets(n, n, rp, cp, rp.map(() => 1))).nnzL).toBe(n - 1);
  });

  it('keeps the fill of a 2-D grid Laplacian well below the natural (banded) order', () => {
    // 5-point Laplacian on a k × k grid: natural order has bandwidth k and about k³ fill entries;
    // minimum degree gives O(k² log k) (George & Liu 1981, ch. 8). Checked as a ratio, not a fixed count.
    const k = 20;
    const r: number[] = [];
    const c: number[] = [];
    const id = (i: number, j: number) => i * k + j;
    for (let i = 0; i < k; i++) {
      for (let j = 0; j < k; j++) {
        r.push(id(i, j));
        c.push(id(i, j));
        if (j + 1 < k) {
          r.push(id(i, j));
          c.push(id(i, j + 1));
        }
        if (i + 1 < k) {
          r.push(id(i, j));
          c.push(id(i + 1, j));
        }
      }
    }
    const natural = ldlSymbolic(cscFromTriplets(k * k, k * k, r, c, r.map(() => 1))).nnzL;
    const pinv = invertPermutation(minimumDegreeOrdering(cscFromTriplets(k * k, k * k, r, c, r.map(() => 1))));
    const rp = r.map((_, t) => Math.min(pinv[r[t]], pinv[c[t]]));
    const cp = r.map((_, t) => Math.max(pinv[r[t]], pinv[c[t]]));
    const ordered = ldlSymbolic(cscFromTriplets(k * k, k * k, rp, cp, rp.map(() => 1))).nnzL;
    expect(ordered).toBeLessThan(0.6 * natural);
  });
});
