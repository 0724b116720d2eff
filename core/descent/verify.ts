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
  /** Distance of the re-simulated end point from the gate point, m, and of its velocity from the gate velocity, m/s. */
  touchdownPositionError_m: number;
  touchdownVelocityError_mps: number;
  /** Propellant of the re-simulation (mass flow from the thrust), kg. */
  propellant_kg: number;
  /** One sentence per constraint missed beyond its tolerance (empty: all met). */
  violations: string[];
}

const cross = (a: Vec3, b: Vec3): Vec3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];

export function verifyBetweenNodes(setup: DescentSetup, traj: DecodedTrajectory, target: Vec3): BetweenNodesReport {
  const s = traj.series;
  const N = s.t.length;
  const veh = deriveVehicle(setup.vehicle);
  const con = setup.constraints;
  const w = setup.planet.rotationRate;
  const g = setup.planet.gravity;
  const dt = traj.timeOfFlight / (N - 1);
  const u = (k: number): Vec3 => [s.thrustX[k] / s.mass[k], s.thrustY[k] / s.mass[k], s.thrustZ[k] / s.mass[k]];
  const uNodes = Array.from({ length: N }, (_, k) => u(k));
  const foh = setup.hold === 'foh';
  const uAt = (k: number, frac: number): Vec3 => {
    const a = uNodes[k];
    if (!foh || k + 1 >= N) return a;
    const b = uNodes[k + 1];
    return [a[0] + (b[0] - a[0]) * frac, a[1] + (b[1] - a[1]) * frac, a[2] + (b[2] - a[2]) * frac];
  };
  // state: r(3), v(3), m
  const deriv = (x: number[], uc: Vec3): number[] => {
    const r: Vec3 = [x[0], x[1], x[2]];
    const v: Vec3 = [x[3], x[4], x[5]];
    const cor = cross(w, v);
    const cen = cross(w, cross(w, r));
    const un = Math.hypot(uc[0], uc[1], uc[2]);
    return [v[0], v[1], v[2],
      uc[0] + g[0] - 2 * cor[0] - cen[0], uc[1] + g[1] - 2 * cor[1] - cen[1], uc[2] + g[2] - 2 * cor[2] - cen[2],
      -veh.alpha * x[6] * un];
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
  const observe = (x: number[], uc: Vec3, interior: boolean) => {
    const m = x[6];
    const un = Math.hypot(uc[0], uc[1], uc[2]);
    const thrust = m * un;
    thrustLo = Math.min(thrustLo, (thrust - veh.rho1) / veh.fullThrust);
    thrustHi = Math.min(thrustHi, (veh.rho2 - thrust) / veh.fullThrust);
    if (pointing && un > 0) point = Math.min(point, setup.vehicle.pointingLimit - Math.acos(Math.max(-1, Math.min(1, uc[2] / un))));
    if (con.maxSpeed !== null) speed = Math.min(speed, con.maxSpeed - Math.hypot(x[3], x[4], x[5]));
    if (!interior) return;
    if (floor !== null) altitude = Math.min(altitude, x[2] - target[2] - floor);
    if (con.glideSlope !== null) {
      glide = Math.min(glide, (x[2] - landing[2]) * cot - Math.hypot(x[0] - landing[0], x[1] - landing[1]));
    }
  };
  let x = [s.x[0], s.y[0], s.z[0], s.vx[0], s.vy[0], s.vz[0], s.mass[0]];
  const h = dt / SUBSTEPS;
  observe(x, uAt(0, 0), false);
  for (let k = 0; k + 1 < N; k++) {
    for (let j = 0; j < SUBSTEPS; j++) {
      const f0 = j / SUBSTEPS;
      const fm = (j + 0.5) / SUBSTEPS;
      const f1 = (j + 1) / SUBSTEPS;
      const k1 = deriv(x, uAt(k, f0));
      const k2 = deriv(x.map((v, i) => v + 0.5 * h * k1[i]), uAt(k, fm));
      const k3 = deriv(x.map((v, i) => v + 0.5 * h * k2[i]), uAt(k, fm));
      const k4 = deriv(x.map((v, i) => v + h * k3[i]), uAt(k, f1));
      x = x.map((v, i) => v + (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]));
      const last = k + 2 === N && j + 1 === SUBSTEPS;
      // The altitude floor and the glide slope hold between ignition and the gate; the end point is the gate.
      observe(x, uAt(k, f1), !last);
    }
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
    touchdownPositionError_m: posErr,
    touchdownVelocityError_mps: velErr,
    propellant_kg: s.mass[0] - x[6],
    violations: veh.rho1 > 0 ? violations : violations.filter((v) => !v.startsWith('minimum thrust')),
  };
}
