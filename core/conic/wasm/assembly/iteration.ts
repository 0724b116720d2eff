// The interior-point iteration of core/conic/workspace.ts in WebAssembly: residuals, Nesterov–Todd
// scaling of every cone, the KKT refactorisation, the three refined solves, Mehrotra's predictor and
// corrector, the step to the boundary and the update. Compiled by AssemblyScript (`npm run build:kernels`)
// together with the LDLᵀ kernels it calls. Same formulas in the same order as the TypeScript (which stays
// the portable reference: the unit tests require both to take the same iterations to the same point);
// the gain is that one call does a whole iteration over typed memory, without a method call per cone.
//
// Every array lives in the instance's imported memory; the caller (core/conic/wasm/iterationWasm.ts)
// writes the byte offsets of the arrays and the sizes into an i32 header and the scalars into an f64
// block. The slot numbers below are mirrored there.

import { ldlRefactor, ldlSolveRefined, ldlSolveRefinedPair } from '../../../linalg/wasm/assembly/kernels';
import { f64At, i32At, setF64, setI32 } from '../../../linalg/wasm/assembly/memory';
export { ldlRefactor, ldlSolveRefined, ldlSolveRefinedPair };

// i32 header slots.
const H_N = 0;
const H_P = 1;
const H_M = 2;
const H_L = 3;
const H_NSOC = 4;
const H_SOC_OFF = 5;
const H_SOC_DIM = 6;
const H_ETA = 7;
const H_W = 8;
const H_POS_DIAG = 9;
const H_POS_CONE = 10;
const H_AP = 11;
const H_AI = 12;
const H_AX = 13;
const H_LP = 14;
const H_LI = 15;
const H_RP = 16;
const H_RI = 17;
const H_RPOS = 18;
const H_LX = 19;
const H_RX = 20;
const H_D = 21;
const H_DINV = 22;
const H_YWORK = 23;
const H_SIGN = 24;
const H_PERM = 25;
const H_WORK = 26;
const H_BK = 27;
const H_CORRECTION = 28;
const H_PREDICTOR_SOLUTION = 29;
const H_LAST_STEP = 30;
const H_INFO = 31;
const H_ESCALE_INV = 32;
const H_CBH = 33;
const H_C = 34;
const H_B = 35;
const H_H = 36;
const H_XYZ = 37;
const H_S = 38;
const H_LAMBDA = 39;
const H_RXYZ = 40;
const H_RHS = 41;
const H_SOL1 = 42;
const H_SOL2 = 43;
const H_DS = 44;
const H_DS_SCALED = 45;
const H_DZ_SCALED = 46;
const H_TMP = 47;
const H_TMP2 = 48;
const H_ONES = 49;
const H_DSCALE_INV = 50;
const H_REFINE_MAX = 51;
const H_REFINE_AFFINE = 52;
const H_RETRIES = 53;
const H_RHS2 = 54;
const H_PAIR = 55;
const H_A_COLPTR = 58;
const H_A_ROWIDX = 59;
const H_A_VALUES = 60;
const H_G_COLPTR = 61;
const H_G_ROWIDX = 62;
const H_G_VALUES = 63;

// f64 scalar slots.
const F_TAU = 0;
const F_KAPPA = 1;
const F_CX = 2;
const F_BY = 3;
const F_HZ = 4;
const F_SZ = 5;
const F_DEGREE = 6;
const F_STEP_FRACTION = 7;
const F_STATIC_REG = 8;
const F_DYN_EPS = 9;
const F_DYN_DELTA = 10;
const F_REFINE_TOL = 11;
const F_DELTA = 12;
const F_DTAU = 14;
const F_DKAPPA = 15;
const F_PRES_EQ = 16;
const F_PRES_CONE = 17;
const F_DRES = 18;
const F_PREDICTOR_DOT = 19;

@inline function ptr(hdr: usize, slot: i32): usize {
  return <usize>i32At(hdr, slot);
}

function dotRange(a: usize, len: i32, b: usize, offset: i32): f64 {
  let r: f64 = 0;
  for (let i = 0; i < len; i++) r += f64At(a, i) * f64At(b, offset + i);
  return r;
}

// ---- cones (orthant rows 0..l−1, then the second-order cones) ----

/** NT scaling of every cone at (s, z); writes λ = W z. False when s or z is not interior. */
function updateScaling(hdr: usize): bool {
  const l = i32At(hdr, H_L);
  const s = ptr(hdr, H_S);
  const z = ptr(hdr, H_XYZ) + (<usize>(i32At(hdr, H_N) + i32At(hdr, H_P)) << 3);
  const w = ptr(hdr, H_W);
  const lambda = ptr(hdr, H_LAMBDA);
  for (let i = 0; i < l; i++) {
    const si = f64At(s, i);
    const zi = f64At(z, i);
    if (!(si > 0) || !(zi > 0)) return false;
    setF64(w, i, Math.sqrt(si / zi));
    setF64(lambda, i, Math.sqrt(si * zi));
  }
  const nsoc = i32At(hdr, H_NSOC);
  const offs = ptr(hdr, H_SOC_OFF);
  const dims = ptr(hdr, H_SOC_DIM);
  const eta = ptr(hdr, H_ETA);
  for (let c = 0; c < nsoc; c++) {
    const o = i32At(offs, c);
    const q = i32At(dims, c);
    const s0 = f64At(s, o);
    const z0 = f64At(z, o);
    let s1n: f64 = 0;
    let z1n: f64 = 0;
    let sz1: f64 = 0;
    for (let i = 1; i < q; i++) {
      const si = f64At(s, o + i);
      const zi = f64At(z, o + i);
      s1n += si * si;
      z1n += zi * zi;
      sz1 += si * zi;
    }
    const sRes = (s0 - Math.sqrt(s1n)) * (s0 + Math.sqrt(s1n));
    const zRes = (z0 - Math.sqrt(z1n)) * (z0 + Math.sqrt(z1n));
    if (!(s0 > 0) || !(z0 > 0) || !(sRes > 0) || !(zRes > 0)) return false;
    const sn = Math.sqrt(sRes);
    const zn = Math.sqrt(zRes);
    const dot = (s0 * z0 + sz1) / (sn * zn);
    const gamma = Math.sqrt((1 + dot) / 2);
    setF64(w, o, (s0 / sn + z0 / zn) / (2 * gamma));
    for (let i = 1; i < q; i++) setF64(w, o + i, (f64At(s, o + i) / sn - f64At(z, o + i) / zn) / (2 * gamma));
    setF64(eta, c, Math.sqrt(sn / zn));
    applySocScaling(w, o, q, z, lambda, f64At(eta, c), 1);
  }
  return true;
}

/** out = factor · [[w₀, σw₁ᵀ], [σw₁, I + w₁w₁ᵀ/(1+w₀)]] v on one second-order cone. */
@inline function applySocScaling(w: usize, o: i32, q: i32, v: usize, out: usize, factor: f64, sgn: f64): void {
  const v0 = f64At(v, o);
  let w1v1: f64 = 0;
  for (let i = 1; i < q; i++) w1v1 += f64At(w, o + i) * f64At(v, o + i);
  const w0 = f64At(w, o);
  const c = sgn * v0 + w1v1 / (1 + w0);
  setF64(out, o, factor * (w0 * v0 + sgn * w1v1));
  for (let i = 1; i < q; i++) setF64(out, o + i, factor * (f64At(v, o + i) + c * f64At(w, o + i)));
}



/** out = −(λ ∘ λ). */
function negatedJordanSquare(hdr: usize, lambda: usize, out: usize): void {
  const l = i32At(hdr, H_L);
  for (let i = 0; i < l; i++) {
    const li = f64At(lambda, i);
    setF64(out, i, -(li * li));
  }
  const nsoc = i32At(hdr, H_NSOC);
  const offs = ptr(hdr, H_SOC_OFF);
  const dims = ptr(hdr, H_SOC_DIM);
  for (let c = 0; c < nsoc; c++) {
    const o = i32At(offs, c);
    const q = i32At(dims, c);
    const l0 = f64At(lambda, o);
    let dot = l0 * l0;
    for (let i = 1; i < q; i++) dot += f64At(lambda, o + i) * f64At(lambda, o + i);
    for (let i = 1; i < q; i++) setF64(out, o + i, -(l0 * f64At(lambda, o + i) + l0 * f64At(lambda, o + i)));
    setF64(out, o, -dot);
  }
}

/** out = u ∘ v (Jordan product). */
function jordanProduct(hdr: usize, u: usize, v: usize, out: usize): void {
  const l = i32At(hdr, H_L);
  for (let i = 0; i < l; i++) setF64(out, i, f64At(u, i) * f64At(v, i));
  const nsoc = i32At(hdr, H_NSOC);
  const offs = ptr(hdr, H_SOC_OFF);
  const dims = ptr(hdr, H_SOC_DIM);
  for (let c = 0; c < nsoc; c++) {
    const o = i32At(offs, c);
    const q = i32At(dims, c);
    const u0 = f64At(u, o);
    const v0 = f64At(v, o);
    let dot = u0 * v0;
    for (let i = 1; i < q; i++) dot += f64At(u, o + i) * f64At(v, o + i);
    for (let i = 1; i < q; i++) setF64(out, o + i, u0 * f64At(v, o + i) + v0 * f64At(u, o + i));
    setF64(out, o, dot);
  }
}

/** out = λ \ v on one second-order cone at offset o. */
@inline function socJordanDivide(lambda: usize, v: usize, out: usize, o: i32, q: i32): void {
  const l0 = f64At(lambda, o);
  let l1n: f64 = 0;
  let l1v1: f64 = 0;
  for (let i = 1; i < q; i++) {
    const li = f64At(lambda, o + i);
    l1n += li * li;
    l1v1 += li * f64At(v, o + i);
  }
  const det = (l0 - Math.sqrt(l1n)) * (l0 + Math.sqrt(l1n));
  const u0 = (l0 * f64At(v, o) - l1v1) / det;
  for (let i = 1; i < q; i++) setF64(out, o + i, (f64At(v, o + i) - u0 * f64At(lambda, o + i)) / l0);
  setF64(out, o, u0);
}

/** Largest α with x + α d in one second-order cone at offset o (x interior; x₀, ‖x₁‖² and x₀² − ‖x₁‖² given); see SecondOrderCone.stepLength. */
@inline function socStepLength(x0: f64, x1n: f64, cc: f64, d: usize, x: usize, o: i32, q: i32): f64 {
  const d0 = f64At(d, o);
  let a = d0 * d0;
  let b = x0 * d0;
  for (let i = 1; i < q; i++) {
    const di = f64At(d, o + i);
    a -= di * di;
    b -= f64At(x, o + i) * di;
  }
  if (!(cc > 0)) return 0;
  const tLimit: f64 = d0 < 0 ? -x0 / d0 : Infinity;
  if (a > 0 && b >= 0) return tLimit;
  const disc = b * b - a * cc;
  if (disc < 0) return tLimit;
  const denom = -b + Math.sqrt(disc);
  return Math.min(tLimit, denom > 0 ? cc / denom : Infinity);
}

/** The smaller of the largest α with x + α d1 and with x + α d2 in every cone (x interior), in one pass. */
function coneStepLength2(hdr: usize, x: usize, d1: usize, d2: usize): f64 {
  let alpha: f64 = Infinity;
  const l = i32At(hdr, H_L);
  // The orthant as NonnegativeCone.stepLength: a ratio that is not a number is passed over.
  let alpha1: f64 = Infinity;
  let alpha2: f64 = Infinity;
  for (let i = 0; i < l; i++) {
    const xi = f64At(x, i);
    const a1 = f64At(d1, i);
    const a2 = f64At(d2, i);
    if (a1 < 0) {
      const a = -xi / a1;
      if (a < alpha1) alpha1 = a;
    }
    if (a2 < 0) {
      const a = -xi / a2;
      if (a < alpha2) alpha2 = a;
    }
  }
  if (l > 0) alpha = Math.min(alpha, Math.min(alpha1, alpha2));
  const nsoc = i32At(hdr, H_NSOC);
  const offs = ptr(hdr, H_SOC_OFF);
  const dims = ptr(hdr, H_SOC_DIM);
  for (let c = 0; c < nsoc; c++) {
    const o = i32At(offs, c);
    const q = i32At(dims, c);
    const x0 = f64At(x, o);
    let x1n: f64 = 0;
    for (let i = 1; i < q; i++) {
      const xi = f64At(x, o + i);
      x1n += xi * xi;
    }
    const cc = (x0 - Math.sqrt(x1n)) * (x0 + Math.sqrt(x1n));
    alpha = Math.min(alpha, Math.min(socStepLength(x0, x1n, cc, d1, x, o, q), socStepLength(x0, x1n, cc, d2, x, o, q)));
  }
  return alpha;
}

// ---- KKT matrix ----

/**
 * Writes the regularised diagonal and the cones' −(W² + δI) blocks and refactors; retries with a 100× and
 * a 10⁴× larger static δ while pivots of the wrong sign appear (see KktSystem.updateAndFactor).
 */
function updateAndFactor(hdr: usize, fs: usize): bool {
  const n = i32At(hdr, H_N);
  const p = i32At(hdr, H_P);
  const dim = n + p + i32At(hdr, H_M);
  const vals = ptr(hdr, H_AX);
  const posDiag = ptr(hdr, H_POS_DIAG);
  const posCone = ptr(hdr, H_POS_CONE);
  const w = ptr(hdr, H_W);
  const eta = ptr(hdr, H_ETA);
  const l = i32At(hdr, H_L);
  const nsoc = i32At(hdr, H_NSOC);
  const offs = ptr(hdr, H_SOC_OFF);
  const dims = ptr(hdr, H_SOC_DIM);
  const base = f64At(fs, F_STATIC_REG);
  let ok = false;
  for (let attempt = 0; attempt < 3; attempt++) {
    const delta = base * (attempt == 0 ? 1.0 : attempt == 1 ? 100.0 : 10000.0);
    setF64(fs, F_DELTA, delta);
    if (attempt > 0) setI32(hdr, H_RETRIES, i32At(hdr, H_RETRIES) + 1);
    for (let i = 0; i < n; i++) setF64(vals, i32At(posDiag, i), delta);
    for (let i = n; i < n + p; i++) setF64(vals, i32At(posDiag, i), -delta);
    let k = 0;
    for (let i = 0; i < l; i++) {
      const wi = f64At(w, i);
      setF64(vals, i32At(posCone, k++), -(wi * wi + delta));
    }
    for (let c = 0; c < nsoc; c++) {
      const o = i32At(offs, c);
      const q = i32At(dims, c);
      const e = f64At(eta, c);
      const e2 = e * e;
      for (let j = 0; j < q; j++) {
        const wj = f64At(w, o + j);
        for (let i = 0; i <= j; i++) {
          let v = 2 * f64At(w, o + i) * wj;
          if (i == j) v += i == 0 ? -1 : 1;
          setF64(vals, i32At(posCone, k++), -(e2 * v + (i == j ? delta : 0)));
        }
      }
    }
    const r = ldlRefactor(
      dim, ptr(hdr, H_AP), ptr(hdr, H_AI), vals, ptr(hdr, H_LP), ptr(hdr, H_LI), ptr(hdr, H_RP), ptr(hdr, H_RI),
      ptr(hdr, H_RPOS), ptr(hdr, H_LX), ptr(hdr, H_RX), ptr(hdr, H_D), ptr(hdr, H_DINV), ptr(hdr, H_YWORK),
      ptr(hdr, H_SIGN), f64At(fs, F_DYN_EPS), f64At(fs, F_DYN_DELTA),
    );
    ok = r >= 0;
    if (ok && r == 0) return true;
  }
  return ok;
}

/** The refined solve K out = rhs (original order); false when the result is not finite. */
function kktSolve(hdr: usize, fs: usize, rhs: usize, out: usize, maxSteps: i32): bool {
  const dim = i32At(hdr, H_N) + i32At(hdr, H_P) + i32At(hdr, H_M);
  const r = ldlSolveRefined(
    dim, ptr(hdr, H_LP), ptr(hdr, H_LI), ptr(hdr, H_LX), ptr(hdr, H_RP), ptr(hdr, H_RI), ptr(hdr, H_RX),
    ptr(hdr, H_DINV), ptr(hdr, H_AP), ptr(hdr, H_AI), ptr(hdr, H_AX), ptr(hdr, H_SIGN), f64At(fs, F_DELTA),
    ptr(hdr, H_PERM), rhs, out, ptr(hdr, H_WORK), ptr(hdr, H_BK), ptr(hdr, H_CORRECTION), ptr(hdr, H_LAST_STEP),
    f64At(fs, F_REFINE_TOL), maxSteps, ptr(hdr, H_INFO),
  );
  return r >= 0;
}

/** Two refined solves on one pass over the factor: K outA = rhsA, K outB = rhsB. */
function kktSolvePair(hdr: usize, fs: usize, rhsA: usize, rhsB: usize, outA: usize, outB: usize, maxA: i32, maxB: i32): bool {
  const dim = i32At(hdr, H_N) + i32At(hdr, H_P) + i32At(hdr, H_M);
  const r = ldlSolveRefinedPair(
    dim, ptr(hdr, H_LP), ptr(hdr, H_LI), ptr(hdr, H_LX), ptr(hdr, H_RP), ptr(hdr, H_RI), ptr(hdr, H_RX),
    ptr(hdr, H_DINV), ptr(hdr, H_AP), ptr(hdr, H_AI), ptr(hdr, H_AX), ptr(hdr, H_SIGN), f64At(fs, F_DELTA),
    ptr(hdr, H_PERM), rhsA, rhsB, outA, outB, ptr(hdr, H_PAIR), f64At(fs, F_REFINE_TOL), maxA, maxB, ptr(hdr, H_INFO),
  );
  return r >= 0;
}

// ---- the iteration ----

/** Residuals of the embedding at the current iterate: r = [Aᵀy + Gᵀz + cτ; Ax − bτ; s + Gx − hτ] and the dots. */
export function ipmResiduals(hdr: usize, fs: usize): void {
  const n = i32At(hdr, H_N);
  const p = i32At(hdr, H_P);
  const m = i32At(hdr, H_M);
  const xyz = ptr(hdr, H_XYZ);
  const c = ptr(hdr, H_C);
  const b = ptr(hdr, H_B);
  const h = ptr(hdr, H_H);
  const s = ptr(hdr, H_S);
  const r = ptr(hdr, H_RXYZ);
  const tau = f64At(fs, F_TAU);
  // One pass over the columns of A and G, as in the workspace's residuals().
  const ry = r + (<usize>n << 3);
  const rz = r + (<usize>(n + p) << 3);
  const y = xyz + (<usize>n << 3);
  const z = xyz + (<usize>(n + p) << 3);
  for (let i = 0; i < p; i++) setF64(ry, i, -f64At(b, i) * tau);
  for (let i = 0; i < m; i++) setF64(rz, i, f64At(s, i) - f64At(h, i) * tau);
  const Ap = ptr(hdr, H_A_COLPTR);
  const Ai = ptr(hdr, H_A_ROWIDX);
  const Ax = ptr(hdr, H_A_VALUES);
  const Gp = ptr(hdr, H_G_COLPTR);
  const Gi = ptr(hdr, H_G_ROWIDX);
  const Gx = ptr(hdr, H_G_VALUES);
  // Each reduction runs in index order, as the workspace's separate loops do, so the sums are the same.
  const Dinv = ptr(hdr, H_DSCALE_INV);
  const Einv = ptr(hdr, H_ESCALE_INV);
  let cx: f64 = 0;
  let dres: f64 = 0;
  for (let j = 0; j < n; j++) {
    const xj = f64At(xyz, j);
    let acc: f64 = 0;
    const aEnd = i32At(Ap, j + 1);
    for (let q = i32At(Ap, j); q < aEnd; q++) {
      const i = i32At(Ai, q);
      const v = f64At(Ax, q);
      setF64(ry, i, f64At(ry, i) + v * xj);
      acc += v * f64At(y, i);
    }
    const gEnd = i32At(Gp, j + 1);
    for (let q = i32At(Gp, j); q < gEnd; q++) {
      const i = i32At(Gi, q);
      const v = f64At(Gx, q);
      setF64(rz, i, f64At(rz, i) + v * xj);
      acc += v * f64At(z, i);
    }
    const cj = f64At(c, j);
    const rj = acc + cj * tau;
    setF64(r, j, rj);
    cx += cj * xj;
    dres = Math.max(dres, Math.abs(rj * f64At(Dinv, j)));
  }
  // The residual norms in the problem's own units (termination.ts: unscaledResidualNorms) and the dots.
  let by: f64 = 0;
  let presEq: f64 = 0;
  for (let i = 0; i < p; i++) {
    by += f64At(b, i) * f64At(y, i);
    presEq = Math.max(presEq, Math.abs(f64At(ry, i) * f64At(Einv, i)));
  }
  let hz: f64 = 0;
  let sz: f64 = 0;
  let presCone: f64 = 0;
  for (let i = 0; i < m; i++) {
    const zi = f64At(z, i);
    hz += f64At(h, i) * zi;
    sz += f64At(s, i) * zi;
    presCone = Math.max(presCone, Math.abs(f64At(rz, i) * f64At(Einv, p + i)));
  }
  setF64(fs, F_CX, cx);
  setF64(fs, F_BY, by);
  setF64(fs, F_HZ, hz);
  setF64(fs, F_SZ, sz);
  setF64(fs, F_PRES_EQ, presEq);
  setF64(fs, F_PRES_CONE, presCone);
  setF64(fs, F_DRES, dres);
}


/**
 * The right-hand side of a search direction for residual reduction η and complementarity right-hand side
 * `dsTarget` (scaled space): u = W(λ \ d_s) into ds, and −η r − [0; 0; u] (less `minus` unless 0) into `rhs`.
 */
function directionRhs(hdr: usize, eta: f64, dsTarget: usize, rhs: usize, minus: usize): void {
  const n = i32At(hdr, H_N);
  const p = i32At(hdr, H_P);
  const ds = ptr(hdr, H_DS);
  const tmp2 = ptr(hdr, H_TMP2);
  const r = ptr(hdr, H_RXYZ);
  const lambda = ptr(hdr, H_LAMBDA);
  const w = ptr(hdr, H_W);
  if (minus == 0) for (let j = 0; j < n + p; j++) setF64(rhs, j, -eta * f64At(r, j));
  else for (let j = 0; j < n + p; j++) setF64(rhs, j, -eta * f64At(r, j) - f64At(minus, j));
  const minusZ = minus + (<usize>(n + p) << 3);
  // Per cone: λ \ d_s, then W(λ \ d_s), then the z rows of the right-hand side.
  const rz = r + (<usize>(n + p) << 3);
  const rhsZ = rhs + (<usize>(n + p) << 3);
  const l = i32At(hdr, H_L);
  for (let i = 0; i < l; i++) {
    const u = f64At(w, i) * (f64At(dsTarget, i) / f64At(lambda, i));
    setF64(ds, i, u);
    const v = -eta * f64At(rz, i) - u;
    setF64(rhsZ, i, minus == 0 ? v : v - f64At(minusZ, i));
  }
  const nsoc = i32At(hdr, H_NSOC);
  const offs = ptr(hdr, H_SOC_OFF);
  const dims = ptr(hdr, H_SOC_DIM);
  const etas = ptr(hdr, H_ETA);
  for (let c = 0; c < nsoc; c++) {
    const o = i32At(offs, c);
    const q = i32At(dims, c);
    socJordanDivide(lambda, dsTarget, tmp2, o, q);
    applySocScaling(w, o, q, tmp2, ds, f64At(etas, c), 1);
    for (let i = o; i < o + q; i++) {
      const v = -eta * f64At(rz, i) - f64At(ds, i);
      setF64(rhsZ, i, minus == 0 ? v : v - f64At(minusZ, i));
    }
  }
}

/**
 * Completes a direction from the solve in `src` (of directionRhs's system; plus `base` and its dot with
 * [c; b; h] from the predictor, unless 0) and d_κ: [Δx; Δy; Δz] in sol2, Δs in ds, W⁻¹Δs and WΔz in
 * dsScaled and dzScaled, Δτ and Δκ in the scalar block. False when Δτ is not finite.
 */
function directionFinish(hdr: usize, fs: usize, eta: f64, dKappa: f64, tauPivot: f64, rTau: f64, src: usize, base: usize): bool {
  const n = i32At(hdr, H_N);
  const p = i32At(hdr, H_P);
  const m = i32At(hdr, H_M);
  const dim = n + p + m;
  const ds = ptr(hdr, H_DS);
  const tmp2 = ptr(hdr, H_TMP2);
  const sol1 = ptr(hdr, H_SOL1);
  const sol2 = ptr(hdr, H_SOL2);
  const tau = f64At(fs, F_TAU);
  const kappa = f64At(fs, F_KAPPA);
  let solDot = dotRange(ptr(hdr, H_CBH), dim, src, 0);
  if (base == 0) setF64(fs, F_PREDICTOR_DOT, solDot);
  else solDot += f64At(fs, F_PREDICTOR_DOT);
  const dTau = (-eta * rTau - dKappa / tau - solDot) / tauPivot;
  if (!isFinite(dTau)) return false;
  if (base == 0) for (let i = 0; i < dim; i++) setF64(sol2, i, f64At(src, i) + dTau * f64At(sol1, i));
  else for (let i = 0; i < dim; i++) setF64(sol2, i, f64At(src, i) + f64At(base, i) + dTau * f64At(sol1, i));
  // Per cone: WΔz, then Δs = W(λ \ d_s) − W(WΔz), then W⁻¹Δs (the workspace's mulW / mulWinv passes).
  const dz = sol2 + (<usize>(n + p) << 3);
  const dzScaled = ptr(hdr, H_DZ_SCALED);
  const dsScaled = ptr(hdr, H_DS_SCALED);
  const w = ptr(hdr, H_W);
  const l = i32At(hdr, H_L);
  for (let i = 0; i < l; i++) {
    const wi = f64At(w, i);
    const dzs = wi * f64At(dz, i);
    setF64(dzScaled, i, dzs);
    const dsi = f64At(ds, i) - wi * dzs;
    setF64(ds, i, dsi);
    setF64(dsScaled, i, dsi / wi);
  }
  const nsoc = i32At(hdr, H_NSOC);
  const offs = ptr(hdr, H_SOC_OFF);
  const dims = ptr(hdr, H_SOC_DIM);
  const etas = ptr(hdr, H_ETA);
  for (let c = 0; c < nsoc; c++) {
    const o = i32At(offs, c);
    const q = i32At(dims, c);
    const eta = f64At(etas, c);
    applySocScaling(w, o, q, dz, dzScaled, eta, 1);
    applySocScaling(w, o, q, dzScaled, tmp2, eta, 1);
    for (let i = o; i < o + q; i++) setF64(ds, i, f64At(ds, i) - f64At(tmp2, i));
    applySocScaling(w, o, q, ds, dsScaled, 1 / eta, -1);
  }
  setF64(fs, F_DTAU, dTau);
  setF64(fs, F_DKAPPA, (dKappa - kappa * dTau) / tau);
  return true;
}

/** Largest α with λ + α W⁻¹Δs, λ + α WΔz ∈ K and τ, κ ≥ 0. */
function stepToBoundary(hdr: usize, fs: usize, dTau: f64, dKappa: f64): f64 {
  const lambda = ptr(hdr, H_LAMBDA);
  let alpha = coneStepLength2(hdr, lambda, ptr(hdr, H_DS_SCALED), ptr(hdr, H_DZ_SCALED));
  if (dTau < 0) alpha = Math.min(alpha, -f64At(fs, F_TAU) / dTau);
  if (dKappa < 0) alpha = Math.min(alpha, -f64At(fs, F_KAPPA) / dKappa);
  return alpha;
}

/**
 * One predictor–corrector step from the iterate and the residuals of ipmResiduals(): updates the iterate
 * (x, y, z, s, τ, κ) and returns the step length, or −1 on a numerical failure.
 */
export function ipmStep(hdr: usize, fs: usize): f64 {
  const n = i32At(hdr, H_N);
  const p = i32At(hdr, H_P);
  const m = i32At(hdr, H_M);
  const dim = n + p + m;
  const tau = f64At(fs, F_TAU);
  const kappa = f64At(fs, F_KAPPA);
  if (!updateScaling(hdr)) return -1;
  if (!updateAndFactor(hdr, fs)) return -1;
  const c = ptr(hdr, H_C);
  const b = ptr(hdr, H_B);
  const h = ptr(hdr, H_H);
  const rhs = ptr(hdr, H_RHS);
  const sol1 = ptr(hdr, H_SOL1);

  // Solve 1 (direction of τ), K [x1; y1; z1] = [−c; b; h], together with the affine (predictor) direction,
  // d_s = −λ∘λ, d_κ = −τκ: two right-hand sides on one pass over the factor.
  for (let j = 0; j < n; j++) setF64(rhs, j, -f64At(c, j));
  memory.copy(rhs + (<usize>n << 3), b, <usize>p << 3);
  memory.copy(rhs + (<usize>(n + p) << 3), h, <usize>m << 3);
  const lambda = ptr(hdr, H_LAMBDA);
  const tmp = ptr(hdr, H_TMP);
  const tmp2 = ptr(hdr, H_TMP2);
  const rhs2 = ptr(hdr, H_RHS2);
  negatedJordanSquare(hdr, lambda, tmp);
  directionRhs(hdr, 1, tmp, rhs2, 0);
  // The predictor's right-hand side (rhs2) and solution stay for the corrector (see the workspace's direction()).
  const predictorSolution = ptr(hdr, H_PREDICTOR_SOLUTION);
  if (!kktSolvePair(hdr, fs, rhs, rhs2, sol1, predictorSolution, i32At(hdr, H_REFINE_MAX), i32At(hdr, H_REFINE_AFFINE))) return -1;
  const tauPivot = dotRange(ptr(hdr, H_CBH), n + p + m, sol1, 0) - kappa / tau;
  const mu = (f64At(fs, F_SZ) + tau * kappa) / (f64At(fs, F_DEGREE) + 1);
  const rTau = kappa + f64At(fs, F_CX) + f64At(fs, F_BY) + f64At(fs, F_HZ);
  if (!directionFinish(hdr, fs, 1, -tau * kappa, tauPivot, rTau, predictorSolution, 0)) return -1;
  const dTauAff = f64At(fs, F_DTAU);
  const dKappaAff = f64At(fs, F_DKAPPA);
  const alphaAff = Math.min(1, stepToBoundary(hdr, fs, dTauAff, dKappaAff));

  // Centring σ = (1 − α_aff)³ and the second-order correction.
  const oneMinus = 1 - alphaAff;
  const sigma = Math.min(1, Math.max(1e-4, oneMinus * oneMinus * oneMinus));
  // tmp still holds −λ∘λ (the affine target).
  jordanProduct(hdr, ptr(hdr, H_DS_SCALED), ptr(hdr, H_DZ_SCALED), tmp2);
  const ones = ptr(hdr, H_ONES);
  for (let i = 0; i < m; i++) setF64(tmp, i, f64At(tmp, i) - f64At(tmp2, i) + sigma * mu * f64At(ones, i));
  const dKappaRhs = -tau * kappa - dTauAff * dKappaAff + sigma * mu;
  // The corrector: the predictor's refined solution plus an unrefined solve of the difference.
  directionRhs(hdr, 1 - sigma, tmp, rhs, rhs2);
  const sol2 = ptr(hdr, H_SOL2);
  if (!kktSolve(hdr, fs, rhs, sol2, 0)) return -1;
  if (!directionFinish(hdr, fs, 1 - sigma, dKappaRhs, tauPivot, rTau, sol2, predictorSolution)) return -1;
  const dTau = f64At(fs, F_DTAU);
  const dKappa = f64At(fs, F_DKAPPA);
  const alphaMax = stepToBoundary(hdr, fs, dTau, dKappa);
  const alpha = Math.min(1, f64At(fs, F_STEP_FRACTION) * alphaMax);

  // Update the iterate.
  const xyz = ptr(hdr, H_XYZ);
  const s = ptr(hdr, H_S);
  const ds = ptr(hdr, H_DS);
  for (let i = 0; i < dim; i++) setF64(xyz, i, f64At(xyz, i) + alpha * f64At(sol2, i));
  for (let i = 0; i < m; i++) setF64(s, i, f64At(s, i) + alpha * f64At(ds, i));
  setF64(fs, F_TAU, tau + alpha * dTau);
  setF64(fs, F_KAPPA, kappa + alpha * dKappa);
  return alpha;
}
