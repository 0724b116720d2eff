/**
 * Shared point-mass simulator for the guidance baselines: rotating-frame dynamics
 * r̈ = T/m + g − 2ω×ṙ − ω×(ω×r), ṁ = −α‖T‖, classical RK4 with the thrust held over each step,
 * thrust saturated to the engine's range [ρ1, ρ2] and tilted back inside the pointing limit.
 */
import type { Vec3 } from '../constants.ts';
import { cross3, norm3 } from '../constants.ts';
import type { DescentSetup, IgnitionState } from '../setup.ts';
import { deriveVehicle } from '../vehicle.ts';

export interface SimState {
  t: number;
  r: Vec3;
  v: Vec3;
  m: number;
}

export interface SimSample extends SimState {
  thrust: Vec3;
}

/** Clamp a commanded thrust acceleration to what the engines can give: magnitude and pointing. */
export function saturateThrust(setup: DescentSetup, m: number, aCmd: Vec3): Vec3 {
  const { rho1, rho2 } = derived(setup);
  let a = aCmd;
  let n = norm3(a);
  if (n === 0) a = [0, 0, 1];
  n = norm3(a);
  const theta = setup.vehicle.pointingLimit;
  if (theta < Math.PI) {
    const tilt = Math.acos(Math.max(-1, Math.min(1, a[2] / n)));
    if (tilt > theta) {
      const h = Math.hypot(a[0], a[1]);
      const s = Math.sin(theta);
      a = h > 0 ? [(a[0] / h) * s * n, (a[1] / h) * s * n, Math.cos(theta) * n] : [0, 0, n];
    }
  }
  const T = Math.min(Math.max(n * m, rho1), rho2);
  return [(a[0] / n) * T, (a[1] / n) * T, (a[2] / n) * T];
}

/** The vehicle's derived limits, computed once per setup (the simulators ask at every step). */
const derivedCache = new WeakMap<DescentSetup['vehicle'], ReturnType<typeof deriveVehicle>>();
function derived(setup: DescentSetup): ReturnType<typeof deriveVehicle> {
  let d = derivedCache.get(setup.vehicle);
  if (!d) {
    d = deriveVehicle(setup.vehicle);
    derivedCache.set(setup.vehicle, d);
  }
  return d;
}

export function simulate(
  setup: DescentSetup,
  ignition: IgnitionState,
  thrustLaw: (s: SimState) => Vec3 | null,
  dt: number,
  maxTime: number,
): SimSample[] {
  const { alpha } = derived(setup);
  const g = setup.planet.gravity;
  const w = setup.planet.rotationRate;
  const deriv = (r: Vec3, v: Vec3, m: number, T: Vec3): [Vec3, Vec3, number] => {
    const cor = cross3(w, v);
    const cen = cross3(w, cross3(w, r));
    const acc: Vec3 = [
      T[0] / m + g[0] - 2 * cor[0] - cen[0],
      T[1] / m + g[1] - 2 * cor[1] - cen[1],
      T[2] / m + g[2] - 2 * cor[2] - cen[2],
    ];
    return [v, acc, -alpha * norm3(T)];
  };
  // (Helpers outside the loop: closures made per step cost more than the arithmetic.)
  const add = (a: Vec3, b: Vec3, k: number): Vec3 => [a[0] + k * b[0], a[1] + k * b[1], a[2] + k * b[2]];
  const rk4 = (k1: Vec3, k2: Vec3, k3: Vec3, k4: Vec3): Vec3 => [
    (dt / 6) * (k1[0] + 2 * k2[0] + 2 * k3[0] + k4[0]),
    (dt / 6) * (k1[1] + 2 * k2[1] + 2 * k3[1] + k4[1]),
    (dt / 6) * (k1[2] + 2 * k2[2] + 2 * k3[2] + k4[2]),
  ];
  let s: SimState = { t: 0, r: ignition.position, v: ignition.velocity, m: ignition.mass };
  const out: SimSample[] = [];
  while (s.t < maxTime) {
    const T = thrustLaw(s);
    if (T === null) break;
    out.push({ ...s, thrust: T });
    if (s.m <= setup.vehicle.dryMass) break;
    const k1 = deriv(s.r, s.v, s.m, T);
    const k2 = deriv(add(s.r, k1[0], dt / 2), add(s.v, k1[1], dt / 2), s.m + (dt / 2) * k1[2], T);
    const k3 = deriv(add(s.r, k2[0], dt / 2), add(s.v, k2[1], dt / 2), s.m + (dt / 2) * k2[2], T);
    const k4 = deriv(add(s.r, k3[0], dt), add(s.v, k3[1], dt), s.m + dt * k3[2], T);
    s = {
      t: s.t + dt,
      r: add(s.r, rk4(k1[0], k2[0], k3[0], k4[0]), 1),
      v: add(s.v, rk4(k1[1], k2[1], k3[1], k4[1]), 1),
      m: s.m + (dt / 6) * (k1[2] + 2 * k2[2] + 2 * k3[2] + k4[2]),
    };
  }
  out.push({ ...s, thrust: [0, 0, 0] });
  return out;
}
