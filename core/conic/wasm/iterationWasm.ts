/**
 * The interior-point iteration on WebAssembly (assembly/iteration.ts): the residuals and one whole
 * predictor–corrector step per call, over the iterate, the data and the KKT factor laid out in one
 * WebAssembly memory. The workspace (../workspace.ts) keeps initialisation, termination and the
 * reduced-accuracy endings, and reads and writes the iterate through the typed-array views this class
 * hands out, so the two sides share the numbers without copies. The TypeScript step in the workspace is
 * the portable reference, with the same operations in the same order: the unit tests require both to give
 * the same bits.
 */
import type { CscMatrix } from '../../linalg/csc.ts';
import type { LdlSystem } from '../../linalg/ldlSystem.ts';
import { WasmLdlSystem, compileEmbeddedModule, type Slot } from '../../linalg/wasm/ldlWasm.ts';
import type { KktSystem } from '../kkt.ts';
import type { Residuals } from '../termination.ts';
import type { ConeSpec } from '../types.ts';
import { ITERATION_BASE64 } from './iteration.generated.ts';

let compiled: WebAssembly.Module | null | undefined;

/** The compiled iteration module, or null where WebAssembly is unavailable (compiled once per thread). */
export function iterationModule(): WebAssembly.Module | null {
  if (compiled === undefined) compiled = compileEmbeddedModule(ITERATION_BASE64);
  return compiled;
}

// i32 header and f64 scalar slots: mirrored from assembly/iteration.ts.
const H = {
  n: 0, p: 1, m: 2, l: 3, nsoc: 4, socOff: 5, socDim: 6, eta: 7, w: 8, posDiag: 9, posCone: 10,
  Ap: 11, Ai: 12, Ax: 13, Lp: 14, Li: 15, Rp: 16, Ri: 17, Rpos: 18, Lx: 19, Rx: 20, D: 21, Dinv: 22, y: 23,
  sign: 24, perm: 25, work: 26, bk: 27, correction: 28, lastStep: 30, info: 31,
  c: 34, b: 35, h: 36, xyz: 37, s: 38, lambda: 39, rxyz: 40, rhs: 41, sol1: 42, sol2: 43, ds: 44,
  dsScaled: 45, dzScaled: 46, tmp: 47, tmp2: 48, ones: 49, refineMax: 51, refineAffine: 52,
  retries: 53, rhs2: 54, pair: 55, colScale: 56, rowScale: 57, aColPtr: 58, aRowIdx: 59, aValues: 60,
  gColPtr: 61, gRowIdx: 62, gValues: 63, cbh: 33, colScaleInv: 50, rowScaleInv: 32, predictorSolution: 29,
} as const;
const HEADER_SLOTS = 64;
const F = {
  tau: 0, kappa: 1, cx: 2, by: 3, hz: 4, sz: 5, degree: 6, stepFraction: 7, staticReg: 8, dynEps: 9,
  dynDelta: 10, refineTol: 11, delta: 12, dTau: 14, dKappa: 15, presEq: 16, presCone: 17, dres: 18,
  predictorDot: 19,
} as const;
const SCALAR_SLOTS = 24;
const LDL_SLOTS: ReadonlyArray<Slot & keyof typeof H> = [
  'Ap', 'Ai', 'Ax', 'Lp', 'Li', 'Rp', 'Ri', 'Rpos', 'Lx', 'Rx', 'D', 'Dinv', 'y', 'sign', 'perm', 'work', 'bk',
  'correction', 'lastStep', 'info', 'pair',
];

interface IterationExports {
  ipmResiduals(header: number, scalars: number): void;
  ipmStep(header: number, scalars: number): number;
}

/** Settings the iteration reads (a subset of SolverSettings). */
export interface IterationSettings {
  stepFraction: number;
  staticRegularisation: number;
  dynamicRegularisationEps: number;
  dynamicRegularisationDelta: number;
  refinementTolerance: number;
  refinementMaxIterations: number;
}

type VectorName = 'cbh' | 'xyz' | 's' | 'lambda' | 'rxyz' | 'rhs' | 'rhs2' | 'sol1' | 'sol2' | 'ds' |
  'dsScaled' | 'dzScaled' | 'tmp' | 'tmp2' | 'ones' | 'w' | 'colScale' | 'rowScale' | 'colScaleInv' | 'rowScaleInv' | 'predictorSolution';

/** The arrays of the iteration and their lengths, in layout order. */
function vectorLengths(n: number, p: number, m: number): Array<[VectorName, number]> {
  const dim = n + p + m;
  return [
    ['cbh', dim], ['xyz', dim], ['s', m], ['lambda', m], ['rxyz', dim], ['rhs', dim],
    ['sol1', dim], ['sol2', dim], ['ds', m], ['dsScaled', m], ['dzScaled', m], ['tmp', m], ['tmp2', m],
    ['ones', m], ['w', m], ['rhs2', dim], ['colScale', n], ['rowScale', p + m], ['colScaleInv', n],
    ['rowScaleInv', p + m], ['predictorSolution', dim],
  ];
}

const align = (bytes: number): number => (bytes + 15) & ~15;

type LayoutName = VectorName | 'header' | 'scalars' | 'socOff' | 'socDim' | 'eta' | 'posDiag' | 'posCone' |
  'aColPtr' | 'aRowIdx' | 'aValues' | 'gColPtr' | 'gRowIdx' | 'gValues';

/**
 * Every array the iteration lays out beside the LDLᵀ system's own, with its length in bytes, in layout
 * order: the one description both the reservation (iterationBytes) and the views (WasmIteration) use.
 */
function iterationLayout(A: CscMatrix, G: CscMatrix, cones: ConeSpec, coneBlockEntries: number): Array<[LayoutName, number]> {
  const n = A.n;
  const nsoc = cones.secondOrder.length;
  return [
    ['header', 4 * HEADER_SLOTS], ['scalars', 8 * SCALAR_SLOTS],
    ...vectorLengths(n, A.m, G.m).map(([name, len]): [LayoutName, number] => [name, 8 * len]),
    ['socOff', 4 * nsoc], ['socDim', 4 * nsoc], ['eta', 8 * nsoc], ['posDiag', 4 * (n + A.m)], ['posCone', 4 * coneBlockEntries],
    ['aColPtr', 4 * (n + 1)], ['aRowIdx', 4 * A.colPtr[n]], ['aValues', 8 * A.colPtr[n]],
    ['gColPtr', 4 * (n + 1)], ['gRowIdx', 4 * G.colPtr[n]], ['gValues', 8 * G.colPtr[n]],
  ];
}

/** Bytes the iteration needs beside the LDLᵀ system's own arrays (A, G: the constraint matrices' patterns). */
export function iterationBytes(A: CscMatrix, G: CscMatrix, cones: ConeSpec, coneBlockEntries: number): number {
  return iterationLayout(A, G, cones, coneBlockEntries).reduce((sum, [, bytes]) => sum + align(bytes), 0);
}

export class WasmIteration {
  readonly vectors: Readonly<Record<VectorName, Float64Array>>;
  /** The equilibrated A and G the iteration multiplies by: the patterns of the constructor's, values to write. */
  readonly As: CscMatrix;
  readonly Gs: CscMatrix;
  private readonly header: Int32Array;
  private readonly scalars: Float64Array;
  private readonly headerAt: number;
  private readonly scalarsAt: number;
  private readonly k: IterationExports;

  /**
   * `kkt` must have been built on the iteration module with `iterationBytes(A, G, …)` reserved; `degree` is
   * the sum of the cone degrees.
   */
  constructor(kkt: KktSystem, A: CscMatrix, G: CscMatrix, cones: ConeSpec, settings: IterationSettings, degree: number) {
    const system: LdlSystem = kkt.system;
    if (!(system instanceof WasmLdlSystem)) throw new Error('internal: the WebAssembly iteration needs a WebAssembly KKT system');
    const { n, p, m } = kkt;
    const buf = system.memory.buffer;
    const blockEntries = kkt.posCone.reduce((sum, pos) => sum + pos.length, 0);
    const at = {} as Record<LayoutName, number>;
    let next = system.reserved;
    for (const [name, bytes] of iterationLayout(A, G, cones, blockEntries)) {
      at[name] = next;
      next += align(bytes);
    }
    if (next > system.reserved + system.reservedBytes) throw new Error('internal: iteration layout larger than its reservation');
    this.headerAt = at.header;
    this.scalarsAt = at.scalars;
    this.header = new Int32Array(buf, at.header, HEADER_SLOTS);
    this.scalars = new Float64Array(buf, at.scalars, SCALAR_SLOTS);
    const hdr = this.header;
    const vectors = {} as Record<VectorName, Float64Array>;
    for (const [name, len] of vectorLengths(n, p, m)) {
      vectors[name] = new Float64Array(buf, at[name], len);
      hdr[H[name]] = at[name];
    }
    // c, b and h are consecutive parts of cbh (the iteration takes cᵀx + bᵀy + hᵀz as one dot product).
    hdr[H.c] = at.cbh;
    hdr[H.b] = at.cbh + 8 * n;
    hdr[H.h] = at.cbh + 8 * (n + p);
    this.vectors = vectors;

    const nsoc = cones.secondOrder.length;
    const offsets = new Int32Array(buf, at.socOff, nsoc);
    const dims = new Int32Array(buf, at.socDim, nsoc);
    let offset = cones.nonnegative;
    cones.secondOrder.forEach((q, i) => {
      offsets[i] = offset;
      dims[i] = q;
      offset += q;
    });
    new Int32Array(buf, at.posDiag, n + p).set(kkt.posDiagXY);
    const cone = new Int32Array(buf, at.posCone, blockEntries);
    let k = 0;
    for (const pos of kkt.posCone) {
      cone.set(pos, k);
      k += pos.length;
    }
    const matrix = (M: CscMatrix, col: 'aColPtr' | 'gColPtr', row: 'aRowIdx' | 'gRowIdx', value: 'aValues' | 'gValues'): CscMatrix => {
      const nnz = M.colPtr[n];
      const colPtr = new Int32Array(buf, at[col], n + 1);
      const rowIdx = new Int32Array(buf, at[row], nnz);
      const values = new Float64Array(buf, at[value], nnz);
      colPtr.set(M.colPtr.subarray(0, n + 1));
      rowIdx.set(M.rowIdx.subarray(0, nnz));
      values.set(M.values.subarray(0, nnz));
      return { m: M.m, n, colPtr, rowIdx, values };
    };
    this.As = matrix(A, 'aColPtr', 'aRowIdx', 'aValues');
    this.Gs = matrix(G, 'gColPtr', 'gRowIdx', 'gValues');
    for (const name of ['eta', 'socOff', 'socDim', 'posDiag', 'posCone', 'aColPtr', 'aRowIdx', 'aValues', 'gColPtr', 'gRowIdx', 'gValues'] as const) {
      hdr[H[name]] = at[name];
    }

    hdr[H.n] = n;
    hdr[H.p] = p;
    hdr[H.m] = m;
    hdr[H.l] = cones.nonnegative;
    hdr[H.nsoc] = nsoc;
    for (const slot of LDL_SLOTS) hdr[H[slot]] = system.at[slot];
    hdr[H.refineMax] = settings.refinementMaxIterations;
    hdr[H.refineAffine] = Math.min(1, settings.refinementMaxIterations);
    const f = this.scalars;
    f[F.degree] = degree;
    f[F.stepFraction] = settings.stepFraction;
    f[F.staticReg] = settings.staticRegularisation;
    f[F.dynEps] = settings.dynamicRegularisationEps;
    f[F.dynDelta] = settings.dynamicRegularisationDelta;
    f[F.refineTol] = settings.refinementTolerance;
    const ones = vectors.ones;
    ones.fill(0, cones.nonnegative);
    ones.fill(1, 0, cones.nonnegative);
    for (let i = 0; i < nsoc; i++) ones[offsets[i]] = 1;
    this.k = system.exports as unknown as IterationExports;
  }

  /**
   * Residuals at τ into `vectors.rxyz`; the dots cᵀx, bᵀy, hᵀz, sᵀz and the unscaled residual norms
   * (see Residuals) into `out`.
   */
  residuals(tau: number, out: Residuals): void {
    const f = this.scalars;
    f[F.tau] = tau;
    this.k.ipmResiduals(this.headerAt, this.scalarsAt);
    out.cx = f[F.cx];
    out.by = f[F.by];
    out.hz = f[F.hz];
    out.sz = f[F.sz];
    out.equalityResidual = f[F.presEq];
    out.coneResidual = f[F.presCone];
    out.dualResidual = f[F.dres];
  }

  /**
   * One predictor–corrector step from (τ, κ) and the dots of the last residuals(): updates the iterate in
   * place (the new τ and κ are then `tau` and `kappa`) and returns the step length, or null on a numerical
   * failure.
   */
  step(tau: number, kappa: number, dots: { cx: number; by: number; hz: number; sz: number }): number | null {
    const f = this.scalars;
    f[F.tau] = tau;
    f[F.kappa] = kappa;
    f[F.cx] = dots.cx;
    f[F.by] = dots.by;
    f[F.hz] = dots.hz;
    f[F.sz] = dots.sz;
    const alpha = this.k.ipmStep(this.headerAt, this.scalarsAt);
    return alpha >= 0 ? alpha : null;
  }

  get tau(): number {
    return this.scalars[F.tau];
  }

  get kappa(): number {
    return this.scalars[F.kappa];
  }

  /** Factorisations retried with a larger static regularisation (diagnostic). */
  get regularisationRetries(): number {
    return this.header[H.retries];
  }
}
