/**
 * Sparse LDLᵀ factorisation of symmetric quasi-definite matrices, split into a symbolic phase
 * (elimination tree and column counts, once per pattern) and a numeric phase (per iteration, no allocation).
 *
 * The numeric phase is the up-looking row-by-row algorithm of QDLDL (Stellato et al., OSQP, 2020) on the
 * upper triangle; quasi-definite matrices factor stably under any symmetric permutation
 * (Vanderbei 1995, SIAM J. Optim. 5(1)), so the ordering is chosen for fill alone.
 */
import type { CscMatrix } from './csc.ts';

const UNKNOWN = -1;

export interface LdlSymbolic {
  readonly n: number;
  readonly etree: Int32Array;
  /** Column pointers of L (strictly lower part). */
  readonly Lp: Int32Array;
  /** Row indices of L by column (fixed by the pattern, so computed here once). */
  readonly Li: Int32Array;
  /**
   * L by rows: row k holds the entries Rp[k] … Rp[k+1]−1, at columns Ri (ascending, which is a
   * topological order of the elimination tree) and stored at positions Rpos of the column-wise arrays.
   */
  readonly Rp: Int32Array;
  readonly Ri: Int32Array;
  readonly Rpos: Int32Array;
  /** Number of stored entries of L. */
  readonly nnzL: number;
}

/**
 * Elimination tree, column counts and the full pattern of L (by columns and by rows) for an
 * upper-triangular CSC pattern (entries with row ≤ column; every column must hold its diagonal entry).
 * The row patterns are the reach of each row's entries in the elimination tree (Liu 1986); computing them
 * once here leaves the numeric phase with no tree walks and no markers.
 */
export function ldlSymbolic(U: CscMatrix): LdlSymbolic {
  const n = U.n;
  if (U.m !== n) throw new RangeError(`LDLᵀ needs a square matrix, got ${U.m} × ${n}`);
  const etree = new Int32Array(n).fill(UNKNOWN);
  const Lnz = new Int32Array(n);
  const work = new Int32Array(n);
  for (let j = 0; j < n; j++) {
    work[j] = j;
    let hasDiagonal = false;
    for (let p = U.colPtr[j]; p < U.colPtr[j + 1]; p++) {
      let i = U.rowIdx[p];
      if (i > j) throw new RangeError(`LDLᵀ input must be upper triangular: entry (${i}, ${j}) is below the diagonal`);
      if (i === j) {
        hasDiagonal = true;
        continue;
      }
      while (work[i] !== j) {
        if (etree[i] === UNKNOWN) etree[i] = j;
        Lnz[i]++;
        work[i] = j;
        i = etree[i];
      }
    }
    if (!hasDiagonal) throw new RangeError(`LDLᵀ input column ${j} has no diagonal entry`);
  }
  const Lp = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) Lp[i + 1] = Lp[i] + Lnz[i];
  const nnzL = Lp[n];

  // Second pass: the same reach, now recording row k's columns, sorted ascending, and their positions.
  const Li = new Int32Array(nnzL);
  const Rp = new Int32Array(n + 1);
  const Ri = new Int32Array(nnzL);
  const Rpos = new Int32Array(nnzL);
  const next = Lp.slice(0, n);
  const row: number[] = [];
  let rp = 0;
  for (let j = 0; j < n; j++) {
    work[j] = UNKNOWN;
  }
  for (let k = 0; k < n; k++) {
    Rp[k] = rp;
    row.length = 0;
    work[k] = k;
    for (let p = U.colPtr[k]; p < U.colPtr[k + 1]; p++) {
      let i = U.rowIdx[p];
      while (i !== k && work[i] !== k) {
        work[i] = k;
        row.push(i);
        i = etree[i];
      }
    }
    row.sort((a, b) => a - b);
    for (const c of row) {
      const pos = next[c]++;
      Li[pos] = k;
      Ri[rp] = c;
      Rpos[rp] = pos;
      rp++;
    }
  }
  Rp[n] = rp;
  return { n, etree, Lp, Li, Rp, Ri, Rpos, nnzL };
}

/** Numeric LDLᵀ with preallocated storage; refactor() may be called any number of times. */
export class LdlFactor {
  readonly symbolic: LdlSymbolic;
  /** Values of L by columns (pattern in symbolic.Lp / symbolic.Li). */
  readonly Lx: Float64Array;
  readonly D: Float64Array;
  readonly Dinv: Float64Array;
  /**
   * Values of L again by rows (pattern in symbolic.Rp / symbolic.Ri), written during refactor() at no
   * extra pass: the forward solve then gathers instead of scattering, which runs faster.
   */
  readonly Rx: Float64Array;
  /** Pivots replaced by dynamic regularisation in the last refactor(). */
  regularisedPivots = 0;
  private readonly yVals: Float64Array;

  constructor(symbolic: LdlSymbolic) {
    this.symbolic = symbolic;
    const n = symbolic.n;
    this.Lx = new Float64Array(symbolic.nnzL);
    this.D = new Float64Array(n);
    this.Dinv = new Float64Array(n);
    this.Rx = new Float64Array(symbolic.nnzL);
    this.yVals = new Float64Array(n);
  }

  /**
   * Factor the upper-triangular matrix U (same pattern as at analysis). `sign[k]` is the expected sign of
   * pivot k (+1 or −1); a pivot with sign[k]·d < eps is replaced by sign[k]·delta (dynamic regularisation).
   * Returns false when a pivot is zero or not finite with no sign given.
   *
   * Up-looking, row by row, as QDLDL (Stellato et al., OSQP, 2020), but on the row patterns computed by
   * the symbolic phase: row k of L solves L₁₁ D₁₁ l = U(0:k, k) by a sparse forward substitution over
   * the columns of its pattern in ascending order.
   */
  refactor(U: CscMatrix, sign: Int8Array | null, eps: number, delta: number): boolean {
    const { n, Lp, Li, Rp, Ri, Rpos } = this.symbolic;
    const { Lx, D, Dinv, yVals, Rx } = this;
    const Ap = U.colPtr;
    const Ai = U.rowIdx;
    const Ax = U.values;
    let regularised = 0;
    yVals.fill(0);
    for (let k = 0; k < n; k++) {
      let dk = 0;
      for (let p = Ap[k]; p < Ap[k + 1]; p++) {
        const i = Ai[p];
        if (i === k) dk = Ax[p];
        else yVals[i] = Ax[p];
      }
      // One accumulator for the pivot, in the order of the WebAssembly kernel, so that both give the same bits.
      const rowEnd = Rp[k + 1];
      for (let t = Rp[k]; t < rowEnd; t++) {
        const c = Ri[t];
        const pos = Rpos[t];
        const yc = yVals[c];
        yVals[c] = 0;
        for (let j = Lp[c]; j < pos; j++) yVals[Li[j]] -= Lx[j] * yc;
        const l = yc * Dinv[c];
        Lx[pos] = l;
        Rx[t] = l;
        dk -= yc * l;
      }
      if (sign) {
        if (!(sign[k] * dk >= eps)) {
          dk = sign[k] * delta;
          regularised++;
        }
      } else if (dk === 0 || !Number.isFinite(dk)) {
        return false;
      }
      D[k] = dk;
      Dinv[k] = 1 / dk;
    }
    this.regularisedPivots = regularised;
    return true;
  }

  /**
   * Solves L D Lᵀ x = b in place (x holds b on entry). Both triangular passes are gathers with two
   * accumulators: the sums are latency-bound, and two independent chains run about twice as fast.
   */
  solveInPlace(x: Float64Array): void {
    // One accumulator per row, in the order of the WebAssembly kernel, so that both give the same bits.
    const { n, Lp, Li, Rp, Ri } = this.symbolic;
    const { Lx, Dinv, Rx } = this;
    for (let i = 0; i < n; i++) {
      let s = x[i];
      for (let q = Rp[i]; q < Rp[i + 1]; q++) s -= Rx[q] * x[Ri[q]];
      x[i] = s;
    }
    for (let i = n - 1; i >= 0; i--) {
      let s = x[i] * Dinv[i];
      for (let j = Lp[i]; j < Lp[i + 1]; j++) s -= Lx[j] * x[Li[j]];
      x[i] = s;
    }
  }

}

/** y = S x for a symmetric S stored as its upper triangle U (CSC). */
export function symmetricUpperMul(U: CscMatrix, x: Float64Array, y: Float64Array): void {
  const { n, colPtr, rowIdx, values } = U;
  y.fill(0);
  for (let j = 0; j < n; j++) {
    const xj = x[j];
    let sum = 0;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIdx[p];
      const v = values[p];
      if (i === j) {
        sum += v * xj;
      } else {
        y[i] += v * xj;
        sum += v * x[i];
      }
    }
    y[j] += sum;
  }
}
