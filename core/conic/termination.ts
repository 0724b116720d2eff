/**
 * Termination tests. Optimality is judged in the problem's own (unequilibrated) units; infeasibility
 * certificates in the equilibrated data, normalised so the test is dimensionless:
 *
 * - solved:   ‖Ax − b‖∞ ≤ ε_f max(1, ‖b‖∞),  ‖Gx + s − h‖∞ ≤ ε_f max(1, ‖h‖∞),
 *             ‖Aᵀy + Gᵀz + c‖∞ ≤ ε_f max(1, ‖c‖∞),  and gap ≤ ε_abs or gap / max(1, min(|p|, |d|)) ≤ ε_rel,
 *             gap = max(|cᵀx + bᵀy + hᵀz|, sᵀz) at (x, y, z, s)/τ;
 * - primal infeasible: κ > τ, bᵀy + hᵀz < 0 and ‖Aᵀy + Gᵀz‖∞ / |bᵀy + hᵀz| · max(1, ‖b‖∞, ‖h‖∞) ≤ ε_inf;
 * - dual infeasible:   κ > τ, cᵀx < 0 and max(‖Ax‖∞, ‖Gx + s‖∞) / |cᵀx| · max(1, ‖c‖∞) ≤ ε_inf.
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
  /** ‖Aᵀy + Gᵀz‖∞, ‖Ax‖∞, ‖Gx + s‖∞ (equilibrated). */
  dualNoC: number;
  axNorm: number;
  gxsNorm: number;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  s: Float64Array;
  degree: number;
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

export function assessIterate(
  r: Residuals,
  norms: DataNorms,
  D: Float64Array,
  E: Float64Array,
  st: SolverSettings,
  relaxed: boolean,
): Assessment {
  const { tau, kappa } = r;
  const p = r.ry.length;
  let presEq = 0;
  for (let i = 0; i < p; i++) presEq = Math.max(presEq, Math.abs(r.ry[i] / E[i]));
  let presCone = 0;
  for (let i = 0; i < r.rz.length; i++) presCone = Math.max(presCone, Math.abs(r.rz[i] / E[p + i]));
  let dres = 0;
  for (let j = 0; j < r.rx.length; j++) dres = Math.max(dres, Math.abs(r.rx[j] / D[j]));
  presEq /= tau;
  presCone /= tau;
  dres /= tau;
  const primalObjective = r.cx / tau;
  const dualObjective = -(r.by + r.hz) / tau;
  const gap = Math.max(Math.abs(primalObjective - dualObjective), r.sz / (tau * tau));
  const primalRel = Math.max(presEq / Math.max(1, norms.b), presCone / Math.max(1, norms.h));
  const dualRel = dres / Math.max(1, norms.c);
  const out: Assessment = {
    status: null,
    primalObjective,
    dualObjective,
    gap,
    primalResidual: Math.max(presEq, presCone),
    dualResidual: dres,
    primalResidualRelative: primalRel,
    dualResidualRelative: dualRel,
  };
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
    const byhz = r.by + r.hz;
    if (byhz < 0 && (r.dualNoC / -byhz) * Math.max(1, norms.bs, norms.hs) <= inf) {
      out.status = relaxed ? 'almost-primal-infeasible' : 'primal-infeasible';
      return out;
    }
    if (r.cx < 0 && (Math.max(r.axNorm, r.gxsNorm) / -r.cx) * Math.max(1, norms.cs) <= inf) {
      out.status = relaxed ? 'almost-dual-infeasible' : 'dual-infeasible';
      return out;
    }
  }
  return out;
}
