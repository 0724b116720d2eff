/**
 * Scenarios for the independent reference formulation. Everything here is invented for these tests:
 * two invented landers on invented bodies (gravity and rotation picked to make the constraints bind,
 * not taken from any real body or vehicle). Each scenario names the constraints it claims ACTIVE; the
 * test checks each claim (the reference's smallest slack is ≈ 0 and leaving the constraint out changes
 * the reference optimum by far more than the agreement tolerance), so dropping one of them from our
 * model could not pass unnoticed.
 */
import type { Vec3 } from '../../../core/descent/constants.ts';
import type { PhysicalScenario, Relaxable } from './independentReference.ts';

/** A constraint claimed active: a relaxable path constraint, the planet's rotation, or the terminal gate. */
export type Claim = Relaxable | 'rotation' | 'gate';

export type CaseMode =
  /** Fixed t_f (s); `infeasibleTime_s`: a shorter time at which both must report no solution. */
  | { kind: 'fixed'; timeOfFlight_s: number; infeasibleTime_s: number }
  /** Free t_f: the reference searches [lower_s, upper_s] on a grid, then golden section to tol_s. */
  | { kind: 'free'; lower_s: number; upper_s: number; grid: number; tol_s: number }
  /** No soft landing: the reference finds every grid time infeasible; ours reports unreachable. */
  | { kind: 'unreachable'; lower_s: number; upper_s: number; grid: number };

export interface IndependentCase {
  scenario: PhysicalScenario;
  description: string;
  mode: CaseMode;
  active: Claim[];
}

/** Rotation vector ω = Ω (0, cos λ, sin λ) at latitude λ (x east, y north, z up). */
const spin = (rate: number, latitudeDeg: number): Vec3 => {
  const lat = (latitudeDeg * Math.PI) / 180;
  return [0, rate * Math.cos(lat), rate * Math.sin(lat)];
};

/** Invented lander A: four engines canted 15°, throttle 20–90 %. */
const landerA: PhysicalScenario['vehicle'] = {
  wetMass_kg: 1600, dryMass_kg: 1150, isp_s: 290, engineCount: 4, thrustPerEngine_N: 1800, cantAngle_deg: 15,
  throttleMin: 0.2, throttleMax: 0.9, pointingLimit_deg: null,
};
/** Invented lander B: six engines canted 20°, throttle 25–85 %, thrust within 45° of vertical. */
const landerB: PhysicalScenario['vehicle'] = {
  wetMass_kg: 2100, dryMass_kg: 1500, isp_s: 255, engineCount: 6, thrustPerEngine_N: 2000, cantAngle_deg: 20,
  throttleMin: 0.25, throttleMax: 0.85, pointingLimit_deg: 45,
};
const still = { gravity: [0, 0, -1.9] as Vec3, rotationRate: [0, 0, 0] as Vec3 };
const none = { glideSlope_deg: null, maxSpeed_mps: null, gateHeight_m: 0, gateDescentRate_mps: 0, minAltitude_m: 0 };

const s2: PhysicalScenario = {
  id: 'pointing-zoh', planet: still, vehicle: { ...landerA, pointingLimit_deg: 25 }, constraints: none,
  ignition: { position_m: [1200, -1500, 2200], velocity_mps: [-20, 35, -40], mass_kg: 1600 }, target_m: [0, 0, 0], nodes: 35, hold: 'zoh',
};
const s5: PhysicalScenario = {
  id: 'rotation-gate-free',
  // An invented body spinning once every 7 h (2.5e-4 rad/s) at 50° latitude, gravity 3.0 m/s².
  planet: { gravity: [0, 0, -3.0], rotationRate: spin(2.5e-4, 50) },
  vehicle: landerB,
  constraints: { glideSlope_deg: 10, maxSpeed_mps: null, gateHeight_m: 15, gateDescentRate_mps: 1.5, minAltitude_m: 0 },
  ignition: { position_m: [2400, -900, 1800], velocity_mps: [-90, 25, -45], mass_kg: 2100 }, target_m: [0, 0, 0], nodes: 30, hold: 'foh',
};

export const INDEPENDENT_CASES: IndependentCase[] = [
  {
    description: 'glide slope, both thrust bounds and a fast-spinning body (fixed t_f, FOH)',
    scenario: {
      id: 'glide-rotation',
      // An invented body spinning once every 4.4 h (4e-4 rad/s) at 30° latitude: Coriolis terms of a few
      // per cent of the thrust acceleration, so a wrong Coriolis factor moves the optimum by about 1 %.
      planet: { gravity: [0, 0, -2.4], rotationRate: spin(4e-4, 30) },
      vehicle: landerA,
      constraints: { ...none, glideSlope_deg: 12 },
      ignition: { position_m: [-3000, 500, 900], velocity_mps: [70, -5, -20], mass_kg: 1600 }, target_m: [0, 0, 0], nodes: 40, hold: 'foh',
    },
    mode: { kind: 'fixed', timeOfFlight_s: 55, infeasibleTime_s: 40 },
    active: ['upperThrust', 'lowerThrust', 'glideSlope', 'rotation'],
  },
  {
    description: 'pointing limit and both thrust bounds (fixed t_f, ZOH)',
    scenario: s2,
    mode: { kind: 'fixed', timeOfFlight_s: 58, infeasibleTime_s: 45 },
    active: ['pointing', 'lowerThrust', 'upperThrust'],
  },
  {
    description: 'speed limit and a terminal gate (fixed t_f, FOH)',
    scenario: {
      id: 'speed-gate', planet: still, vehicle: landerA,
      constraints: { ...none, maxSpeed_mps: 40, gateHeight_m: 20, gateDescentRate_mps: 2 },
      ignition: { position_m: [-2000, 0, 300], velocity_mps: [20, 0, -30], mass_kg: 1600 }, target_m: [0, 0, 0], nodes: 40, hold: 'foh',
    },
    mode: { kind: 'fixed', timeOfFlight_s: 62, infeasibleTime_s: 50 },
    active: ['speed', 'gate', 'upperThrust'],
  },
  {
    description: 'landing-plane floor and a terminal gate (fixed t_f, ZOH)',
    scenario: {
      id: 'floor-gate', planet: still, vehicle: landerA,
      constraints: { ...none, gateHeight_m: 10, gateDescentRate_mps: 1 },
      ignition: { position_m: [-2000, 0, 300], velocity_mps: [20, 0, -30], mass_kg: 1600 }, target_m: [0, 0, 0], nodes: 40, hold: 'zoh',
    },
    mode: { kind: 'fixed', timeOfFlight_s: 50, infeasibleTime_s: 30 },
    active: ['altitude', 'gate', 'lowerThrust'],
  },
  {
    description: 'spinning body, gate, glide slope and pointing limit (free t_f, FOH)',
    scenario: s5,
    mode: { kind: 'free', lower_s: 45, upper_s: 65, grid: 5, tol_s: 0.02 },
    active: ['rotation', 'gate', 'upperThrust'],
  },
  {
    description: 'pointing limit at the free-t_f optimum (free t_f, ZOH)',
    scenario: { ...s2, id: 'pointing-zoh-free' },
    mode: { kind: 'free', lower_s: 50, upper_s: 70, grid: 5, tol_s: 0.02 },
    active: ['pointing', 'lowerThrust'],
  },
  {
    description: 'target 8.9 km away with 600 kg of propellant (unreachable)',
    scenario: { ...s5, id: 'too-far', target_m: [-8000, 4000, 0] },
    // Longest possible burn (m0 − m_dry)/(α ρ1) ≈ 500 s: the grid covers every feasible time.
    mode: { kind: 'unreachable', lower_s: 20, upper_s: 500, grid: 13 },
    active: [],
  },
  {
    description: '150 m up, falling at 40 m/s, with the landing-plane floor (unreachable; reachable without the floor)',
    scenario: {
      id: 'floor-crash', planet: still, vehicle: landerA, constraints: none,
      ignition: { position_m: [-1500, 200, 150], velocity_mps: [20, 0, -40], mass_kg: 1600 }, target_m: [0, 0, 0], nodes: 30, hold: 'foh',
    },
    mode: { kind: 'unreachable', lower_s: 10, upper_s: 130, grid: 13 },
    active: ['altitude'],
  },
];
