/**
 * The landing-success study: P(safe touchdown) without divert (open loop; Monte Carlo and the Gaussian
 * ellipse model over the hazard map) and with divert (closed loop, closedLoop.ts), with Wilson score
 * intervals, propellant quantiles and the share of samples with no safe reachable site.
 *
 * `prepareLandingSuccess` builds what every sample shares (the guidance's descent setup, the nominal plan);
 * `runLandingSamples` flies a range of samples (a worker's job); `summariseLandingSuccess` reduces the
 * samples, in index order, to the figures. Every sample depends only on (inputs, seed, index), so the result
 * is the same bits for any worker count and any split into jobs.
 */
import type { Vec3 } from '../descent/constants.ts';
import { landreachConicBackend } from '../descent/conicBackend.ts';
import { searchFreeFinalTime } from '../descent/search.ts';
import type { IgnitionState } from '../descent/setup.ts';
import { DescentSolver } from '../descent/solver.ts';
import { dispersionEllipse, sampleMoments, type Ellipse } from '../footprint/ellipse.ts';
import type { Study } from '../study/schema.ts';
import { studyToDescent } from '../study/toDescent.ts';
import type { ConicSolution } from '../conic/types.ts';
import type { ProgramKind } from '../descent/program.ts';
import { FOOTPRINT_SOLVER_SETTINGS } from '../footprint/descentEvaluator.ts';
import { flySample, PLAN_PROPELLANT_TOLERANCE_KG, type ClosedLoopSettings, type LandingSample, type SampleOutcome, type UncertaintyModel } from './closedLoop.ts';
import { planFromTrajectory, type Plan } from './flight.ts';
import { gaussianUnsafeProbability, isClearAt, type HazardLayer } from './hazardLayer.ts';
import { resolveLandingSuccessInputs, type LandingSuccessInputs } from './inputs.ts';
import { sampleQuantile, wilsonInterval, type ProportionInterval } from './statistics.ts';

/** The target policy, as the report states it (closedLoop.ts has the details). */
export const LANDING_POLICY =
  'at ignition, from the navigated state: the nominal target if it is on safe ground outside the safety margin and reachable with the reserve kept, else the first of the ranked safe sites reachable with the reserve kept (the guidance\'s nominal engine model), else no safe reachable site (the nominal plan is flown open loop); the target is kept, and the minimum-propellant plan to it is re-solved from a fresh navigated state every re-planning interval until the time to go would drop below the minimum, the last plan flown to its end; a re-plan without a flyable trajectory keeps the current plan';

/** The flight model, as the report states it (flight.ts). */
export const LANDING_MODEL =
  'true dynamics: rotating-frame point mass, RK4 aligned on the plan nodes (16 steps per interval); the thrust loop delivers the planned acceleration within the true engine range (1 + thrust error) x [minimum throttle, full thrust]; mass flow from the delivered thrust at the true Isp; touchdown = end of powered descent (the gate); success = safe ground (no slope, roughness or unknown flag), reserve kept, velocity within the tolerance of the gate velocity, never below the landing plane';

/** Everything a worker needs to fly samples: plain data (crosses to workers). */
export interface LandingSuccessJob {
  study: Study;
  inputs: Partial<LandingSuccessInputs>;
  hazard: HazardLayer;
  /** Ranked safe sites, best first, m east/north of the nominal target. */
  sites: [number, number][];
  /** Samples [from, to). */
  from: number;
  to: number;
}

export interface PreparedLandingSuccess {
  inputs: LandingSuccessInputs;
  model: UncertaintyModel;
  solver: DescentSolver;
  nominal: { ignition: IgnitionState; plan: Plan; timeOfFlight_s: number; propellant_kg: number; warmStarts: ReadonlyMap<ProgramKind, ConicSolution> };
  settings: ClosedLoopSettings;
}

/** The guidance setup and the nominal plan; throws a RangeError naming the problem when there is none. */
export function prepareLandingSuccess(study: Study, given: Partial<LandingSuccessInputs>, hazard: HazardLayer, sites: readonly (readonly [number, number])[], replan = true): PreparedLandingSuccess {
  const { inputs, model } = resolveLandingSuccessInputs(given);
  const d = studyToDescent(study);
  // Solved against the dry mass; the reserve is the policy's budget check (so one solve serves any reserve).
  const setup = { ...d.setup, nodes: inputs.nodes, vehicle: { ...d.setup.vehicle, dryMass: study.vehicle.dryMass_kg } };
  const reserve_kg = inputs.reserve_kg ?? study.vehicle.propellantReserve_kg;
  const solver = new DescentSolver(setup, landreachConicBackend(FOOTPRINT_SOLVER_SETTINGS), d.ignition);
  const r = searchFreeFinalTime(solver, d.target, d.ignition, { propellantTolerance: PLAN_PROPELLANT_TOLERANCE_KG });
  if ((r.status !== 'solved' && r.status !== 'relaxation-gap') || !r.trajectory) {
    throw new RangeError(`the nominal target is ${r.status} from the study's ignition state: the landing-success study needs a nominal trajectory (check the ignition state and the target)`);
  }
  const plan = planFromTrajectory(r.trajectory, 0, setup.hold, d.target);
  return {
    inputs,
    model,
    solver,
    nominal: { ignition: d.ignition, plan, timeOfFlight_s: r.timeOfFlight, propellant_kg: r.propellant, warmStarts: solver.warmStarts() },
    settings: {
      target: d.target as Vec3,
      sites: sites.slice(0, inputs.sites),
      hazard,
      reserve_kg,
      replanInterval_s: inputs.replanInterval_s,
      minTimeToGo_s: inputs.minTimeToGo_s,
      touchdownVelocityTolerance_mps: inputs.touchdownVelocityTolerance_mps,
      replan,
    },
  };
}

/** Flies samples [from, to) of a prepared study. */
export function runLandingSamples(p: PreparedLandingSuccess, from: number, to: number): LandingSample[] {
  const out: LandingSample[] = [];
  for (let i = from; i < to; i++) out.push(flySample(p.solver, p.model, p.nominal, p.settings, p.inputs.seed, i));
  return out;
}

export interface PropellantQuantiles {
  p50_kg: number;
  p90_kg: number;
  p99_kg: number;
}

export interface LandingSuccessSummary {
  samples: number;
  confidence: number;
  intervalMethod: 'Wilson score interval (Wilson 1927)';
  withoutDivert: {
    /** Monte Carlo: share of open-loop touchdowns on safe ground, with its interval. */
    safeTouchdown: ProportionInterval;
    /** The Gaussian ellipse model: N(mean, cov) of the open-loop landing points integrated over the hazard map. */
    gaussianSafeProbability: number;
    ellipse: Ellipse;
    propellant: PropellantQuantiles;
  };
  withDivert: {
    safeTouchdown: ProportionInterval;
    noSafeReachableSite: ProportionInterval;
    propellant: PropellantQuantiles;
    outcomes: Record<SampleOutcome, number>;
    /** Mean re-plans per sample and how many re-plans found no flyable trajectory in all. */
    meanReplans: number;
    replanFailures: number;
    /** Largest miss from the planned site among the samples that flew a plan, m. */
    maxMiss_m: number;
    missP99_m: number;
    solves: number;
  };
  nominal: { propellant_kg: number; timeOfFlight_s: number; targetSafe: boolean };
}

function quantiles(values: ArrayLike<number>): PropellantQuantiles {
  return { p50_kg: sampleQuantile(values, 0.5), p90_kg: sampleQuantile(values, 0.9), p99_kg: sampleQuantile(values, 0.99) };
}

/** The figures of a finished (or stopped) run; `samples` in index order. */
export function summariseLandingSuccess(p: Pick<PreparedLandingSuccess, 'inputs' | 'nominal' | 'settings'>, samples: readonly LandingSample[], nominalTargetSafe: boolean): LandingSuccessSummary {
  const n = samples.length;
  const conf = p.inputs.confidence;
  const openEast = samples.map((s) => s.openLoopEast_m);
  const openNorth = samples.map((s) => s.openLoopNorth_m);
  let gaussian = NaN;
  let ellipse: Ellipse = { centreEast_m: NaN, centreNorth_m: NaN, semiMajor_m: NaN, semiMinor_m: NaN, orientation_deg: NaN, probability: p.inputs.ellipseProbability };
  if (n >= 3) {
    const { mean, cov } = sampleMoments(openEast, openNorth);
    ellipse = dispersionEllipse(mean, cov, p.inputs.ellipseProbability);
    try {
      gaussian = 1 - gaussianUnsafeProbability(p.settings.hazard, mean, cov);
    } catch {
      gaussian = NaN; // no spread: the model is undefined (said by NaN in the report)
    }
  }
  const outcomes: Record<SampleOutcome, number> = { safe: 0, 'unsafe-ground': 0, 'reserve-used': 0, 'touchdown-velocity': 0, 'below-landing-plane': 0, 'no-safe-site': 0 };
  for (const s of samples) outcomes[s.outcome]++;
  const flown = samples.filter((s) => s.targetChoice >= 0);
  const misses = flown.map((s) => s.miss_m);
  return {
    samples: n,
    confidence: conf,
    intervalMethod: 'Wilson score interval (Wilson 1927)',
    withoutDivert: {
      safeTouchdown: wilsonInterval(samples.filter((s) => s.openLoopSafe).length, n, conf),
      gaussianSafeProbability: gaussian,
      ellipse,
      propellant: quantiles(samples.map((s) => s.openLoopPropellant_kg)),
    },
    withDivert: {
      safeTouchdown: wilsonInterval(outcomes.safe, n, conf),
      noSafeReachableSite: wilsonInterval(outcomes['no-safe-site'], n, conf),
      propellant: quantiles(samples.map((s) => s.propellant_kg)),
      outcomes,
      meanReplans: n ? samples.reduce((a, s) => a + s.replans, 0) / n : NaN,
      replanFailures: samples.reduce((a, s) => a + s.replanFailures, 0),
      maxMiss_m: misses.length ? Math.max(...misses) : NaN,
      missP99_m: sampleQuantile(misses, 0.99),
      solves: samples.reduce((a, s) => a + s.solves, 0),
    },
    nominal: { propellant_kg: p.nominal.propellant_kg, timeOfFlight_s: p.nominal.timeOfFlight_s, targetSafe: nominalTargetSafe },
  };
}

/** Everything in one thread (tests, small runs): prepare, fly every sample, summarise. */
export function landingSuccessStudy(study: Study, given: Partial<LandingSuccessInputs>, hazard: HazardLayer, sites: readonly (readonly [number, number])[], replan = true) {
  const p = prepareLandingSuccess(study, given, hazard, sites, replan);
  const samples = runLandingSamples(p, 0, p.inputs.samples);
  return { prepared: p, samples, summary: summariseLandingSuccess(p, samples, isNominalSafe(p)) };
}

export const isNominalSafe = (p: Pick<PreparedLandingSuccess, 'settings'>) => isClearAt(p.settings.hazard, p.settings.target[0], p.settings.target[1]);
