/**
 * Termination tests, judged in the problem's own (unequilibrated) units:
 *
 * - solved:   ‖Ax − b‖∞ ≤ ε_f max(1, ‖b‖∞),  ‖Gx + s − h‖∞ ≤ ε_f max(1, ‖h‖∞),
 *             ‖Aᵀy + Gᵀz + c‖∞ ≤ ε_f max(1, ‖c‖∞),  and gap ≤ ε_abs or gap / max(1, min(|p|, |d|)) ≤ ε_rel,
 *             gap = max(|cᵀx + bᵀy + hᵀz|, sᵀz) at (x, y, z, s)/τ;
 * - primal infeasible: κ > τ, bᵀy + hᵀz < 0 and ‖Aᵀy + Gᵀz‖∞ / |bᵀy + hᵀz| · max(1, ‖b‖∞, ‖h‖∞) ≤ ε_inf;
 * - dual infeasible:   κ > τ, cᵀx < 0 and max(‖Ax‖∞, ‖Gx + s‖∞) / |cᵀx| · max(1, ‖c‖∞) ≤ ε_inf;
 * all norms in the problem's own units (the certificate scaled to bᵀy + hᵀz = −1 resp. cᵀx = −1 makes
 * these the residuals a user checking the certificate would compute).
 */
import type { SolverSettings } from './settings.ts';
import type { SolveStatus } from './types.ts';

export interface Residuals {
  /** Aᵀy + Gᵀz + cτ (equilibrated). */
  rx: Float64Array;
  /** Ax − bτ. */
  ry: Float64Array;
  /** s + Gx − hτ. */
  rz: Float64Array;
  cx: number;
  by: number;
  hz: number;
  sz: number;
  tau: number;
  kappa: number;
  /** ‖Ax − bτ‖∞, ‖s + Gx − hτ‖∞ and ‖Aᵀy + Gᵀz + cτ‖∞ in the problem's own units (rows divided by their scaling). */
  equalityResidual: number;
  coneResidual: number;
  dualResidual: number;
  /** Equilibrated data vectors. */
  c: Float64Array;
  b: Float64Array;
  h: Float64Array;
}

export interface DataNorms {
  b: number;
  h: number;
  c: number;
  bs: number;
  hs: number;
  cs: number;
}

export interface Assessment {
  status: SolveStatus | null;
  primalObjective: number;
  dualObjective: number;
  gap: number;
  primalResidual: number;
  dualResidual: number;
  primalResidualRelative: number;
  dualResidualRelative: number;
}

export function emptyAssessment(): Assessment {
  return {
    status: null,
    primalObjective: NaN,
    dualObjective: NaN,
    gap: NaN,
    primalResidual: NaN,
    dualResidual: NaN,
    primalResidualRelative: NaN,
    dualResidualRelative: NaN,
  };
}

/**
 * The unscaled residual norms of `r` (its equalityResidual, coneResidual, dualResidual) from its
 * equilibrated residual vectors; Dinv and Einv are the reciprocals of the column and row scalings.
 */
export function unscaledResidualNorms(r: Residuals, Dinv: Float64Array, Einv: Float64Array): void {
  const p = r.ry.length;
  let presEq = 0;
  for (let i = 0; i < p; i++) presEq = Math.max(presEq, Math.abs(r.ry[i] * Einv[i]));
  let presCone = 0;
  for (let i = 0; i < r.rz.length; i++) presCone = Math.max(presCone, Math.abs(r.rz[i] * Einv[p + i]));
  let dres = 0;
  for (let j = 0; j < r.rx.length; j++) dres = Math.max(dres, Math.abs(r.rx[j] * Dinv[j]));
  r.equalityResidual = presEq;
  r.coneResidual = presCone;
  r.dualResidual = dres;
}

/** Fills `out` (no allocation) with the measures of the iterate and its status, if it is final. */
export function assessIterate(
  r: Residuals,
  norms: DataNorms,
  D: Float64Array,
  E: Float64Array,
  st: SolverSettings,
  relaxed: boolean,
  out: Assessment,
): Assessment {
  const { tau, kappa } = r;
  const p = r.ry.length;
  const presEq = r.equalityResidual / tau;
  const presCone = r.coneResidual / tau;
  const dres = r.dualResidual / tau;
  const primalObjective = r.cx / tau;
  const dualObjective = -(r.by + r.hz) / tau;
  const gap = Math.max(Math.abs(primalObjective - dualObjective), r.sz / (tau * tau));
  const primalRel = Math.max(presEq / Math.max(1, norms.b), presCone / Math.max(1, norms.h));
  const dualRel = dres / Math.max(1, norms.c);
  out.status = null;
  out.primalObjective = primalObjective;
  out.dualObjective = dualObjective;
  out.gap = gap;
  out.primalResidual = Math.max(presEq, presCone);
  out.dualResidual = dres;
  out.primalResidualRelative = primalRel;
  out.dualResidualRelative = dualRel;
  const feas = relaxed ? st.feasibilityToleranceInaccurate : st.feasibilityTolerance;
  const gapAbs = relaxed ? st.gapAbsoluteToleranceInaccurate : st.gapAbsoluteTolerance;
  const gapRel = relaxed ? st.gapRelativeToleranceInaccurate : st.gapRelativeTolerance;
  const inf = relaxed ? st.infeasibilityToleranceInaccurate : st.infeasibilityTolerance;
  const relGap = gap / Math.max(1, Math.min(Math.abs(primalObjective), Math.abs(dualObjective)));
  if (primalRel <= feas && dualRel <= feas && (gap <= gapAbs || relGap <= gapRel)) {
    out.status = relaxed ? 'almost-solved' : 'solved';
    return out;
  }
  if (kappa > tau) {
    // Certificates are judged in the problem's own units, as a user would check them.
    const byhz = r.by + r.hz;
    if (byhz < 0) {
      let atyGtz = 0;
      for (let j = 0; j < r.rx.length; j++) {
        atyGtz = Math.max(atyGtz, Math.abs((r.rx[j] - r.c[j] * tau) / D[j]));
      }
      if ((atyGtz / -byhz) * Math.max(1, norms.b, norms.h) <= inf) {
        out.status = relaxed ? 'almost-primal-infeasible' : 'primal-infeasible';
        return out;
      }
    }
    if (r.cx < 0) {
      let axGxs = 0;
      for (let i = 0; i < p; i++) axGxs = Math.max(axGxs, Math.abs((r.ry[i] + r.b[i] * tau) / E[i]));
      for (let i = 0; i < r.rz.length; i++) {
        axGxs = Math.max(axGxs, Math.abs((r.rz[i] + r.h[i] * tau) / E[p + i]));
      }
      if ((axGxs / -r.cx) * Math.max(1, norms.c) <= inf) {
        out.status = relaxed ? 'almost-dual-infeasible' : 'dual-infeasible';
        return out;
      }
    }
  }
  return out;
}
