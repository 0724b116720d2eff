import { describe, expect, it } from 'vitest';
import { cscFromDense, cscFromTriplets, cscMulAdd, cscMulTransAdd, cscToDense, cscTranspose } from '../../../core/linalg/csc.ts';
import { matVec, transpose } from '../../support/dense.ts';
import { Rng } from '../../support/random.ts';

describe('CSC matrices', () => {
  it('sums duplicate triplets and sorts rows within columns', () => {
    const M = cscFromTriplets(3, 2, [2, 0, 2, 1], [0, 0, 0, 1], [1, 2, 3, 4]);
    expect(Array.from(M.colPtr)).toEqual([0, 2, 3]);
    expect(Array.from(M.rowIdx)).toEqual([0, 2, 1]);
    expect(Array.from(M.values)).toEqual([2, 4, 4]);
  });

  it('rejects triplets outside the matrix, naming the entry', () => {
    expect(() => cscFromTriplets(2, 2, [2], [0], [1])).toThrow(/triplet 0: row 2 outside 0..1/);
    expect(() => cscFromTriplets(2, 2, [0], [0, 1], [1])).toThrow(/differ in length/);
  });

  it('multiplies like the dense matrix (and its transpose)', () => {
    const rng = new Rng(7);
    const dense = Array.from({ length: 5 }, () => Array.from({ length: 4 }, () => (rng.next() < 0.5 ? 0 : rng.normal())));
    const M = cscFromDense(dense);
    const x = [1, -2, 0.5, 3];
    const y = new Float64Array(5);
    cscMulAdd(M, x, y);
    matVec(dense, x).forEach((v, i) => expect(y[i]).toBeCloseTo(v, 12));
    const w = [1, 2, 3, 4, 5];
    const t = new Float64Array(4);
    cscMulTransAdd(M, w, t);
    matVec(transpose(dense), w).forEach((v, i) => expect(t[i]).toBeCloseTo(v, 12));
    expect(cscToDense(cscTranspose(M))).toEqual(transpose(dense));
  });
});
