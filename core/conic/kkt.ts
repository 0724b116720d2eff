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
import { ldlSymbolic } from '../linalg/ldl.ts';
import { JsLdlSystem, type LdlSystem } from '../linalg/ldlSystem.ts';
import { invertPermutation, minimumDegreeOrdering } from '../linalg/ordering.ts';
import { WasmLdlSystem, wasmKernelsAvailable, type WasmSystemOptions } from '../linalg/wasm/ldlWasm.ts';
import type { Cone } from './cones/cone.ts';
import type { KernelChoice } from './settings.ts';

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
  kernels: KernelChoice;
}

export class KktSystem {
  readonly dim: number;
  readonly n: number;
  readonly p: number;
  readonly m: number;
  /** Permuted upper-triangular KKT matrix (values rewritten in place). */
  readonly matrix: CscMatrix;
  /** The matrix, its factor and the refined solve (WebAssembly or portable kernels). */
  readonly system: LdlSystem;
  /** perm[k] = original index of permuted row k; pinv is its inverse. */
  readonly perm: Int32Array;
  readonly pinv: Int32Array;
  private readonly posA: Int32Array;
  private readonly posG: Int32Array;
  /** Positions in `matrix.values` of the x and y diagonal entries (the static regularisation ±δ). */
  readonly posDiagXY: Int32Array;
  /** Per cone, the positions of its −(W² + δI) block entries, in the cone's blockPattern() order. */
  readonly posCone: Int32Array[];
  private readonly sign: Int8Array;
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
    /** WebAssembly module and reserved memory for a caller that runs more kernels on this system's memory. */
    wasm?: WasmSystemOptions,
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
    const pattern: CscMatrix = { m: dim, n: dim, colPtr, rowIdx, values: new Float64Array(0) };
    this.sign = new Int8Array(dim);
    for (let k = 0; k < dim; k++) this.sign[k] = this.perm[k] < n ? 1 : -1;
    const symbolic = ldlSymbolic(pattern);
    const useWasm = wasm !== undefined || options.kernels === 'wasm' || (options.kernels === 'auto' && wasmKernelsAvailable());
    this.system = useWasm
      ? new WasmLdlSystem(pattern, symbolic, this.sign, this.perm, wasm)
      : new JsLdlSystem(pattern, symbolic, this.sign, this.perm);
    this.matrix = this.system.matrix;

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
      ok = this.system.refactor(this.options.dynamicRegularisationEps, this.options.dynamicRegularisationDelta);
      if (ok && this.system.regularisedPivots === 0) return true;
    }
    return ok;
  }

  /**
   * Solves K [x; y; z] = rhs (both in original order, length n + p + m), refining against K without the
   * static regularisation. Returns false if the result is not finite.
   */
  solve(rhs: Float64Array, out: Float64Array, maxRefinement = this.options.refinementMaxIterations): boolean {
    const finite = this.system.solveRefined(rhs, out, this.delta, this.options.refinementTolerance, maxRefinement);
    this.lastRefinementSteps = this.system.lastRefinementSteps;
    this.lastRelativeResidual = this.system.lastRelativeResidual;
    return finite;
  }

  /** Two solve()s on one pass over the factor (see LdlSystem.solveRefinedPair). */
  solvePair(rhsA: Float64Array, rhsB: Float64Array, outA: Float64Array, outB: Float64Array): boolean {
    const o = this.options;
    const finite = this.system.solveRefinedPair(rhsA, rhsB, outA, outB, this.delta, o.refinementTolerance,
      o.refinementMaxIterations, o.refinementMaxIterations);
    this.lastRefinementSteps = this.system.lastRefinementSteps;
    this.lastRelativeResidual = this.system.lastRelativeResidual;
    return finite;
  }

  /** Number of stored entries of the factor L (fill-in diagnostic). */
  get factorEntries(): number {
    return this.system.symbolic.nnzL;
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
