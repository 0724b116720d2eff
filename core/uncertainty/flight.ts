/**
 * Flying a plan on the TRUE dynamics. A plan is a minimum-propellant trajectory's node thrust accelerations
 * u_k = T_k/m_k, held between nodes as the program assumes (first-order hold: linear; zero-order: constant).
 * The vehicle's thrust loop (throttle closed on the accelerometers) delivers the planned acceleration, i.e.
 * the thrust m·u(t), as long as the TRUE engines can: their range is (1 + δT)·[ρ1, full thrust] — the plan's
 * `throttleMax` is a planning limit that keeps authority in hand for the thrust loop, not the engines' top —
 * so a thrust error is felt only where the plan asks for more than a weak engine gives (or less than a strong
 * one's minimum); there the thrust saturates at the true limit. The engines burn at the true specific impulse:
 * ṁ = −‖T‖/(Isp_true g0 cos φ), the mass flow of the thrust itself, never the relaxation's σ.
 * Dynamics in the rotating surface frame, r̈ = T/m + g − 2ω×ṙ − ω×(ω×r), classical fourth-order Runge–Kutta
 * with the steps aligned on the plan's nodes (the hold is smooth inside a step). Without the engine limits
 * (`limits: 'none'`) this is the model `core/descent/verify.ts` re-simulates independently (tests compare the
 * two); with them, a thrust that dips below the minimum between nodes (where ‖u‖ of a turning FOH thrust
 * sags) is held at the minimum, as an engine would.
 */
import type { Vec3 } from '../descent/constants.ts';
import type { DescentSetup } from '../descent/setup.ts';
import type { DecodedTrajectory } from '../descent/trajectory.ts';
import { deriveVehicle } from '../descent/vehicle.ts';

/** RK4 steps per node interval of a plan. */
export const FLIGHT_SUBSTEPS = 16;

export interface Plan {
  /** Absolute time of the plan's first node, s. */
  start_s: number;
  /** Node spacing, s, and node count. */
  dt_s: number;
  nodes: number;
  /** Node thrust accelerations, m/s², [x0, y0, z0, x1, …]. */
  u: Float64Array;
  hold: 'foh' | 'zoh';
  /** The landing point the plan flies to (its gate is above it). */
  target: Vec3;
  /** Propellant the plan expects to burn, kg. */
  propellant_kg: number;
}

export function planFromTrajectory(traj: DecodedTrajectory, start_s: number, hold: 'foh' | 'zoh', target: Vec3): Plan {
  const s = traj.series;
  const N = s.t.length;
  const u = new Float64Array(3 * N);
  for (let k = 0; k < N; k++) {
    u[3 * k] = s.thrustX[k] / s.mass[k];
    u[3 * k + 1] = s.thrustY[k] / s.mass[k];
    u[3 * k + 2] = s.thrustZ[k] / s.mass[k];
  }
  return { start_s, dt_s: traj.timeOfFlight / (N - 1), nodes: N, u, hold, target, propellant_kg: traj.propellant };
}

/** End time of a plan (absolute), s. */
export const planEnd = (p: Plan) => p.start_s + p.dt_s * (p.nodes - 1);

/** What the engines really do: thrust factor 1 + δT and the true specific impulse. */
export interface TrueEngine {
  thrustScale: number;
  isp_s: number;
}

/** The flown state [x, y, z, vx, vy, vz, m] with running extremes. */
export interface FlightState {
  t: number;
  x: Float64Array;
  /** Lowest height above the landing plane seen so far, m. */
  minHeight_m: number;
}

/**
 * Integrates the true dynamics from `state.t` to `until_s` (clamped to the plan's end) under the plan's
 * thrust; updates `state` in place. `landingHeight_m`: the landing plane's height (for the lowest height).
 */
export function flyPlan(
  setup: DescentSetup,
  plan: Plan,
  engine: TrueEngine,
  state: FlightState,
  until_s: number,
  landingHeight_m: number,
  /** 'none': the planned acceleration whatever the engines can do (the model verify.ts re-simulates). */
  limits: 'engine' | 'none' = 'engine',
): void {
  const veh = deriveVehicle(setup.vehicle);
  // α scales with 1/Isp: the same thrust burns more propellant at a lower Isp.
  const alpha = (veh.alpha * setup.vehicle.isp) / engine.isp_s;
  const lowest = veh.rho1 * engine.thrustScale;
  const highest = veh.fullThrust * engine.thrustScale;
  const g = setup.planet.gravity;
  const [wx, wy, wz] = setup.planet.rotationRate;
  const N = plan.nodes;
  const u = plan.u;
  const foh = plan.hold === 'foh';
  const end = Math.min(until_s, planEnd(plan));
  const x = state.x;
  const k1 = new Float64Array(7), k2 = new Float64Array(7), k3 = new Float64Array(7), k4 = new Float64Array(7), y = new Float64Array(7);
  const deriv = (s: Float64Array, ux: number, uy: number, uz: number, out: Float64Array) => {
    const m = s[6];
    const un = Math.sqrt(ux * ux + uy * uy + uz * uz);
    // The thrust loop delivers m‖u‖ within the TRUE engines' range (1 + δT)·[ρ1, full thrust].
    const thrust = limits === 'none' ? m * un : Math.min(Math.max(m * un, lowest), highest);
    const a = un > 0 ? thrust / (m * un) : 0;
    const vx = s[3], vy = s[4], vz = s[5];
    const cvx = wy * vz - wz * vy, cvy = wz * vx - wx * vz, cvz = wx * vy - wy * vx;
    const ax = wy * s[2] - wz * s[1], ay = wz * s[0] - wx * s[2], az = wx * s[1] - wy * s[0];
    const cx = wy * az - wz * ay, cy = wz * ax - wx * az, cz = wx * ay - wy * ax;
    out[0] = vx; out[1] = vy; out[2] = vz;
    out[3] = a * ux + g[0] - 2 * cvx - cx;
    out[4] = a * uy + g[1] - 2 * cvy - cy;
    out[5] = a * uz + g[2] - 2 * cvz - cz;
    out[6] = -alpha * thrust;
  };
  const uv = [0, 0, 0];
  while (state.t < end - 1e-12) {
    // The current node interval, split into FLIGHT_SUBSTEPS equal steps (a re-plan time may cut it short).
    const k = Math.min(N - 2, Math.max(0, Math.floor((state.t - plan.start_s) / plan.dt_s + 1e-9)));
    const intervalEnd = Math.min(end, plan.start_s + (k + 1) * plan.dt_s);
    const span = intervalEnd - state.t;
    if (!(span > 0)) break;
    const steps = Math.max(1, Math.ceil((FLIGHT_SUBSTEPS * span) / plan.dt_s - 1e-9));
    const h = span / steps;
    // Hold evaluated inside the interval k (no kink inside a step).
    const at = (t: number) => {
      const f = Math.min(1, Math.max(0, (t - plan.start_s) / plan.dt_s - k));
      if (!foh) { uv[0] = u[3 * k]; uv[1] = u[3 * k + 1]; uv[2] = u[3 * k + 2]; return; }
      for (let c = 0; c < 3; c++) uv[c] = u[3 * k + c] + f * (u[3 * (k + 1) + c] - u[3 * k + c]);
    };
    for (let j = 0; j < steps; j++) {
      const t0 = state.t + j * h;
      at(t0);
      deriv(x, uv[0], uv[1], uv[2], k1);
      for (let i = 0; i < 7; i++) y[i] = x[i] + 0.5 * h * k1[i];
      at(t0 + h / 2);
      deriv(y, uv[0], uv[1], uv[2], k2);
      for (let i = 0; i < 7; i++) y[i] = x[i] + 0.5 * h * k2[i];
      deriv(y, uv[0], uv[1], uv[2], k3);
      for (let i = 0; i < 7; i++) y[i] = x[i] + h * k3[i];
      at(t0 + h);
      deriv(y, uv[0], uv[1], uv[2], k4);
      for (let i = 0; i < 7; i++) x[i] += (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
      state.minHeight_m = Math.min(state.minHeight_m, x[2] - landingHeight_m);
    }
    state.t = intervalEnd;
  }
}
