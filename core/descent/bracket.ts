/**
 * Physical bounds on the powered-descent time, used to bracket the free-final-time search.
 *
 * Upper bound: σ ≥ ρ1/m and ż = −ασ give ṁ ≤ −α ρ1, so the burn cannot last longer than
 * (m0 − m_dry)/(α ρ1). With ρ1 = 0 (engine may shut down) there is no such bound; we use the
 * hover time ln(m0/m_dry)/(α g) plus the ballistic fall time from the ignition altitude — a heuristic,
 * not a bound.
 * Lower bound (necessary conditions, rotation neglected): with ‖u‖ ≤ a = ρ2/m_dry,
 *   ‖v_f − v_0 − g t‖ ≤ a t   and   ‖r_f − r_0 − v_0 t − g t²/2‖ ≤ a t²/2.
 * The smallest t meeting both is found by a scan; it is shaded by 2 % to allow for rotation terms.
 */
import type { Vec3 } from './constants.ts';
import { norm3 } from './constants.ts';
import type { DescentSetup, IgnitionState } from './setup.ts';
import { deriveVehicle } from './vehicle.ts';

export interface TimeBracket {
  lower: number;
  upper: number;
  /** True when `upper` is the rigorous min-throttle bound, false when it is the ρ1 = 0 heuristic. */
  upperIsBound: boolean;
}

/**
 * `landingFree`: the bracket of a landing anywhere on the target's plane (the minimum-landing-error problem):
 * the horizontal position condition is dropped, so a target far out of reach still gets the times of
 * flight at which the vehicle can land at all.
 */
export function timeOfFlightBracket(setup: DescentSetup, ignition: IgnitionState, target: Vec3, landingFree = false): TimeBracket {
  const veh = setup.vehicle;
  const { alpha, rho1, rho2 } = deriveVehicle(veh);
  const m0 = ignition.mass;
  const g = setup.planet.gravity;
  const gMag = norm3(g);
  const con = setup.constraints;
  const rf: Vec3 = [target[0], target[1], target[2] + con.gateHeight];
  const vf: Vec3 = [0, 0, -con.gateDescentRate];
  let upper: number;
  let upperIsBound = true;
  const bound = (m0 - veh.dryMass) / (alpha * rho1);
  if (rho1 > 0 && Number.isFinite(bound)) {
    upper = bound;
  } else {
    // No bound (or one too large to represent, ρ1 almost 0): the heuristic below.
    const h = Math.max(0, ignition.position[2] - rf[2]);
    const vz = ignition.velocity[2];
    const fall = (vz + Math.sqrt(vz * vz + 2 * gMag * h)) / gMag;
    upper = Math.log(m0 / veh.dryMass) / (alpha * gMag) + fall;
    upperIsBound = false;
  }
  const a = rho2 / veh.dryMass;
  const ok = (t: number) => {
    const dv = [vf[0] - ignition.velocity[0] - g[0] * t, vf[1] - ignition.velocity[1] - g[1] * t, vf[2] - ignition.velocity[2] - g[2] * t];
    if (Math.hypot(dv[0], dv[1], dv[2]) > a * t) return false;
    const dr = [0, 1, 2].map((i) => rf[i] - ignition.position[i] - ignition.velocity[i] * t - 0.5 * g[i] * t * t);
    return (landingFree ? Math.abs(dr[2]) : Math.hypot(dr[0], dr[1], dr[2])) <= 0.5 * a * t * t;
  };
  // First time on a grid of 4000 steps over (0, upper]. When that is the grid's first point, the grid was
  // too coarse (a huge upper bound, e.g. engines throttling almost to zero): zoom into the first step
  // until the first admissible time is not the first point or the step is below a millisecond.
  const steps = 4000;
  let lower = upper;
  let span = upper;
  while (Number.isFinite(span) && span > 0) {
    let first = 0;
    for (let i = 1; i <= steps; i++) {
      if (ok((span * i) / steps)) {
        first = i;
        break;
      }
    }
    if (first === 0) break;
    lower = (span * first) / steps;
    if (first > 1 || span / steps < 1e-3) break;
    span /= steps;
  }
  lower = Math.max(lower * 0.98, 1e-3);
  return { lower, upper, upperIsBound };
}
