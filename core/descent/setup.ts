/**
 * The descent setup shared by every target of a study: planet, vehicle, constraints, discretisation.
 * Everything here is SI with angles in radians; the study file (core/study) converts from its
 * boundary units.
 */
import type { Vec3 } from './constants.ts';
import type { ControlHold } from './discretise.ts';
import type { PlanetModel } from './planet.ts';
import { validatePlanet } from './planet.ts';
import type { VehicleModel } from './vehicle.ts';
import { deriveVehicle, validateVehicle } from './vehicle.ts';
import { DEG, norm3, SPEED_OF_LIGHT } from './constants.ts';
import { DescentInputError } from './inputError.ts';
import { burnTimeBound, landingPlaneWindow } from './landingWindow.ts';

export interface DescentConstraints {
  /** Glide-slope angle above the horizontal, measured at the landing point, rad; null: no glide-slope cone. */
  readonly glideSlope: number | null;
  /** Largest speed, m/s; null: unlimited. */
  readonly maxSpeed: number | null;
  /** Powered descent ends this high above the target (start of a final vertical segment), m. Default 0. */
  readonly gateHeight: number;
  /** Downward speed at the gate, m/s (≥ 0). Default 0. */
  readonly gateDescentRate: number;
  /**
   * Lowest altitude above the target's height while descending (nodes between ignition and gate), m; null:
   * none. The study file's default is 0, the landing plane (core/study `altitudeFloor_m`).
   */
  readonly minAltitude: number | null;
}

export interface IgnitionState {
  /** Position relative to the nominal target (surface frame origin), m. */
  readonly position: Vec3;
  /** Velocity in the surface frame, m/s. */
  readonly velocity: Vec3;
  /** Mass at ignition, kg (usually the vehicle's wet mass). */
  readonly mass: number;
}

export interface DescentSetup {
  readonly planet: PlanetModel;
  readonly vehicle: VehicleModel;
  readonly constraints: DescentConstraints;
  /** Number of time nodes (ignition and gate included), ≥ 5. */
  readonly nodes: number;
  /** How the thrust varies between nodes. */
  readonly hold: ControlHold;
}

/** Most time nodes a descent may have (the study file's limit too). */
export const MAX_NODES = 2000;

export const DEFAULT_CONSTRAINTS: DescentConstraints = Object.freeze({
  glideSlope: null,
  maxSpeed: null,
  gateHeight: 0,
  gateDescentRate: 0,
  // The landing plane: a trajectory through the ground is not an answer (switch off with null, knowingly).
  minAltitude: 0,
});

/**
 * Checks a whole setup; throws DescentInputError (a RangeError) naming the field, the value and the fix.
 * Besides each value's own range it refuses derived quantities that describe no vehicle able to land
 * (the study file runs these same checks when it is read, core/study/toDescent.ts).
 */
export function validateSetup(s: DescentSetup): void {
  validatePlanet(s.planet);
  validateVehicle(s.vehicle);
  validateModelRange(s);
  if (!Number.isInteger(s.nodes) || s.nodes < 5 || s.nodes > MAX_NODES) {
    throw new DescentInputError('nodes', String(s.nodes), `must be a whole number from 5 to ${MAX_NODES}`);
  }
  if (s.hold !== 'zoh' && s.hold !== 'foh') throw new DescentInputError('hold', String(s.hold), "must be 'zoh' or 'foh'");
  if ((s.vehicle.throttleBands ?? []).length > 0 && s.hold !== 'zoh') {
    throw new DescentInputError('hold', String(s.hold), "must be 'zoh' with forbidden throttle bands: a linear thrust ramp between a high and a low node would cross the band between nodes (the study file switches to 'zoh' by itself)");
  }
  const c = s.constraints;
  if (c.glideSlope !== null && !(c.glideSlope > 0 && c.glideSlope < Math.PI / 2)) {
    throw new DescentInputError('constraints.glideSlope', `${(c.glideSlope * 180) / Math.PI}°`, 'must be between 0° and 90°, or absent');
  }
  if (c.maxSpeed !== null && !(c.maxSpeed > 0 && Number.isFinite(c.maxSpeed))) {
    throw new DescentInputError('constraints.maxSpeed', `${c.maxSpeed} m/s`, 'must be positive, or absent');
  }
  if (!(c.gateHeight >= 0 && Number.isFinite(c.gateHeight))) {
    throw new DescentInputError('constraints.gateHeight', `${c.gateHeight} m`, 'must be zero or positive');
  }
  if (!(c.gateDescentRate >= 0 && Number.isFinite(c.gateDescentRate))) {
    throw new DescentInputError('constraints.gateDescentRate', `${c.gateDescentRate} m/s`, 'must be zero or positive; it is a downward speed');
  }
  if (c.maxSpeed !== null && c.gateDescentRate >= c.maxSpeed) {
    throw new DescentInputError('constraints.gateDescentRate', `${c.gateDescentRate} m/s`, `must be below maxSpeed ${c.maxSpeed} m/s`);
  }
  if (c.minAltitude !== null && !Number.isFinite(c.minAltitude)) {
    throw new DescentInputError('constraints.minAltitude', `${c.minAltitude} m`, 'must be a finite number, or absent');
  }
  // The descent ends at the gate: a lowest altitude above it could hold only between nodes' samples.
  if (c.minAltitude !== null && c.minAltitude > c.gateHeight) {
    throw new DescentInputError('constraints.minAltitude', `${c.minAltitude} m`, `must not be above the gate height ${c.gateHeight} m, where the powered descent ends; lower it or raise the gate`);
  }
  // The throttle-rate rows (program.ts throttleRateStep) reserve the thrust change that mass loss alone causes
  // at full thrust on the dry vehicle, α ρ2²/m_dry per second: a rate at or below it could not be met at all.
  const rate = s.vehicle.throttleRate ?? null;
  if (rate !== null) {
    const d = deriveVehicle(s.vehicle);
    const drift = (d.alpha * d.rho2 * d.rho2) / (s.vehicle.dryMass * d.fullThrust);
    if (!(rate > drift)) {
      throw new DescentInputError('vehicle.throttleRate', `${rate} per s`,
        `must be above ${drift.toPrecision(3)} per s, the throttle change that the mass loss at full thrust alone causes on this vehicle; raise it, or leave it out for no limit`);
    }
  }
  // Full thrust must hold the vehicle's weight at its lightest, or the vertical speed only ever grows
  // downward and the descent can never be stopped.
  const { rho2 } = deriveVehicle(s.vehicle);
  const weight = s.vehicle.dryMass * norm3(s.planet.gravity);
  if (!(rho2 > weight)) {
    const v = s.vehicle;
    throw new DescentInputError(
      'vehicle.thrustPerEngine', `${v.thrustPerEngine} N`,
      `full thrust, ${rho2.toPrecision(4)} N (${v.engineCount} engine(s) × ${v.thrustPerEngine} N × cos ${(v.cantAngle / DEG).toFixed(1)}° × throttleMax ${v.throttleMax}), ` +
      `is not above the weight at the dry mass (plus any reserve), ${weight.toPrecision(4)} N: the vehicle could never stop its descent; ` +
      'raise the thrust per engine, the engine count or throttleMax, or lower the dry mass',
    );
  }
}

/**
 * Largest distance from the nominal target, m. The model is a flat planet with uniform gravity (planet.ts);
 * 10,000 km is beyond the radius of every rocky body of the solar system, so no study the model can
 * describe is refused, while coordinates such as 1e308 m (which overflow the solver's arithmetic) are.
 */
export const MAX_DISTANCE_M = 1e7;
/** Speeds must stay below the speed of light (a speed limit of 1e300 m/s overflows the solver's scaling). */
const MAX_SPEED_MPS = SPEED_OF_LIGHT;
/**
 * Flattest glide slope, degrees. A cone flatter than this rises 1.7 mm per 10 m (less than any DEM
 * resolves); flatter ones make the cone's coefficient cot θ exceed 5e5, where the solver's answers were
 * seen to go wrong (1e-12° gave "unreachable" for a target 218.69 kg away): use null for no cone.
 */
export const MIN_GLIDE_SLOPE_DEG = 0.01;

function validateModelRange(s: DescentSetup): void {
  const c = s.constraints;
  if (c.glideSlope !== null && c.glideSlope < MIN_GLIDE_SLOPE_DEG * DEG) {
    throw new DescentInputError('constraints.glideSlope', `${c.glideSlope / DEG}°`, `must be at least ${MIN_GLIDE_SLOPE_DEG}° (a flatter cone constrains nothing a map can show); leave it out (null) for no glide slope`);
  }
  if (c.maxSpeed !== null && c.maxSpeed >= MAX_SPEED_MPS) {
    throw new DescentInputError('constraints.maxSpeed', `${c.maxSpeed} m/s`, 'must be below the speed of light, 299,792,458 m/s; leave it out (null) for no speed limit');
  }
  if (c.gateDescentRate >= MAX_SPEED_MPS) {
    throw new DescentInputError('constraints.gateDescentRate', `${c.gateDescentRate} m/s`, 'must be below the speed of light, 299,792,458 m/s');
  }
  for (const [field, v] of [['constraints.gateHeight', c.gateHeight], ['constraints.minAltitude', c.minAltitude ?? 0]] as const) {
    if (Math.abs(v) > MAX_DISTANCE_M) {
      throw new DescentInputError(field, `${v} m`, `must be within ${MAX_DISTANCE_M / 1000} km of the target (the flat-planet model's range)`);
    }
  }
}

/** Checks an ignition state against a (valid) setup; throws DescentInputError naming the field, the value and the fix. */
export function validateIgnition(state: IgnitionState, s: DescentSetup): void {
  for (const [field, v] of [['position', state.position], ['velocity', state.velocity]] as const) {
    if (v.length !== 3 || !v.every(Number.isFinite)) {
      throw new DescentInputError(`ignition.${field}`, `[${v.join(', ')}]`, 'must be three finite numbers');
    }
  }
  if (!state.position.every((x) => Math.abs(x) <= MAX_DISTANCE_M)) {
    throw new DescentInputError('ignition.position', `[${state.position.join(', ')}] m`, `must be within ${MAX_DISTANCE_M / 1000} km of the nominal target in each axis (the flat-planet model's range)`);
  }
  if (!(norm3(state.velocity) < MAX_SPEED_MPS)) {
    throw new DescentInputError('ignition.velocity', `[${state.velocity.join(', ')}] m/s`, 'must be slower than light (299,792,458 m/s)');
  }
  if (!(state.mass > s.vehicle.dryMass && state.mass <= s.vehicle.wetMass * (1 + 1e-12))) {
    throw new DescentInputError(
      'ignition.mass', `${state.mass} kg`, `must be above the dry mass ${s.vehicle.dryMass} kg and at most the wet mass ${s.vehicle.wetMass} kg`,
    );
  }
}

/** Checks a target position (relative to the nominal target, m) against the model's range. */
export function validateTarget(target: Vec3): void {
  if (!target.every((x) => Math.abs(x) <= MAX_DISTANCE_M)) {
    throw new DescentInputError('target.position', `[${target.join(', ')}] m`, `must be within ${MAX_DISTANCE_M / 1000} km of the nominal target in each axis (the flat-planet model's range)`);
  }
}

/**
 * Checks of one descent case, run when a study is read (not by DescentSolver's constructor): throws
 * DescentInputError when the ignition is faster than the speed limit, the gate is above the ignition, or
 * no burn the propellant allows can reach the landing plane (the target's height plus the gate) at all
 * (landingWindow.ts: necessary conditions, so nothing valid is refused).
 */
/**
 * The ignition point must be at or above the altitude floor (the landing plane by default): the floor holds
 * from the first node after ignition, so a start below it could only be "solved" by a jump. Also run by
 * the free-final-time search itself, for setups built without a study.
 */
export function validateAltitudeFloor(s: DescentSetup, state: IgnitionState, targetHeight_m: number): void {
  const floor = s.constraints.minAltitude;
  if (floor !== null && state.position[2] < targetHeight_m + floor) {
    throw new DescentInputError(
      'ignition.position', `[${state.position.join(', ')}] m`,
      `its altitude ${state.position[2]} m is below the altitude floor ${targetHeight_m + floor} m (target height ${targetHeight_m} m + ` +
      `minimum altitude ${floor} m); raise the ignition point, or set constraints.stayAboveLandingPlane to false knowingly`,
    );
  }
}

export function validateLanding(s: DescentSetup, state: IgnitionState, targetHeight_m: number): void {
  validateAltitudeFloor(s, state, targetHeight_m);
  const c = s.constraints;
  // The speed limit holds from the first node after ignition (program.ts): a faster ignition would be
  // slowed within one node step, an answer that depends on the number of nodes rather than on physics.
  // (Checked here, not by the solver's constructor: a dispersed sample of a study may start faster, and
  // the solver still answers for it as before.)
  const speed = norm3(state.velocity);
  if (c.maxSpeed !== null && speed > c.maxSpeed) {
    throw new DescentInputError(
      'ignition.velocity', `[${state.velocity.join(', ')}] m/s`,
      `its speed ${speed.toFixed(1)} m/s is above the speed limit maxSpeed ${c.maxSpeed} m/s, which the descent could not meet from its start; raise the limit or start slower`,
    );
  }
  if (!(Math.abs(targetHeight_m) <= MAX_DISTANCE_M)) {
    throw new DescentInputError('target.height', `${targetHeight_m} m`, `must be within ${MAX_DISTANCE_M / 1000} km of the nominal target (the flat-planet model's range)`);
  }
  const plane = targetHeight_m + c.gateHeight;
  const z0 = state.position[2];
  if (c.gateHeight > 0 && z0 < plane) {
    throw new DescentInputError(
      'constraints.gateHeight', `${c.gateHeight} m`,
      `puts the end of the powered descent at ${plane} m, above the ignition altitude ${z0} m: the descent would have to climb to its gate; lower the gate or start higher`,
    );
  }
  const longest = burnTimeBound(s, state);
  if (!Number.isFinite(longest)) return;
  const window = landingPlaneWindow(s, state, plane, longest);
  if (window.earliest !== null) return;
  const v = s.vehicle;
  const { rho1 } = deriveVehicle(v);
  throw new DescentInputError(
    'vehicle.throttleMin', String(v.throttleMin),
    `at the lowest thrust, ${rho1.toPrecision(4)} N (${v.engineCount} engine(s) × ${v.thrustPerEngine} N × cos ${(v.cantAngle / DEG).toFixed(1)}° × throttleMin ${v.throttleMin}), ` +
    `the ${(state.mass - v.dryMass).toPrecision(4)} kg of usable propellant (${state.mass} kg at ignition less ${v.dryMass} kg dry and reserve) burn out within ${longest.toPrecision(3)} s, ` +
    `and no descent that short reaches the landing plane at ${plane} m from ${z0} m (vertical speed ${state.velocity[2]} m/s); ` +
    'lower throttleMin, the engine count or the thrust per engine, or carry more usable propellant',
    'burn-time',
  );
}
