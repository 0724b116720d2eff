/**
 * Independent checks of a conic solution against the problem data (no solver code involved):
 * residuals, cone membership, duality gap, and the Farkas-type certificates of infeasibility.
 */
import type { ConicProblem } from '../../core/conic/types.ts';
import type { CscMatrix } from '../../core/linalg/csc.ts';

function mul(M: CscMatrix, x: ArrayLike<number>): Float64Array {
  const y = new Float64Array(M.m);
  for (let j = 0; j < M.n; j++) for (let p = M.colPtr[j]; p < M.colPtr[j + 1]; p++) y[M.rowIdx[p]] += M.values[p] * x[j];
  return y;
}

function mulT(M: CscMatrix, y: ArrayLike<number>): Float64Array {
  const x = new Float64Array(M.n);
  for (let j = 0; j < M.n; j++) for (let p = M.colPtr[j]; p < M.colPtr[j + 1]; p++) x[j] += M.values[p] * y[M.rowIdx[p]];
  return x;
}

const infNorm = (v: ArrayLike<number>) => Array.from(v).reduce((m, x) => Math.max(m, Math.abs(x)), 0);
const dot = (a: ArrayLike<number>, b: ArrayLike<number>) => Array.from(a).reduce((s, x, i) => s + x * b[i], 0);

/** Largest violation of v ∈ K (K self-dual, so the same test serves z ∈ K*): 0 when inside. */
export function coneViolation(p: ConicProblem, v: ArrayLike<number>): number {
  let worst = 0;
  const l = p.cones.nonnegative;
  for (let i = 0; i < l; i++) worst = Math.max(worst, -v[i]);
  let off = l;
  for (const q of p.cones.secondOrder) {
    let nrm = 0;
    for (let i = 1; i < q; i++) nrm += v[off + i] ** 2;
    worst = Math.max(worst, Math.sqrt(nrm) - v[off]);
    off += q;
  }
  return worst;
}

export interface OptimalityReport {
  /** ‖Ax − b‖∞ / max(1, ‖b‖∞) */
  equalityResidual: number;
  /** ‖Gx + s − h‖∞ / max(1, ‖h‖∞) */
  coneResidual: number;
  /** ‖Aᵀy + Gᵀz + c‖∞ / max(1, ‖c‖∞) */
  dualResidual: number;
  /** violations of s ∈ K and z ∈ K, relative to max(1, ‖·‖∞) */
  slackViolation: number;
  multiplierViolation: number;
  /** |cᵀx + bᵀy + hᵀz| / max(1, |cᵀx|) */
  relativeGap: number;
  objective: number;
}

export function checkOptimality(p: ConicProblem, x: Float64Array, y: Float64Array, z: Float64Array, s: Float64Array): OptimalityReport {
  const ax = mul(p.A, x);
  const gx = mul(p.G, x);
  const r1 = ax.map((v, i) => v - p.b[i]);
  const r2 = gx.map((v, i) => v + s[i] - p.h[i]);
  const rd = mulT(p.A, y);
  const gz = mulT(p.G, z);
  const r3 = rd.map((v, j) => v + gz[j] + p.c[j]);
  const objective = dot(p.c, x);
  return {
    equalityResidual: infNorm(r1) / Math.max(1, infNorm(p.b)),
    coneResidual: infNorm(r2) / Math.max(1, infNorm(p.h)),
    dualResidual: infNorm(r3) / Math.max(1, infNorm(p.c)),
    slackViolation: coneViolation(p, s) / Math.max(1, infNorm(s)),
    multiplierViolation: coneViolation(p, z) / Math.max(1, infNorm(z)),
    relativeGap: Math.abs(objective + dot(p.b, y) + dot(p.h, z)) / Math.max(1, Math.abs(objective)),
    objective,
  };
}

export interface CertificateReport {
  /** For primal infeasibility: ‖Aᵀy + Gᵀz‖∞ · max(1, ‖b‖∞, ‖h‖∞) / |bᵀy + hᵀz|; for dual: max(‖Ax‖∞, ‖Gx + s‖∞) · max(1, ‖c‖∞) / |cᵀx|. */
  residual: number;
  /** bᵀy + hᵀz (primal) or cᵀx (dual): must be negative. */
  value: number;
  /** Violation of z ∈ K* (primal) or s ∈ K (dual), relative to ‖·‖∞. */
  coneViolation: number;
}

/** Farkas: z ∈ K*, Aᵀy + Gᵀz = 0, bᵀy + hᵀz < 0 proves {x : Ax = b, h − Gx ∈ K} is empty. */
export function checkPrimalInfeasibility(p: ConicProblem, y: Float64Array, z: Float64Array): CertificateReport {
  const r = mulT(p.A, y);
  const gz = mulT(p.G, z);
  const value = dot(p.b, y) + dot(p.h, z);
  return {
    residual: (infNorm(r.map((v, j) => v + gz[j])) * Math.max(1, infNorm(p.b), infNorm(p.h))) / Math.abs(value),
    value,
    coneViolation: coneViolation(p, z) / Math.max(1e-300, infNorm(z)),
  };
}

/** A direction x with Ax = 0, s = −Gx ∈ K, cᵀx < 0 proves the problem unbounded below (if feasible). */
export function checkDualInfeasibility(p: ConicProblem, x: Float64Array, s: Float64Array): CertificateReport {
  const ax = mul(p.A, x);
  const gx = mul(p.G, x);
  const value = dot(p.c, x);
  return {
    residual: (Math.max(infNorm(ax), infNorm(gx.map((v, i) => v + s[i]))) * Math.max(1, infNorm(p.c))) / Math.abs(value),
    value,
    coneViolation: coneViolation(p, s) / Math.max(1e-300, infNorm(s)),
  };
}
