/**
 * Decoding a solution of the descent program into physical time series and diagnostics.
 */
import type { Vec3 } from './constants.ts';
import { NODE } from './program.ts';
import type { DescentProgram } from './program.ts';
import { deriveVehicle } from './vehicle.ts';

/** Time series at the N nodes (struct of arrays, SI units, angles in radians). */
export interface TrajectorySeries {
  t: Float64Array;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  vx: Float64Array;
  vy: Float64Array;
  vz: Float64Array;
  /** Mass, kg. */
  mass: Float64Array;
  /** Net thrust vector, N. */
  thrustX: Float64Array;
  thrustY: Float64Array;
  thrustZ: Float64Array;
  /** Net thrust over the full-throttle net thrust n T_e cos φ. */
  throttle: Float64Array;
  /** Angle of the thrust from vertical, rad. */
  tilt: Float64Array;
  /** Propellant mass flow, kg/s (α m σ). */
  massFlow: Float64Array;
}

export interface TrajectoryDiagnostics {
  /** max_k (σ_k − ‖u_k‖), m/s²: zero when the convexification is lossless. */
  losslessnessGap: number;
  /** The same relative to the full-throttle acceleration at ignition. */
  losslessnessGapRelative: number;
  /** True when the relative gap is below `LOSSLESS_TOLERANCE`. */
  lossless: boolean;
  maxTilt: number;
  minThrottle: number;
  maxThrottle: number;
  maxSpeed: number;
  /** Smallest elevation of the trajectory above the glide-slope cone, rad (NaN without a glide slope). */
  glideSlopeMargin: number;
  /** Smallest height above the minimum altitude, m (NaN without one). */
  altitudeMargin: number;
  /** Smallest distance below the speed limit, m/s (NaN without one). */
  speedMargin: number;
}

export interface DecodedTrajectory {
  timeOfFlight: number;
  propellant: number;
  finalMass: number;
  landing: Vec3;
  series: TrajectorySeries;
  diagnostics: TrajectoryDiagnostics;
}

/** Relative losslessness gap above which a result is flagged as not lossless. */
export const LOSSLESS_TOLERANCE = 1e-4;

export function decodeTrajectory(program: DescentProgram, x: ArrayLike<number>, timeOfFlight: number, target: Vec3): DecodedTrajectory {
  const setup = program.setup;
  const N = program.nodes;
  const { alpha, fullThrust, rho2 } = deriveVehicle(setup.vehicle);
  const f = () => new Float64Array(N);
  const s: TrajectorySeries = {
    t: f(), x: f(), y: f(), z: f(), vx: f(), vy: f(), vz: f(), mass: f(),
    thrustX: f(), thrustY: f(), thrustZ: f(), throttle: f(), tilt: f(), massFlow: f(),
  };
  const dt = timeOfFlight / (N - 1);
  let gap = 0;
  let maxTilt = 0;
  let minThrottle = Infinity;
  let maxThrottle = 0;
  let maxSpeed = 0;
  const v = (k: number, field: number) => program.value(x, k * NODE.size + field);
  for (let k = 0; k < N; k++) {
    s.t[k] = k * dt;
    s.x[k] = v(k, NODE.r);
    s.y[k] = v(k, NODE.r + 1);
    s.z[k] = v(k, NODE.r + 2);
    s.vx[k] = v(k, NODE.v);
    s.vy[k] = v(k, NODE.v + 1);
    s.vz[k] = v(k, NODE.v + 2);
    const m = Math.exp(v(k, NODE.z));
    s.mass[k] = m;
    const ux = v(k, NODE.u);
    const uy = v(k, NODE.u + 1);
    const uz = v(k, NODE.u + 2);
    const sigma = v(k, NODE.sigma);
    const un = Math.hypot(ux, uy, uz);
    gap = Math.max(gap, sigma - un);
    s.thrustX[k] = m * ux;
    s.thrustY[k] = m * uy;
    s.thrustZ[k] = m * uz;
    s.throttle[k] = (m * un) / fullThrust;
    s.tilt[k] = un > 0 ? Math.acos(Math.max(-1, Math.min(1, uz / un))) : 0;
    s.massFlow[k] = alpha * m * sigma;
    maxTilt = Math.max(maxTilt, s.tilt[k]);
    minThrottle = Math.min(minThrottle, s.throttle[k]);
    maxThrottle = Math.max(maxThrottle, s.throttle[k]);
    maxSpeed = Math.max(maxSpeed, Math.hypot(s.vx[k], s.vy[k], s.vz[k]));
  }
  const con = setup.constraints;
  const landing: Vec3 = [s.x[N - 1], s.y[N - 1], s.z[N - 1] - con.gateHeight];
  let glideSlopeMargin = NaN;
  let altitudeMargin = NaN;
  if (con.glideSlope !== null) {
    glideSlopeMargin = Infinity;
    for (let k = 1; k < N - 1; k++) {
      const elev = Math.atan2(s.z[k] - landing[2], Math.hypot(s.x[k] - landing[0], s.y[k] - landing[1]));
      glideSlopeMargin = Math.min(glideSlopeMargin, elev - con.glideSlope);
    }
  }
  if (con.minAltitude !== null) {
    altitudeMargin = Infinity;
    for (let k = 1; k < N - 1; k++) altitudeMargin = Math.min(altitudeMargin, s.z[k] - target[2] - con.minAltitude);
  }
  const accelRef = rho2 / s.mass[0];
  const rel = gap / accelRef;
  return {
    timeOfFlight,
    propellant: s.mass[0] - s.mass[N - 1],
    finalMass: s.mass[N - 1],
    landing,
    series: s,
    diagnostics: {
      losslessnessGap: gap,
      losslessnessGapRelative: rel,
      lossless: rel <= LOSSLESS_TOLERANCE,
      maxTilt,
      minThrottle,
      maxThrottle,
      maxSpeed,
      glideSlopeMargin,
      altitudeMargin,
      speedMargin: con.maxSpeed !== null ? con.maxSpeed - maxSpeed : NaN,
    },
  };
}
