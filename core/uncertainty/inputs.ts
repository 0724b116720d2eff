/**
 * Inputs of the landing-success study (run inputs, like the other trade studies' — not part of the study
 * file), their illustrative defaults, and their checks. Every check names the field, the value and the fix
 * (UncertaintyInputError). Covariances are full 3 × 3 matrices in the surface frame (x east, y north, z up).
 */
import { covarianceFactor, diagonalCovariance } from './covariance.ts';
import type { UncertaintyModel } from './closedLoop.ts';
import { UncertaintyInputError } from './inputError.ts';

export interface LandingSuccessInputs {
  /** Monte Carlo samples (1 … 100,000). */
  samples: number;
  /** Study number from which every sample's random stream is derived (whole number 0 … 2³² − 1). */
  seed: number;
  /** Covariance of the true ignition position about the study's, m² (3 × 3, symmetric PSD). */
  ignitionPositionCovariance_m2: number[][];
  /** Covariance of the true ignition velocity, (m/s)² (3 × 3, symmetric PSD). */
  ignitionVelocityCovariance_m2ps2: number[][];
  /** 1σ of the ignition mass, kg. */
  sigmaMass_kg: number;
  /** 1σ of the delivered thrust, as a fraction of the commanded. */
  sigmaThrustFraction: number;
  /** 1σ of the specific impulse, as a fraction of nominal. */
  sigmaIspFraction: number;
  /** Navigation error of the state the guidance sees at each plan: position covariance, m². */
  navPositionCovariance_m2: number[][];
  /** … and velocity covariance, (m/s)². Drawn afresh (independent) at every plan. */
  navVelocityCovariance_m2ps2: number[][];
  /** Time between re-plans, s. */
  replanInterval_s: number;
  /** No re-plan once the plan's time to go would be shorter than this, s. */
  minTimeToGo_s: number;
  /** Largest distance of the touchdown velocity from the gate velocity for a success, m/s. */
  touchdownVelocityTolerance_mps: number;
  /** Propellant to keep, kg; null: the study's vehicle.propellantReserve_kg. */
  reserve_kg: number | null;
  /** Time nodes of every plan. */
  nodes: number;
  /** How many ranked safe sites the policy may fall back to. */
  sites: number;
  /** Two-sided confidence level of the Wilson intervals. */
  confidence: number;
  /** Probability of the landing ellipse drawn and reported (2-D Gaussian). */
  ellipseProbability: number;
}

/**
 * ILLUSTRATIVE defaults — not from any mission: 50 m / 2 m/s 1σ per axis at ignition (the dispersion study's),
 * 5 m / 0.2 m/s 1σ navigation error, re-plan every 10 s down to 8 s to go, a 1 m/s touchdown gate.
 */
export const DEFAULT_LANDING_SUCCESS: Readonly<LandingSuccessInputs> = Object.freeze({
  samples: 1000,
  seed: 1,
  ignitionPositionCovariance_m2: diagonalCovariance([50, 50, 50]),
  ignitionVelocityCovariance_m2ps2: diagonalCovariance([2, 2, 2]),
  sigmaMass_kg: 5,
  sigmaThrustFraction: 0.01,
  sigmaIspFraction: 0.005,
  navPositionCovariance_m2: diagonalCovariance([5, 5, 5]),
  navVelocityCovariance_m2ps2: diagonalCovariance([0.2, 0.2, 0.2]),
  replanInterval_s: 10,
  minTimeToGo_s: 8,
  touchdownVelocityTolerance_mps: 1,
  reserve_kg: null,
  nodes: 30,
  sites: 10,
  confidence: 0.95,
  ellipseProbability: 0.997,
});

const KEYS = Object.keys(DEFAULT_LANDING_SUCCESS) as (keyof LandingSuccessInputs)[];

function numberIn(field: string, v: unknown, ok: (x: number) => boolean, fix: string): number {
  if (typeof v !== 'number' || !ok(v)) throw new UncertaintyInputError(field, v, fix);
  return v;
}

/**
 * Fills defaults and checks every input; `given` may hold any subset (unknown keys are refused, naming the
 * known ones). Returns the complete inputs and the factored model.
 */
export function resolveLandingSuccessInputs(given: Partial<Record<string, unknown>>): { inputs: LandingSuccessInputs; model: UncertaintyModel } {
  for (const k of Object.keys(given)) {
    if (!(KEYS as string[]).includes(k)) throw new UncertaintyInputError(k, given[k], `is not an input of the landing-success study; known inputs: ${KEYS.join(', ')}`);
  }
  const v = { ...DEFAULT_LANDING_SUCCESS, ...Object.fromEntries(Object.entries(given).filter(([, x]) => x !== undefined)) } as Record<string, unknown>;
  const whole = (lo: number, hi: number) => (x: number) => Number.isInteger(x) && x >= lo && x <= hi;
  const nonNeg = (x: number) => Number.isFinite(x) && x >= 0;
  const inputs: LandingSuccessInputs = {
    samples: numberIn('samples', v.samples, whole(1, 100000), 'must be a whole number from 1 to 100000'),
    seed: numberIn('seed', v.seed, whole(0, 2 ** 32 - 1), 'must be a whole number from 0 to 4294967295'),
    ignitionPositionCovariance_m2: v.ignitionPositionCovariance_m2 as number[][],
    ignitionVelocityCovariance_m2ps2: v.ignitionVelocityCovariance_m2ps2 as number[][],
    sigmaMass_kg: numberIn('sigmaMass_kg', v.sigmaMass_kg, nonNeg, 'must be zero or a positive mass in kg'),
    sigmaThrustFraction: numberIn('sigmaThrustFraction', v.sigmaThrustFraction, (x) => nonNeg(x) && x < 0.2, 'must be a fraction from 0 to below 0.2, e.g. 0.01 (1 %)'),
    sigmaIspFraction: numberIn('sigmaIspFraction', v.sigmaIspFraction, (x) => nonNeg(x) && x < 0.2, 'must be a fraction from 0 to below 0.2, e.g. 0.005'),
    navPositionCovariance_m2: v.navPositionCovariance_m2 as number[][],
    navVelocityCovariance_m2ps2: v.navVelocityCovariance_m2ps2 as number[][],
    replanInterval_s: numberIn('replanInterval_s', v.replanInterval_s, (x) => Number.isFinite(x) && x >= 0.5 && x <= 3600, 'must be a time from 0.5 to 3600 s'),
    minTimeToGo_s: numberIn('minTimeToGo_s', v.minTimeToGo_s, (x) => Number.isFinite(x) && x >= 0 && x <= 3600, 'must be a time from 0 to 3600 s'),
    touchdownVelocityTolerance_mps: numberIn('touchdownVelocityTolerance_mps', v.touchdownVelocityTolerance_mps, (x) => Number.isFinite(x) && x > 0, 'must be a positive speed in m/s, e.g. 1'),
    reserve_kg: v.reserve_kg === null ? null : numberIn('reserve_kg', v.reserve_kg, nonNeg, 'must be zero or a positive mass in kg (or null for the study\'s reserve)'),
    nodes: numberIn('nodes', v.nodes, whole(5, 2000), 'must be a whole number from 5 to 2000'),
    sites: numberIn('sites', v.sites, whole(0, 1000), 'must be a whole number from 0 to 1000'),
    confidence: numberIn('confidence', v.confidence, (x) => x > 0 && x < 1, 'must be between 0 and 1, e.g. 0.95'),
    ellipseProbability: numberIn('ellipseProbability', v.ellipseProbability, (x) => x > 0 && x < 1, 'must be between 0 and 1, e.g. 0.997'),
  };
  const model: UncertaintyModel = {
    position: covarianceFactor('ignitionPositionCovariance_m2', inputs.ignitionPositionCovariance_m2, 3, 'm²'),
    velocity: covarianceFactor('ignitionVelocityCovariance_m2ps2', inputs.ignitionVelocityCovariance_m2ps2, 3, '(m/s)²'),
    sigmaMass_kg: inputs.sigmaMass_kg,
    sigmaThrustFraction: inputs.sigmaThrustFraction,
    sigmaIspFraction: inputs.sigmaIspFraction,
    navPosition: covarianceFactor('navPositionCovariance_m2', inputs.navPositionCovariance_m2, 3, 'm²'),
    navVelocity: covarianceFactor('navVelocityCovariance_m2ps2', inputs.navVelocityCovariance_m2ps2, 3, '(m/s)²'),
  };
  return { inputs, model };
}
