/**
 * Gravity-turn soft-landing baseline (no targeting): thrust always opposite the velocity, magnitude
 * from a speed-versus-altitude schedule v_ref(h) = √(v_t² + 2 a_s h), which a vehicle decelerating
 * at a constant a_s along its path follows exactly. Command: ‖a_T‖ = a_s + g·v̂ (holding a_s of net
 * deceleration along the path) + k (|v| − v_ref(h)), saturated to the engines' range. Once the speed
 * is down to v_t it descends vertically at v_t. Reports propellant, landing point and touchdown speed.
 */
import type { Vec3 } from '../constants.ts';
import { dot3, norm3 } from '../constants.ts';
import type { DescentSetup, IgnitionState } from '../setup.ts';
import { deriveVehicle } from '../vehicle.ts';
import { saturateThrust, simulate } from './simulate.ts';
import type { SimSample } from './simulate.ts';

export interface GravityTurnOptions {
  /** Scheduled deceleration along the path, m/s². Default 60 % of (ρ2/m0 − g). */
  deceleration?: number;
  /** Touchdown speed, m/s. Default: the gate descent rate, or 1 m/s. */
  touchdownSpeed?: number;
  /** Gain on the speed error, 1/s. Default 0.5. */
  gain?: number;
  /** Simulation step, s. Default 0.05. */
  step?: number;
}

export interface GravityTurnResult {
  propellant: number;
  timeOfFlight: number;
  /** Where the vehicle reaches the target's height (or the gate height), m. */
  landing: Vec3;
  touchdownSpeed: number;
  /** True when the propellant ran out above the ground (landing and speed are then not a touchdown). */
  outOfPropellant: boolean;
  samples: SimSample[];
}

export function gravityTurn(setup: DescentSetup, ignition: IgnitionState, groundHeight = 0, options: GravityTurnOptions = {}): GravityTurnResult {
  const { rho2 } = deriveVehicle(setup.vehicle);
  const g = setup.planet.gravity;
  const gMag = norm3(g);
  const as = options.deceleration ?? 0.6 * (rho2 / ignition.mass - gMag);
  if (!(as > 0)) throw new RangeError(`gravityTurn deceleration: ${as} m/s² (must be positive: the engines cannot out-thrust gravity)`);
  const vt = options.touchdownSpeed ?? Math.max(setup.constraints.gateDescentRate, 1);
  const k = options.gain ?? 0.5;
  const floor = groundHeight + setup.constraints.gateHeight;
  const samples = simulate(setup, ignition, (s) => {
    const h = s.r[2] - floor;
    if (h <= 0) return null;
    const speed = norm3(s.v);
    if (speed <= vt) {
      const aZ = gMag + k * (-vt - s.v[2]);
      return saturateThrust(setup, s.m, [-k * s.v[0], -k * s.v[1], aZ]);
    }
    const vhat: Vec3 = [s.v[0] / speed, s.v[1] / speed, s.v[2] / speed];
    const vRef = Math.sqrt(vt * vt + 2 * as * h);
    const mag = as + dot3(g, vhat) + k * (speed - vRef);
    return saturateThrust(setup, s.m, [-vhat[0] * mag, -vhat[1] * mag, -vhat[2] * mag]);
  }, options.step ?? 0.05, 3600);
  // Interpolate to the crossing of the floor height.
  const n = samples.length;
  const b = samples[n - 1];
  const a = samples[Math.max(0, n - 2)];
  const f = a.r[2] === b.r[2] ? 1 : (a.r[2] - floor) / (a.r[2] - b.r[2]);
  const lerp = (x: number, y: number) => x + f * (y - x);
  const landing: Vec3 = [lerp(a.r[0], b.r[0]), lerp(a.r[1], b.r[1]), floor - setup.constraints.gateHeight];
  const vEnd: Vec3 = [lerp(a.v[0], b.v[0]), lerp(a.v[1], b.v[1]), lerp(a.v[2], b.v[2])];
  const outOfPropellant = b.r[2] > floor && b.m <= setup.vehicle.dryMass * (1 + 1e-9);
  return { propellant: ignition.mass - lerp(a.m, b.m), timeOfFlight: lerp(a.t, b.t), landing, touchdownSpeed: norm3(vEnd), outOfPropellant, samples };
}
