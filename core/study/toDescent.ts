/** From a validated study (boundary units) to the descent models (SI, radians). */
import type { Vec3 } from '../descent/constants.ts';
import { DEG } from '../descent/constants.ts';
import { MARS_SIDEREAL_RATE, MARS_SURFACE_GRAVITY, MOON_SIDEREAL_RATE, MOON_SURFACE_GRAVITY, rotationAtLatitude } from '../descent/planet.ts';
import type { PlanetModel } from '../descent/planet.ts';
import type { DescentSetup, IgnitionState } from '../descent/setup.ts';
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
    },
    constraints: {
      glideSlope: c.glideSlope_deg === null ? null : c.glideSlope_deg * DEG,
      maxSpeed: c.maxSpeed_mps,
      gateHeight: c.gateHeight_m,
      gateDescentRate: c.gateDescentRate_mps,
      minAltitude: altitudeFloor_m(c),
    },
    nodes: study.discretisation.nodes,
    hold: study.discretisation.hold,
  };
  const ignition: IgnitionState = {
    position: study.ignition.position_m,
    velocity: study.ignition.velocity_mps,
    mass: study.ignition.mass_kg ?? v.wetMass_kg,
  };
  return { setup, ignition, target: [study.target.x_m, study.target.y_m, study.target.z_m] };
}
