// Sparse LDLᵀ and KKT kernels, compiled to WebAssembly by AssemblyScript (`npm run build:kernels`).
// Every array lives in the instance's imported memory and is passed as a byte offset; the TypeScript
// side (core/linalg/wasm/ldlWasm.ts) lays the arrays out and keeps views on them. The algorithms are
// those of core/linalg/ldl.ts, which stays as the portable reference implementation: the unit tests
// require both to agree.

@inline function f64At(base: usize, i: i32): f64 {
  return load<f64>(base + (<usize>i << 3));
}
@inline function setF64(base: usize, i: i32, v: f64): void {
  store<f64>(base + (<usize>i << 3), v);
}
@inline function i32At(base: usize, i: i32): i32 {
  return load<i32>(base + (<usize>i << 2));
}

/**
 * Numeric up-looking LDLᵀ on precomputed row patterns (see ldl.ts). Returns the number of pivots replaced
 * by dynamic regularisation, or −1 when a pivot is zero or not finite and no sign is given (sign = 0).
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
    let dk: f64 = 0;
    const colEnd = i32At(Ap, k + 1);
    for (let p = i32At(Ap, k); p < colEnd; p++) {
      const i = i32At(Ai, p);
      if (i == k) dk = f64At(Ax, p);
      else setF64(y, i, f64At(Ax, p));
    }
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

/** Solves L D Lᵀ x = b in place: forward substitution by rows (gather), diagonal, backward by columns. */
export function ldlSolve(n: i32, Lp: usize, Li: usize, Lx: usize, Rp: usize, Ri: usize, Rx: usize, Dinv: usize, x: usize): void {
  for (let i = 0; i < n; i++) {
    let s = f64At(x, i);
    const end = i32At(Rp, i + 1);
    for (let q = i32At(Rp, i); q < end; q++) s -= f64At(Rx, q) * f64At(x, i32At(Ri, q));
    setF64(x, i, s);
  }
  for (let i = 0; i < n; i++) setF64(x, i, f64At(x, i) * f64At(Dinv, i));
  for (let i = n - 1; i >= 0; i--) {
    let s = f64At(x, i);
    const end = i32At(Lp, i + 1);
    for (let j = i32At(Lp, i); j < end; j++) s -= f64At(Lx, j) * f64At(x, i32At(Li, j));
    setF64(x, i, s);
  }
}

/**
 * y = (S − δ·diag(sign)) x for a symmetric S stored as its upper triangle (CSC, rows sorted, so each
 * column's diagonal is its last entry). With δ the static regularisation this is the product with the
 * unregularised KKT matrix that iterative refinement needs.
 */
export function symmetricUpperMulShifted(n: i32, Ap: usize, Ai: usize, Ax: usize, sign: usize, delta: f64, x: usize, y: usize): void {
  memory.fill(y, 0, <usize>n << 3);
  for (let j = 0; j < n; j++) {
    const xj = f64At(x, j);
    const last = i32At(Ap, j + 1) - 1;
    let s = (f64At(Ax, last) - <f64>load<i8>(sign + <usize>j) * delta) * xj;
    for (let q = i32At(Ap, j); q < last; q++) {
      const i = i32At(Ai, q);
      const v = f64At(Ax, q);
      setF64(y, i, f64At(y, i) + v * xj);
      s += v * f64At(x, i);
    }
    setF64(y, j, f64At(y, j) + s);
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
  rhs: usize, out: usize, work: usize, bk: usize, correction: usize, product: usize, lastStep: usize,
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
  let finalNorm: f64 = 0;
  while (true) {
    symmetricUpperMulShifted(n, Ap, Ai, Ax, sign, shift, work, product);
    let norm: f64 = 0;
    for (let k = 0; k < n; k++) {
      const r = f64At(bk, k) - f64At(product, k);
      setF64(correction, k, r);
      const a = abs(r);
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
    memory.copy(lastStep, correction, <usize>n << 3);
    steps++;
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

/**
 * y = M x for the symmetric matrix made of the stored entries with mask[q] ≠ 0 only (off-diagonal
 * entries), x and y in the original order (perm as in ldlSolveRefined). For the KKT matrix with the A and
 * G entries masked this is [Aᵀy + Gᵀz; Ax; Gx], the products the interior-point residuals need.
 */
export function symmetricMaskedProduct(
  n: i32, Ap: usize, Ai: usize, Ax: usize, mask: usize, perm: usize, x: usize, y: usize, xw: usize, yw: usize,
): void {
  for (let k = 0; k < n; k++) setF64(xw, k, f64At(x, i32At(perm, k)));
  memory.fill(yw, 0, <usize>n << 3);
  for (let j = 0; j < n; j++) {
    const xj = f64At(xw, j);
    let s: f64 = 0;
    const end = i32At(Ap, j + 1);
    for (let q = i32At(Ap, j); q < end; q++) {
      if (load<u8>(mask + <usize>q) == 0) continue;
      const i = i32At(Ai, q);
      const v = f64At(Ax, q);
      setF64(yw, i, f64At(yw, i) + v * xj);
      s += v * f64At(xw, i);
    }
    setF64(yw, j, f64At(yw, j) + s);
  }
  for (let k = 0; k < n; k++) setF64(y, i32At(perm, k), f64At(yw, k));
}
