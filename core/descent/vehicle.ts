/**
 * Vehicle model: engines, throttle range, mass and the derived quantities of the convex problem.
 *
 * Each of `engineCount` engines produces `thrustPerEngine` at full throttle along its own axis,
 * canted by φ from the vehicle thrust axis. Lateral components cancel, so the useful (net) thrust
 * magnitude is ‖T‖ = n T_e cos φ · throttle, while every engine still burns propellant for its full
 * thrust: ṁ = −n T_e · throttle / (Isp g0) = −‖T‖ / (Isp g0 cos φ).
 * Hence (Açıkmeşe & Ploen 2007, JGCD 30(5), eq. for α):
 *   α  = 1 / (Isp g0 cos φ)                     [s/m]  ṁ = −α ‖T‖
 *   ρ1 = n T_e cos φ · throttleMin,  ρ2 = n T_e cos φ · throttleMax   [N]  ρ1 ≤ ‖T‖ ≤ ρ2
 */
import { DEG, G0, SPEED_OF_LIGHT } from './constants.ts';
import { DescentInputError } from './inputError.ts';

export interface VehicleModel {
  /** Mass at ignition with all propellant, kg. */
  readonly wetMass: number;
  /** Mass with no usable propellant left (the propellant reserve may be added here), kg. */
  readonly dryMass: number;
  /** Specific impulse, s. */
  readonly isp: number;
  /** Number of identical engines. */
  readonly engineCount: number;
  /** Full-throttle thrust of one engine along its own axis, N. */
  readonly thrustPerEngine: number;
  /** Cant angle of each engine from the vehicle thrust axis, rad. */
  readonly cantAngle: number;
  /** Throttle fraction range, 0 ≤ min < max ≤ 1. */
  readonly throttleMin: number;
  readonly throttleMax: number;
  /** Largest thrust tilt from vertical, rad (π or more: unconstrained). */
  readonly pointingLimit: number;
  /**
   * Forbidden throttle bands (open intervals of thrust fraction, like throttleMin), increasing, disjoint and
   * strictly inside (throttleMin, throttleMax). Absent or empty: none. See band.ts for how they are solved.
   */
  readonly throttleBands?: readonly (readonly [number, number])[];
  /** Largest throttle rate |dρ/dt|, fraction of full thrust per second; absent or null: unlimited. */
  readonly throttleRate?: number | null;
}

/** The allowed throttle intervals [lo, hi] (fractions of full thrust) left between the forbidden bands. */
export function allowedThrottleIntervals(v: VehicleModel): [number, number][] {
  const out: [number, number][] = [];
  let lo = v.throttleMin;
  for (const [a, b] of v.throttleBands ?? []) {
    out.push([lo, a]);
    lo = b;
  }
  out.push([lo, v.throttleMax]);
  return out;
}

export interface VehicleDerived {
  /** Mass-flow constant α, s/m: ṁ = −α ‖T‖. */
  readonly alpha: number;
  /** Smallest and largest net thrust magnitude, N. */
  readonly rho1: number;
  readonly rho2: number;
  /** Net thrust at full throttle, N (n T_e cos φ). */
  readonly fullThrust: number;
}

export function deriveVehicle(v: VehicleModel): VehicleDerived {
  const c = Math.cos(v.cantAngle);
  const fullThrust = v.engineCount * v.thrustPerEngine * c;
  return {
    alpha: 1 / (v.isp * G0 * c),
    rho1: fullThrust * v.throttleMin,
    rho2: fullThrust * v.throttleMax,
    fullThrust,
  };
}

function positive(field: 'wetMass' | 'dryMass' | 'isp' | 'thrustPerEngine', value: number, unit: string): void {
  if (!Number.isFinite(value) || value <= 0) {
    throw new DescentInputError(`vehicle.${field}`, String(value), `must be a positive number of ${unit}`);
  }
}

/** Checks a vehicle model; throws DescentInputError (a RangeError) naming the field, the value and the fix. */
export function validateVehicle(v: VehicleModel): void {
  positive('wetMass', v.wetMass, 'kg');
  positive('dryMass', v.dryMass, 'kg');
  positive('isp', v.isp, 's');
  positive('thrustPerEngine', v.thrustPerEngine, 'N');
  // The exhaust speed Isp·g0 of any engine is below the speed of light (299,792,458 m/s, exact by the SI
  // definition of the metre): Isp < 3.06e7 s.
  if (v.isp * G0 >= SPEED_OF_LIGHT) {
    throw new DescentInputError('vehicle.isp', `${v.isp} s`, `gives an exhaust speed Isp·g0 = ${(v.isp * G0).toPrecision(3)} m/s, faster than light; a rocket engine's Isp is at most a few thousand seconds`);
  }
  if (!(v.dryMass < v.wetMass)) {
    throw new DescentInputError('vehicle.dryMass', `${v.dryMass} kg`, `must be below the wet mass ${v.wetMass} kg`);
  }
  if (!Number.isInteger(v.engineCount) || v.engineCount < 1) {
    throw new DescentInputError('vehicle.engineCount', String(v.engineCount), 'must be a whole number ≥ 1');
  }
  if (!(v.cantAngle >= 0 && v.cantAngle < 80 * DEG)) {
    throw new DescentInputError('vehicle.cantAngle', `${v.cantAngle / DEG}°`, 'must be in [0°, 80°)');
  }
  if (!(v.throttleMin >= 0 && v.throttleMin < v.throttleMax && v.throttleMax <= 1)) {
    throw new DescentInputError('vehicle.throttleMin', `throttle range [${v.throttleMin}, ${v.throttleMax}]`, 'need 0 ≤ throttleMin < throttleMax ≤ 1');
  }
  const bands = v.throttleBands ?? [];
  for (let i = 0; i < bands.length; i++) {
    const [lo, hi] = bands[i];
    const prev = i > 0 ? bands[i - 1][1] : v.throttleMin;
    if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo < hi && lo > prev && hi < v.throttleMax)) {
      throw new DescentInputError('vehicle.throttleBands', `[${lo}, ${hi}] (band ${i + 1})`,
        `bands must be [lo, hi] with lo < hi, strictly inside (throttleMin ${v.throttleMin}, throttleMax ${v.throttleMax}), in increasing order and not overlapping`);
    }
  }
  const rate = v.throttleRate ?? null;
  if (rate !== null && !(rate > 0 && Number.isFinite(rate))) {
    throw new DescentInputError('vehicle.throttleRate', `${rate} per s`, 'must be a positive fraction of full thrust per second, or absent for no limit');
  }
  if (!(v.pointingLimit > 0)) {
    throw new DescentInputError('vehicle.pointingLimit', `${v.pointingLimit / DEG}°`, 'must be positive; 180° leaves the thrust direction free');
  }
}
