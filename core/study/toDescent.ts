/** From a validated study (boundary units) to the descent models (SI, radians). */
import type { Vec3 } from '../descent/constants.ts';
import { DEG } from '../descent/constants.ts';
import { MARS_SIDEREAL_RATE, MARS_SURFACE_GRAVITY, MOON_SIDEREAL_RATE, MOON_SURFACE_GRAVITY, rotationAtLatitude } from '../descent/planet.ts';
import type { PlanetModel } from '../descent/planet.ts';
import type { DescentSetup, IgnitionState } from '../descent/setup.ts';
import { validateIgnition, validateLanding, validateSetup, validateTarget } from '../descent/setup.ts';
import { DescentInputError, type DescentField } from '../descent/inputError.ts';
import type { Study } from './schema.ts';
import { altitudeFloor_m } from './schema.ts';

export interface StudyDescent {
  setup: DescentSetup;
  ignition: IgnitionState;
  target: Vec3;
}

export function studyPlanet(study: Study): PlanetModel {
  const p = study.planet;
  const preset = p.body === 'mars'
    ? { g: MARS_SURFACE_GRAVITY, rate: MARS_SIDEREAL_RATE, name: 'Mars' }
    : p.body === 'moon'
      ? { g: MOON_SURFACE_GRAVITY, rate: MOON_SIDEREAL_RATE, name: 'Moon' }
      : { g: NaN, rate: 0, name: 'custom body' };
  const g = p.gravity_mps2 ?? preset.g;
  const rate = p.siderealPeriod_h === undefined ? preset.rate : p.siderealPeriod_h === null ? 0 : (2 * Math.PI) / (p.siderealPeriod_h * 3600);
  return { name: preset.name, gravity: [0, 0, -g], rotationRate: rotationAtLatitude(rate, study.site.latitude_deg * DEG) };
}

export function studyToDescent(study: Study): StudyDescent {
  const v = study.vehicle;
  const c = study.constraints;
  const setup: DescentSetup = {
    planet: studyPlanet(study),
    vehicle: {
      wetMass: v.wetMass_kg,
      dryMass: v.dryMass_kg + v.propellantReserve_kg,
      isp: v.isp_s,
      engineCount: v.engineCount,
      thrustPerEngine: v.thrustPerEngine_N,
      cantAngle: v.cantAngle_deg * DEG,
      throttleMin: v.throttleMin,
      throttleMax: v.throttleMax,
      pointingLimit: v.pointingLimit_deg >= 180 ? Math.PI : v.pointingLimit_deg * DEG,
      throttleBands: v.throttleBands.map(([lo, hi]) => [lo, hi] as const),
      throttleRate: v.throttleRate_perS,
    },
    constraints: {
      glideSlope: c.glideSlope_deg === null ? null : c.glideSlope_deg * DEG,
      maxSpeed: c.maxSpeed_mps,
      gateHeight: c.gateHeight_m,
      gateDescentRate: c.gateDescentRate_mps,
      minAltitude: altitudeFloor_m(c),
    },
    nodes: study.discretisation.nodes,
    // A forbidden band needs piecewise-constant thrust (band.ts: a linear ramp between a high and a low node
    // would cross the band between nodes), so a study with bands is discretised with zero-order hold.
    hold: v.throttleBands.length > 0 ? 'zoh' : study.discretisation.hold,
  };
  const ignition: IgnitionState = {
    position: study.ignition.position_m,
    velocity: study.ignition.velocity_mps,
    mass: study.ignition.mass_kg ?? v.wetMass_kg,
  };
  return { setup, ignition, target: [study.target.x_m, study.target.y_m, study.target.z_m] };
}

/** Where each descent-model field comes from in the study file. */
const STUDY_FIELD: Record<DescentField, string> = {
  'planet.gravity': 'planet.gravity_mps2',
  'planet.rotationRate': 'planet.siderealPeriod_h',
  'vehicle.wetMass': 'vehicle.wetMass_kg',
  'vehicle.dryMass': 'vehicle.dryMass_kg',
  'vehicle.isp': 'vehicle.isp_s',
  'vehicle.engineCount': 'vehicle.engineCount',
  'vehicle.thrustPerEngine': 'vehicle.thrustPerEngine_N',
  'vehicle.cantAngle': 'vehicle.cantAngle_deg',
  'vehicle.throttleMin': 'vehicle.throttleMin',
  'vehicle.throttleMax': 'vehicle.throttleMax',
  'vehicle.pointingLimit': 'vehicle.pointingLimit_deg',
  'vehicle.throttleBands': 'vehicle.throttleBands',
  'vehicle.throttleRate': 'vehicle.throttleRate_perS',
  'constraints.glideSlope': 'constraints.glideSlope_deg',
  'constraints.maxSpeed': 'constraints.maxSpeed_mps',
  'constraints.gateHeight': 'constraints.gateHeight_m',
  'constraints.gateDescentRate': 'constraints.gateDescentRate_mps',
  'constraints.minAltitude': 'constraints.minAltitude_m',
  nodes: 'discretisation.nodes',
  hold: 'discretisation.hold',
  'ignition.position': 'ignition.position_m',
  'ignition.velocity': 'ignition.velocity_mps',
  'ignition.mass': 'ignition.mass_kg',
  'target.position': 'target',
  'target.height': 'target.z_m',
};

/** A problem with a study as a model of a descent: the study field, its value in the file, what to do. */
export interface StudyDescentProblem {
  field: string;
  value: unknown;
  message: string;
  /** Set when a derived rule failed rather than one field's own range ('burn-time': no burn reaches the landing plane). */
  rule?: 'burn-time';
}

function valueAt(study: Study, path: string): unknown {
  return path.split('.').reduce<unknown>((node, key) => (node !== null && typeof node === 'object' ? (node as Record<string, unknown>)[key] : undefined), study);
}

/** The descent model's checks on a study (validateSetup, validateIgnition, validateTarget, validateLanding), or null. */
function descentCheck(study: Study, target: Vec3): DescentInputError | null {
  const d = studyToDescent(study);
  try {
    validateSetup(d.setup);
    validateIgnition(d.ignition, d.setup);
    validateTarget(target);
    validateLanding(d.setup, d.ignition, target[2]);
    return null;
  } catch (err) {
    if (err instanceof DescentInputError) return err;
    throw err;
  }
}

/**
 * The one place where a study is checked as a descent: every command and the app read studies through
 * parseStudy, which runs this after the schema. The checks themselves are the descent model's
 * (core/descent/setup.ts), so a setup built any other way meets the same rules. `target` (default: the
 * study's) sets the landing plane's height. Returns null when the study describes a descent the solver
 * can be asked about.
 */
export function studyDescentProblem(study: Study, target: Vec3 = [study.target.x_m, study.target.y_m, study.target.z_m]): StudyDescentProblem | null {
  const err = descentCheck(study, target);
  if (!err) return null;
  let field = STUDY_FIELD[err.field];
  if (err.rule === 'burn-time') {
    // Too little burn time: name the reserve or the ignition mass when restoring it alone would do.
    const v = study.vehicle;
    if (v.propellantReserve_kg > 0 && !descentCheck({ ...study, vehicle: { ...v, propellantReserve_kg: 0 } }, target)) field = 'vehicle.propellantReserve_kg';
    else if (study.ignition.mass_kg !== undefined && !descentCheck({ ...study, ignition: { ...study.ignition, mass_kg: undefined } }, target)) field = 'ignition.mass_kg';
  }
  return { field, value: valueAt(study, field), message: err.fix, ...(err.rule ? { rule: err.rule } : {}) };
}
