/**
 * Can the vehicle reach its landing plane at all? Two target-independent facts the input checks use
 * (setup.ts `validateLanding`):
 *
 * 1. The longest powered descent. With a lowest thrust ρ1 > 0 the engines cannot throttle below it, so
 *    ṁ = −α‖T‖ ≤ −α ρ1 and the burn ends, out of propellant, by T = (m0 − m_dry)/(α ρ1)
 *    (Açıkmeşe & Ploen 2007, the same bound bracket.ts uses for the time of flight). With ρ1 = 0 there is
 *    no such bound.
 *
 * 2. The times t at which the vertical motion alone can meet the landing plane z_f at the gate's vertical
 *    speed v_f. In the rotating surface frame r̈ = u + g − 2ω×ṙ − ω×(ω×r) with ‖u‖ ≤ a = ρ2/m_dry, so the
 *    vertical part obeys |z̈ − g_z| ≤ a + δ, δ bounding the rotation terms, and landing at t needs
 *      |v_f − v_z0 − g_z t| ≤ (a + δ) t   and   |z_f − z_0 − v_z0 t − g_z t²/2| ≤ (a + δ) t²/2.
 *    δ over [0, T] by Grönwall: E = ‖v‖ + ω‖r‖ has Ė ≤ a + |g| + 3ωE (|2ω×v + ω×(ω×r)| ≤ 2ωE), hence
 *    E(t) ≤ E0 e^{3ωt} + (a + |g|)(e^{3ωt} − 1)/(3ω) and δ = 2ω E(T). The four inequalities are linear or
 *    quadratic in t, so the set of admissible t is found exactly from their roots (no scan that could step
 *    over a narrow window).
 *
 * Both are necessary conditions: a study failing them describes no landing whatever the target on that
 * plane, the solver, or the discretisation.
 */
import { norm3 } from './constants.ts';
import type { DescentSetup, IgnitionState } from './setup.ts';
import { deriveVehicle } from './vehicle.ts';

/** Longest possible powered descent, s; Infinity when the engines may throttle to zero (ρ1 = 0). */
export function burnTimeBound(setup: DescentSetup, ignition: IgnitionState): number {
  const { alpha, rho1 } = deriveVehicle(setup.vehicle);
  if (!(rho1 > 0)) return Infinity;
  return (ignition.mass - setup.vehicle.dryMass) / (alpha * rho1);
}

export interface PlaneWindow {
  /** Earliest admissible time of flight in (0, tMax], s (to rounding); null when there is none. */
  earliest: number | null;
  /** The vertical acceleration bound a + δ used, m/s². */
  accelerationBound: number;
}

/** Smallest t in (0, tMax] meeting the vertical necessary conditions of the landing plane at `planeHeight_m` (module comment). */
export function landingPlaneWindow(setup: DescentSetup, ignition: IgnitionState, planeHeight_m: number, tMax: number): PlaneWindow {
  const { rho2 } = deriveVehicle(setup.vehicle);
  const a = rho2 / setup.vehicle.dryMass;
  const gMag = norm3(setup.planet.gravity);
  const gz = setup.planet.gravity[2];
  const w = norm3(setup.planet.rotationRate);
  const horizon = Number.isFinite(tMax) ? tMax : 0;
  const e0 = norm3(ignition.velocity) + w * norm3(ignition.position);
  const growth = w > 0 ? Math.expm1(3 * w * horizon) / (3 * w) : horizon;
  const delta = w > 0 && horizon > 0 ? 2 * w * (e0 * Math.exp(3 * w * horizon) + (a + gMag) * growth) : 0;
  const A = a + delta;
  const vz0 = ignition.velocity[2];
  const dv = -setup.constraints.gateDescentRate - vz0;
  const dz = planeHeight_m - ignition.position[2];
  // f(t) ≤ 0 for each: linear f1, f2 (speed) and quadratic f3, f4 (height), as c0 + c1 t + c2 t².
  const conditions: [number, number, number][] = [
    [dv, -(gz + A), 0],
    [-dv, gz - A, 0],
    [dz, -vz0, -(gz + A) / 2],
    [-dz, vz0, (gz - A) / 2],
  ];
  const slack = (t: number, c: [number, number, number]) => 1e-9 * (Math.abs(c[0]) + Math.abs(c[1]) * t + (gMag + A) * t * t + 1e-12);
  const admissible = (t: number) => conditions.every((c) => c[0] + c[1] * t + c[2] * t * t <= slack(t, c));
  const roots: number[] = [];
  for (const [c0, c1, c2] of conditions) {
    if (c2 === 0) {
      if (c1 !== 0) roots.push(-c0 / c1);
    } else {
      const disc = c1 * c1 - 4 * c2 * c0;
      if (disc >= 0) {
        // Numerically stable pair (Press et al., Numerical Recipes §5.6).
        const q = -0.5 * (c1 + Math.sign(c1 || 1) * Math.sqrt(disc));
        roots.push(q / c2);
        if (q !== 0) roots.push(c0 / q);
      }
    }
  }
  const upper = Number.isFinite(tMax) ? tMax : 2 * Math.max(1, ...roots.filter(Number.isFinite)) + 1;
  const points = [...new Set(roots.filter((t) => t > 0 && t < upper)), upper].sort((x, y) => x - y);
  // Every component of the admissible set is an interval whose ends are roots, 0 or the upper end:
  // testing the roots, the upper end and the midpoints between them finds the earliest.
  let previous = 0;
  for (const t of points) {
    const mid = 0.5 * (previous + t);
    if (mid > 0 && admissible(mid)) return { earliest: previous > 0 ? previous : mid, accelerationBound: A };
    if (admissible(t)) return { earliest: t, accelerationBound: A };
    previous = t;
  }
  if (!Number.isFinite(tMax) && admissible(upper * 10)) return { earliest: upper * 10, accelerationBound: A };
  return { earliest: null, accelerationBound: A };
}
