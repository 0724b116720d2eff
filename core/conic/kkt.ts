/**
 * The reduced KKT system of the interior-point method,
 *
 *   [ δI   Aᵀ    Gᵀ         ] [Δx]   [r_x]
 *   [ A   −δI    0          ] [Δy] = [r_y]
 *   [ G    0   −(W² + δI)   ] [Δz]   [r_z]
 *
 * stored as the upper triangle of its symmetric permutation, factored by sparse LDLᵀ. The ordering and
 * the symbolic analysis are computed once per pattern; A, G, and the scaling blocks are written into the
 * value array in place through precomputed position maps. Static regularisation δ keeps the matrix
 * quasi-definite; each solve is refined against the unregularised matrix (iterative refinement), the
 * scheme of ECOS (Domahidi, Chu & Boyd 2013).
 */
import type { CscMatrix } from '../linalg/csc.ts';
import { LdlFactor, ldlSymbolic } from '../linalg/ldl.ts';
import { invertPermutation, minimumDegreeOrdering } from '../linalg/ordering.ts';
import type { Cone } from './cones/cone.ts';

const SRC_DIAGONAL = 0;
const SRC_A = 1;
const SRC_G = 2;
const SRC_CONE = 3;

export interface KktOptions {
  staticRegularisation: number;
  dynamicRegularisationEps: number;
  dynamicRegularisationDelta: number;
  refinementMaxIterations: number;
  refinementTolerance: number;
}

export class KktSystem {
  readonly dim: number;
  readonly n: number;
  readonly p: number;
  readonly m: number;
  /** Permuted upper-triangular KKT matrix (values rewritten in place). */
  readonly matrix: CscMatrix;
  readonly factor: LdlFactor;
  /** perm[k] = original index of permuted row k; pinv is its inverse. */
  readonly perm: Int32Array;
  readonly pinv: Int32Array;
  private readonly posA: Int32Array;
  private readonly posG: Int32Array;
  private readonly posDiagXY: Int32Array;
  private readonly posCone: Int32Array[];
  private readonly sign: Int8Array;
  private readonly work: Float64Array;
  private readonly residual: Float64Array;
  private readonly correction: Float64Array;
  private readonly product: Float64Array;
  private readonly lastStep: Float64Array;
  private readonly cones: readonly Cone[];
  /** Static regularisation in force for the current factorisation. */
  private delta: number;
  /** Factorisations retried with a larger static regularisation (diagnostic). */
  regularisationRetries = 0;
  /** Refinement steps taken by the last solve(). */
  lastRefinementSteps = 0;
  /** ‖rhs − K₀x‖∞ / (1 + ‖rhs‖∞) after the last solve(). */
  lastRelativeResidual = 0;

  constructor(
    A: CscMatrix,
    G: CscMatrix,
    cones: readonly Cone[],
    private readonly options: KktOptions,
  ) {
    const n = A.n;
    const p = A.m;
    const m = G.m;
    this.n = n;
    this.p = p;
    this.m = m;
    this.cones = cones;
    this.delta = options.staticRegularisation;
    const dim = n + p + m;
    this.dim = dim;

    // Unpermuted upper-triangle entries, each tagged with where its value comes from.
    const rows: number[] = [];
    const cols: number[] = [];
    const srcKind: number[] = [];
    const srcIndex: number[] = [];
    const push = (r: number, c: number, kind: number, index: number) => {
      rows.push(r);
      cols.push(c);
      srcKind.push(kind);
      srcIndex.push(index);
    };
    for (let i = 0; i < n + p; i++) push(i, i, SRC_DIAGONAL, i);
    for (let j = 0; j < n; j++) {
      for (let q = A.colPtr[j]; q < A.colPtr[j + 1]; q++) push(j, n + A.rowIdx[q], SRC_A, q);
      for (let q = G.colPtr[j]; q < G.colPtr[j + 1]; q++) push(j, n + p + G.rowIdx[q], SRC_G, q);
    }
    const coneSrc: Array<[number, number]> = [];
    cones.forEach((cone, ci) => {
      cone.blockPattern().forEach(([li, lj], k) => {
        push(n + p + cone.offset + li, n + p + cone.offset + lj, SRC_CONE, coneSrc.length);
        coneSrc.push([ci, k]);
      });
    });

    const nnz = rows.length;
    const unpermuted = buildUpperPattern(dim, rows, cols);
    this.perm = minimumDegreeOrdering(unpermuted);
    this.pinv = invertPermutation(this.perm);

    // Permuted coordinates, kept upper (row ≤ col), then sorted into CSC with the source map.
    const pr = new Int32Array(nnz);
    const pc = new Int32Array(nnz);
    for (let k = 0; k < nnz; k++) {
      const a = this.pinv[rows[k]];
      const b = this.pinv[cols[k]];
      pr[k] = Math.min(a, b);
      pc[k] = Math.max(a, b);
    }
    const order = Array.from({ length: nnz }, (_, k) => k).sort((x, y) => pc[x] - pc[y] || pr[x] - pr[y]);
    const colPtr = new Int32Array(dim + 1);
    const rowIdx = new Int32Array(nnz);
    for (let t = 0; t < nnz; t++) {
      const k = order[t];
      rowIdx[t] = pr[k];
      colPtr[pc[k] + 1]++;
      if (t > 0 && pc[order[t - 1]] === pc[k] && pr[order[t - 1]] === pr[k]) {
        throw new Error('internal: duplicate KKT entry');
      }
    }
    for (let j = 0; j < dim; j++) colPtr[j + 1] += colPtr[j];
    this.matrix = { m: dim, n: dim, colPtr, rowIdx, values: new Float64Array(nnz) };

    this.posA = new Int32Array(A.colPtr[n]);
    this.posG = new Int32Array(G.colPtr[n]);
    this.posDiagXY = new Int32Array(n + p);
    this.posCone = cones.map((c) => new Int32Array(c.blockEntries));
    for (let t = 0; t < nnz; t++) {
      const k = order[t];
      const idx = srcIndex[k];
      switch (srcKind[k]) {
        case SRC_DIAGONAL:
          this.posDiagXY[idx] = t;
          break;
        case SRC_A:
          this.posA[idx] = t;
          break;
        case SRC_G:
          this.posG[idx] = t;
          break;
        default: {
          const [ci, local] = coneSrc[idx];
          this.posCone[ci][local] = t;
        }
      }
    }

    this.sign = new Int8Array(dim);
    for (let k = 0; k < dim; k++) this.sign[k] = this.perm[k] < n ? 1 : -1;
    this.factor = new LdlFactor(ldlSymbolic(this.matrix));
    this.work = new Float64Array(dim);
    this.residual = new Float64Array(dim);
    this.correction = new Float64Array(dim);
    this.product = new Float64Array(dim);
    this.lastStep = new Float64Array(dim);
    this.writeDiagonalRegularisation();
    this.setAG(A.values, G.values);
  }

  /** Writes new values of A and G (same patterns as at construction). */
  setAG(aValues: Float64Array, gValues: Float64Array): void {
    const vals = this.matrix.values;
    for (let k = 0; k < aValues.length; k++) vals[this.posA[k]] = aValues[k];
    for (let k = 0; k < gValues.length; k++) vals[this.posG[k]] = gValues[k];
  }

  private writeDiagonalRegularisation(): void {
    const vals = this.matrix.values;
    for (let i = 0; i < this.n; i++) vals[this.posDiagXY[i]] = this.delta;
    for (let i = this.n; i < this.n + this.p; i++) vals[this.posDiagXY[i]] = -this.delta;
  }

  /**
   * Writes the cones' current −(W² + δI) blocks and refactors. A pivot of the wrong sign (cancellation
   * late in the iterations, when W² spans many decades) is first met by refactoring with a 100× and then a
   * 10⁴× larger static δ; refinement against the unregularised matrix restores the accuracy. Only then
   * are pivots replaced (dynamic regularisation). False on a numerical failure.
   */
  updateAndFactor(): boolean {
    const vals = this.matrix.values;
    const base = this.options.staticRegularisation;
    let ok = false;
    for (let attempt = 0; attempt < 3; attempt++) {
      this.delta = base * 100 ** attempt;
      if (attempt > 0) this.regularisationRetries++;
      this.writeDiagonalRegularisation();
      for (let c = 0; c < this.cones.length; c++) this.cones[c].writeKktBlock(vals, this.posCone[c], this.delta);
      ok = this.factor.refactor(
        this.matrix,
        this.sign,
        this.options.dynamicRegularisationEps,
        this.options.dynamicRegularisationDelta,
      );
      if (ok && this.factor.regularisedPivots === 0) return true;
    }
    return ok;
  }

  /**
   * Solves K [x; y; z] = rhs (both in original order, length n + p + m), refining against K without the
   * static regularisation. Returns false if the result is not finite.
   */
  solve(rhs: Float64Array, out: Float64Array, maxRefinement = this.options.refinementMaxIterations): boolean {
    const { dim, perm, work, residual, correction, product, lastStep } = this;
    let rhsNorm = 0;
    for (let k = 0; k < dim; k++) {
      const v = rhs[perm[k]];
      work[k] = v;
      const a = Math.abs(v);
      if (a > rhsNorm) rhsNorm = a;
    }
    const bk = residual;
    bk.set(work);
    this.factor.solveInPlace(work);
    const tol = this.options.refinementTolerance * (1 + rhsNorm);
    let steps = 0;
    let prevNorm = Infinity;
    let finalNorm: number;
    for (;;) {
      // residual = b − K₀ x, K₀ = the stored matrix without the static δ on its diagonal.
      this.multiplyUnregularised(work, product);
      let norm = 0;
      for (let k = 0; k < dim; k++) {
        const r = bk[k] - product[k];
        correction[k] = r;
        const a = Math.abs(r);
        if (a > norm) norm = a;
      }
      if (norm > prevNorm) {
        // The last correction made things worse: take it back and stop.
        for (let k = 0; k < dim; k++) work[k] -= lastStep[k];
        finalNorm = prevNorm;
        break;
      }
      finalNorm = norm;
      if (!(norm > tol) || steps >= maxRefinement || norm > 0.2 * prevNorm) break;
      prevNorm = norm;
      this.factor.solveInPlace(correction);
      for (let k = 0; k < dim; k++) work[k] += correction[k];
      lastStep.set(correction);
      steps++;
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

  /**
   * y = K₀ x for the stored (permuted, upper) matrix without the static δ. Every column's diagonal is its
   * last stored entry (rows sorted, upper triangle, diagonal always present), which spares a branch per entry.
   */
  private multiplyUnregularised(x: Float64Array, y: Float64Array): void {
    const { colPtr, rowIdx, values } = this.matrix;
    const { dim, sign, delta } = this;
    y.fill(0);
    for (let j = 0; j < dim; j++) {
      const xj = x[j];
      const last = colPtr[j + 1] - 1;
      let s0 = (values[last] - sign[j] * delta) * xj;
      let s1 = 0;
      let q = colPtr[j];
      for (; q + 1 < last; q += 2) {
        const i0 = rowIdx[q];
        const i1 = rowIdx[q + 1];
        const v0 = values[q];
        const v1 = values[q + 1];
        y[i0] += v0 * xj;
        y[i1] += v1 * xj;
        s0 += v0 * x[i0];
        s1 += v1 * x[i1];
      }
      if (q < last) {
        const i0 = rowIdx[q];
        y[i0] += values[q] * xj;
        s0 += values[q] * x[i0];
      }
      y[j] += s0 + s1;
    }
  }

  /** Number of stored entries of the factor L (fill-in diagnostic). */
  get factorEntries(): number {
    return this.factor.symbolic.nnzL;
  }
}

/** Pattern-only CSC of an upper triangle from coordinates (no values needed for the ordering). */
function buildUpperPattern(dim: number, rows: number[], cols: number[]): CscMatrix {
  const colPtr = new Int32Array(dim + 1);
  for (const c of cols) colPtr[c + 1]++;
  for (let j = 0; j < dim; j++) colPtr[j + 1] += colPtr[j];
  const next = colPtr.slice(0, dim);
  const rowIdx = new Int32Array(rows.length);
  for (let k = 0; k < rows.length; k++) rowIdx[next[cols[k]]++] = rows[k];
  return { m: dim, n: dim, colPtr, rowIdx, values: new Float64Array(0) };
}
