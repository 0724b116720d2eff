/** Small dense linear algebra for tests (independent of core/linalg, so it can check it). */

/** Solves M x = b by Gaussian elimination with partial pivoting. */
export function denseSolve(M: number[][], b: number[]): number[] {
  const n = M.length;
  const a = M.map((row, i) => [...row, b[i]]);
  for (let k = 0; k < n; k++) {
    let piv = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i][k]) > Math.abs(a[piv][k])) piv = i;
    [a[k], a[piv]] = [a[piv], a[k]];
    if (a[k][k] === 0) throw new Error('singular matrix');
    for (let i = k + 1; i < n; i++) {
      const f = a[i][k] / a[k][k];
      for (let j = k; j <= n; j++) a[i][j] -= f * a[k][j];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let s = a[i][n];
    for (let j = i + 1; j < n; j++) s -= a[i][j] * x[j];
    x[i] = s / a[i][i];
  }
  return x;
}

export function matVec(M: number[][], x: ArrayLike<number>): number[] {
  return M.map((row) => row.reduce((s, v, j) => s + v * x[j], 0));
}

export function transpose(M: number[][]): number[][] {
  return M.length === 0 ? [] : M[0].map((_, j) => M.map((row) => row[j]));
}

export function matMul(A: number[][], B: number[][]): number[][] {
  const Bt = transpose(B);
  return A.map((row) => Bt.map((col) => row.reduce((s, v, k) => s + v * col[k], 0)));
}

export const norm2 = (v: ArrayLike<number>): number => Math.sqrt(Array.from(v).reduce((s, x) => s + x * x, 0));
export const normInf = (v: ArrayLike<number>): number => Array.from(v).reduce((s, x) => Math.max(s, Math.abs(x)), 0);

/**
 * A random quasi-definite matrix [[H, Bᵀ], [B, −F]] (Vanderbei 1995: H, F diagonal positive), dense:
 * the shape of an interior-point KKT matrix, for the sparse LDLᵀ tests.
 */
export function quasiDefinite(rng: { uniform(a: number, b: number): number; next(): number; normal(): number }, n1: number, n2: number, density: number): number[][] {
  const n = n1 + n2;
  const M = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let i = 0; i < n1; i++) M[i][i] = rng.uniform(0.5, 3);
  for (let i = n1; i < n; i++) M[i][i] = -rng.uniform(0.5, 3);
  for (let i = n1; i < n; i++) {
    for (let j = 0; j < n1; j++) {
      if (rng.next() < density) {
        const v = rng.normal();
        M[i][j] = v;
        M[j][i] = v;
      }
    }
  }
  return M;
}
