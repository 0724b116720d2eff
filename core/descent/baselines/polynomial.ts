/**
 * Polynomial explicit guidance baseline (Klumpp 1974, Automatica 10(2)): the acceleration is a quadratic in time that meets the target position,
 * velocity and acceleration at t_go. Solving the three conditions for the current acceleration gives
 *   a = a_f + 12 (r_f − r)/t_go² − 6 (v + v_f)/t_go        (total acceleration; thrust = m (a − g))
 * (derived in the unit test). The law is flown closed-loop with t_go = T − t, thrust saturated to the
 * engines' range and pointing limit; the guidance stops at t_go = `cutoffTime`, where the remaining
 * position and velocity errors are reported. The burn time T is chosen by a search: the smallest
 * propellant among T giving a miss below `missTolerance`, else the smallest miss.
 */
import type { Vec3 } from '../constants.ts';
import { norm3 } from '../constants.ts';
import type { DescentSetup, IgnitionState } from '../setup.ts';
import { timeOfFlightBracket } from '../bracket.ts';
import { saturateThrust, simulate } from './simulate.ts';
import type { SimSample } from './simulate.ts';

export interface PolynomialGuidanceOptions {
  /** Target acceleration at the gate, m/s² (total; default 0: arrive hovering). */
  finalAcceleration?: Vec3;
  /** Simulation step, s. Default 0.05. */
  step?: number;
  /** Guidance ends this long before t_go = 0, s. Default 0.5. */
  cutoffTime?: number;
  /** Landing-position miss accepted as on target, m. Default 1. */
  missTolerance?: number;
  /**
   * Burn times scanned across the bracket, coarse then fine: `scan` evenly spaced, then `scan` more
   * within one coarse step either side of the best (finer than a single scan of 4 × as many, for half
   * the simulations). Default 20.
   */
  scan?: number;
}

export interface BaselineResult {
  propellant: number;
  timeOfFlight: number;
  /** Position error at the end of guidance, m (horizontal and vertical together). */
  miss: number;
  /** Velocity error at the end of guidance, m/s. */
  velocityError: number;
  /** Fraction of the burn spent at a thrust or pointing limit. */
  saturatedFraction: number;
  samples: SimSample[];
}

export function polynomialCommand(r: Vec3, v: Vec3, rf: Vec3, vf: Vec3, af: Vec3, tgo: number): Vec3 {
  return [0, 1, 2].map((i) => af[i] + (12 * (rf[i] - r[i])) / (tgo * tgo) - (6 * (v[i] + vf[i])) / tgo) as unknown as Vec3;
}

export function flyPolynomial(setup: DescentSetup, ignition: IgnitionState, target: Vec3, burnTime: number, options: PolynomialGuidanceOptions = {}): BaselineResult {
  const dt = options.step ?? 0.05;
  const cutoff = options.cutoffTime ?? 0.5;
  const af = options.finalAcceleration ?? [0, 0, 0];
  const g = setup.planet.gravity;
  const rf: Vec3 = [target[0], target[1], target[2] + setup.constraints.gateHeight];
  const vf: Vec3 = [0, 0, -setup.constraints.gateDescentRate];
  let saturated = 0;
  let steps = 0;
  const samples = simulate(setup, ignition, (s) => {
    const tgo = burnTime - s.t;
    if (tgo <= cutoff) return null;
    const a = polynomialCommand(s.r, s.v, rf, vf, af, tgo);
    const want: Vec3 = [a[0] - g[0], a[1] - g[1], a[2] - g[2]];
    const T = saturateThrust(setup, s.m, want);
    steps++;
    if (Math.abs(norm3(T) - norm3(want) * s.m) > 1e-6 * norm3(T) || norm3([T[0] / s.m - want[0], T[1] / s.m - want[1], T[2] / s.m - want[2]]) > 1e-6) saturated++;
    return T;
  }, dt, burnTime + 1);
  const end = samples[samples.length - 1];
  const miss = norm3([end.r[0] - rf[0], end.r[1] - rf[1], end.r[2] - rf[2]]);
  const velocityError = norm3([end.v[0] - vf[0], end.v[1] - vf[1], end.v[2] - vf[2]]);
  return { propellant: ignition.mass - end.m, timeOfFlight: end.t, miss, velocityError, saturatedFraction: steps ? saturated / steps : 0, samples };
}

/** Scans the burn time over the physical bracket and keeps the best (see the file comment). */
export function polynomialGuidance(setup: DescentSetup, ignition: IgnitionState, target: Vec3, options: PolynomialGuidanceOptions = {}): BaselineResult & { scanned: number } {
  const br = timeOfFlightBracket(setup, ignition, target);
  const n = options.scan ?? 20;
  const tol = options.missTolerance ?? 1;
  // Best on-target flight (least propellant) and closest flight, each with its burn time.
  const found: { hit: { r: BaselineResult; T: number } | null; miss: { r: BaselineResult; T: number } | null } = { hit: null, miss: null };
  let scanned = 0;
  const fly = (T: number) => {
    if (T <= (options.cutoffTime ?? 0.5) + 1) return;
    const r = flyPolynomial(setup, ignition, target, T, options);
    scanned++;
    const ok = r.miss <= tol && r.velocityError <= Math.max(0.5, tol / 2) && r.samples[r.samples.length - 1].m > setup.vehicle.dryMass;
    if (ok && (!found.hit || r.propellant < found.hit.r.propellant)) found.hit = { r, T };
    if (!found.miss || r.miss < found.miss.r.miss) found.miss = { r, T };
  };
  const hi = Math.min(br.upper, br.lower * 6);
  const step = (hi - br.lower) / n;
  for (let i = 0; i <= n; i++) fly(br.lower + step * i);
  const centre = (found.hit ?? found.miss)?.T;
  if (centre !== undefined) {
    for (let i = 1; i <= n; i++) {
      const T = centre - step + (2 * step * i) / (n + 1);
      if (T > br.lower && T < hi) fly(T);
    }
  }
  const best = (found.hit ?? found.miss)!.r;
  return { ...best, scanned };
}
