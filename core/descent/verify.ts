/**
 * Dense re-simulation of a returned trajectory, independent of the cone program: the node thrust
 * accelerations u_k = T_k/m_k are held as the program assumes (first-order hold: linear between nodes;
 * zero-order hold: constant over each interval) and the translational dynamics in the rotating surface frame
 *   r̈ = u + g − 2 ω×ṙ − ω×(ω×r),   ṁ = −α m ‖u‖   (α = 1/(Isp g0 cos φ): the mass flow of the thrust itself,
 * not of the relaxation's σ) are integrated with the classical fourth-order Runge–Kutta method at
 * SUBSTEPS points per interval. Every constraint is then measured between the nodes too, where the program
 * never looks: altitude floor, glide slope, speed limit, thrust bounds, pointing, and the touchdown state.
 *
 * A margin is positive when the constraint is met with room to spare and negative when it is missed; a miss
 * beyond its tolerance (VERIFY_TOLERANCES) is a violation, reported to the user.
 */
import type { Vec3 } from './constants.ts';
import type { DescentSetup } from './setup.ts';
import type { DecodedTrajectory } from './trajectory.ts';
import { deriveVehicle } from './vehicle.ts';

/** Integration points per interval between nodes. */
export const SUBSTEPS = 32;

/**
 * How far a re-simulated constraint may be missed before it is reported as a violation. Engineering
 * thresholds chosen for preliminary design (well below what a trade study resolves), not fitted to results:
 * 0.1 m of height or position, 0.01 m/s of speed, 0.1 % of full thrust, 0.05° of pointing.
 */
export const VERIFY_TOLERANCES = Object.freeze({
  altitude_m: 0.1,
  glideSlope_m: 0.1,
  speed_mps: 0.01,
  thrustFraction: 1e-3,
  pointing_rad: (0.05 * Math.PI) / 180,
  touchdownPosition_m: 0.1,
  touchdownVelocity_mps: 0.01,
});

export interface BetweenNodesReport {
  /** Re-simulation points per interval. */
  substeps: number;
  /** Smallest height above the altitude floor between ignition and the gate, m (NaN without a floor). */
  altitudeMargin_m: number;
  /** Smallest horizontal distance inside the glide-slope cone, m (NaN without a glide slope). */
  glideSlopeMargin_m: number;
  /** Smallest distance below the speed limit, m/s (NaN without one). */
  speedMargin_mps: number;
  /** Smallest thrust above the lower bound and below the upper bound, as fractions of full thrust. */
  thrustLowerMargin: number;
  thrustUpperMargin: number;
  /** Smallest angle inside the pointing limit, rad (NaN without a limit). */
  pointingMargin_rad: number;
  /**
   * Forbidden throttle bands: the smallest distance of the thrust fraction from the nearest band edge,
   * positive outside every band, negative inside one (NaN without bands).
   */
  bandMargin: number;
  /**
   * Throttle-rate limit: the limit less the largest mean rate |ρ(t + Δt) − ρ(t)|/Δt over every window of one
   * node step Δt, full thrust per second (NaN without a limit). A window of one step is how the program
   * states the limit (|ρ_{k+1} − ρ_k| ≤ R Δt); with zero-order hold the thrust steps at the nodes.
   */
  throttleRateMargin_perS: number;
  /** Distance of the re-simulated end point from the gate point, m, and of its velocity from the gate velocity, m/s. */
  touchdownPositionError_m: number;
  touchdownVelocityError_mps: number;
  /** Propellant of the re-simulation (mass flow from the thrust), kg. */
  propellant_kg: number;
  /** One sentence per constraint missed beyond its tolerance (empty: all met). */
  violations: string[];
}


export function verifyBetweenNodes(setup: DescentSetup, traj: DecodedTrajectory, target: Vec3): BetweenNodesReport {
  const s = traj.series;
  const N = s.t.length;
  const veh = deriveVehicle(setup.vehicle);
  const con = setup.constraints;
  const w = setup.planet.rotationRate;
  const g = setup.planet.gravity;
  const dt = traj.timeOfFlight / (N - 1);
  const uNodes = Array.from({ length: N }, (_, k): Vec3 => [s.thrustX[k] / s.mass[k], s.thrustY[k] / s.mass[k], s.thrustZ[k] / s.mass[k]]);
  const foh = setup.hold === 'foh';
  // State r(3), v(3), m in preallocated arrays (the footprint runs this for every target: no allocation per step).
  const [wx, wy, wz] = w;
  const deriv = (x: Float64Array, ux: number, uy: number, uz: number, out: Float64Array): void => {
    const vx = x[3], vy = x[4], vz = x[5];
    // ω × v and ω × (ω × r)
    const cvx = wy * vz - wz * vy, cvy = wz * vx - wx * vz, cvz = wx * vy - wy * vx;
    const ax = wy * x[2] - wz * x[1], ay = wz * x[0] - wx * x[2], az = wx * x[1] - wy * x[0];
    const cx = wy * az - wz * ay, cy = wz * ax - wx * az, cz = wx * ay - wy * ax;
    out[0] = vx; out[1] = vy; out[2] = vz;
    out[3] = ux + g[0] - 2 * cvx - cx;
    out[4] = uy + g[1] - 2 * cvy - cy;
    out[5] = uz + g[2] - 2 * cvz - cz;
    out[6] = -veh.alpha * x[6] * Math.sqrt(ux * ux + uy * uy + uz * uz);
  };
  const landing: Vec3 = [target[0], target[1], target[2]];
  const gateTop: Vec3 = [target[0], target[1], target[2] + con.gateHeight];
  const floor = con.minAltitude;
  const cot = con.glideSlope !== null ? 1 / Math.tan(con.glideSlope) : NaN;
  const pointing = setup.vehicle.pointingLimit < Math.PI;
  let altitude = floor !== null ? Infinity : NaN;
  let glide = con.glideSlope !== null ? Infinity : NaN;
  let speed = con.maxSpeed !== null ? Infinity : NaN;
  let thrustLo = Infinity;
  let thrustHi = Infinity;
  let point = pointing ? Infinity : NaN;
  const bands = setup.vehicle.throttleBands ?? [];
  let band = bands.length > 0 ? Infinity : NaN;
  const rateLimit = setup.vehicle.throttleRate ?? null;
  // Thrust fraction at every re-simulation point (the first of each interval's points is the node itself).
  const fractions = new Float64Array((N - 1) * SUBSTEPS + 1);
  let sample = 0;
  const observe = (x: Float64Array, ux: number, uy: number, uz: number, interior: boolean) => {
    const m = x[6];
    const un = Math.sqrt(ux * ux + uy * uy + uz * uz);
    const thrust = m * un;
    const fraction = thrust / veh.fullThrust;
    if (sample < fractions.length) fractions[sample++] = fraction;
    for (const [lo, hi] of bands) {
      const d = fraction <= lo ? lo - fraction : fraction >= hi ? fraction - hi : -Math.min(fraction - lo, hi - fraction);
      band = Math.min(band, d);
    }
    thrustLo = Math.min(thrustLo, (thrust - veh.rho1) / veh.fullThrust);
    thrustHi = Math.min(thrustHi, (veh.rho2 - thrust) / veh.fullThrust);
    if (pointing && un > 0) point = Math.min(point, setup.vehicle.pointingLimit - Math.acos(Math.max(-1, Math.min(1, uz / un))));
    if (con.maxSpeed !== null) speed = Math.min(speed, con.maxSpeed - Math.sqrt(x[3] * x[3] + x[4] * x[4] + x[5] * x[5]));
    if (!interior) return;
    if (floor !== null) altitude = Math.min(altitude, x[2] - target[2] - floor);
    if (con.glideSlope !== null) {
      const de = x[0] - landing[0];
      const dn = x[1] - landing[1];
      glide = Math.min(glide, (x[2] - landing[2]) * cot - Math.sqrt(de * de + dn * dn));
    }
  };
  const x = Float64Array.of(s.x[0], s.y[0], s.z[0], s.vx[0], s.vy[0], s.vz[0], s.mass[0]);
  const k1 = new Float64Array(7), k2 = new Float64Array(7), k3 = new Float64Array(7), k4 = new Float64Array(7), y = new Float64Array(7);
  const h = dt / SUBSTEPS;
  // Thrust acceleration at fraction f of interval k under the program's hold (FOH: linear; ZOH: constant).
  const u = [0, 0, 0];
  const uAt = (k: number, f: number) => {
    const a = uNodes[k];
    if (!foh || k + 1 >= N) { u[0] = a[0]; u[1] = a[1]; u[2] = a[2]; return; }
    const b = uNodes[k + 1];
    u[0] = a[0] + (b[0] - a[0]) * f; u[1] = a[1] + (b[1] - a[1]) * f; u[2] = a[2] + (b[2] - a[2]) * f;
  };
  uAt(0, 0);
  observe(x, u[0], u[1], u[2], false);
  for (let k = 0; k + 1 < N; k++) {
    for (let j = 0; j < SUBSTEPS; j++) {
      uAt(k, j / SUBSTEPS);
      deriv(x, u[0], u[1], u[2], k1);
      for (let i = 0; i < 7; i++) y[i] = x[i] + 0.5 * h * k1[i];
      uAt(k, (j + 0.5) / SUBSTEPS);
      deriv(y, u[0], u[1], u[2], k2);
      for (let i = 0; i < 7; i++) y[i] = x[i] + 0.5 * h * k2[i];
      deriv(y, u[0], u[1], u[2], k3);
      for (let i = 0; i < 7; i++) y[i] = x[i] + h * k3[i];
      uAt(k, (j + 1) / SUBSTEPS);
      deriv(y, u[0], u[1], u[2], k4);
      for (let i = 0; i < 7; i++) x[i] += (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
      const last = k + 2 === N && j + 1 === SUBSTEPS;
      // The altitude floor and the glide slope hold between ignition and the gate; the end point is the gate.
      observe(x, u[0], u[1], u[2], !last);
    }
  }
  let rateMargin = NaN;
  if (rateLimit !== null) {
    let worst = 0;
    for (let i = SUBSTEPS; i < sample; i++) worst = Math.max(worst, Math.abs(fractions[i] - fractions[i - SUBSTEPS]) / dt);
    rateMargin = rateLimit - worst;
  }
  const posErr = Math.hypot(x[0] - gateTop[0], x[1] - gateTop[1], x[2] - gateTop[2]);
  const velErr = Math.hypot(x[3], x[4], x[5] + con.gateDescentRate);
  const T = VERIFY_TOLERANCES;
  const violations: string[] = [];
  const miss = (what: string, margin: number, tol: number, unit: string, scale = 1, digits = 2) => {
    if (margin < -tol) violations.push(`${what} missed by ${(-margin * scale).toFixed(digits)} ${unit} between nodes (tolerance ${(tol * scale).toFixed(digits)} ${unit})`);
  };
  miss('altitude floor', altitude, T.altitude_m, 'm');
  miss('glide slope', glide, T.glideSlope_m, 'm');
  miss('speed limit', speed, T.speed_mps, 'm/s', 1, 3);
  miss('minimum thrust', thrustLo, T.thrustFraction, '% of full thrust', 100, 2);
  miss('maximum thrust', thrustHi, T.thrustFraction, '% of full thrust', 100, 2);
  miss('pointing limit', point, T.pointing_rad, '°', 180 / Math.PI, 3);
  miss('forbidden throttle band', band, T.thrustFraction, '% of full thrust', 100, 2);
  // The rate over one node step, to the same 0.1 % of full thrust over that step.
  miss('throttle-rate limit', rateMargin * dt, T.thrustFraction, '% of full thrust per node step', 100, 2);
  if (posErr > T.touchdownPosition_m) violations.push(`re-simulated end point ${posErr.toFixed(2)} m from the gate point (tolerance ${T.touchdownPosition_m} m)`);
  if (velErr > T.touchdownVelocity_mps) violations.push(`re-simulated end velocity ${velErr.toFixed(3)} m/s from the gate velocity (tolerance ${T.touchdownVelocity_mps} m/s)`);
  return {
    substeps: SUBSTEPS,
    altitudeMargin_m: altitude,
    glideSlopeMargin_m: glide,
    speedMargin_mps: speed,
    thrustLowerMargin: veh.rho1 > 0 ? thrustLo : NaN,
    thrustUpperMargin: thrustHi,
    pointingMargin_rad: point,
    bandMargin: band,
    throttleRateMargin_perS: rateMargin,
    touchdownPositionError_m: posErr,
    touchdownVelocityError_mps: velErr,
    propellant_kg: s.mass[0] - x[6],
    violations: veh.rho1 > 0 ? violations : violations.filter((v) => !v.startsWith('minimum thrust')),
  };
}
