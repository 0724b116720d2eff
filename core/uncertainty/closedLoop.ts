/**
 * One Monte Carlo sample of a landing, flown two ways from the same dispersed truth:
 *
 * WITHOUT DIVERT (open loop): the nominal plan (the minimum-propellant trajectory from the nominal ignition
 * state to the nominal target) is flown unchanged on the true dynamics (flight.ts) for its time of flight; the
 * touchdown point is where powered descent ends.
 *
 * WITH DIVERT (closed loop), the target policy:
 *   1. At ignition the guidance sees the state with navigation error (position and velocity; the mass is
 *      known) and plans to the NOMINAL TARGET if it is safe on the hazard map, outside its safety margin,
 *      and reachable with the reserve
 *      kept (minimum propellant ≤ propellant on board − reserve, by the guidance's nominal engine model);
 *   2. else to the first of the ranked safe sites (best first, as given) reachable with the reserve kept;
 *   3. if none is, the sample has NO SAFE REACHABLE SITE: it flies the nominal plan open loop (counted apart).
 *   The chosen target is kept to touchdown. Every `replanInterval_s` the guidance re-solves the minimum-
 *   propellant trajectory to it from a fresh navigated state (warm-started: the last solution and the
 *   remaining time of flight as the first guess), until the time to go would drop below `minTimeToGo_s`;
 *   the last plan is flown to its end. A re-plan that finds no flyable trajectory keeps the current plan.
 *
 * A sample succeeds when it touches down on safe ground (hazard flags 0, on the DEM), with the reserve kept
 * (true propellant left ≥ reserve), at a velocity within `touchdownVelocityTolerance_mps` of the gate's
 * (0, 0, −gate descent rate), never below the landing plane on the way.
 */
import type { Vec3 } from '../descent/constants.ts';
import { searchFreeFinalTime, type DescentResult } from '../descent/search.ts';
import type { DescentSetup, IgnitionState } from '../descent/setup.ts';
import type { DescentSolver } from '../descent/solver.ts';
import type { ProgramKind } from '../descent/program.ts';
import type { ConicSolution } from '../conic/types.ts';
import { applyFactor, type CholeskyFactor } from './covariance.ts';
import { flyPlan, planEnd, planFromTrajectory, type FlightState, type Plan, type TrueEngine } from './flight.ts';
import { isClearAt, isSafeAt, type HazardLayer } from './hazardLayer.ts';
import { sampleStream, type SampleStream } from './random.ts';

/** The dispersion and navigation model, factored (covariance.ts). */
export interface UncertaintyModel {
  position: CholeskyFactor;
  velocity: CholeskyFactor;
  sigmaMass_kg: number;
  sigmaThrustFraction: number;
  sigmaIspFraction: number;
  navPosition: CholeskyFactor;
  navVelocity: CholeskyFactor;
}

export interface DispersedTruth {
  ignition: IgnitionState;
  engine: TrueEngine;
}

/**
 * The truth of sample `index`: its own random stream (random.ts), drawn in a fixed order — position (3),
 * velocity (3), mass, thrust, Isp — then the navigation errors of each plan, in turn.
 */
export function dispersedTruth(model: UncertaintyModel, nominal: IgnitionState, isp_s: number, seed: number, index: number): { truth: DispersedTruth; stream: SampleStream } {
  const stream = sampleStream(seed, index);
  const z = [stream.normal(), stream.normal(), stream.normal()];
  const dr = applyFactor(model.position, z, [0, 0, 0]);
  const zv = [stream.normal(), stream.normal(), stream.normal()];
  const dv = applyFactor(model.velocity, zv, [0, 0, 0]);
  const mass = nominal.mass + stream.normal() * model.sigmaMass_kg;
  const thrustScale = 1 + stream.normal() * model.sigmaThrustFraction;
  const isp = isp_s * (1 + stream.normal() * model.sigmaIspFraction);
  return {
    truth: {
      ignition: {
        position: [nominal.position[0] + dr[0], nominal.position[1] + dr[1], nominal.position[2] + dr[2]],
        velocity: [nominal.velocity[0] + dv[0], nominal.velocity[1] + dv[1], nominal.velocity[2] + dv[2]],
        mass,
      },
      engine: { thrustScale, isp_s: isp },
    },
    stream,
  };
}

export interface ClosedLoopSettings {
  /** Nominal landing point (ground metres from the nominal target, and its height). */
  target: Vec3;
  /** Ranked safe sites, best first: east, north (m from the nominal target); landed at the target's height. */
  sites: readonly (readonly [number, number])[];
  hazard: HazardLayer;
  reserve_kg: number;
  replanInterval_s: number;
  minTimeToGo_s: number;
  touchdownVelocityTolerance_mps: number;
  /** 0 = no re-planning: the first plan flown open loop (a reference for the undisturbed case). */
  replan: boolean;
}

export type SampleOutcome = 'safe' | 'unsafe-ground' | 'reserve-used' | 'touchdown-velocity' | 'below-landing-plane' | 'no-safe-site';

export interface LandingSample {
  index: number;
  /** Without divert. */
  openLoopEast_m: number;
  openLoopNorth_m: number;
  openLoopSafe: boolean;
  openLoopPropellant_kg: number;
  /** With divert. */
  outcome: SampleOutcome;
  success: boolean;
  landingEast_m: number;
  landingNorth_m: number;
  /** The target flown to: −1 none, 0 the nominal target, k ≥ 1 the k-th ranked site. */
  targetChoice: number;
  plannedEast_m: number;
  plannedNorth_m: number;
  /** Horizontal distance from the touchdown point to the planned site, m. */
  miss_m: number;
  propellant_kg: number;
  /** Re-plans after the first plan, and those that found no flyable trajectory. */
  replans: number;
  replanFailures: number;
  touchdownVelocityError_mps: number;
  /** Conic solves spent on this sample. */
  solves: number;
}

/**
 * Certified propellant tolerance of every plan's time-of-flight search, kg: the footprint's (0.05 kg), far
 * below the propellant spread a dispersion study resolves.
 */
export const PLAN_PROPELLANT_TOLERANCE_KG = 0.05;

const usable = (r: DescentResult) => (r.status === 'solved' || r.status === 'relaxation-gap') && r.trajectory !== null && Number.isFinite(r.propellant);

function navigated(model: UncertaintyModel, stream: SampleStream, x: Float64Array): IgnitionState {
  const dr = applyFactor(model.navPosition, [stream.normal(), stream.normal(), stream.normal()], [0, 0, 0]);
  const dv = applyFactor(model.navVelocity, [stream.normal(), stream.normal(), stream.normal()], [0, 0, 0]);
  return { position: [x[0] + dr[0], x[1] + dr[1], x[2] + dr[2]], velocity: [x[3] + dv[0], x[4] + dv[1], x[5] + dv[2]], mass: x[6] };
}

function newState(ignition: IgnitionState): FlightState {
  return { t: 0, x: Float64Array.of(...ignition.position, ...ignition.velocity, ignition.mass), minHeight_m: Infinity };
}

/** A re-plan's solve; an input the model refuses (e.g. a navigated state below the floor) is no plan. */
function trySearch(solver: DescentSolver, target: Vec3, state: IgnitionState, options: Parameters<typeof searchFreeFinalTime>[3]): DescentResult | null {
  try {
    return searchFreeFinalTime(solver, target, state, options);
  } catch (err) {
    if (err instanceof RangeError) return null;
    throw err;
  }
}

/**
 * Flies sample `index` both ways. `solver` is the guidance's (nominal vehicle, the study's nodes); it is
 * reset to start from the nominal optimum (`nominal.warmStarts`) first, so the sample gives the same bits on
 * any worker and after any other sample.
 */
export function flySample(
  solver: DescentSolver,
  model: UncertaintyModel,
  nominal: { ignition: IgnitionState; plan: Plan; timeOfFlight_s: number; warmStarts: ReadonlyMap<ProgramKind, ConicSolution> },
  settings: ClosedLoopSettings,
  seed: number,
  index: number,
): LandingSample {
  solver.resetTo(nominal.warmStarts);
  const solvesBefore = solver.solves;
  const setup: DescentSetup = solver.setup;
  const dry = setup.vehicle.dryMass;
  const zT = settings.target[2];
  const { truth, stream } = dispersedTruth(model, nominal.ignition, setup.vehicle.isp, seed, index);

  // Without divert.
  const open = newState(truth.ignition);
  flyPlan(setup, nominal.plan, truth.engine, open, planEnd(nominal.plan), zT);
  const openSafe = isSafeAt(settings.hazard, open.x[0], open.x[1]);

  // With divert: choose the target from the first navigated state.
  const seen = navigated(model, stream, Float64Array.of(...truth.ignition.position, ...truth.ignition.velocity, truth.ignition.mass));
  const budget = seen.mass - dry - settings.reserve_kg;
  const candidates: Vec3[] = [];
  if (isClearAt(settings.hazard, settings.target[0], settings.target[1])) candidates.push(settings.target);
  const nominalIsCandidate = candidates.length === 1;
  for (const [e, n] of settings.sites) candidates.push([e, n, zT]);
  let plan: Plan | null = null;
  let choice = -1;
  let tfGuess = nominal.timeOfFlight_s;
  for (let c = 0; c < candidates.length && budget > 0; c++) {
    const r = trySearch(solver, candidates[c], seen, { tfGuess, propellantBudget_kg: budget, propellantTolerance: PLAN_PROPELLANT_TOLERANCE_KG });
    if (r && usable(r) && Number.isNaN(r.overBudgetBound_kg) && r.propellant <= budget) {
      plan = planFromTrajectory(r.trajectory!, 0, setup.hold, candidates[c]);
      choice = nominalIsCandidate ? c : c + 1;
      break;
    }
    if (r && Number.isFinite(r.timeOfFlight)) tfGuess = r.timeOfFlight;
  }
  const base = {
    index,
    openLoopEast_m: open.x[0],
    openLoopNorth_m: open.x[1],
    openLoopSafe: openSafe,
    openLoopPropellant_kg: truth.ignition.mass - open.x[6],
  };
  if (!plan) {
    return {
      ...base,
      outcome: 'no-safe-site',
      success: false,
      landingEast_m: open.x[0],
      landingNorth_m: open.x[1],
      targetChoice: -1,
      plannedEast_m: NaN,
      plannedNorth_m: NaN,
      miss_m: NaN,
      propellant_kg: truth.ignition.mass - open.x[6],
      replans: 0,
      replanFailures: 0,
      touchdownVelocityError_mps: Math.hypot(open.x[3], open.x[4], open.x[5] + setup.constraints.gateDescentRate),
      solves: solver.solves - solvesBefore,
    };
  }
  const target = plan.target;
  const flight = newState(truth.ignition);
  let replans = 0;
  let replanFailures = 0;
  let curvature: number | undefined;
  for (;;) {
    const end = planEnd(plan);
    const next = flight.t + settings.replanInterval_s;
    if (!settings.replan || end - next < settings.minTimeToGo_s) {
      flyPlan(setup, plan, truth.engine, flight, end, zT);
      break;
    }
    flyPlan(setup, plan, truth.engine, flight, next, zT);
    const state = navigated(model, stream, flight.x);
    // Warm start: the solver starts from its last solution, the search from the remaining time of flight
    // and the last curvature. (Opening with a probe pair about that time, ±0.1–0.25 s, saved no solves on
    // the demo: the optimum sits at the short edge of the feasible times, which the search must find anyway.)
    const r = trySearch(solver, target, state, { tfGuess: end - flight.t, curvatureGuess: curvature, propellantTolerance: PLAN_PROPELLANT_TOLERANCE_KG });
    if (r && Number.isFinite(r.curvature) && r.curvature > 0) curvature = r.curvature;
    if (r && usable(r)) {
      plan = planFromTrajectory(r.trajectory!, flight.t, setup.hold, target);
      replans++;
    } else replanFailures++;
  }
  const x = flight.x;
  const propellant = truth.ignition.mass - x[6];
  const velocityError = Math.hypot(x[3], x[4], x[5] + setup.constraints.gateDescentRate);
  const safe = isSafeAt(settings.hazard, x[0], x[1]);
  const outcome: SampleOutcome =
    flight.minHeight_m < 0 ? 'below-landing-plane'
      : !safe ? 'unsafe-ground'
        : x[6] - dry < settings.reserve_kg ? 'reserve-used'
          : velocityError > settings.touchdownVelocityTolerance_mps ? 'touchdown-velocity'
            : 'safe';
  return {
    ...base,
    outcome,
    success: outcome === 'safe',
    landingEast_m: x[0],
    landingNorth_m: x[1],
    targetChoice: choice,
    plannedEast_m: target[0],
    plannedNorth_m: target[1],
    miss_m: Math.hypot(x[0] - target[0], x[1] - target[1]),
    propellant_kg: propellant,
    replans,
    replanFailures,
    touchdownVelocityError_mps: velocityError,
    solves: solver.solves - solvesBefore,
  };
}
