/**
 * Bridge to the independent reference formulation (test/reference/py/descent_reference.py, Debian
 * python3-cvxopt): scenarios are described physically, in boundary units, and handed unchanged to
 * the Python side, which builds its own problem from the published equations. Only `toSetup` turns
 * the same description into our `DescentSetup`; no matrix of ours ever reaches the reference.
 */
import { REFERENCE_PYTHON } from '../../support/reference-tools.ts';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { DEG } from '../../../core/descent/constants.ts';
import type { Vec3 } from '../../../core/descent/constants.ts';
import type { DescentSetup, IgnitionState } from '../../../core/descent/setup.ts';

const SCRIPT = fileURLToPath(new URL('../py/descent_reference.py', import.meta.url));
const PYTHON = REFERENCE_PYTHON;

/** A scenario's physical description (the JSON the reference reads). */
export interface PhysicalScenario {
  id: string;
  planet: { gravity: Vec3; rotationRate: Vec3 };
  vehicle: {
    wetMass_kg: number; dryMass_kg: number; isp_s: number; engineCount: number; thrustPerEngine_N: number;
    cantAngle_deg: number; throttleMin: number; throttleMax: number; pointingLimit_deg: number | null;
    /** Largest throttle rate, full thrust per second (absent: none). */
    throttleRate_perS?: number;
  };
  constraints: {
    glideSlope_deg: number | null; maxSpeed_mps: number | null; gateHeight_m: number; gateDescentRate_mps: number;
    minAltitude_m: number | null;
  };
  ignition: { position_m: Vec3; velocity_mps: Vec3; mass_kg: number };
  target_m: Vec3;
  nodes: number;
  hold: 'zoh' | 'foh';
}

/** Constraints the reference can leave out (to show that a constraint binds). */
export type Relaxable = 'upperThrust' | 'lowerThrust' | 'pointing' | 'glideSlope' | 'speed' | 'altitude' | 'rate';

export interface ReferenceJob extends PhysicalScenario {
  problem?: 'min-propellant' | 'min-landing-error';
  timeOfFlight_s?: number;
  /** Free final time: grid over [lower_s, upper_s], then golden-section search to tol_s. */
  search?: { lower_s: number; upper_s: number; grid: number; tol_s?: number };
  relax?: Relaxable[];
  /** ZOH: one allowed throttle interval [lo, hi] per hold interval (N − 1 of them). */
  throttleIntervals?: [number, number][];
  /** ZOH, fixed t_f: enumerate every assignment of the intervals to the throttle ranges between these bands. */
  bruteForceBands?: [number, number][];
}

/** Smallest slack over the nodes; thrust terms relative to the full-throttle acceleration at ignition. */
export interface ReferenceMargins {
  losslessGap: number;
  upperThrust: number;
  lowerThrust?: number;
  pointing?: number;
  glideSlope?: number;
  speed?: number;
  altitude?: number;
}

export interface ReferenceResult {
  id: string;
  status: 'optimal' | 'infeasible' | string;
  /** conelp's stopping tolerance for this solve (1e-9, or 1e-8 / 1e-7 on a retry after a domain error). */
  tolerance?: number;
  timeOfFlight_s?: number;
  propellant_kg?: number;
  miss_m?: number;
  margins?: ReferenceMargins;
  throttle?: number[];
  mass_kg?: number[];
  altitude_m?: number[];
  /** Brute force: the cheapest assignment (index of the allowed interval per hold interval) and counts. */
  assignment?: number[];
  feasibleAssignments?: number;
  solves: number;
  /** Search only: times at which conelp gave neither an answer nor an infeasibility certificate. */
  failures?: number;
  atGridEdge?: boolean;
  evaluations?: [number, number | null][];
  error?: string;
}

/** Runs the jobs in one Python process (BLAS single-threaded: small dense problems, shared cores). */
export function runReference(jobs: ReferenceJob[]): ReferenceResult[] {
  const r = spawnSync(PYTHON, [SCRIPT], {
    input: JSON.stringify(jobs),
    encoding: 'utf8',
    maxBuffer: 1 << 28,
    env: { ...process.env, OPENBLAS_NUM_THREADS: '1', OMP_NUM_THREADS: '1' },
  });
  if (r.status !== 0) throw new Error(`independent reference failed (exit ${r.status}): ${r.stderr}`);
  const out = JSON.parse(r.stdout) as ReferenceResult[];
  for (const o of out) if (o.status === 'error') throw new Error(`independent reference, job ${o.id}: ${o.error}`);
  return out;
}

/** The same physical description as our setup (radians inside; a null pointing limit is 180°). */
export function toSetup(s: PhysicalScenario): DescentSetup {
  const v = s.vehicle;
  const c = s.constraints;
  return {
    planet: { name: s.id, gravity: s.planet.gravity, rotationRate: s.planet.rotationRate },
    vehicle: {
      wetMass: v.wetMass_kg, dryMass: v.dryMass_kg, isp: v.isp_s, engineCount: v.engineCount, thrustPerEngine: v.thrustPerEngine_N,
      cantAngle: v.cantAngle_deg * DEG, throttleMin: v.throttleMin, throttleMax: v.throttleMax,
      pointingLimit: v.pointingLimit_deg === null ? Math.PI : v.pointingLimit_deg * DEG,
      throttleRate: v.throttleRate_perS ?? null,
    },
    constraints: {
      glideSlope: c.glideSlope_deg === null ? null : c.glideSlope_deg * DEG, maxSpeed: c.maxSpeed_mps,
      gateHeight: c.gateHeight_m, gateDescentRate: c.gateDescentRate_mps, minAltitude: c.minAltitude_m,
    },
    nodes: s.nodes,
    hold: s.hold,
  };
}

export function toIgnition(s: PhysicalScenario): IgnitionState {
  return { position: s.ignition.position_m, velocity: s.ignition.velocity_mps, mass: s.ignition.mass_kg };
}

/** The physical description of one of our setups (for scenarios first written as a DescentSetup). */
export function fromSetup(id: string, setup: DescentSetup, ignition: IgnitionState, target: Vec3): PhysicalScenario {
  const v = setup.vehicle;
  const c = setup.constraints;
  return {
    id,
    planet: { gravity: setup.planet.gravity, rotationRate: setup.planet.rotationRate },
    vehicle: {
      wetMass_kg: v.wetMass, dryMass_kg: v.dryMass, isp_s: v.isp, engineCount: v.engineCount, thrustPerEngine_N: v.thrustPerEngine,
      cantAngle_deg: v.cantAngle / DEG, throttleMin: v.throttleMin, throttleMax: v.throttleMax,
      pointingLimit_deg: v.pointingLimit >= Math.PI ? null : v.pointingLimit / DEG,
    },
    constraints: {
      glideSlope_deg: c.glideSlope === null ? null : c.glideSlope / DEG, maxSpeed_mps: c.maxSpeed,
      gateHeight_m: c.gateHeight, gateDescentRate_mps: c.gateDescentRate, minAltitude_m: c.minAltitude,
    },
    ignition: { position_m: ignition.position, velocity_mps: ignition.velocity, mass_kg: ignition.mass },
    target_m: target,
    nodes: setup.nodes,
    hold: setup.hold,
  };
}
