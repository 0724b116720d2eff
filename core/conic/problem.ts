/** Validation of problem data and Ruiz equilibration. */
import type { CscMatrix } from '../linalg/csc.ts';
import type { ConicProblem, ConeSpec } from './types.ts';

function checkVector(name: string, v: unknown, length: number): asserts v is Float64Array {
  if (!(v instanceof Float64Array)) throw new TypeError(`invalid ${name}: expected a Float64Array`);
  if (v.length !== length) {
    throw new RangeError(`invalid ${name}: length ${v.length}, expected ${length} (${lengthReason(name)})`);
  }
  for (let i = 0; i < v.length; i++) {
    if (!Number.isFinite(v[i])) throw new RangeError(`invalid ${name}[${i}]: ${v[i]} (must be finite)`);
  }
}

function lengthReason(name: string): string {
  switch (name) {
    case 'c':
      return 'one entry per variable, the columns of A and G';
    case 'b':
      return 'one entry per row of A';
    case 'h':
      return 'one entry per row of G';
    default:
      return 'must match the matrix';
  }
}

function checkMatrix(name: string, M: CscMatrix, rows: number | null, cols: number): void {
  if (!M || !(M.colPtr instanceof Int32Array) || !(M.rowIdx instanceof Int32Array) || !(M.values instanceof Float64Array)) {
    throw new TypeError(`invalid ${name}: expected a CSC matrix {m, n, colPtr: Int32Array, rowIdx: Int32Array, values: Float64Array}`);
  }
  if (M.n !== cols) throw new RangeError(`invalid ${name}: ${M.n} columns, expected ${cols} (one per entry of c)`);
  if (rows !== null && M.m !== rows) throw new RangeError(`invalid ${name}: ${M.m} rows, expected ${rows}`);
  if (M.colPtr.length !== M.n + 1 || M.colPtr[0] !== 0) {
    throw new RangeError(`invalid ${name}.colPtr: must have n + 1 = ${M.n + 1} entries starting at 0`);
  }
  const nnz = M.colPtr[M.n];
  if (M.rowIdx.length < nnz || M.values.length < nnz) {
    throw new RangeError(`invalid ${name}: colPtr announces ${nnz} entries, rowIdx/values hold ${M.rowIdx.length}/${M.values.length}`);
  }
  for (let j = 0; j < M.n; j++) {
    if (M.colPtr[j + 1] < M.colPtr[j]) throw new RangeError(`invalid ${name}.colPtr: decreases at column ${j}`);
    let last = -1;
    for (let p = M.colPtr[j]; p < M.colPtr[j + 1]; p++) {
      const i = M.rowIdx[p];
      if (i <= last || i >= M.m) {
        throw new RangeError(`invalid ${name}: column ${j} row indices must be increasing and below ${M.m} (found ${i})`);
      }
      last = i;
      if (!Number.isFinite(M.values[p])) {
        throw new RangeError(`invalid ${name}: entry (${i}, ${j}) is ${M.values[p]} (must be finite)`);
      }
    }
  }
}

function checkCones(cones: ConeSpec, m: number): void {
  if (!cones || !Number.isInteger(cones.nonnegative) || cones.nonnegative < 0) {
    throw new RangeError(`invalid cones.nonnegative: ${cones?.nonnegative} (must be a non-negative integer)`);
  }
  let total = cones.nonnegative;
  cones.secondOrder.forEach((q, k) => {
    if (!Number.isInteger(q) || q < 1) throw new RangeError(`invalid cones.secondOrder[${k}]: ${q} (must be an integer ≥ 1)`);
    total += q;
  });
  if (total !== m) {
    throw new RangeError(`invalid cones: sizes sum to ${total} but G has ${m} rows (nonnegative + Σ secondOrder must equal rows of G)`);
  }
}

/** Throws a RangeError/TypeError naming the first bad field. */
export function validateProblem(p: ConicProblem): void {
  if (!p || !(p.c instanceof Float64Array)) throw new TypeError('invalid c: expected a Float64Array');
  const n = p.c.length;
  if (n === 0) throw new RangeError('invalid problem: no variables (c is empty)');
  checkVector('c', p.c, n);
  checkMatrix('A', p.A, null, n);
  checkMatrix('G', p.G, null, n);
  checkVector('b', p.b, p.A.m);
  checkVector('h', p.h, p.G.m);
  checkCones(p.cones, p.G.m);
}

/** Diagonal scalings of Ruiz equilibration: Ã = E_A A D, G̃ = E_G G D (E_G constant on each second-order cone). */
export interface Equilibration {
  readonly D: Float64Array;
  readonly E: Float64Array;
  /** Scratch of length n and p + m (allocated here when absent). */
  readonly colMax?: Float64Array;
  readonly rowMax?: Float64Array;
}

/**
 * Ruiz (2001) equilibration of the stacked matrix [A; G] in the ∞-norm, keeping one factor per
 * second-order cone so the cone is preserved. With `continueFrom`, the passes start from the scaling
 * already in `out` instead of from the identity: a problem whose values moved a little since its last
 * equilibration (the next target of a footprint, the next t_f of a search) then needs one or two passes
 * instead of the full count.
 */
export function ruizEquilibrate(
  A: CscMatrix,
  G: CscMatrix,
  cones: ConeSpec,
  iterations: number,
  minScale: number,
  maxScale: number,
  out: Equilibration,
  continueFrom = false,
): void {
  const n = A.n;
  const p = A.m;
  const m = G.m;
  const { D, E } = out;
  if (!continueFrom) {
    D.fill(1);
    E.fill(1);
  }
  const colMax = out.colMax ?? new Float64Array(n);
  const rowMax = out.rowMax ?? new Float64Array(p + m);
  const clamp = (v: number) => (v < minScale ? minScale : v > maxScale ? maxScale : v);
  for (let it = 0; it < iterations; it++) {
    colMax.fill(0);
    rowMax.fill(0);
    for (let j = 0; j < n; j++) {
      for (let q = A.colPtr[j]; q < A.colPtr[j + 1]; q++) {
        const i = A.rowIdx[q];
        const v = Math.abs(A.values[q] * E[i] * D[j]);
        if (v > colMax[j]) colMax[j] = v;
        if (v > rowMax[i]) rowMax[i] = v;
      }
      for (let q = G.colPtr[j]; q < G.colPtr[j + 1]; q++) {
        const i = p + G.rowIdx[q];
        const v = Math.abs(G.values[q] * E[i] * D[j]);
        if (v > colMax[j]) colMax[j] = v;
        if (v > rowMax[i]) rowMax[i] = v;
      }
    }
    // One factor per second-order cone: the largest row norm of the block.
    let off = p + cones.nonnegative;
    for (const q of cones.secondOrder) {
      let mx = 0;
      for (let i = off; i < off + q; i++) if (rowMax[i] > mx) mx = rowMax[i];
      for (let i = off; i < off + q; i++) rowMax[i] = mx;
      off += q;
    }
    let change = 0;
    for (let j = 0; j < n; j++) {
      const f = colMax[j] > 0 ? 1 / Math.sqrt(colMax[j]) : 1;
      D[j] = clamp(D[j] * f);
      change = Math.max(change, Math.abs(1 - colMax[j]));
    }
    for (let i = 0; i < p + m; i++) {
      const f = rowMax[i] > 0 ? 1 / Math.sqrt(rowMax[i]) : 1;
      E[i] = clamp(E[i] * f);
      change = Math.max(change, Math.abs(1 - rowMax[i]));
    }
    if (change < 1e-3) break;
  }
}
