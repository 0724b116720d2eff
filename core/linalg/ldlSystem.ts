/**
 * A symmetric matrix of fixed sparsity pattern (stored as the upper triangle of a symmetric permutation
 * P S Pᵀ), its LDLᵀ factor, and the refined solve S x = b, behind one interface with two implementations:
 * portable TypeScript (this file) and WebAssembly kernels (wasm/ldlWasm.ts, two to three times faster on
 * the interior-point KKT systems; figures in DEVELOPERS.md). Both run the same algorithms in the same
 * order; the unit tests require them to agree.
 */
import type { CscMatrix } from './csc.ts';
import { LdlFactor, type LdlSymbolic } from './ldl.ts';

export interface LdlSystem {
  /** The permuted matrix P S Pᵀ: pattern as given at construction, values writable in place. */
  readonly matrix: CscMatrix;
  readonly symbolic: LdlSymbolic;
  /** Pivots replaced by dynamic regularisation in the last refactor(). */
  readonly regularisedPivots: number;
  /** Refinement steps taken by the last solveRefined(). */
  readonly lastRefinementSteps: number;
  /** ‖b − S₀x‖∞ / (1 + ‖b‖∞) as last measured by solveRefined() (before its final step if maxSteps ended it). */
  readonly lastRelativeResidual: number;
  /**
   * Refactors the current values. Pivot k must have the sign `sign[k]` given at construction: one with
   * sign·d < eps (or not a number) is replaced by sign·delta (dynamic regularisation).
   */
  refactor(eps: number, delta: number): boolean;
  /**
   * Solves S x = b, b and x in the original (unpermuted) order, with iterative refinement against
   * S₀ = S − shift·diag(sign) (the matrix without its static regularisation): refinement stops once the
   * residual is below tolerance·(1 + ‖b‖∞), after maxSteps, when a step gains less than a factor 5, or —
   * taking that step back — when a step makes the residual worse (checked only for steps that another
   * could follow: the residual after the last allowed step is not measured, and with maxSteps = 0 none
   * is, lastRelativeResidual then being NaN). False if x is not finite.
   */
  solveRefined(b: Float64Array, x: Float64Array, shift: number, tolerance: number, maxSteps: number): boolean;
  /**
   * Two solveRefined() at once, S xA = bA and S xB = bB, each with its own step limit: the same results
   * (the WebAssembly kernel runs both on one pass over the factor). lastRelativeResidual and
   * lastRefinementSteps are the larger of the two. False if either solution is not finite.
   */
  solveRefinedPair(
    bA: Float64Array, bB: Float64Array, xA: Float64Array, xB: Float64Array,
    shift: number, tolerance: number, maxStepsA: number, maxStepsB: number,
  ): boolean;
}

/** Checks the invariant the shifted residual relies on: each column ends with its diagonal entry. */
export function checkUpperPattern(U: CscMatrix): void {
  for (let j = 0; j < U.n; j++) {
    const last = U.colPtr[j + 1] - 1;
    if (last < U.colPtr[j] || U.rowIdx[last] !== j) {
      throw new RangeError(`LDLᵀ system: column ${j} must end with its diagonal entry (rows sorted, upper triangle)`);
    }
  }
}

/** The portable implementation. */
export class JsLdlSystem implements LdlSystem {
  readonly matrix: CscMatrix;
  readonly symbolic: LdlSymbolic;
  lastRefinementSteps = 0;
  lastRelativeResidual = 0;
  private readonly factor: LdlFactor;
  private readonly sign: Int8Array;
  private readonly perm: Int32Array;
  private readonly work: Float64Array;
  private readonly bk: Float64Array;
  private readonly correction: Float64Array;
  private readonly lastStep: Float64Array;

  /** `perm[k]` is the original index of permuted row k; `pattern` is the permuted upper triangle. */
  constructor(pattern: CscMatrix, symbolic: LdlSymbolic, sign: Int8Array, perm: Int32Array) {
    checkUpperPattern(pattern);
    const n = pattern.n;
    const nnz = pattern.colPtr[n];
    this.matrix = { m: n, n, colPtr: pattern.colPtr, rowIdx: pattern.rowIdx, values: new Float64Array(nnz) };
    this.symbolic = symbolic;
    this.factor = new LdlFactor(symbolic);
    this.sign = sign.slice(0, n);
    this.perm = perm.slice(0, n);
    this.work = new Float64Array(n);
    this.bk = new Float64Array(n);
    this.correction = new Float64Array(n);
    this.lastStep = new Float64Array(n);
  }

  get regularisedPivots(): number {
    return this.factor.regularisedPivots;
  }

  refactor(eps: number, delta: number): boolean {
    return this.factor.refactor(this.matrix, this.sign, eps, delta);
  }

  solveRefined(rhs: Float64Array, out: Float64Array, shift: number, tolerance: number, maxSteps: number): boolean {
    const { perm, work, bk, correction, lastStep } = this;
    const dim = this.matrix.n;
    let rhsNorm = 0;
    for (let k = 0; k < dim; k++) {
      const v = rhs[perm[k]];
      work[k] = v;
      bk[k] = v;
      const a = Math.abs(v);
      if (a > rhsNorm) rhsNorm = a;
    }
    this.factor.solveInPlace(work);
    const tol = tolerance * (1 + rhsNorm);
    let steps = 0;
    let prevNorm = Infinity;
    // With no step allowed the residual is not measured.
    let finalNorm = NaN;
    while (maxSteps > 0) {
      this.residualShifted(shift, bk, work, correction);
      let norm = 0;
      for (let k = 0; k < dim; k++) {
        const a = Math.abs(correction[k]);
        if (a > norm) norm = a;
      }
      if (norm > prevNorm) {
        for (let k = 0; k < dim; k++) work[k] -= lastStep[k];
        finalNorm = prevNorm;
        break;
      }
      finalNorm = norm;
      if (!(norm > tol) || steps >= maxSteps || norm > 0.2 * prevNorm) break;
      prevNorm = norm;
      this.factor.solveInPlace(correction);
      for (let k = 0; k < dim; k++) work[k] += correction[k];
      steps++;
      // After the last allowed step the residual is not measured again: the check would cost a third of a
      // one-step solve, and taking such a step back changed no outcome in the benchmarks (DEVELOPERS.md).
      if (steps >= maxSteps) break;
      lastStep.set(correction);
    }
    this.lastRefinementSteps = steps;
    this.lastRelativeResidual = finalNorm / (1 + rhsNorm);
    let finite = true;
    for (let k = 0; k < dim; k++) {
      const v = work[k];
      if (!Number.isFinite(v)) finite = false;
      out[perm[k]] = v;
    }
    return finite;
  }

  solveRefinedPair(
    bA: Float64Array, bB: Float64Array, xA: Float64Array, xB: Float64Array,
    shift: number, tolerance: number, maxStepsA: number, maxStepsB: number,
  ): boolean {
    const okA = this.solveRefined(bA, xA, shift, tolerance, maxStepsA);
    const residualA = this.lastRelativeResidual;
    const stepsA = this.lastRefinementSteps;
    const okB = this.solveRefined(bB, xB, shift, tolerance, maxStepsB);
    this.lastRelativeResidual = Math.max(residualA, this.lastRelativeResidual);
    this.lastRefinementSteps = Math.max(stepsA, this.lastRefinementSteps);
    return okA && okB;
  }

  /**
   * r = b − S₀x with S₀ = S − shift·diag(sign), S from its stored upper triangle; one accumulator per
   * column, in the order of the WebAssembly kernel, so that both give the same bits.
   */
  private residualShifted(shift: number, b: Float64Array, x: Float64Array, r: Float64Array): void {
    const { colPtr, rowIdx, values, n } = this.matrix;
    const sign = this.sign;
    r.set(b);
    for (let j = 0; j < n; j++) {
      const xj = x[j];
      const last = colPtr[j + 1] - 1;
      let s = (values[last] - sign[j] * shift) * xj;
      for (let q = colPtr[j]; q < last; q++) {
        const i = rowIdx[q];
        const v = values[q];
        r[i] -= v * xj;
        s += v * x[i];
      }
      r[j] -= s;
    }
  }

}
