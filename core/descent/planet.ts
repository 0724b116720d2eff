/**
 * Planet models in the local surface frame: x east, y north, z up, origin at the nominal target.
 *
 * The surface frame rotates with the planet, so the dynamics carry Coriolis and centrifugal terms
 * r̈ = u + g − 2 ω × ṙ − ω × (ω × r); both are linear in the state and keep the problem convex.
 * Gravity is taken uniform over the few kilometres of a powered descent (flat-planet model).
 */
import type { Vec3 } from './constants.ts';
import { norm3 } from './constants.ts';
import { DescentInputError } from './inputError.ts';

export interface PlanetModel {
  /** Name for reports. */
  readonly name: string;
  /** Gravity vector in the surface frame, m/s² (points down: [0, 0, −g]). */
  readonly gravity: Vec3;
  /** Planet rotation rate vector in the surface frame, rad/s ([0, 0, 0] for a non-rotating model). */
  readonly rotationRate: Vec3;
}

/**
 * Sidereal rotation rate vector in the surface frame at latitude `latitudeRad`:
 * ω = Ω (0, cos λ, sin λ) with x east, y north, z up.
 */
export function rotationAtLatitude(siderealRate: number, latitudeRad: number): Vec3 {
  return [0, siderealRate * Math.cos(latitudeRad), siderealRate * Math.sin(latitudeRad)];
}

/**
 * Mars surface gravity 3.71 m/s² and sidereal rotation period 24.6229 h: common-practice values
 * from the published planetary fact sheets, quoted from memory (second-hand; no check rests on them alone). The rotation vector here is for the equator; use
 * `rotationAtLatitude(MARS_SIDEREAL_RATE, lat)` for a site.
 */
export const MARS_SURFACE_GRAVITY = 3.71;
export const MARS_SIDEREAL_RATE = (2 * Math.PI) / (24.6229 * 3600);

/**
 * Moon surface gravity 1.62 m/s² and sidereal rotation period 655.72 h (27.3217 d): common-practice
 * values from the published planetary fact sheets, quoted from memory (second-hand).
 */
export const MOON_SURFACE_GRAVITY = 1.62;
export const MOON_SIDEREAL_RATE = (2 * Math.PI) / (655.72 * 3600);

export const MARS: PlanetModel = Object.freeze({
  name: 'Mars',
  gravity: [0, 0, -MARS_SURFACE_GRAVITY] as Vec3,
  rotationRate: rotationAtLatitude(MARS_SIDEREAL_RATE, 0),
});

export const MOON: PlanetModel = Object.freeze({
  name: 'Moon',
  gravity: [0, 0, -MOON_SURFACE_GRAVITY] as Vec3,
  rotationRate: rotationAtLatitude(MOON_SIDEREAL_RATE, 0),
});

export const PLANET_PRESETS = { mars: MARS, moon: MOON } as const;
export type PlanetPresetName = keyof typeof PLANET_PRESETS;

/** Checks a planet model; throws DescentInputError (a RangeError) naming the field. */
export function validatePlanet(p: PlanetModel): void {
  for (const [field, v] of [['gravity', p.gravity], ['rotationRate', p.rotationRate]] as const) {
    if (v.length !== 3 || !v.every(Number.isFinite)) {
      throw new DescentInputError(`planet.${field}`, `[${v.join(', ')}]`, 'must be three finite numbers');
    }
  }
  if (!(p.gravity[2] < 0) || norm3(p.gravity) === 0) {
    throw new DescentInputError('planet.gravity', `[${p.gravity.join(', ')}]`, 'the vertical component must be negative: gravity points down, z up');
  }
  if (norm3(p.rotationRate) > 1e-2) {
    throw new DescentInputError('planet.rotationRate', `|ω| = ${norm3(p.rotationRate)} rad/s`, 'too fast for this flat-planet model; expected below 1e-2 rad/s');
  }
}
