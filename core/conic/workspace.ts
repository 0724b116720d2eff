/**
 * The primal–dual interior-point method for SOCPs on the homogeneous self-dual embedding
 * (Ye, Todd & Mizuno 1994; as formulated for cone programs in Vandenberghe 2010 and ECOS,
 * Domahidi, Chu & Boyd 2013), with Nesterov–Todd scaling and Mehrotra's predictor–corrector.
 *
 * Embedding (in the equilibrated data):
 *   Aᵀy + Gᵀz + cτ = 0,   Ax − bτ = 0,   s + Gx − hτ = 0,   κ + cᵀx + bᵀy + hᵀz = 0,
 *   s, z ∈ K,  τ, κ ≥ 0.
 * τ → 0 with κ > 0 exposes infeasibility; the iterates then converge to a certificate.
 *
 * Per iteration: one factorisation, the τ-direction and predictor systems solved together (one refinement
 * step each), the corrector from the predictor's solution plus an unrefined solve (see direction()). With
 * WebAssembly available the step runs in wasm/iterationWasm.ts, with the same operations in the same order
 * as step() below, which stays as the portable path.
 */
import type { CscMatrix } from '../linalg/csc.ts';
import type { Cone } from './cones/cone.ts';
import { NonnegativeCone } from './cones/nonnegative.ts';
import { SecondOrderCone } from './cones/secondOrder.ts';
import { KktSystem } from './kkt.ts';
import { ruizEquilibrate, validateProblem, type Equilibration } from './problem.ts';
import { resolveSettings, type SolverSettings } from './settings.ts';
import type { ConeSpec, ConicProblem, ConicSolution, SolveStatus } from './types.ts';
import { type Residuals, assessIterate, emptyAssessment, type Assessment, unscaledResidualNorms } from './termination.ts';
import { WasmIteration, iterationBytes, iterationModule } from './wasm/iterationWasm.ts';

/** New values for a problem of the same shape and sparsity pattern. */
export interface ProblemUpdate {
  c?: Float64Array;
  b?: Float64Array;
  h?: Float64Array;
  /** New values of A, in the stored order of its CSC pattern. */
  AValues?: Float64Array;
  /** New values of G, in the stored order of its CSC pattern. */
  GValues?: Float64Array;
}

/** Refinement steps for the predictor (affine) solve at most (and not more than the setting, which the τ-direction solve uses). */
const AFFINE_REFINEMENT = 1;

/** A starting point for solve(), in the problem's units. */
export interface WarmStart {
  x?: Float64Array;
  y?: Float64Array;
  z?: Float64Array;
  s?: Float64Array;
}

const now = (): number => (typeof performance !== 'undefined' ? performance.now() : 0);

export class ConicWorkspace {
  readonly settings: SolverSettings;
  readonly n: number;
  readonly p: number;
  readonly m: number;
  /** Sum of the cone degrees. */
  readonly degree: number;
  private readonly cones: Cone[];
  private readonly kkt: KktSystem;
  // Original data (owned copies) and equilibrated data.
  private readonly A: CscMatrix;
  private readonly G: CscMatrix;
  private readonly c0: Float64Array;
  private readonly b0: Float64Array;
  private readonly h0: Float64Array;
  /** Equilibrated A and G (in the WebAssembly memory with the WebAssembly iteration). */
  private readonly As: CscMatrix;
  private readonly Gs: CscMatrix;
  /** [c; b; h] (equilibrated), and its parts. */
  private readonly cbh: Float64Array;
  private readonly c: Float64Array;
  private readonly b: Float64Array;
  private readonly h: Float64Array;
  /** 1/D and 1/E (the residual norms in problem units multiply by them). */
  private readonly Dinv: Float64Array;
  private readonly Einv: Float64Array;
  private readonly D: Float64Array;
  private readonly E: Float64Array;
  private readonly coneSpec: ConeSpec;
  private readonly scratch: Equilibration;
  private readonly norms = { b: 0, h: 0, c: 0, bs: 0, hs: 0, cs: 0 };
  // Iterate; x, y, z are consecutive parts of xyz.
  private readonly xyz: Float64Array;
  private readonly x: Float64Array;
  private readonly y: Float64Array;
  private readonly z: Float64Array;
  private readonly s: Float64Array;
  private tau = 1;
  private kappa = 1;
  // Work vectors.
  private readonly lambda: Float64Array;
  private readonly rx: Float64Array;
  private readonly ry: Float64Array;
  private readonly rz: Float64Array;
  private readonly rhs: Float64Array;
  /** A second right-hand side: the cold start's pair of solves, then the predictor's (kept for the corrector). */
  private readonly rhs2: Float64Array;
  /** The predictor's KKT solution (before its τ part), from which the corrector's starts, and its dot with [c; b; h]. */
  private readonly predictorSolution: Float64Array;
  private predictorDot = 0;
  /** The iteration on WebAssembly (null: the TypeScript step below). */
  private readonly engine: WasmIteration | null;
  private readonly sol1: Float64Array;
  private readonly sol2: Float64Array;
  private readonly ds: Float64Array;
  private readonly dsScaled: Float64Array;
  private readonly dzScaled: Float64Array;
  private readonly tmpM: Float64Array;
  private readonly tmpM2: Float64Array;
  private readonly ones: Float64Array;
  private factorisations = 0;
  /** Regularisation retries counted before this solve (both paths keep running totals). */
  private retriesAtStart = 0;
  private bestMerit = Infinity;
  /**
   * The next update() equilibrates from the identity scaling instead of continuing from the current one
   * (true on a new workspace and after reset()), so the scaling after it depends on that update's data only.
   */
  private freshScaling = true;
  private readonly res: Residuals;
  private readonly assessment: Assessment = emptyAssessment();
  private readonly relaxedAssessment: Assessment = emptyAssessment();
  /** Δτ and Δκ of the last direction(). */
  private dTau = 0;
  private dKappa = 0;
  private readonly best: { x: Float64Array; y: Float64Array; z: Float64Array; s: Float64Array; tau: number; kappa: number };

  constructor(problem: ConicProblem, settings: Partial<SolverSettings> = {}) {
    this.settings = resolveSettings(settings);
    validateProblem(problem);
    const n = problem.c.length;
    const p = problem.A.m;
    const m = problem.G.m;
    this.n = n;
    this.p = p;
    this.m = m;
    const copy = (M: CscMatrix): CscMatrix => ({
      m: M.m,
      n: M.n,
      colPtr: M.colPtr.slice(0, M.n + 1),
      rowIdx: M.rowIdx.slice(0, M.colPtr[M.n]),
      values: M.values.slice(0, M.colPtr[M.n]),
    });
    this.A = copy(problem.A);
    this.G = copy(problem.G);
    this.c0 = problem.c.slice();
    this.b0 = problem.b.slice();
    this.h0 = problem.h.slice();

    this.cones = [];
    let offset = 0;
    if (problem.cones.nonnegative > 0) {
      this.cones.push(new NonnegativeCone(0, problem.cones.nonnegative));
      offset = problem.cones.nonnegative;
    }
    for (const q of problem.cones.secondOrder) {
      this.cones.push(new SecondOrderCone(offset, q));
      offset += q;
    }
    this.degree = this.cones.reduce((sum, k) => sum + k.degree, 0);
    this.coneSpec = { nonnegative: problem.cones.nonnegative, secondOrder: problem.cones.secondOrder.slice() };

    // The KKT system first: with the WebAssembly iteration, every vector below lives in its memory.
    const kernels = this.settings.kernels;
    const module = kernels === 'javascript' ? null : iterationModule();
    if (kernels === 'wasm' && !module) throw new Error('WebAssembly kernels are not available here (set kernels: "javascript")');
    const blockEntries = this.cones.reduce((sum, k) => sum + k.blockEntries, 0);
    this.kkt = new KktSystem(this.A, this.G, this.cones, this.settings,
      module ? { module, reserveBytes: iterationBytes(this.A, this.G, this.coneSpec, blockEntries) } : undefined);
    this.engine = module ? new WasmIteration(this.kkt, this.A, this.G, this.coneSpec, this.settings, this.degree) : null;
    this.As = this.engine?.As ?? copy(problem.A);
    this.Gs = this.engine?.Gs ?? copy(problem.G);
    const v = this.engine?.vectors;
    const dim = n + p + m;
    this.D = v?.colScale ?? new Float64Array(n);
    this.E = v?.rowScale ?? new Float64Array(p + m);
    this.cbh = v?.cbh ?? new Float64Array(dim);
    this.c = this.cbh.subarray(0, n);
    this.b = this.cbh.subarray(n, n + p);
    this.h = this.cbh.subarray(n + p);
    this.Dinv = v?.colScaleInv ?? new Float64Array(n);
    this.Einv = v?.rowScaleInv ?? new Float64Array(p + m);
    this.xyz = v?.xyz ?? new Float64Array(dim);
    this.x = this.xyz.subarray(0, n);
    this.y = this.xyz.subarray(n, n + p);
    this.z = this.xyz.subarray(n + p);
    this.s = v?.s ?? new Float64Array(m);
    this.lambda = v?.lambda ?? new Float64Array(m);
    const r = v?.rxyz ?? new Float64Array(dim);
    this.rx = r.subarray(0, n);
    this.ry = r.subarray(n, n + p);
    this.rz = r.subarray(n + p);
    this.rhs = v?.rhs ?? new Float64Array(dim);
    this.rhs2 = v?.rhs2 ?? new Float64Array(dim);
    this.predictorSolution = v?.predictorSolution ?? new Float64Array(dim);
    this.sol1 = v?.sol1 ?? new Float64Array(dim);
    this.sol2 = v?.sol2 ?? new Float64Array(dim);
    this.ds = v?.ds ?? new Float64Array(m);
    this.dsScaled = v?.dsScaled ?? new Float64Array(m);
    this.dzScaled = v?.dzScaled ?? new Float64Array(m);
    this.tmpM = v?.tmp ?? new Float64Array(m);
    this.tmpM2 = v?.tmp2 ?? new Float64Array(m);
    this.ones = new Float64Array(m);
    this.res = {
      rx: this.rx, ry: this.ry, rz: this.rz, c: this.c, b: this.b, h: this.h,
      cx: 0, by: 0, hz: 0, sz: 0, tau: 1, kappa: 1, equalityResidual: NaN, coneResidual: NaN, dualResidual: NaN,
    };
    this.best = { x: new Float64Array(n), y: new Float64Array(p), z: new Float64Array(m), s: new Float64Array(m), tau: 1, kappa: 1 };
    for (const k of this.cones) k.addIdentity(this.ones, 1);

    this.scratch = { D: this.D, E: this.E, colMax: new Float64Array(n), rowMax: new Float64Array(p + m) };
    this.equilibrate(false);
    this.kkt.setAG(this.As.values, this.Gs.values);
  }

  /** Replaces data values (same sizes, same sparsity patterns); the symbolic analysis is kept. */
  update(data: ProblemUpdate): void {
    const check = (name: string, v: Float64Array | undefined, len: number) => {
      if (v === undefined) return;
      if (!(v instanceof Float64Array) || v.length !== len) {
        throw new RangeError(`invalid update.${name}: expected a Float64Array of length ${len}`);
      }
      for (let i = 0; i < len; i++) {
        if (!Number.isFinite(v[i])) throw new RangeError(`invalid update.${name}[${i}]: ${v[i]} (must be finite)`);
      }
    };
    check('c', data.c, this.n);
    check('b', data.b, this.p);
    check('h', data.h, this.m);
    check('AValues', data.AValues, this.A.colPtr[this.n]);
    check('GValues', data.GValues, this.G.colPtr[this.n]);
    if (data.c) this.c0.set(data.c);
    if (data.b) this.b0.set(data.b);
    if (data.h) this.h0.set(data.h);
    if (data.AValues) this.A.values.set(data.AValues);
    if (data.GValues) this.G.values.set(data.GValues);
    this.equilibrate(!this.freshScaling);
    this.freshScaling = false;
    this.kkt.setAG(this.As.values, this.Gs.values);
  }

  /**
   * Forgets what earlier solves left behind, so that what follows is a function of the data alone: the
   * next update() equilibrates from scratch (update() otherwise continues Ruiz's iteration from the last
   * scaling, which then depends on every problem solved before). A solve without a start is cold anyway;
   * nothing else carries over between solves. The footprint calls this at the start of every row, so a
   * row's result does not depend on which rows its worker solved before (reproducible footprints).
   */
  reset(): void {
    this.freshScaling = true;
  }

  /** Fill-in diagnostic: entries of the LDLᵀ factor. */
  get factorEntries(): number {
    return this.kkt.factorEntries;
  }

  private equilibrate(continueFrom: boolean): void {
    const { A, G, As, Gs, D, E, p } = this;
    const s = this.settings;
    ruizEquilibrate(A, G, this.coneSpec, s.equilibrationIterations, s.equilibrationMin, s.equilibrationMax, this.scratch, continueFrom);
    scaleMatrix(A, As, E, 0, D);
    scaleMatrix(G, Gs, E, p, D);
    for (let j = 0; j < this.n; j++) this.c[j] = this.c0[j] * D[j];
    for (let i = 0; i < p; i++) this.b[i] = this.b0[i] * E[i];
    for (let i = 0; i < this.m; i++) this.h[i] = this.h0[i] * E[p + i];
    for (let j = 0; j < this.n; j++) this.Dinv[j] = 1 / D[j];
    for (let i = 0; i < p + this.m; i++) this.Einv[i] = 1 / E[i];
    this.norms.b = infNorm(this.b0);
    this.norms.h = infNorm(this.h0);
    this.norms.c = infNorm(this.c0);
    this.norms.bs = infNorm(this.b);
    this.norms.hs = infNorm(this.h);
    this.norms.cs = infNorm(this.c);
  }


  /**
   * Solves the current problem. Without `start`, from the cold start of Vandenberghe (2010); with it, from
   * the given point (problem units; any part may be left out and then comes from the cold start), its s and
   * z moved into the interior of K by their violation plus 10 % of their largest entry. A warm start helps
   * an interior-point method less than an active-set method; it pays when the point is close.
   */
  solve(start?: WarmStart): ConicSolution {
    const t0 = now();
    this.factorisations = 0;
    this.retriesAtStart = this.regularisationRetries();
    const st = this.settings;
    // A complete starting point needs no cold start (its factorisation and two solves would be overwritten).
    const complete = start !== undefined && start.x !== undefined && start.y !== undefined && start.z !== undefined && start.s !== undefined;
    if (complete) {
      this.tau = 1;
      this.kappa = 1;
    } else if (!this.initialise()) {
      return this.finish('numerical-error', null, 0, t0);
    }
    if (start) this.applyWarmStart(start);
    this.bestMerit = Infinity;
    for (let iter = 0; ; iter++) {
      const res = this.residuals();
      const assessment = assessIterate(res, this.norms, this.D, this.E, st, false, this.assessment);
      if (st.verbose) this.log(iter, res, assessment);
      if (assessment.status) return this.finish(assessment.status, assessment, iter, t0);
      this.keepIfBest(assessment);
      const stuck = iter >= st.maxIterations ? null : this.step(res);
      if (stuck !== null && stuck >= st.minStep) continue;
      // Out of iterations or no usable step: settle for reduced accuracy if the data allow it.
      const fallback: SolveStatus = iter >= st.maxIterations ? 'max-iterations' : 'numerical-error';
      return this.finishReduced(res, fallback, iter, t0);
    }
  }

  /** Merit of an iterate on the way to optimality: the worst of the relative residuals and gap. */
  private keepIfBest(a: Assessment): void {
    const relGap = a.gap / Math.max(1, Math.min(Math.abs(a.primalObjective), Math.abs(a.dualObjective)));
    const merit = Math.max(a.primalResidualRelative, a.dualResidualRelative, relGap);
    if (!(merit < this.bestMerit)) return;
    this.bestMerit = merit;
    this.best.x.set(this.x);
    this.best.y.set(this.y);
    this.best.z.set(this.z);
    this.best.s.set(this.s);
    this.best.tau = this.tau;
    this.best.kappa = this.kappa;
  }

  /**
   * The reduced-accuracy ending: the current iterate may certify infeasibility at the relaxed tolerances;
   * otherwise the best iterate seen may be almost optimal; otherwise the fallback status, with the best
   * iterate returned.
   */
  private finishReduced(res: Residuals, fallback: SolveStatus, iter: number, t0: number): ConicSolution {
    const st = this.settings;
    const current = assessIterate(res, this.norms, this.D, this.E, st, true, this.relaxedAssessment);
    if (current.status && current.status !== 'almost-solved') return this.finish(current.status, current, iter, t0);
    if (this.bestMerit < Infinity) {
      this.x.set(this.best.x);
      this.y.set(this.best.y);
      this.z.set(this.best.z);
      this.s.set(this.best.s);
      this.tau = this.best.tau;
      this.kappa = this.best.kappa;
    }
    const best = assessIterate(this.residuals(), this.norms, this.D, this.E, st, true, this.relaxedAssessment);
    return this.finish(best.status === 'almost-solved' ? 'almost-solved' : fallback, best, iter, t0);
  }

  /** Cold start of Vandenberghe (2010) §5.3 / ECOS: least-squares primal and dual points shifted into K. */
  private initialise(): boolean {
    const { n, p, m, cones, kkt, rhs, sol1 } = this;
    for (const k of cones) k.setIdentityScaling();
    this.factorisations++;
    if (!kkt.updateAndFactor()) return false;
    // Primal, min ‖Gx − h‖² s.t. Ax = b → s = h − Gx, and dual, min ‖z‖² s.t. Aᵀy + Gᵀz + c = 0: one pair.
    const { sol2, rhs2 } = this;
    rhs.fill(0);
    rhs.set(this.b, n);
    rhs.set(this.h, n + p);
    rhs2.fill(0);
    for (let j = 0; j < n; j++) rhs2[j] = -this.c[j];
    if (!kkt.solvePair(rhs, rhs2, sol1, sol2)) return false;
    this.x.set(sol1.subarray(0, n));
    for (let i = 0; i < m; i++) this.s[i] = -sol1[n + p + i];
    shiftIntoCone(cones, this.s);
    this.y.set(sol2.subarray(n, n + p));
    this.z.set(sol2.subarray(n + p));
    shiftIntoCone(cones, this.z);
    this.tau = 1;
    this.kappa = 1;
    return true;
  }

  /** Residuals of the embedding at the current iterate, written into the preallocated `res`. */
  private applyWarmStart(start: WarmStart): void {
    const { n, p, m, D, E } = this;
    const check = (name: string, v: Float64Array | undefined, len: number) => {
      if (v !== undefined && (!(v instanceof Float64Array) || v.length !== len || !v.every(Number.isFinite))) {
        throw new RangeError(`invalid start.${name}: expected a finite Float64Array of length ${len}`);
      }
    };
    check('x', start.x, n);
    check('y', start.y, p);
    check('z', start.z, m);
    check('s', start.s, m);
    if (start.x) for (let j = 0; j < n; j++) this.x[j] = start.x[j] / D[j];
    if (start.y) for (let i = 0; i < p; i++) this.y[i] = start.y[i] / E[i];
    if (start.s) {
      for (let i = 0; i < m; i++) this.s[i] = start.s[i] * E[p + i];
      pushInside(this.cones, this.s);
    }
    if (start.z) {
      for (let i = 0; i < m; i++) this.z[i] = start.z[i] / E[p + i];
      pushInside(this.cones, this.z);
    }
  }

  private residuals(): Residuals {
    const { c, b, h, x, y, z, s, tau, rx, ry, rz, res, n, p, m } = this;
    res.tau = tau;
    res.kappa = this.kappa;
    if (this.engine) {
      this.engine.residuals(tau, res);
      return res;
    }
    // r_y = Ax − bτ, r_z = s + Gx − hτ, r_x = Aᵀy + Gᵀz + cτ: one pass over the columns of A and G.
    const As = this.As;
    const Gs = this.Gs;
    for (let i = 0; i < p; i++) ry[i] = -b[i] * tau;
    for (let i = 0; i < m; i++) rz[i] = s[i] - h[i] * tau;
    for (let j = 0; j < n; j++) {
      const xj = x[j];
      let acc = 0;
      for (let q = As.colPtr[j]; q < As.colPtr[j + 1]; q++) {
        const i = As.rowIdx[q];
        const v = As.values[q];
        ry[i] += v * xj;
        acc += v * y[i];
      }
      for (let q = Gs.colPtr[j]; q < Gs.colPtr[j + 1]; q++) {
        const i = Gs.rowIdx[q];
        const v = Gs.values[q];
        rz[i] += v * xj;
        acc += v * z[i];
      }
      rx[j] = acc + c[j] * tau;
    }
    res.cx = dot(c, x);
    res.by = dot(b, y);
    res.hz = dot(h, z);
    res.sz = dot(s, z);
    unscaledResidualNorms(res, this.Dinv, this.Einv);
    return res;
  }

  /** One predictor–corrector step; returns the step length, or null on a numerical failure. */
  private step(res: Residuals): number | null {
    const { n, p, m, cones, kkt, rhs, sol1, sol2, lambda, s, z, ds, dsScaled, dzScaled, tmpM, tmpM2 } = this;
    const { tau, kappa } = this;
    if (this.engine) {
      this.factorisations++;
      const alpha = this.engine.step(tau, kappa, res);
      this.tau = this.engine.tau;
      this.kappa = this.engine.kappa;
      return alpha;
    }
    for (const k of cones) if (!k.updateScaling(s, z, lambda)) return null;
    this.factorisations++;
    if (!kkt.updateAndFactor()) return null;

    // Solve 1 (direction of τ): K [x1; y1; z1] = [−c; b; h].
    for (let j = 0; j < n; j++) rhs[j] = -this.c[j];
    rhs.set(this.b, n);
    rhs.set(this.h, n + p);
    if (!kkt.solve(rhs, sol1)) return null;
    // cᵀx1 + bᵀy1 + hᵀz1 = −‖W z1‖² ≤ 0, so the τ pivot below is negative.
    const tauPivot = dot(this.cbh, sol1) - kappa / tau;
    const mu = (res.sz + tau * kappa) / (this.degree + 1);
    const rTau = kappa + res.cx + res.by + res.hz;

    // Affine (predictor) direction: d_s = −λ∘λ, d_κ = −τκ.
    for (const k of cones) k.jordanProduct(lambda, lambda, tmpM);
    for (let i = 0; i < m; i++) tmpM[i] = -tmpM[i];
    if (!this.direction(1, tmpM, -tau * kappa, tauPivot, rTau, res, true)) return null;
    const dTauAff = this.dTau;
    const dKappaAff = this.dKappa;
    const alphaAff = Math.min(1, this.stepToBoundary(dTauAff, dKappaAff));

    // Centring σ = (1 − α_aff)³ (Mehrotra's heuristic as in ECOS) and the second-order correction.
    const oneMinus = 1 - alphaAff;
    const sigma = Math.min(1, Math.max(1e-4, oneMinus * oneMinus * oneMinus));
    // tmpM still holds −λ∘λ (the affine target).
    for (const k of cones) k.jordanProduct(dsScaled, dzScaled, tmpM2);
    for (let i = 0; i < m; i++) tmpM[i] = tmpM[i] - tmpM2[i] + sigma * mu * this.ones[i];
    const dKappaRhs = -tau * kappa - dTauAff * dKappaAff + sigma * mu;
    if (!this.direction(1 - sigma, tmpM, dKappaRhs, tauPivot, rTau, res, false)) return null;
    const alphaMax = this.stepToBoundary(this.dTau, this.dKappa);
    const alpha = Math.min(1, this.settings.stepFraction * alphaMax);

    // Update the iterate.
    for (let j = 0; j < n; j++) this.x[j] += alpha * sol2[j];
    for (let i = 0; i < p; i++) this.y[i] += alpha * sol2[n + i];
    for (let i = 0; i < m; i++) {
      this.z[i] += alpha * sol2[n + p + i];
      this.s[i] += alpha * ds[i];
    }
    this.tau += alpha * this.dTau;
    this.kappa += alpha * this.dKappa;
    return alpha;
  }

  /**
   * Solves for a search direction given η (residual reduction), d_s (complementarity right-hand side in
   * the scaled space, held in `dsTarget`), and d_κ. Leaves Δx, Δy, Δz in sol2, Δs in `ds`, and the scaled
   * directions W⁻¹Δs, WΔz in dsScaled, dzScaled, and Δτ, Δκ in this.dTau, this.dKappa. False on failure.
   *
   * The predictor's system is solved with refinement (at most one step, and not more than the setting)
   * and its right-hand side and solution kept; the corrector's solution is then the predictor's plus an
   * unrefined solve of the difference of the two right-hand sides. The regularisation error of an
   * unrefined solve scales with its right-hand side, and the difference is the smaller part: measured on
   * the control and descent problems of the benchmarks, the iterations and optima stay those of a
   * refined corrector (DEVELOPERS.md), for one pass over the factor instead of three.
   */
  private direction(
    eta: number,
    dsTarget: Float64Array,
    dKappa: number,
    tauPivot: number,
    rTau: number,
    res: Residuals,
    predictor: boolean,
  ): boolean {
    const { n, p, m, cones, kkt, rhs, rhs2: predictorRhs, predictorSolution, sol1, sol2, lambda, ds, dsScaled, dzScaled, tmpM2 } = this;
    const { tau, kappa } = this;
    // u = W (λ \ d_s), kept in ds for now.
    for (const k of cones) k.jordanDivide(lambda, dsTarget, tmpM2);
    for (const k of cones) k.mulW(tmpM2, ds);
    for (let j = 0; j < n; j++) rhs[j] = -eta * res.rx[j];
    for (let i = 0; i < p; i++) rhs[n + i] = -eta * res.ry[i];
    for (let i = 0; i < m; i++) rhs[n + p + i] = -eta * res.rz[i] - ds[i];
    const dim = n + p + m;
    let solutionDot: number;
    if (predictor) {
      if (!kkt.solve(rhs, predictorSolution, Math.min(AFFINE_REFINEMENT, this.settings.refinementMaxIterations))) return false;
      predictorRhs.set(rhs);
      solutionDot = dot(this.cbh, predictorSolution);
      this.predictorDot = solutionDot;
    } else {
      for (let i = 0; i < dim; i++) rhs[i] -= predictorRhs[i];
      if (!kkt.solve(rhs, sol2, 0)) return false;
      solutionDot = dot(this.cbh, sol2) + this.predictorDot;
    }
    const dTau = (-eta * rTau - dKappa / tau - solutionDot) / tauPivot;
    if (!Number.isFinite(dTau)) return false;
    if (predictor) for (let i = 0; i < dim; i++) sol2[i] = predictorSolution[i] + dTau * sol1[i];
    else for (let i = 0; i < dim; i++) sol2[i] = sol2[i] + predictorSolution[i] + dTau * sol1[i];
    // Δs = W(λ \ d_s) − W²Δz; scaled directions for the step length and the corrector.
    for (let i = 0; i < m; i++) tmpM2[i] = sol2[n + p + i];
    for (const k of cones) k.mulW(tmpM2, dzScaled);
    for (const k of cones) k.mulW(dzScaled, tmpM2);
    for (let i = 0; i < m; i++) ds[i] -= tmpM2[i];
    for (const k of cones) k.mulWinv(ds, dsScaled);
    this.dTau = dTau;
    this.dKappa = (dKappa - kappa * dTau) / tau;
    return true;
  }

  /** Largest α with λ + α W⁻¹Δs, λ + α WΔz ∈ K and τ, κ ≥ 0. */
  private stepToBoundary(dTau: number, dKappa: number): number {
    let alpha = Infinity;
    for (const k of this.cones) {
      alpha = Math.min(alpha, k.stepLength(this.lambda, this.dsScaled), k.stepLength(this.lambda, this.dzScaled));
    }
    if (dTau < 0) alpha = Math.min(alpha, -this.tau / dTau);
    if (dKappa < 0) alpha = Math.min(alpha, -this.kappa / dKappa);
    return alpha;
  }

  private finish(status: SolveStatus, a: Assessment | null, iterations: number, t0: number): ConicSolution {
    const { n, p, m, D, E, x, y, z, s, tau } = this;
    const X = new Float64Array(n);
    const Y = new Float64Array(p);
    const Z = new Float64Array(m);
    const S = new Float64Array(m);
    if (status === 'primal-infeasible' || status === 'almost-primal-infeasible') {
      const scale = -1 / (dot(this.b, y) + dot(this.h, z));
      for (let i = 0; i < p; i++) Y[i] = y[i] * E[i] * scale;
      for (let i = 0; i < m; i++) Z[i] = z[i] * E[p + i] * scale;
      X.fill(NaN);
      S.fill(NaN);
    } else if (status === 'dual-infeasible' || status === 'almost-dual-infeasible') {
      const scale = -1 / dot(this.c, x);
      for (let j = 0; j < n; j++) X[j] = x[j] * D[j] * scale;
      for (let i = 0; i < m; i++) S[i] = (s[i] / E[p + i]) * scale;
      Y.fill(NaN);
      Z.fill(NaN);
    } else {
      for (let j = 0; j < n; j++) X[j] = (x[j] * D[j]) / tau;
      for (let i = 0; i < p; i++) Y[i] = (y[i] * E[i]) / tau;
      for (let i = 0; i < m; i++) {
        Z[i] = (z[i] * E[p + i]) / tau;
        S[i] = s[i] / E[p + i] / tau;
      }
    }
    const solvedLike = status !== 'primal-infeasible' && status !== 'dual-infeasible' &&
      status !== 'almost-primal-infeasible' && status !== 'almost-dual-infeasible';
    return {
      status,
      x: X,
      y: Y,
      z: Z,
      s: S,
      info: {
        iterations,
        primalObjective: solvedLike && a ? a.primalObjective : NaN,
        dualObjective: solvedLike && a ? a.dualObjective : NaN,
        gap: a ? a.gap : NaN,
        primalResidual: a ? a.primalResidual : NaN,
        dualResidual: a ? a.dualResidual : NaN,
        factorisations: this.factorisations,
        regularisationRetries: this.regularisationRetries() - this.retriesAtStart,
        solveTimeMs: now() - t0,
        kernels: this.engine ? 'wasm' : 'javascript',
      },
    };
  }

  /** Factorisations retried with a larger static regularisation so far (the cold start's and the steps'). */
  private regularisationRetries(): number {
    return this.kkt.regularisationRetries + (this.engine ? this.engine.regularisationRetries : 0);
  }

  private log(iter: number, res: Residuals, a: Assessment): void {
    const f = (v: number) => v.toExponential(2).padStart(10);
    console.log(
      `${String(iter).padStart(3)} pcost ${f(a.primalObjective)} dcost ${f(a.dualObjective)} gap ${f(a.gap)} ` +
        `pres ${f(a.primalResidualRelative)} dres ${f(a.dualResidualRelative)} τ ${f(res.tau)} κ ${f(res.kappa)}`,
    );
  }
}

/** One-shot solve: builds a workspace, solves, returns the solution. */
export function solveConic(problem: ConicProblem, settings: Partial<SolverSettings> = {}): ConicSolution {
  return new ConicWorkspace(problem, settings).solve();
}

function pushInside(cones: readonly Cone[], v: Float64Array): void {
  let worst = 0;
  for (const k of cones) worst = Math.max(worst, k.violation(v));
  const shift = worst + 0.1 * Math.max(1e-8, infNorm(v));
  for (const k of cones) k.addIdentity(v, shift);
}

function shiftIntoCone(cones: readonly Cone[], v: Float64Array): void {
  let worst = -Infinity;
  for (const k of cones) worst = Math.max(worst, k.violation(v));
  if (worst >= 0) for (const k of cones) k.addIdentity(v, 1 + worst);
}

function scaleMatrix(M: CscMatrix, out: CscMatrix, E: Float64Array, rowOffset: number, D: Float64Array): void {
  for (let j = 0; j < M.n; j++) {
    for (let q = M.colPtr[j]; q < M.colPtr[j + 1]; q++) {
      out.values[q] = M.values[q] * E[rowOffset + M.rowIdx[q]] * D[j];
    }
  }
}

function infNorm(v: Float64Array): number {
  let r = 0;
  for (let i = 0; i < v.length; i++) {
    const a = Math.abs(v[i]);
    if (a > r) r = a;
  }
  return r;
}

function dot(a: Float64Array, b: Float64Array): number {
  let r = 0;
  for (let i = 0; i < a.length; i++) r += a[i] * b[i];
  return r;
}

