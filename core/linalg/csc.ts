/**
 * Compressed sparse column (CSC) matrices: the one sparse format used across Landreach.
 *
 * Row indices inside each column are kept sorted and unique; `fromTriplets` sums duplicates.
 */
export interface CscMatrix {
  /** Number of rows. */
  readonly m: number;
  /** Number of columns. */
  readonly n: number;
  /** Column pointers, length n + 1; column j holds entries colPtr[j] .. colPtr[j+1]-1. */
  readonly colPtr: Int32Array;
  /** Row index of each stored entry, sorted within a column. */
  readonly rowIdx: Int32Array;
  /** Value of each stored entry. */
  readonly values: Float64Array;
}

/** Build a CSC matrix from (row, col, value) triplets; duplicate entries are summed. */
export function cscFromTriplets(
  m: number,
  n: number,
  rows: ArrayLike<number>,
  cols: ArrayLike<number>,
  vals: ArrayLike<number>,
): CscMatrix {
  if (!Number.isInteger(m) || m < 0) throw new RangeError(`invalid rows m: ${m} (must be a non-negative integer)`);
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`invalid columns n: ${n} (must be a non-negative integer)`);
  const nnz = rows.length;
  if (cols.length !== nnz || vals.length !== nnz) {
    throw new RangeError(`triplet arrays differ in length: rows ${rows.length}, cols ${cols.length}, values ${vals.length}`);
  }
  const count = new Int32Array(n + 1);
  for (let k = 0; k < nnz; k++) {
    const i = rows[k];
    const j = cols[k];
    if (!Number.isInteger(i) || i < 0 || i >= m) throw new RangeError(`triplet ${k}: row ${i} outside 0..${m - 1}`);
    if (!Number.isInteger(j) || j < 0 || j >= n) throw new RangeError(`triplet ${k}: column ${j} outside 0..${n - 1}`);
    count[j + 1]++;
  }
  for (let j = 0; j < n; j++) count[j + 1] += count[j];
  const order = new Int32Array(nnz);
  const next = count.slice(0, n);
  for (let k = 0; k < nnz; k++) order[next[cols[k]]++] = k;
  // Sort each column by row and merge duplicates.
  const colPtr = new Int32Array(n + 1);
  const rowTmp: number[] = [];
  const valTmp: number[] = [];
  for (let j = 0; j < n; j++) {
    const start = count[j];
    const end = count[j + 1];
    const idx = Array.from(order.subarray(start, end)).sort((a, b) => rows[a] - rows[b]);
    let last = -1;
    for (const k of idx) {
      const i = rows[k];
      if (i === last) {
        valTmp[valTmp.length - 1] += vals[k];
      } else {
        rowTmp.push(i);
        valTmp.push(vals[k]);
        last = i;
      }
    }
    colPtr[j + 1] = rowTmp.length;
  }
  return { m, n, colPtr, rowIdx: Int32Array.from(rowTmp), values: Float64Array.from(valTmp) };
}

/** Build a CSC matrix from a dense row-major array of rows (zeros are not stored). */
export function cscFromDense(dense: ReadonlyArray<ReadonlyArray<number>>, n?: number): CscMatrix {
  const m = dense.length;
  const cols = n ?? (m > 0 ? dense[0].length : 0);
  const r: number[] = [];
  const c: number[] = [];
  const v: number[] = [];
  for (let i = 0; i < m; i++) {
    if (dense[i].length !== cols) throw new RangeError(`dense row ${i} has ${dense[i].length} entries, expected ${cols}`);
    for (let j = 0; j < cols; j++) {
      if (dense[i][j] !== 0) {
        r.push(i);
        c.push(j);
        v.push(dense[i][j]);
      }
    }
  }
  return cscFromTriplets(m, cols, r, c, v);
}

/** An m × n matrix with no stored entries. */
export function cscEmpty(m: number, n: number): CscMatrix {
  return { m, n, colPtr: new Int32Array(n + 1), rowIdx: new Int32Array(0), values: new Float64Array(0) };
}

/** y += alpha · M x */
export function cscMulAdd(M: CscMatrix, x: ArrayLike<number>, y: Float64Array, alpha = 1): void {
  const { n, colPtr, rowIdx, values } = M;
  for (let j = 0; j < n; j++) {
    const xj = alpha * x[j];
    if (xj === 0) continue;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) y[rowIdx[p]] += values[p] * xj;
  }
}

/** y += alpha · Mᵀ x */
export function cscMulTransAdd(M: CscMatrix, x: ArrayLike<number>, y: Float64Array, alpha = 1): void {
  const { n, colPtr, rowIdx, values } = M;
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) sum += values[p] * x[rowIdx[p]];
    y[j] += alpha * sum;
  }
}

/** The transpose as a new CSC matrix (rows come out sorted). */
export function cscTranspose(M: CscMatrix): CscMatrix {
  const { m, n, colPtr, rowIdx, values } = M;
  const nnz = colPtr[n];
  const ptr = new Int32Array(m + 1);
  for (let p = 0; p < nnz; p++) ptr[rowIdx[p] + 1]++;
  for (let i = 0; i < m; i++) ptr[i + 1] += ptr[i];
  const next = ptr.slice(0, m);
  const ri = new Int32Array(nnz);
  const va = new Float64Array(nnz);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const q = next[rowIdx[p]]++;
      ri[q] = j;
      va[q] = values[p];
    }
  }
  return { m: n, n: m, colPtr: ptr, rowIdx: ri, values: va };
}

/** Dense copy (row-major arrays), for tests and small diagnostics. */
export function cscToDense(M: CscMatrix): number[][] {
  const out = Array.from({ length: M.m }, () => new Array<number>(M.n).fill(0));
  for (let j = 0; j < M.n; j++) {
    for (let p = M.colPtr[j]; p < M.colPtr[j + 1]; p++) out[M.rowIdx[p]][j] += M.values[p];
  }
  return out;
}

/** True when two matrices have the same size and the same stored pattern. */
export function cscSamePattern(a: CscMatrix, b: CscMatrix): boolean {
  if (a.m !== b.m || a.n !== b.n || a.colPtr[a.n] !== b.colPtr[b.n]) return false;
  for (let j = 0; j <= a.n; j++) if (a.colPtr[j] !== b.colPtr[j]) return false;
  const nnz = a.colPtr[a.n];
  for (let p = 0; p < nnz; p++) if (a.rowIdx[p] !== b.rowIdx[p]) return false;
  return true;
}
