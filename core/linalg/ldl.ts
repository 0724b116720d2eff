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
  /** Number of stored entries of L. */
  readonly nnzL: number;
}

/**
 * Elimination tree and column counts of L for an upper-triangular CSC pattern (entries with row ≤ column;
 * every column must hold its diagonal entry).
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
  return { n, etree, Lp, nnzL: Lp[n] };
}

/** Numeric LDLᵀ with preallocated storage; refactor() may be called any number of times. */
export class LdlFactor {
  readonly symbolic: LdlSymbolic;
  readonly Li: Int32Array;
  readonly Lx: Float64Array;
  readonly D: Float64Array;
  readonly Dinv: Float64Array;
  /**
   * L again, by rows (row k: entries Rp[k] … Rp[k+1]−1 at columns Ri, values Rx), written during
   * refactor() at no extra pass: the forward solve then gathers instead of scattering, which runs faster.
   */
  readonly Rp: Int32Array;
  readonly Ri: Int32Array;
  readonly Rx: Float64Array;
  /** Pivots replaced by dynamic regularisation in the last refactor(). */
  regularisedPivots = 0;
  private readonly yVals: Float64Array;
  private readonly yIdx: Int32Array;
  private readonly elimBuffer: Int32Array;
  private readonly yMarkers: Uint8Array;
  private readonly nextSpace: Int32Array;

  constructor(symbolic: LdlSymbolic) {
    this.symbolic = symbolic;
    const n = symbolic.n;
    this.Li = new Int32Array(symbolic.nnzL);
    this.Lx = new Float64Array(symbolic.nnzL);
    this.D = new Float64Array(n);
    this.Dinv = new Float64Array(n);
    this.Rp = new Int32Array(n + 1);
    this.Ri = new Int32Array(symbolic.nnzL);
    this.Rx = new Float64Array(symbolic.nnzL);
    this.yVals = new Float64Array(n);
    this.yIdx = new Int32Array(n);
    this.elimBuffer = new Int32Array(n);
    this.yMarkers = new Uint8Array(n);
    this.nextSpace = new Int32Array(n);
  }

  /**
   * Factor the upper-triangular matrix U (same pattern as at analysis). `sign[k]` is the expected sign of
   * pivot k (+1 or −1); a pivot with sign[k]·d < eps is replaced by sign[k]·delta (dynamic regularisation).
   * Returns false when a pivot is zero or not finite with no sign given.
   */
  refactor(U: CscMatrix, sign: Int8Array | null, eps: number, delta: number): boolean {
    const { n, etree, Lp } = this.symbolic;
    const { Li, Lx, D, Dinv, yVals, yIdx, elimBuffer, yMarkers, nextSpace, Rp, Ri, Rx } = this;
    let rp = 0;
    const Ap = U.colPtr;
    const Ai = U.rowIdx;
    const Ax = U.values;
    let regularised = 0;
    for (let i = 0; i < n; i++) {
      yMarkers[i] = 0;
      yVals[i] = 0;
      D[i] = 0;
      nextSpace[i] = Lp[i];
    }
    for (let k = 0; k < n; k++) {
      Rp[k] = rp;
      let nnzY = 0;
      for (let p = Ap[k]; p < Ap[k + 1]; p++) {
        const bidx = Ai[p];
        if (bidx === k) {
          D[k] = Ax[p];
          continue;
        }
        yVals[bidx] = Ax[p];
        let nextIdx = bidx;
        if (yMarkers[nextIdx] === 0) {
          yMarkers[nextIdx] = 1;
          elimBuffer[0] = nextIdx;
          let nnzE = 1;
          nextIdx = etree[bidx];
          while (nextIdx !== UNKNOWN && nextIdx < k) {
            if (yMarkers[nextIdx] === 1) break;
            yMarkers[nextIdx] = 1;
            elimBuffer[nnzE++] = nextIdx;
            nextIdx = etree[nextIdx];
          }
          while (nnzE > 0) yIdx[nnzY++] = elimBuffer[--nnzE];
        }
      }
      let dk = D[k];
      let dk2 = 0; // a second accumulator halves the dependency chain of the pivot update
      for (let i = nnzY - 1; i >= 0; i--) {
        const cidx = yIdx[i];
        const tmpIdx = nextSpace[cidx];
        const yc = yVals[cidx];
        for (let j = Lp[cidx]; j < tmpIdx; j++) yVals[Li[j]] -= Lx[j] * yc;
        Li[tmpIdx] = k;
        const l = yc * Dinv[cidx];
        Lx[tmpIdx] = l;
        Ri[rp] = cidx;
        Rx[rp] = l;
        rp++;
        if (i & 1) dk2 -= yc * l;
        else dk -= yc * l;
        nextSpace[cidx] = tmpIdx + 1;
        yVals[cidx] = 0;
        yMarkers[cidx] = 0;
      }
      dk += dk2;
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
    Rp[n] = rp;
    this.regularisedPivots = regularised;
    return true;
  }

  /**
   * Solves L D Lᵀ x = b in place (x holds b on entry). Both triangular passes are gathers with two
   * accumulators: the sums are latency-bound, and two independent chains run about twice as fast.
   */
  solveInPlace(x: Float64Array): void {
    const { n, Lp } = this.symbolic;
    const { Li, Lx, Dinv, Rp, Ri, Rx } = this;
    for (let i = 0; i < n; i++) {
      let s0 = x[i];
      let s1 = 0;
      const end = Rp[i + 1];
      let q = Rp[i];
      for (; q + 1 < end; q += 2) {
        s0 -= Rx[q] * x[Ri[q]];
        s1 -= Rx[q + 1] * x[Ri[q + 1]];
      }
      if (q < end) s0 -= Rx[q] * x[Ri[q]];
      x[i] = s0 + s1;
    }
    for (let i = 0; i < n; i++) x[i] *= Dinv[i];
    for (let i = n - 1; i >= 0; i--) {
      let s0 = x[i];
      let s1 = 0;
      const end = Lp[i + 1];
      let j = Lp[i];
      for (; j + 1 < end; j += 2) {
        s0 -= Lx[j] * x[Li[j]];
        s1 -= Lx[j + 1] * x[Li[j + 1]];
      }
      if (j < end) s0 -= Lx[j] * x[Li[j]];
      x[i] = s0 + s1;
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
