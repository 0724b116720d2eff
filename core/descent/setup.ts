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
import { validateVehicle } from './vehicle.ts';

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

/** Checks a whole setup; throws RangeError naming the field, the value and the fix. */
export function validateSetup(s: DescentSetup): void {
  validatePlanet(s.planet);
  validateVehicle(s.vehicle);
  if (!Number.isInteger(s.nodes) || s.nodes < 5 || s.nodes > MAX_NODES) {
    throw new RangeError(`nodes: ${s.nodes} (must be a whole number from 5 to ${MAX_NODES})`);
  }
  if (s.hold !== 'zoh' && s.hold !== 'foh') throw new RangeError(`hold: ${String(s.hold)} (must be 'zoh' or 'foh')`);
  const c = s.constraints;
  if (c.glideSlope !== null && !(c.glideSlope > 0 && c.glideSlope < Math.PI / 2)) {
    throw new RangeError(`constraints.glideSlope: ${(c.glideSlope * 180) / Math.PI}° (must be between 0° and 90°, or absent)`);
  }
  if (c.maxSpeed !== null && !(c.maxSpeed > 0 && Number.isFinite(c.maxSpeed))) {
    throw new RangeError(`constraints.maxSpeed: ${c.maxSpeed} m/s (must be positive, or absent)`);
  }
  if (!(c.gateHeight >= 0 && Number.isFinite(c.gateHeight))) {
    throw new RangeError(`constraints.gateHeight: ${c.gateHeight} m (must be zero or positive)`);
  }
  if (!(c.gateDescentRate >= 0 && Number.isFinite(c.gateDescentRate))) {
    throw new RangeError(`constraints.gateDescentRate: ${c.gateDescentRate} m/s (must be zero or positive; it is a downward speed)`);
  }
  if (c.maxSpeed !== null && c.gateDescentRate >= c.maxSpeed) {
    throw new RangeError(`constraints.gateDescentRate: ${c.gateDescentRate} m/s (must be below maxSpeed ${c.maxSpeed} m/s)`);
  }
  if (c.minAltitude !== null && !Number.isFinite(c.minAltitude)) {
    throw new RangeError(`constraints.minAltitude: ${c.minAltitude} m (must be a finite number, or absent)`);
  }
}

export function validateIgnition(state: IgnitionState, s: DescentSetup): void {
  for (const [field, v] of [['position', state.position], ['velocity', state.velocity]] as const) {
    if (v.length !== 3 || !v.every(Number.isFinite)) {
      throw new RangeError(`ignition.${field}: [${v.join(', ')}] (must be three finite numbers)`);
    }
  }
  if (!(state.mass > s.vehicle.dryMass && state.mass <= s.vehicle.wetMass * (1 + 1e-12))) {
    throw new RangeError(
      `ignition.mass: ${state.mass} kg (must be above the dry mass ${s.vehicle.dryMass} kg and at most the wet mass ${s.vehicle.wetMass} kg)`,
    );
  }
}
