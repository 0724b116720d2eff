/**
 * Exact discretisation of the translational dynamics in the rotating surface frame,
 *   ẋ = A x + B (u + g),  x = (r, v),  A = [[0, I], [−[ω×]², −2[ω×]]],  B = [0; I],
 * for a control that is held piecewise constant (zero-order hold, ZOH) or piecewise linear
 * (first-order hold, FOH) between nodes. The matrices come from one matrix exponential of the
 * augmented system  d/dt (x, w, ẇ) = ([A B 0; 0 0 I; 0 0 0]) (x, w, ẇ)  over one step Δt
 * (Van Loan 1978, "Computing integrals involving the matrix exponential", IEEE TAC 23(3)):
 *   exp(M Δt) = [[Φ, Γ1, Γ2], [0, I, Δt I], [0, 0, I]],
 *   Φ = e^{AΔt},  Γ1 = ∫₀^Δt e^{As} ds B,  Γ2 = ∫₀^Δt e^{A(Δt−s)} B s ds.
 * With u(t) = u_k + (u_{k+1} − u_k)(t − t_k)/Δt:
 *   x_{k+1} = Φ x_k + (Γ1 − Γ2/Δt) u_k + (Γ2/Δt) u_{k+1} + Γ1 g.
 * With ZOH, x_{k+1} = Φ x_k + Γ1 u_k + Γ1 g. Gravity is constant, so Γ1 g is exact in both cases.
 */
import type { Vec3 } from './constants.ts';
import { expm } from './expm.ts';

export type ControlHold = 'zoh' | 'foh';

export interface DiscreteStep {
  /** State transition, 6 × 6 row-major. */
  readonly phi: Float64Array;
  /** Control influence of u_k and u_{k+1}, 6 × 3 row-major (uNext is zero for ZOH). */
  readonly uNow: Float64Array;
  readonly uNext: Float64Array;
  /** Constant term Γ1 g, length 6. */
  readonly gravityTerm: Float64Array;
}

/** Continuous-time A (6 × 6 row-major) for rotation rate ω. */
export function continuousDynamics(omega: Vec3): Float64Array {
  const [wx, wy, wz] = omega;
  const W = [0, -wz, wy, wz, 0, -wx, -wy, wx, 0];
  const W2 = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) W2[i * 3 + j] += W[i * 3 + k] * W[k * 3 + j];
  const A = new Float64Array(36);
  for (let i = 0; i < 3; i++) {
    A[i * 6 + 3 + i] = 1;
    for (let j = 0; j < 3; j++) {
      A[(3 + i) * 6 + j] = -W2[i * 3 + j];
      A[(3 + i) * 6 + 3 + j] = -2 * W[i * 3 + j];
    }
  }
  return A;
}

export function discretise(omega: Vec3, gravity: Vec3, dt: number, hold: ControlHold): DiscreteStep {
  if (!(dt > 0) || !Number.isFinite(dt)) throw new RangeError(`discretise: time step ${dt} s (must be positive and finite)`);
  const A = continuousDynamics(omega);
  const n = 12;
  const M = new Float64Array(n * n);
  for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) M[i * n + j] = A[i * 6 + j] * dt;
  for (let i = 0; i < 3; i++) {
    M[(3 + i) * n + 6 + i] = dt; // B
    M[(6 + i) * n + 9 + i] = dt; // ẇ
  }
  const E = expm(M, n);
  const phi = new Float64Array(36);
  const g1 = new Float64Array(18);
  const g2 = new Float64Array(18);
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < 6; j++) phi[i * 6 + j] = E[i * n + j];
    for (let j = 0; j < 3; j++) {
      g1[i * 3 + j] = E[i * n + 6 + j];
      g2[i * 3 + j] = E[i * n + 9 + j] / dt; // Γ2 / Δt
    }
  }
  const uNow = new Float64Array(18);
  const uNext = new Float64Array(18);
  for (let i = 0; i < 18; i++) {
    if (hold === 'foh') {
      uNow[i] = g1[i] - g2[i];
      uNext[i] = g2[i];
    } else {
      uNow[i] = g1[i];
    }
  }
  const gravityTerm = new Float64Array(6);
  for (let i = 0; i < 6; i++) for (let j = 0; j < 3; j++) gravityTerm[i] += g1[i * 3 + j] * gravity[j];
  return { phi, uNow, uNext, gravityTerm };
}
