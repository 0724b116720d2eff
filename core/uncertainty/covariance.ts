/**
 * Covariance matrices given by the user: checked square, finite, symmetric and positive semi-definite, and
 * factored L Lᵀ = C for sampling (x = mean + L z, z standard normal). The check IS the factorisation: a
 * Cholesky decomposition (Golub & Van Loan, Matrix Computations, 4th ed., §4.2) with a pivot tolerance, so a
 * semi-definite matrix (a perfectly known axis, or perfectly correlated axes) is accepted and its zero pivot
 * gives a zero column, while a negative pivot beyond rounding is refused with the field named.
 */
import { UncertaintyInputError } from './inputError.ts';

/** Lower-triangular factor, row-major n × n. */
export interface CholeskyFactor {
  n: number;
  lower: Float64Array;
}

/**
 * Relative tolerance of the symmetry check and of a pivot treated as zero, against the largest diagonal
 * entry: a few hundred ulps of double precision, far below any covariance a user means to give.
 */
const RELATIVE_TOLERANCE = 1e-12;

/** Factors a covariance given as rows (`field` names it in errors, `unit` its unit, e.g. 'm²'). */
export function covarianceFactor(field: string, matrix: readonly (readonly number[])[], n: number, unit: string): CholeskyFactor {
  if (!Array.isArray(matrix) || matrix.length !== n || !matrix.every((row) => Array.isArray(row) && row.length === n)) {
    throw new UncertaintyInputError(field, matrix, `must be a ${n} × ${n} matrix (${n} rows of ${n} numbers, ${unit})`);
  }
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      if (!Number.isFinite(matrix[i][j])) throw new UncertaintyInputError(`${field}[${i}][${j}]`, matrix[i][j], `must be a finite number (${unit})`);
    }
  }
  let scale = 0;
  for (let i = 0; i < n; i++) {
    if (matrix[i][i] < 0) throw new UncertaintyInputError(`${field}[${i}][${i}]`, matrix[i][i], `is a variance and must be ≥ 0 (${unit}; the square of the 1σ value)`);
    scale = Math.max(scale, matrix[i][i]);
  }
  const tol = RELATIVE_TOLERANCE * scale;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      if (Math.abs(matrix[i][j] - matrix[j][i]) > tol) {
        throw new UncertaintyInputError(
          field,
          matrix,
          `is not symmetric: [${i}][${j}] = ${matrix[i][j]} but [${j}][${i}] = ${matrix[j][i]}; a covariance matrix has equal entries either side of the diagonal`,
        );
      }
    }
  }
  const L = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    let d = matrix[j][j];
    for (let k = 0; k < j; k++) d -= L[j * n + k] ** 2;
    if (d < -tol) {
      throw new UncertaintyInputError(
        field,
        matrix,
        `is not positive semi-definite (Cholesky pivot ${j} is ${d.toPrecision(4)} < 0): some combination of the axes would have a negative variance; keep every correlation ρ_ij = C_ij/√(C_ii C_jj) within ±1 and the matrix consistent`,
      );
    }
    const ljj = d > tol ? Math.sqrt(d) : 0;
    L[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = matrix[i][j];
      for (let k = 0; k < j; k++) s -= L[i * n + k] * L[j * n + k];
      if (ljj > 0) L[i * n + j] = s / ljj;
      else if (Math.abs(s) > Math.sqrt(tol * Math.max(tol, matrix[i][i])) + tol) {
        // A zero pivot with a non-zero remainder below it: the matrix has a negative eigenvalue.
        throw new UncertaintyInputError(
          field,
          matrix,
          `is not positive semi-definite (axis ${j} has no variance left but is still correlated with axis ${i}); keep every correlation within ±1`,
        );
      }
    }
  }
  return { n, lower: L };
}

/** x = L z for a factor and a vector of standard normals (written into `out`). */
export function applyFactor(f: CholeskyFactor, z: ArrayLike<number>, out: number[]): number[] {
  for (let i = 0; i < f.n; i++) {
    let s = 0;
    for (let k = 0; k <= i; k++) s += f.lower[i * f.n + k] * z[k];
    out[i] = s;
  }
  return out;
}

/** A diagonal covariance from per-axis 1σ values (rows). */
export function diagonalCovariance(sigmas: readonly number[]): number[][] {
  return sigmas.map((s, i) => sigmas.map((_, j) => (i === j ? s * s : 0)));
}
