// Sparse LDLᵀ and KKT kernels, compiled to WebAssembly by AssemblyScript (`npm run build:kernels`).
// Every array lives in the instance's imported memory and is passed as a byte offset; the TypeScript
// side (core/linalg/wasm/ldlWasm.ts) lays the arrays out and keeps views on them. The algorithms are
// those of core/linalg/ldl.ts, which stays as the portable reference implementation: the unit tests
// require both to agree.

import { f64At, i32At, setF64 } from './memory';

/**
 * Numeric up-looking LDLᵀ on precomputed row patterns (see ldl.ts), for an upper triangle whose columns
 * end with their diagonal entries. Returns the number of pivots replaced by dynamic regularisation, or −1
 * when a pivot is zero or not finite and no sign is given (sign = 0).
 */
export function ldlRefactor(
  n: i32, Ap: usize, Ai: usize, Ax: usize,
  Lp: usize, Li: usize, Rp: usize, Ri: usize, Rpos: usize,
  Lx: usize, Rx: usize, D: usize, Dinv: usize, y: usize,
  sign: usize, eps: f64, delta: f64,
): i32 {
  let regularised = 0;
  memory.fill(y, 0, <usize>n << 3);
  for (let k = 0; k < n; k++) {
    // Column k of the upper triangle ends with its diagonal entry (checked by the systems that call this).
    const last = i32At(Ap, k + 1) - 1;
    for (let p = i32At(Ap, k); p < last; p++) setF64(y, i32At(Ai, p), f64At(Ax, p));
    let dk = f64At(Ax, last);
    const rowEnd = i32At(Rp, k + 1);
    for (let t = i32At(Rp, k); t < rowEnd; t++) {
      const c = i32At(Ri, t);
      const pos = i32At(Rpos, t);
      const yc = f64At(y, c);
      setF64(y, c, 0);
      for (let j = i32At(Lp, c); j < pos; j++) {
        const r = i32At(Li, j);
        setF64(y, r, f64At(y, r) - f64At(Lx, j) * yc);
      }
      const l = yc * f64At(Dinv, c);
      setF64(Lx, pos, l);
      setF64(Rx, t, l);
      dk -= yc * l;
    }
    if (sign != 0) {
      const sk = <f64>load<i8>(sign + <usize>k);
      if (!(sk * dk >= eps)) {
        dk = sk * delta;
        regularised++;
      }
    } else if (dk == 0 || !isFinite(dk)) {
      return -1;
    }
    setF64(D, k, dk);
    setF64(Dinv, k, 1 / dk);
  }
  return regularised;
}

/** Solves L D Lᵀ x = b in place: forward substitution by rows (gather), then diagonal and backward by columns. */
export function ldlSolve(n: i32, Lp: usize, Li: usize, Lx: usize, Rp: usize, Ri: usize, Rx: usize, Dinv: usize, x: usize): void {
  for (let i = 0; i < n; i++) {
    let s = f64At(x, i);
    const end = i32At(Rp, i + 1);
    for (let q = i32At(Rp, i); q < end; q++) s -= f64At(Rx, q) * f64At(x, i32At(Ri, q));
    setF64(x, i, s);
  }
  // Backward, each row scaled by its D⁻¹ as it is reached (rows below it are final by then).
  for (let i = n - 1; i >= 0; i--) {
    let s = f64At(x, i) * f64At(Dinv, i);
    const end = i32At(Lp, i + 1);
    for (let j = i32At(Lp, i); j < end; j++) s -= f64At(Lx, j) * f64At(x, i32At(Li, j));
    setF64(x, i, s);
  }
}

/**
 * r = b − (S − δ·diag(sign)) x for a symmetric S stored as its upper triangle (CSC, rows sorted, so each
 * column's diagonal is its last entry). With δ the static regularisation this is the residual against the
 * unregularised KKT matrix that iterative refinement needs.
 */
export function symmetricResidualShifted(n: i32, Ap: usize, Ai: usize, Ax: usize, sign: usize, delta: f64, b: usize, x: usize, r: usize): void {
  memory.copy(r, b, <usize>n << 3);
  for (let j = 0; j < n; j++) {
    const xj = f64At(x, j);
    const last = i32At(Ap, j + 1) - 1;
    let s = (f64At(Ax, last) - <f64>load<i8>(sign + <usize>j) * delta) * xj;
    for (let q = i32At(Ap, j); q < last; q++) {
      const i = i32At(Ai, q);
      const v = f64At(Ax, q);
      setF64(r, i, f64At(r, i) - v * xj);
      s += v * f64At(x, i);
    }
    setF64(r, j, f64At(r, j) - s);
  }
}

/**
 * The refined solve of ldlSystem.ts, whole: x = S⁻¹ b with b, x in the original order (perm[k] = original
 * index of permuted row k), refined against S₀ = S − shift·diag(sign). Writes the final relative residual
 * to info[0]; returns the refinement steps taken, or −1 − steps when x is not finite.
 */
export function ldlSolveRefined(
  n: i32, Lp: usize, Li: usize, Lx: usize, Rp: usize, Ri: usize, Rx: usize, Dinv: usize,
  Ap: usize, Ai: usize, Ax: usize, sign: usize, shift: f64, perm: usize,
  rhs: usize, out: usize, work: usize, bk: usize, correction: usize, lastStep: usize,
  tolerance: f64, maxSteps: i32, info: usize,
): i32 {
  let rhsNorm: f64 = 0;
  for (let k = 0; k < n; k++) {
    const v = f64At(rhs, i32At(perm, k));
    setF64(work, k, v);
    setF64(bk, k, v);
    const a = abs(v);
    if (a > rhsNorm) rhsNorm = a;
  }
  ldlSolve(n, Lp, Li, Lx, Rp, Ri, Rx, Dinv, work);
  const tol = tolerance * (1 + rhsNorm);
  let steps = 0;
  let prevNorm: f64 = Infinity;
  // With no step allowed the residual is not measured (see ldlSystem.ts).
  let finalNorm: f64 = NaN;
  while (maxSteps > 0) {
    symmetricResidualShifted(n, Ap, Ai, Ax, sign, shift, bk, work, correction);
    let norm: f64 = 0;
    for (let k = 0; k < n; k++) {
      const a = abs(f64At(correction, k));
      if (a > norm) norm = a;
    }
    if (norm > prevNorm) {
      for (let k = 0; k < n; k++) setF64(work, k, f64At(work, k) - f64At(lastStep, k));
      finalNorm = prevNorm;
      break;
    }
    finalNorm = norm;
    if (!(norm > tol) || steps >= maxSteps || norm > 0.2 * prevNorm) break;
    prevNorm = norm;
    ldlSolve(n, Lp, Li, Lx, Rp, Ri, Rx, Dinv, correction);
    for (let k = 0; k < n; k++) setF64(work, k, f64At(work, k) + f64At(correction, k));
    steps++;
    // The residual after the last allowed step is not measured (see ldlSystem.ts).
    if (steps >= maxSteps) break;
    memory.copy(lastStep, correction, <usize>n << 3);
  }
  setF64(info, 0, finalNorm / (1 + rhsNorm));
  let finite = true;
  for (let k = 0; k < n; k++) {
    const v = f64At(work, k);
    if (!isFinite(v)) finite = false;
    setF64(out, i32At(perm, k), v);
  }
  return finite ? steps : -1 - steps;
}

// ---- two right-hand sides at once (WebAssembly SIMD: one f64x2 lane per right-hand side) ----
// Vectors of the pair are interleaved: entry k of the first at 16k, of the second at 16k + 8. Each lane
// runs exactly the operations of the one-vector kernels above, in the same order, so a pair gives the
// same bits as two single solves for the price of little more than one pass over the factor.

@inline function pairAt(base: usize, i: i32): v128 {
  return v128.load(base + (<usize>i << 4));
}
@inline function setPair(base: usize, i: i32, v: v128): void {
  v128.store(base + (<usize>i << 4), v);
}

/** ldlSolve on an interleaved pair, in place. */
export function ldlSolvePair(n: i32, Lp: usize, Li: usize, Lx: usize, Rp: usize, Ri: usize, Rx: usize, Dinv: usize, x: usize): void {
  for (let i = 0; i < n; i++) {
    let s = pairAt(x, i);
    const end = i32At(Rp, i + 1);
    for (let q = i32At(Rp, i); q < end; q++) s = f64x2.sub(s, f64x2.mul(f64x2.splat(f64At(Rx, q)), pairAt(x, i32At(Ri, q))));
    setPair(x, i, s);
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = f64x2.mul(pairAt(x, i), f64x2.splat(f64At(Dinv, i)));
    const end = i32At(Lp, i + 1);
    for (let j = i32At(Lp, i); j < end; j++) s = f64x2.sub(s, f64x2.mul(f64x2.splat(f64At(Lx, j)), pairAt(x, i32At(Li, j))));
    setPair(x, i, s);
  }
}

/** symmetricResidualShifted on an interleaved pair. */
export function symmetricResidualShiftedPair(n: i32, Ap: usize, Ai: usize, Ax: usize, sign: usize, delta: f64, b: usize, x: usize, r: usize): void {
  memory.copy(r, b, <usize>n << 4);
  for (let j = 0; j < n; j++) {
    const xj = pairAt(x, j);
    const last = i32At(Ap, j + 1) - 1;
    let s = f64x2.mul(f64x2.splat(f64At(Ax, last) - <f64>load<i8>(sign + <usize>j) * delta), xj);
    for (let q = i32At(Ap, j); q < last; q++) {
      const i = i32At(Ai, q);
      const v = f64x2.splat(f64At(Ax, q));
      setPair(r, i, f64x2.sub(pairAt(r, i), f64x2.mul(v, xj)));
      s = f64x2.add(s, f64x2.mul(v, pairAt(x, i)));
    }
    setPair(r, j, f64x2.sub(pairAt(r, j), s));
  }
}

/**
 * ldlSolveRefined for two right-hand sides at once: each runs its own refinement (own tolerance test,
 * step limit, and taking back of a step that made its residual worse); a side that has stopped rides
 * along with a zero correction. `pair` is scratch of 4 interleaved vectors (64 n bytes). Writes the
 * final relative residuals to info[0], info[1]; returns stepsA + 1024 stepsB, negated minus one when
 * either result is not finite.
 */
export function ldlSolveRefinedPair(
  n: i32, Lp: usize, Li: usize, Lx: usize, Rp: usize, Ri: usize, Rx: usize, Dinv: usize,
  Ap: usize, Ai: usize, Ax: usize, sign: usize, shift: f64, perm: usize,
  rhsA: usize, rhsB: usize, outA: usize, outB: usize, pair: usize,
  tolerance: f64, maxStepsA: i32, maxStepsB: i32, info: usize,
): i32 {
  const bytes = <usize>n << 4;
  const work = pair;
  const bk = pair + bytes;
  const correction = pair + 2 * bytes;
  const lastStep = pair + 3 * bytes;
  let normA: f64 = 0;
  let normB: f64 = 0;
  for (let k = 0; k < n; k++) {
    const o = i32At(perm, k);
    const a = f64At(rhsA, o);
    const b = f64At(rhsB, o);
    const v = f64x2.replace_lane(f64x2.splat(a), 1, b);
    setPair(work, k, v);
    setPair(bk, k, v);
    if (abs(a) > normA) normA = abs(a);
    if (abs(b) > normB) normB = abs(b);
  }
  ldlSolvePair(n, Lp, Li, Lx, Rp, Ri, Rx, Dinv, work);
  const tolA = tolerance * (1 + normA);
  const tolB = tolerance * (1 + normB);
  let stepsA = 0;
  let stepsB = 0;
  let prevA: f64 = Infinity;
  let prevB: f64 = Infinity;
  // A side allowed no step is not measured (see ldlSystem.ts).
  let finalA: f64 = NaN;
  let finalB: f64 = NaN;
  let doneA = maxStepsA <= 0;
  let doneB = maxStepsB <= 0;
  while (!doneA || !doneB) {
    symmetricResidualShiftedPair(n, Ap, Ai, Ax, sign, shift, bk, work, correction);
    let rA: f64 = 0;
    let rB: f64 = 0;
    for (let k = 0; k < n; k++) {
      const r = pairAt(correction, k);
      const a = abs(f64x2.extract_lane(r, 0));
      const b = abs(f64x2.extract_lane(r, 1));
      if (a > rA) rA = a;
      if (b > rB) rB = b;
    }
    // Per side: take back a step that made things worse; stop at the tolerance, the limit, or a poor gain.
    let keepA = false;
    let keepB = false;
    if (!doneA) {
      if (rA > prevA) {
        for (let k = 0; k < n; k++) store<f64>(work + (<usize>k << 4), load<f64>(work + (<usize>k << 4)) - load<f64>(lastStep + (<usize>k << 4)));
        finalA = prevA;
        doneA = true;
      } else {
        finalA = rA;
        if (!(rA > tolA) || stepsA >= maxStepsA || rA > 0.2 * prevA) doneA = true;
        else { prevA = rA; keepA = true; }
      }
    }
    if (!doneB) {
      if (rB > prevB) {
        for (let k = 0; k < n; k++) store<f64>(work + (<usize>k << 4) + 8, load<f64>(work + (<usize>k << 4) + 8) - load<f64>(lastStep + (<usize>k << 4) + 8));
        finalB = prevB;
        doneB = true;
      } else {
        finalB = rB;
        if (!(rB > tolB) || stepsB >= maxStepsB || rB > 0.2 * prevB) doneB = true;
        else { prevB = rB; keepB = true; }
      }
    }
    if (doneA && doneB) break;
    // A stopped side's correction is cleared bitwise (+0 whatever it held), so its solution stays put.
    if (!keepA || !keepB) {
      const keep = i64x2.replace_lane(i64x2.splat(keepA ? -1 : 0), 1, keepB ? -1 : 0);
      for (let k = 0; k < n; k++) setPair(correction, k, v128.and(pairAt(correction, k), keep));
    }
    ldlSolvePair(n, Lp, Li, Lx, Rp, Ri, Rx, Dinv, correction);
    for (let k = 0; k < n; k++) setPair(work, k, f64x2.add(pairAt(work, k), pairAt(correction, k)));
    // A side that has taken its last allowed step stops unmeasured (as in ldlSolveRefined).
    if (keepA && ++stepsA >= maxStepsA) doneA = true;
    if (keepB && ++stepsB >= maxStepsB) doneB = true;
    if (doneA && doneB) break;
    memory.copy(lastStep, correction, bytes);
  }
  setF64(info, 0, finalA / (1 + normA));
  setF64(info, 1, finalB / (1 + normB));
  let finite = true;
  for (let k = 0; k < n; k++) {
    const o = i32At(perm, k);
    const v = pairAt(work, k);
    const a = f64x2.extract_lane(v, 0);
    const b = f64x2.extract_lane(v, 1);
    if (!isFinite(a) || !isFinite(b)) finite = false;
    setF64(outA, o, a);
    setF64(outB, o, b);
  }
  const steps = stepsA + 1024 * stepsB;
  return finite ? steps : -1 - steps;
}
