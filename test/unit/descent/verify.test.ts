/**
 * The dense re-simulation between nodes (core/descent/verify.ts) against closed forms: constant thrust
 * acceleration in uniform gravity (r(t) = r0 + v0 t + (u + g) t²/2, and ṁ = −α m ‖u‖ integrates to
 * m(t) = m0 e^{−α ‖u‖ t}, the Tsiolkovsky form), and the thrust between two nodes under a first-order hold,
 * whose magnitude at mid-interval is that of the mean of the two node vectors.
 */
import { describe, expect, it } from 'vitest';
import type { DescentSetup } from '../../../core/descent/setup.ts';
import type { DecodedTrajectory } from '../../../core/descent/trajectory.ts';
import { deriveVehicle } from '../../../core/descent/vehicle.ts';
import { verifyBetweenNodes } from '../../../core/descent/verify.ts';

const setup: DescentSetup = {
  planet: { name: 'invented body', gravity: [0, 0, -3.7], rotationRate: [0, 0, 0] },
  vehicle: { wetMass: 2000, dryMass: 1500, isp: 230, engineCount: 4, thrustPerEngine: 4000, cantAngle: 0, throttleMin: 0.2, throttleMax: 0.9, pointingLimit: Math.PI },
  constraints: { glideSlope: null, maxSpeed: null, gateHeight: 0, gateDescentRate: 0, minAltitude: 0 },
  nodes: 11,
  hold: 'foh',
};

/** A decoded trajectory at N nodes from node thrust accelerations, with the positions filled in by `r`. */
function trajectory(T: number, u: (k: number) => [number, number, number], r: (t: number) => [number, number, number, number, number, number], m: (t: number) => number): DecodedTrajectory {
  const N = setup.nodes;
  const f = () => new Float64Array(N);
  const s = { t: f(), x: f(), y: f(), z: f(), vx: f(), vy: f(), vz: f(), mass: f(), thrustX: f(), thrustY: f(), thrustZ: f(), throttle: f(), tilt: f(), massFlow: f() };
  for (let k = 0; k < N; k++) {
    const t = (k * T) / (N - 1);
    const st = r(t);
    s.t[k] = t;
    [s.x[k], s.y[k], s.z[k], s.vx[k], s.vy[k], s.vz[k]] = st;
    s.mass[k] = m(t);
    const uk = u(k);
    s.thrustX[k] = uk[0] * s.mass[k];
    s.thrustY[k] = uk[1] * s.mass[k];
    s.thrustZ[k] = uk[2] * s.mass[k];
  }
  const diagnostics = { losslessnessGap: 0, losslessnessGapRelative: 0, lossless: true, maxTilt: 0, minThrottle: 0, maxThrottle: 0, maxSpeed: 0, glideSlopeMargin: NaN, altitudeMargin: NaN, speedMargin: NaN };
  return { timeOfFlight: T, propellant: s.mass[0] - s.mass[N - 1], finalMass: s.mass[N - 1], landing: [s.x[N - 1], s.y[N - 1], s.z[N - 1]], series: s, diagnostics };
}

describe('dense re-simulation between nodes', () => {
  it('reproduces constant-thrust flight in uniform gravity and the Tsiolkovsky mass to 1e-6', () => {
    // Vertical braking: u = (0, 0, a) from 800 m at v0 = −60 m/s; choose a and T so that the vehicle stops
    // exactly at z = 0: v(T) = v0 + (a − g) T = 0 and z(T) = z0 + v0 T + (a − g) T²/2 = 0 ⇒ T = −2 z0 / v0,
    // a − g = −v0 / T.
    const z0 = 800;
    const v0 = -60;
    const T = (-2 * z0) / v0;
    const a = 3.7 - v0 / T;
    const alpha = deriveVehicle(setup.vehicle).alpha;
    const m0 = 2000;
    const traj = trajectory(T, () => [0, 0, a], (t) => [0, 0, z0 + v0 * t + 0.5 * (a - 3.7) * t * t, 0, 0, v0 + (a - 3.7) * t], (t) => m0 * Math.exp(-alpha * a * t));
    const v = verifyBetweenNodes(setup, traj, [0, 0, 0]);
    expect(v.touchdownPositionError_m).toBeLessThan(1e-6);
    expect(v.touchdownVelocityError_mps).toBeLessThan(1e-6);
    expect(Math.abs(v.propellant_kg - m0 * (1 - Math.exp(-alpha * a * T)))).toBeLessThan(1e-6);
    expect(v.altitudeMargin_m).toBeGreaterThan(-1e-9);
    expect(v.violations).toEqual([]);
  });

  it('finds a thrust below the lower bound between two nodes that each meet it', () => {
    // Node thrust accelerations (±b, 0, c) both of magnitude √(b² + c²) above the lower bound; at
    // mid-interval the first-order hold gives (0, 0, c), of magnitude c below it.
    const { rho1, fullThrust } = deriveVehicle(setup.vehicle);
    const m = 1800;
    const c = (0.5 * rho1) / m; // half the minimum thrust at mid-interval
    const b = (1.2 * rho1) / m; // each node above it
    const traj = trajectory(20, (k) => [k % 2 ? -b : b, 0, c], (t) => [0, 0, 500 - t, 0, 0, -1], () => m);
    const v = verifyBetweenNodes(setup, traj, [0, 0, 0]);
    // Mid-interval thrust m·c = 0.5 ρ1: margin (0.5 ρ1 − ρ1)/full thrust, to the integrator's mass drift.
    expect(v.thrustLowerMargin).toBeLessThan(-0.4 * rho1 / fullThrust);
    expect(v.violations.some((s) => s.startsWith('minimum thrust'))).toBe(true);
  });

  it('finds a dip below the altitude floor between nodes that are all above it', () => {
    // z(t) = (t − 4.5)² − 0.2 with nodes at t = 0, 1, …, 10: every node is at least 0.05 m up, but the
    // minimum at t = 4.5 is −0.2 m, 0.2 m below the landing plane (beyond the 0.1 m tolerance).
    // Constant vertical acceleration z″ = 2 ⇒ u_z = 2 + g.
    const traj = trajectory(10, () => [0, 0, 2 + 3.7], (t) => [0, 0, (t - 4.5) ** 2 - 0.2, 0, 0, 2 * (t - 4.5)], () => 1800);
    for (const z of traj.series.z) expect(z).toBeGreaterThanOrEqual(0.05 - 1e-12);
    const v = verifyBetweenNodes(setup, traj, [0, 0, 0]);
    expect(v.altitudeMargin_m).toBeCloseTo(-0.2, 3);
    expect(v.violations.some((x) => x.startsWith('altitude floor'))).toBe(true);
  });
});
