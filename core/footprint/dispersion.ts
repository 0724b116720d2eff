/**
 * Dispersion study: how far the vehicle lands from the nominal target if it flies the nominal optimal thrust
 * profile open loop (no divert) from a dispersed ignition state. Ignition position and velocity errors
 * (independent Gaussians per axis), mass, thrust and Isp errors are sampled from a seeded generator; each
 * sample replays the nominal thrust-force history (scaled by the thrust error) through the rotating-frame
 * point-mass dynamics (RK4, baselines/simulate.ts) for the nominal time of flight; the landing point is the
 * horizontal position at the end of powered descent. The landing ellipse at a chosen probability follows
 * from the samples' mean and covariance (ellipse.ts).
 */
import type { Vec3 } from '../descent/constants.ts';
import type { DescentSetup, IgnitionState } from '../descent/setup.ts';
import type { TrajectorySeries } from '../descent/trajectory.ts';
import { simulate } from '../descent/baselines/simulate.ts';
import { dispersionEllipse, sampleMoments, type Ellipse } from './ellipse.ts';
import { TARGET, type FootprintField } from './field.ts';

export interface DispersionSigmas {
  /** 1σ of each ignition position axis, m. */
  position_m: number;
  /** 1σ of each ignition velocity axis, m/s. */
  velocity_mps: number;
  /** 1σ of the ignition mass, kg. */
  mass_kg: number;
  /** 1σ of the thrust, as a fraction of nominal. */
  thrustFraction: number;
  /** 1σ of the specific impulse, as a fraction of nominal. */
  ispFraction: number;
}

export interface DispersionResult {
  landingEast_m: Float64Array;
  landingNorth_m: Float64Array;
  ellipse: Ellipse;
  samples: number;
}

/** A seeded uniform generator (mulberry32, a common-practice 32-bit PRNG) with Box–Muller normals. */
export function seededNormal(seed: number): () => number {
  let state = seed >>> 0;
  const uniform = () => {
    let t = (state = (state + 0x6d2b79f5) >>> 0);
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

/** The nominal thrust force at time t, held between nodes (linear between node values). */
function thrustAt(series: TrajectorySeries, t: number): Vec3 {
  const ts = series.t;
  const n = ts.length;
  if (t <= ts[0]) return [series.thrustX[0], series.thrustY[0], series.thrustZ[0]];
  if (t >= ts[n - 1]) return [series.thrustX[n - 1], series.thrustY[n - 1], series.thrustZ[n - 1]];
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (ts[mid] <= t) lo = mid;
    else hi = mid;
  }
  const f = (t - ts[lo]) / (ts[hi] - ts[lo]);
  const lerp = (a: Float64Array) => a[lo] + f * (a[hi] - a[lo]);
  return [lerp(series.thrustX), lerp(series.thrustY), lerp(series.thrustZ)];
}

/** Landing point (horizontal, m) of the open-loop nominal thrust history from one ignition state. */
export function openLoopLanding(setup: DescentSetup, series: TrajectorySeries, ignition: IgnitionState, thrustScale = 1, step_s = 0.05): [number, number] {
  const tf = series.t[series.t.length - 1];
  const samples = simulate(
    setup,
    ignition,
    (s) => {
      const T = thrustAt(series, s.t + step_s / 2);
      return [T[0] * thrustScale, T[1] * thrustScale, T[2] * thrustScale];
    },
    step_s,
    tf - 1e-9,
  );
  const last = samples[samples.length - 1];
  return [last.r[0], last.r[1]];
}

/** One dispersed ignition: the state, and the thrust and Isp of that sample. */
export interface DispersedSample {
  ignition: IgnitionState;
  thrustScale: number;
  isp_s: number;
}

/** Seeded dispersed samples around the nominal ignition state (see the file comment for the model). */
export function sampleDispersions(setup: DescentSetup, nominal: IgnitionState, sigmas: DispersionSigmas, count: number, seed: number): DispersedSample[] {
  if (!Number.isInteger(count) || count < 1 || count > 100000) throw new RangeError(`samples: ${count} (must be a whole number from 1 to 100000)`);
  for (const [k, v] of Object.entries(sigmas)) {
    if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`sigma ${k}: ${v} (must be zero or positive)`);
  }
  const normal = seededNormal(seed);
  return Array.from({ length: count }, () => {
    const dr = [normal(), normal(), normal()].map((z) => z * sigmas.position_m);
    const dv = [normal(), normal(), normal()].map((z) => z * sigmas.velocity_mps);
    const dm = normal() * sigmas.mass_kg;
    const thrustScale = 1 + normal() * sigmas.thrustFraction;
    const isp_s = setup.vehicle.isp * (1 + normal() * sigmas.ispFraction);
    return {
      ignition: {
        position: [nominal.position[0] + dr[0], nominal.position[1] + dr[1], nominal.position[2] + dr[2]],
        velocity: [nominal.velocity[0] + dv[0], nominal.velocity[1] + dv[1], nominal.velocity[2] + dv[2]],
        mass: nominal.mass + dm,
      },
      thrustScale,
      isp_s,
    };
  });
}

export function dispersionStudy(
  setup: DescentSetup,
  nominal: IgnitionState,
  series: TrajectorySeries,
  sigmas: DispersionSigmas,
  options: { samples: number; seed: number; probability: number; step_s?: number },
): DispersionResult {
  const { samples, seed, probability } = options;
  if (!Number.isInteger(samples) || samples < 10 || samples > 100000) {
    throw new RangeError(`samples: ${samples} (must be a whole number from 10 to 100000)`);
  }
  const draws = sampleDispersions(setup, nominal, sigmas, samples, seed);
  const east = new Float64Array(samples);
  const north = new Float64Array(samples);
  draws.forEach((s, i) => {
    const [e, n] = openLoopLanding({ ...setup, vehicle: { ...setup.vehicle, isp: s.isp_s } }, series, s.ignition, s.thrustScale, options.step_s);
    east[i] = e;
    north[i] = n;
  });
  const { mean, cov } = sampleMoments(east, north);
  return { landingEast_m: east, landingNorth_m: north, ellipse: dispersionEllipse(mean, cov, probability), samples };
}

/**
 * Probability of reach: for each target, the fraction of dispersed samples whose footprint holds it within
 * that sample's budget (its propellant on board less dry mass and reserve; fields all on the same grid).
 */
export function probabilityOfReach(fields: readonly FootprintField[], budgets_kg: readonly number[]): Float32Array {
  if (fields.length === 0) throw new RangeError('probability of reach needs at least one sample footprint');
  if (budgets_kg.length !== fields.length) throw new RangeError('probability of reach: one budget per sample footprint');
  const n = fields[0].nx * fields[0].ny;
  const count = new Float32Array(n);
  fields.forEach((f, s) => {
    if (f.nx * f.ny !== n) throw new RangeError('probability of reach: every sample footprint must use the same grid');
    for (let k = 0; k < n; k++) if (f.status[k] === TARGET.reachable && f.propellant_kg[k] <= budgets_kg[s]) count[k]++;
  });
  for (let k = 0; k < n; k++) count[k] /= fields.length;
  return count;
}
