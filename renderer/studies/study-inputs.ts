/**
 * The trade studies' own inputs, as typed (run inputs like the grid: not part of the study file), their
 * defaults (core/footprint/studyRuns.ts, the same as the CLI's) and their checks. Each problem names the
 * field, the value typed and the fix. Pure.
 */
import type { DispersionSigmas } from '../../core/footprint/dispersion.ts';
import type { IgnitionRule } from '../../core/footprint/studies.ts';
import { defaultAltitudes, defaultReserves, DEFAULT_DIRECTIONS, DEFAULT_DISPERSION, DEFAULT_SIGMAS } from '../../core/footprint/studyRuns.ts';
import type { Study } from '../../core/study/schema.ts';
import { FIELDS } from '../study/field-table.ts';

/** The main inputs' ignition-altitude limits (Ignition › Altitude): a study sweeps within the same range. */
const ALTITUDE_FIELD = FIELDS.find((f) => f.id === 'ignition.position_m.2')!;

export type StudyKind = 'reserve' | 'ignition-altitude' | 'dispersion';

export interface ReserveInputs {
  /** Reserves to evaluate, kg, comma-separated. */
  reserves_kg: string;
}

export interface AltitudeInputs {
  /** Ignition altitudes above the target, m, comma-separated. */
  altitudes_m: string;
  rule: 'fixed-velocity' | 'fixed-flight-path-angle';
  reserve_kg: string;
  /** Divert radius the mission requires, m; empty for none. */
  requiredRadius_m: string;
  method: 'directions' | 'grid';
  directions: string;
}

export interface DispersionInputs {
  samples: string;
  seed: string;
  probability: string;
  sigmaPosition_m: string;
  sigmaVelocity_mps: string;
  sigmaMass_kg: string;
  sigmaThrust: string;
  sigmaIsp: string;
  /** Dispersed footprints for the probability-of-reach map (0: no map). */
  reachSamples: string;
}

export interface StudyInputs {
  reserve: ReserveInputs;
  'ignition-altitude': AltitudeInputs;
  dispersion: DispersionInputs;
}

const list = (v: readonly number[]) => v.join(', ');

/** Defaults for a study: reserves from its usable propellant, altitudes around its ignition altitude. */
export function defaultStudyInputs(study: Pick<Study, 'vehicle' | 'ignition'>): StudyInputs {
  const usable = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
  return {
    reserve: { reserves_kg: list(defaultReserves(usable)) },
    'ignition-altitude': {
      altitudes_m: list(defaultAltitudes(study.ignition.position_m[2])),
      rule: 'fixed-velocity',
      reserve_kg: String(study.vehicle.propellantReserve_kg),
      requiredRadius_m: '',
      method: 'directions',
      directions: String(DEFAULT_DIRECTIONS),
    },
    dispersion: {
      samples: String(DEFAULT_DISPERSION.samples),
      seed: String(DEFAULT_DISPERSION.seed),
      probability: String(DEFAULT_DISPERSION.probability),
      sigmaPosition_m: String(DEFAULT_SIGMAS.position_m),
      sigmaVelocity_mps: String(DEFAULT_SIGMAS.velocity_mps),
      sigmaMass_kg: String(DEFAULT_SIGMAS.mass_kg),
      sigmaThrust: String(DEFAULT_SIGMAS.thrustFraction),
      sigmaIsp: String(DEFAULT_SIGMAS.ispFraction),
      reachSamples: '0',
    },
  };
}

export type Problems<T> = Partial<Record<keyof T, string>>;
export type Checked<T, V> = { ok: true; value: V } | { ok: false; problems: Problems<T> };

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** A number as typed, or null when it is not one. */
function parseNumber(text: string): number | null {
  const t = text.trim();
  return NUMBER.test(t) ? Number(t) : null;
}

function parseList(text: string): number[] | null {
  const parts = text.split(',').map((p) => p.trim()).filter((p) => p !== '');
  if (!parts.length) return null;
  const values = parts.map(parseNumber);
  return values.every((v): v is number => v !== null) ? values : null;
}

/** The first value listed more than once, or undefined: a list names each case once. */
function repeated(values: number[]): number | undefined {
  return values.find((v, k) => values.indexOf(v) !== k);
}

export interface ReserveStudyInputs {
  reserves_kg: number[];
}

export function checkReserveInputs(t: ReserveInputs, study: Pick<Study, 'vehicle'>): Checked<ReserveInputs, ReserveStudyInputs> {
  const usable = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
  const v = parseList(t.reserves_kg);
  if (!v) return { ok: false, problems: { reserves_kg: `Reserves “${t.reserves_kg.trim()}”: enter numbers in kg separated by commas, e.g. 0, 50, 100.` } };
  const bad = v.find((r) => !(r >= 0 && r < usable));
  if (bad !== undefined) return { ok: false, problems: { reserves_kg: `Reserve ${bad} kg: each reserve must be from 0 up to below the usable propellant, ${usable} kg (wet − dry mass).` } };
  const twice = repeated(v);
  if (twice !== undefined) return { ok: false, problems: { reserves_kg: `Reserve ${twice} kg is listed twice: give each reserve once.` } };
  return { ok: true, value: { reserves_kg: v } };
}

export interface AltitudeStudyInputs {
  altitudes_m: number[];
  rule: IgnitionRule;
  reserve_kg: number;
  requiredRadius_m: number | null;
  method: 'directions' | 'grid';
  directions: number;
}

export function checkAltitudeInputs(t: AltitudeInputs, study: Pick<Study, 'vehicle' | 'ignition'>): Checked<AltitudeInputs, AltitudeStudyInputs> {
  const problems: Problems<AltitudeInputs> = {};
  const usable = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
  const altitudes = parseList(t.altitudes_m);
  if (!altitudes) problems.altitudes_m = `Altitudes “${t.altitudes_m.trim()}”: enter altitudes in m separated by commas, e.g. 1200, 1800, 2400.`;
  else {
    const { min, max } = ALTITUDE_FIELD;
    const bad = altitudes.find((h) => !(h >= min && h <= max));
    const twice = repeated(altitudes);
    if (bad !== undefined) problems.altitudes_m = `Altitude ${bad} m: each ignition altitude must be above the target, from ${min} to ${max} m (the limits of Ignition › Altitude).`;
    else if (twice !== undefined) problems.altitudes_m = `Altitude ${twice} m is listed twice: give each altitude once.`;
    else if (altitudes.length > 50) problems.altitudes_m = `${altitudes.length} altitudes: give at most 50.`;
  }
  if (t.rule === 'fixed-flight-path-angle' && !(study.ignition.velocity_mps[2] < 0)) {
    problems.rule = 'Constant flight-path angle needs a descending ignition velocity (negative vertical speed): choose fixed velocity or fix the ignition velocity.';
  }
  const reserve = parseNumber(t.reserve_kg);
  if (reserve === null || !(reserve >= 0 && reserve < usable)) problems.reserve_kg = `Reserve “${t.reserve_kg.trim()}” kg: enter a mass from 0 up to below the usable propellant, ${usable} kg.`;
  const required = t.requiredRadius_m.trim() === '' ? null : parseNumber(t.requiredRadius_m);
  if (t.requiredRadius_m.trim() !== '' && (required === null || !(required > 0))) {
    problems.requiredRadius_m = `Required radius “${t.requiredRadius_m.trim()}” m: enter a distance above 0, or leave it empty for none.`;
  }
  const directions = parseNumber(t.directions);
  if (t.method === 'directions' && (directions === null || !Number.isInteger(directions) || directions < 3 || directions > 720)) {
    problems.directions = `Directions “${t.directions.trim()}”: enter a whole number from 3 to 720 (24 = every 15°).`;
  }
  if (Object.keys(problems).length) return { ok: false, problems };
  return {
    ok: true,
    value: {
      altitudes_m: [...altitudes!].sort((a, b) => a - b),
      rule: { kind: t.rule },
      reserve_kg: reserve!,
      requiredRadius_m: required,
      method: t.method,
      directions: directions ?? DEFAULT_DIRECTIONS,
    },
  };
}

export interface DispersionStudyInputs {
  samples: number;
  seed: number;
  probability: number;
  sigmas: DispersionSigmas;
  reachSamples: number;
}

export function checkDispersionInputs(t: DispersionInputs): Checked<DispersionInputs, DispersionStudyInputs> {
  const problems: Problems<DispersionInputs> = {};
  const read = (key: keyof DispersionInputs, label: string, ok: (v: number) => boolean, fix: string): number => {
    const v = parseNumber(t[key]);
    if (v === null || !ok(v)) {
      problems[key] = `${label} “${t[key].trim()}”: ${fix}`;
      return NaN;
    }
    return v;
  };
  const whole = (lo: number, hi: number) => (v: number) => Number.isInteger(v) && v >= lo && v <= hi;
  const nonNegative = (v: number) => v >= 0 && Number.isFinite(v);
  const samples = read('samples', 'Samples', whole(10, 100000), 'enter a whole number from 10 to 100000.');
  const seed = read('seed', 'Seed', whole(0, 2 ** 32 - 1), 'enter a whole number from 0 to 4294967295.');
  const probability = read('probability', 'Ellipse probability', (v) => v > 0 && v < 1, 'enter a fraction between 0 and 1, e.g. 0.997.');
  const sigmas: DispersionSigmas = {
    position_m: read('sigmaPosition_m', 'Position 1σ', nonNegative, 'enter zero or a positive distance in m.'),
    velocity_mps: read('sigmaVelocity_mps', 'Velocity 1σ', nonNegative, 'enter zero or a positive speed in m/s.'),
    mass_kg: read('sigmaMass_kg', 'Mass 1σ', nonNegative, 'enter zero or a positive mass in kg.'),
    thrustFraction: read('sigmaThrust', 'Thrust 1σ', (v) => v >= 0 && v < 0.5, 'enter a fraction of nominal thrust from 0 to below 0.5, e.g. 0.01.'),
    ispFraction: read('sigmaIsp', 'Isp 1σ', (v) => v >= 0 && v < 0.5, 'enter a fraction of nominal Isp from 0 to below 0.5, e.g. 0.005.'),
  };
  const reachSamples = read('reachSamples', 'Reach-map samples', whole(0, 200), 'enter a whole number from 0 (no map) to 200.');
  if (Object.keys(problems).length) return { ok: false, problems };
  return { ok: true, value: { samples, seed, probability, sigmas, reachSamples } };
}
