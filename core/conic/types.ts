/**
 * Public types of the second-order cone program (SOCP) solver.
 *
 * Standard form:
 *   minimise    cᵀx
 *   subject to  A x = b
 *               G x + s = h,   s ∈ K
 * where K = R₊^l × Q^{q₁} × … × Q^{q_k}, Q^q = { (t, u) ∈ R × R^{q−1} : ‖u‖₂ ≤ t }.
 * The rows of G and h are ordered as the cones: first the l orthant rows, then each
 * second-order cone's rows with its "t" entry first.
 */
import type { CscMatrix } from '../linalg/csc.ts';

/** The cone K: l non-negative orthant rows, then second-order cones of the given sizes (each ≥ 1). */
export interface ConeSpec {
  /** Number of rows of G in the non-negative orthant (first rows of G). */
  readonly nonnegative: number;
  /** Sizes of the second-order cones, in row order after the orthant rows. */
  readonly secondOrder: readonly number[];
}

export interface ConicProblem {
  /** Cost vector, length n. */
  readonly c: Float64Array;
  /** Equality matrix, p × n (may have p = 0). */
  readonly A: CscMatrix;
  /** Equality right-hand side, length p. */
  readonly b: Float64Array;
  /** Cone matrix, m × n. */
  readonly G: CscMatrix;
  /** Cone right-hand side, length m. */
  readonly h: Float64Array;
  readonly cones: ConeSpec;
}

/**
 * Outcome of a solve.
 * - `solved`: primal and dual feasible and the gap closed to the requested tolerances.
 * - `almost-solved`: the same at the reduced-accuracy tolerances (`*Inaccurate` settings).
 * - `primal-infeasible`: a certificate (y, z) with z ∈ K*, Aᵀy + Gᵀz ≈ 0, bᵀy + hᵀz = −1 was found.
 * - `dual-infeasible`: the problem is unbounded below; a certificate x with cᵀx = −1,
 *    A x ≈ 0, −G x ∈ K (approximately) was found.
 * - `almost-primal-infeasible` / `almost-dual-infeasible`: the certificate holds at reduced accuracy.
 * - `max-iterations`: the iteration limit was reached with none of the above.
 * - `numerical-error`: the search direction or step broke down (e.g. singular KKT system).
 */
export type SolveStatus =
  | 'solved'
  | 'almost-solved'
  | 'primal-infeasible'
  | 'almost-primal-infeasible'
  | 'dual-infeasible'
  | 'almost-dual-infeasible'
  | 'max-iterations'
  | 'numerical-error';

export const isSolved = (s: SolveStatus): boolean => s === 'solved' || s === 'almost-solved';
export const isPrimalInfeasible = (s: SolveStatus): boolean =>
  s === 'primal-infeasible' || s === 'almost-primal-infeasible';
export const isDualInfeasible = (s: SolveStatus): boolean =>
  s === 'dual-infeasible' || s === 'almost-dual-infeasible';
export const isInfeasible = (s: SolveStatus): boolean => isPrimalInfeasible(s) || isDualInfeasible(s);

export interface SolveInfo {
  iterations: number;
  /** cᵀx at the returned point (NaN for infeasible outcomes). */
  primalObjective: number;
  /** −bᵀy − hᵀz at the returned point (NaN for infeasible outcomes). */
  dualObjective: number;
  /** max(|cᵀx + bᵀy + hᵀz|, sᵀz) at the returned point, scaled to τ = 1 (the measure the termination tests use). */
  gap: number;
  /** max(‖Ax − b‖∞, ‖Gx + s − h‖∞), in the problem's own units. */
  primalResidual: number;
  /** ‖Aᵀy + Gᵀz + c‖∞. */
  dualResidual: number;
  /** Number of numeric KKT factorisations. */
  factorisations: number;
  /**
   * Factorisations that met a pivot of the wrong sign and were retried with a 100× (then 10⁴×) larger
   * static regularisation (see kkt.ts). Absent in solutions adapted from other solvers.
   */
  regularisationRetries?: number;
  /** Wall time of the solve in milliseconds (0 where no clock is available). */
  solveTimeMs: number;
  /**
   * Which implementation of this solver ran the iterations: WebAssembly, or the portable TypeScript (same
   * bits, slower). Absent in solutions adapted from other solvers (test references).
   */
  kernels?: 'wasm' | 'javascript';
}

export interface ConicSolution {
  status: SolveStatus;
  /** Primal point (or the unboundedness certificate for dual-infeasible). */
  x: Float64Array;
  /** Equality multipliers (or part of the infeasibility certificate). */
  y: Float64Array;
  /** Cone multipliers, z ∈ K* (or part of the infeasibility certificate). */
  z: Float64Array;
  /** Cone slacks, s ∈ K. */
  s: Float64Array;
  info: SolveInfo;
}
