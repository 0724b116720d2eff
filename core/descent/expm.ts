/**
 * Dense matrix exponential for the small matrices of the discretisation (≤ 12 × 12).
 *
 * Scaling and squaring with a truncated Taylor series: the matrix is scaled by 2^−s so that its
 * 1-norm is ≤ 1/2, the series is summed until terms fall below machine precision relative to the
 * sum (at most 30 terms), then squared s times (Moler & Van Loan 1978/2003, "Nineteen dubious ways",
 * method 3 + scaling and squaring). Accurate to a few ulps for the well-scaled systems used here.
 */

/** Row-major n × n matrix. */
export type DenseMatrix = Float64Array;

function norm1(M: DenseMatrix, n: number): number {
  let best = 0;
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += Math.abs(M[i * n + j]);
    if (s > best) best = s;
  }
  return best;
}

function matmul(A: DenseMatrix, B: DenseMatrix, n: number, out: DenseMatrix): void {
  out.fill(0);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < n; k++) {
      const a = A[i * n + k];
      if (a === 0) continue;
      for (let j = 0; j < n; j++) out[i * n + j] += a * B[k * n + j];
    }
  }
}

/** exp(M) for a row-major n × n matrix. */
export function expm(M: DenseMatrix, n: number): DenseMatrix {
  if (M.length !== n * n) throw new RangeError(`expm: matrix has ${M.length} entries, expected ${n * n}`);
  for (let i = 0; i < M.length; i++) {
    if (!Number.isFinite(M[i])) throw new RangeError(`expm: entry ${i} is ${M[i]} (must be finite)`);
  }
  const nrm = norm1(M, n);
  const s = nrm > 0.5 ? Math.ceil(Math.log2(nrm / 0.5)) : 0;
  const scale = Math.pow(2, -s);
  const A = new Float64Array(n * n);
  for (let i = 0; i < A.length; i++) A[i] = M[i] * scale;
  const sum = new Float64Array(n * n);
  for (let i = 0; i < n; i++) sum[i * n + i] = 1;
  let term = new Float64Array(sum);
  let next = new Float64Array(n * n);
  for (let k = 1; k <= 30; k++) {
    matmul(term, A, n, next);
    const inv = 1 / k;
    let maxTerm = 0;
    for (let i = 0; i < next.length; i++) {
      next[i] *= inv;
      sum[i] += next[i];
      if (Math.abs(next[i]) > maxTerm) maxTerm = Math.abs(next[i]);
    }
    [term, next] = [next, term];
    if (maxTerm <= 1e-18) break;
  }
  let result = sum;
  let tmp = new Float64Array(n * n);
  for (let k = 0; k < s; k++) {
    matmul(result, result, n, tmp);
    [result, tmp] = [tmp, result];
  }
  return result;
}
