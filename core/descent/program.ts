/**
 * The lossless-convexification second-order cone program for one descent (Açıkmeşe & Ploen 2007,
 * JGCD 30(5); Blackmore, Açıkmeşe & Scharf 2010, JGCD 33(4)).
 *
 * Variables at each node k = 0 … N−1: position r, velocity v, log-mass z = ln m, thrust acceleration
 * u = T/m and its magnitude slack σ ≥ ‖u‖. Constraints:
 *   dynamics    x_{k+1} = Φ x_k + Γ⁻ u_k + Γ⁺ u_{k+1} + Γ1 g   (exact, see discretise.ts)
 *   mass        z_{k+1} = z_k − α Δt (σ_k + σ_{k+1})/2  (FOH)   or  − α Δt σ_k (ZOH)
 *   thrust      ‖u_k‖ ≤ σ_k
 *               μ1,k (1 − δ + δ²/2) ≤ σ_k ≤ μ2,k (1 − δ),  δ = z_k − z0,k,  μi,k = ρi e^{−z0,k}
 *               (second-order Taylor lower bound as a rotated cone, tangent upper bound; both lie
 *               inside the exact ρ1 e^{−z} ≤ σ ≤ ρ2 e^{−z} when z ≥ z0, which the mass bounds ensure)
 *   mass bounds z0,k = ln max(m0 − α ρ2 t_k, m_dry) ≤ z_k ≤ ln(m0 − α ρ1 t_k),  z_{N−1} ≥ ln m_dry
 *   pointing    ẑᵀu_k ≥ σ_k cos θ_max
 *   glide slope ‖(r_k − r_land)_xy‖ ≤ (r_k − r_land)_z / tan γ, r_land = r_{N−1} − (0, 0, gate height)
 *   speed       ‖v_k‖ ≤ V_max;  altitude  r_z,k ≥ r_z,target + h_min
 *   boundary    r_0, v_0, z_0 = ln m0 fixed; r_{N−1} = target + gate height, v_{N−1} = (0, 0, −gate rate)
 *   ZOH only    (u, σ)_{N−1} = (u, σ)_{N−2}: the last node reports the hold value of the last interval
 *   flyable     (min-propellant-flyable only) d_kᵀu_k ≥ σ_k at nodes given a direction d_k (see ProgramData)
 *   rate        (vehicle.throttleRate set) |σ_{k+1} − σ_k| ≤ c_k, see throttleRateStep below
 * Minimum propellant: maximise z_{N−1}. Minimum landing error (Blackmore 2010): the horizontal
 * landing position is free and ‖(r_{N−1} − target)_xy‖ ≤ e is minimised (with a tiny propellant tie-break).
 *
 * Inequalities that are fixed by the boundary conditions are left out at the first and last node, so
 * the cone constraints keep a strict interior (interior-point solvers need it).
 */
import type { Vec3 } from './constants.ts';
import { norm3 } from './constants.ts';
import { discretise } from './discretise.ts';
import type { Emitter } from './assembler.ts';
import { FixedPatternProblem } from './assembler.ts';
import type { DescentSetup, IgnitionState } from './setup.ts';
import { deriveVehicle } from './vehicle.ts';

/**
 * min-propellant: land on the target using least propellant. min-landing-error: land as close to the target
 * as the vehicle can (Blackmore et al. 2010). max-divert: land as far along a horizontal direction as a
 * propellant budget allows (the reach boundary of the footprint, one direction at a time).
 */
export type ProgramKind = 'min-propellant' | 'min-landing-error' | 'max-divert' | 'min-propellant-flyable' | 'min-propellant-band';

/** Kinds that land exactly on the target (the landing point is data). */
export function landsOnTarget(kind: ProgramKind): boolean {
  return kind === 'min-propellant' || kind === 'min-propellant-flyable' || kind === 'min-propellant-band';
}

/**
 * Lowest throttle fraction the band restriction imposes on an interval assigned to a range that starts at
 * zero: the rotated cone of the lower bound needs a positive coefficient to keep a strict interior. Being a
 * restriction (the engine may go lower), it can only raise the band-respecting cost, never the lower bound.
 */
export const BAND_THROTTLE_FLOOR = 0.005;

/** Per-solve data: only values depend on it. */
export interface ProgramData {
  readonly timeOfFlight: number;
  readonly target: Vec3;
  readonly ignition: IgnitionState;
  /** max-divert: unit horizontal direction (east, north) to push the landing point along. */
  readonly direction?: readonly [number, number];
  /** max-divert: propellant that may be used, kg. */
  readonly propellantBudget?: number;
  /**
   * min-propellant-flyable: per node a unit thrust direction d_k (3 N entries) or zeros. Where d_k is set,
   * the half-space d_kᵀu_k ≥ σ_k replaces the relaxed ‖u_k‖ ≥ … : with ‖u_k‖ ≤ σ_k it forces ‖u_k‖ = σ_k
   * along d_k, so the node's thrust is flyable (a convex restriction of the non-convex thrust set).
   */
  readonly thrustDirections?: Float64Array;
  /**
   * min-propellant-band (zero-order hold): per hold interval k = 0 … N−2 the allowed throttle range
   * [lo_k, hi_k] (fractions of full thrust, 2(N − 1) entries) that the whole interval keeps: with u_k held
   * and the mass falling, the thrust m(t)‖u_k‖ sweeps [m_{k+1}σ_k, m_kσ_k] (lossless), so
   *   m_{k+1}σ_k ≥ lo_k F  (the second-order lower bound of Açıkmeşe & Ploen, expanded at node k + 1)
   *   m_k σ_k ≤ hi_k F     (the linearised upper bound at node k)
   * and both lie inside the exact bounds (z ≥ z0): the interval respects the range at every instant.
   * Absent: [throttleMin, throttleMax] everywhere. The thrustDirections rows are part of this kind too.
   */
  readonly throttleIntervals?: Float64Array;
}

/** Field offsets inside one node's block of variables. */
export const NODE = { r: 0, v: 3, z: 6, u: 7, sigma: 10, size: 11 } as const;

export interface ProgramScales {
  readonly length: number;
  readonly accel: number;
  readonly velocity: number;
  readonly time: number;
}

/** Nondimensional units: acceleration from the full-throttle thrust at ignition, a length from the geometry. */
export function chooseScales(setup: DescentSetup, lengthHint: number): ProgramScales {
  const { rho2 } = deriveVehicle(setup.vehicle);
  const accel = Math.max(rho2 / setup.vehicle.wetMass, norm3(setup.planet.gravity));
  const length = Math.max(100, lengthHint);
  const time = Math.sqrt(length / accel);
  return { length, accel, velocity: length / time, time };
}

const TRANSITION_MASK_STEPS = [0.731, 3.17];

export class DescentProgram {
  readonly nodes: number;
  readonly kind: ProgramKind;
  readonly scales: ProgramScales;
  readonly errorVariable: number;
  private readonly fp: FixedPatternProblem<ProgramData>;

  constructor(readonly setup: DescentSetup, kind: ProgramKind, initial: ProgramData, scales?: ProgramScales) {
    this.nodes = setup.nodes;
    this.kind = kind;
    this.scales = scales ?? chooseScales(setup, norm3(initial.ignition.position));
    const N = setup.nodes;
    const nv = N * NODE.size + (kind === 'min-landing-error' ? 1 : 0);
    this.errorVariable = kind === 'min-landing-error' ? N * NODE.size : -1;
    const colScale = new Float64Array(nv);
    const S = this.scales;
    for (let k = 0; k < N; k++) {
      const o = k * NODE.size;
      for (let i = 0; i < 3; i++) {
        colScale[o + NODE.r + i] = S.length;
        colScale[o + NODE.v + i] = S.velocity;
        colScale[o + NODE.u + i] = S.accel;
      }
      colScale[o + NODE.z] = 1;
      colScale[o + NODE.sigma] = S.accel;
    }
    if (this.errorVariable >= 0) colScale[this.errorVariable] = S.length;
    const masks = this.transitionMasks();
    this.fp = new FixedPatternProblem(nv, colScale, (e, d) => this.emit(e, d, masks), initial);
  }

  get problem() {
    return this.fp.problem;
  }

  /** Refreshes the values for new data (same pattern). */
  update(data: ProgramData) {
    return this.fp.refresh(data);
  }

  /** Physical value of variable `j` from a scaled solution. */
  value(x: ArrayLike<number>, j: number): number {
    return this.fp.unscale(x, j);
  }

  private transitionMasks(): { phi: Uint8Array; uNow: Uint8Array; uNext: Uint8Array } {
    const phi = new Uint8Array(36);
    const uNow = new Uint8Array(18);
    const uNext = new Uint8Array(18);
    const { planet, hold } = this.setup;
    for (const dt of TRANSITION_MASK_STEPS) {
      const d = discretise(planet.rotationRate, planet.gravity, dt, hold);
      for (let i = 0; i < 36; i++) if (d.phi[i] !== 0) phi[i] = 1;
      for (let i = 0; i < 18; i++) {
        if (d.uNow[i] !== 0) uNow[i] = 1;
        if (d.uNext[i] !== 0) uNext[i] = 1;
      }
    }
    return { phi, uNow, uNext };
  }

  private emit(e: Emitter, d: ProgramData, masks: { phi: Uint8Array; uNow: Uint8Array; uNext: Uint8Array }): void {
    const { setup, kind } = this;
    const S = this.scales;
    const N = setup.nodes;
    const veh = setup.vehicle;
    const con = setup.constraints;
    const { alpha, rho1, rho2 } = deriveVehicle(veh);
    const tf = d.timeOfFlight;
    if (!(tf > 0) || !Number.isFinite(tf)) throw new RangeError(`timeOfFlight: ${tf} s (must be positive)`);
    const dt = tf / (N - 1);
    const m0 = d.ignition.mass;
    const foh = setup.hold === 'foh';
    const idx = (k: number, f: number) => k * NODE.size + f;
    const rowScaleState = (i: number) => (i < 3 ? 1 / S.length : 1 / S.velocity);

    // ── equalities ───────────────────────────────────────────────────────────
    for (let i = 0; i < 3; i++) {
      const r = e.eqRow(1 / S.length);
      e.a(r, idx(0, NODE.r + i), 1);
      e.b(r, d.ignition.position[i]);
    }
    for (let i = 0; i < 3; i++) {
      const r = e.eqRow(1 / S.velocity);
      e.a(r, idx(0, NODE.v + i), 1);
      e.b(r, d.ignition.velocity[i]);
    }
    {
      const r = e.eqRow(1);
      e.a(r, idx(0, NODE.z), 1);
      e.b(r, Math.log(m0));
    }
    const step = discretise(setup.planet.rotationRate, setup.planet.gravity, dt, setup.hold);
    assertMasked(step.phi, masks.phi, 'Φ');
    assertMasked(step.uNow, masks.uNow, 'Γ⁻');
    assertMasked(step.uNext, masks.uNext, 'Γ⁺');
    // Per state row: the (column offset, value) pairs of Φ, Γ⁻ (node k) and Γ⁺ (node k + 1) in the pattern.
    const rowTerms: { now: number[]; nowVal: number[]; next: number[]; nextVal: number[] }[] = [];
    for (let i = 0; i < 6; i++) {
      const t = { now: [] as number[], nowVal: [] as number[], next: [] as number[], nextVal: [] as number[] };
      for (let j = 0; j < 6; j++) if (masks.phi[i * 6 + j]) { t.now.push(j); t.nowVal.push(-step.phi[i * 6 + j]); }
      for (let j = 0; j < 3; j++) {
        if (masks.uNow[i * 3 + j]) { t.now.push(NODE.u + j); t.nowVal.push(-step.uNow[i * 3 + j]); }
        if (masks.uNext[i * 3 + j]) { t.next.push(NODE.u + j); t.nextVal.push(-step.uNext[i * 3 + j]); }
      }
      rowTerms.push(t);
    }
    for (let k = 0; k + 1 < N; k++) {
      const o0 = k * NODE.size;
      const o1 = o0 + NODE.size;
      for (let i = 0; i < 6; i++) {
        const r = e.eqRow(rowScaleState(i));
        const t = rowTerms[i];
        e.a(r, o1 + i, 1);
        for (let q = 0; q < t.now.length; q++) e.a(r, o0 + t.now[q], t.nowVal[q]);
        for (let q = 0; q < t.next.length; q++) e.a(r, o1 + t.next[q], t.nextVal[q]);
        e.b(r, step.gravityTerm[i]);
      }
      const r = e.eqRow(1);
      e.a(r, idx(k + 1, NODE.z), 1);
      e.a(r, idx(k, NODE.z), -1);
      if (foh) {
        e.a(r, idx(k, NODE.sigma), (alpha * dt) / 2);
        e.a(r, idx(k + 1, NODE.sigma), (alpha * dt) / 2);
      } else {
        e.a(r, idx(k, NODE.sigma), alpha * dt);
      }
    }
    const last = N - 1;
    if (!foh) {
      // Zero-order hold: the last node's control is the hold value of the last interval.
      for (const f of [NODE.u, NODE.u + 1, NODE.u + 2, NODE.sigma]) {
        const r = e.eqRow(1 / S.accel);
        e.a(r, idx(last, f), 1);
        e.a(r, idx(last - 1, f), -1);
        e.b(r, 0);
      }
    }
    const gateTop: Vec3 = [d.target[0], d.target[1], d.target[2] + con.gateHeight];
    for (let i = landsOnTarget(kind) ? 0 : 2; i < 3; i++) {
      const r = e.eqRow(1 / S.length);
      e.a(r, idx(last, NODE.r + i), 1);
      e.b(r, gateTop[i]);
    }
    for (let i = 0; i < 3; i++) {
      const r = e.eqRow(1 / S.velocity);
      e.a(r, idx(last, NODE.v + i), 1);
      e.b(r, i === 2 ? -con.gateDescentRate : 0);
    }

    // ── orthant rows ─────────────────────────────────────────────────────────
    const zRef = new Float64Array(N);
    const zMax = new Float64Array(N);
    for (let k = 0; k < N; k++) {
      const t = k * dt;
      zRef[k] = Math.log(Math.max(m0 - alpha * rho2 * t, veh.dryMass));
      zMax[k] = Math.log(Math.max(m0 - alpha * rho1 * t, 1e-3 * m0));
    }
    const cosPoint = Math.cos(veh.pointingLimit);
    const pointing = veh.pointingLimit < Math.PI;
    for (let k = 0; k < N; k++) {
      if (pointing) {
        const r = e.orthRow(1 / S.accel);
        e.g(r, idx(k, NODE.sigma), cosPoint);
        e.g(r, idx(k, NODE.u + 2), -1);
        e.h(r, 0);
      }
      const mu2 = rho2 * Math.exp(-zRef[k]);
      const r = e.orthRow(1 / S.accel);
      e.g(r, idx(k, NODE.sigma), 1);
      e.g(r, idx(k, NODE.z), mu2);
      e.h(r, mu2 * (1 + zRef[k]));
    }
    for (let k = 1; k < N; k++) {
      const lo = e.orthRow(1);
      e.g(lo, idx(k, NODE.z), -1);
      e.h(lo, -zRef[k]);
      const hi = e.orthRow(1);
      e.g(hi, idx(k, NODE.z), 1);
      e.h(hi, zMax[k]);
    }
    {
      const r = e.orthRow(1);
      e.g(r, idx(last, NODE.z), -1);
      e.h(r, -Math.log(veh.dryMass));
    }
    if (kind === 'max-divert') {
      // Propellant ≤ budget ⇔ z_final ≥ ln(m0 − budget).
      const budget = d.propellantBudget;
      if (budget === undefined || !(budget > 0) || !(m0 - budget > 0)) {
        throw new RangeError(`propellantBudget: ${budget} kg (max-divert needs a budget between 0 and the ignition mass)`);
      }
      const r = e.orthRow(1);
      e.g(r, idx(last, NODE.z), -1);
      e.h(r, -Math.log(m0 - budget));
    }
    if (kind === 'min-propellant-flyable' || kind === 'min-propellant-band') {
      // σ_k − d_kᵀu_k ≤ 0 where a direction is given; elsewhere d_k = 0 and the row reads σ_k ≤ 2 μ2,k,
      // which the upper thrust bound already implies (σ_k ≤ μ2,k(1 − δ) with δ ≥ 0): inactive.
      const dirs = d.thrustDirections;
      if (dirs !== undefined && dirs.length !== 3 * N) throw new RangeError(`thrustDirections: ${dirs.length} entries (must be 3 × nodes = ${3 * N})`);
      for (let k = 0; k < N; k++) {
        const dk = dirs ? [dirs[3 * k], dirs[3 * k + 1], dirs[3 * k + 2]] : [0, 0, 0];
        const set = dk[0] !== 0 || dk[1] !== 0 || dk[2] !== 0;
        const r = e.orthRow(1 / S.accel);
        e.g(r, idx(k, NODE.sigma), 1);
        for (let i = 0; i < 3; i++) e.g(r, idx(k, NODE.u + i), -dk[i]);
        e.h(r, set ? 0 : 2 * rho2 * Math.exp(-zRef[k]));
      }
    }
    const band = kind === 'min-propellant-band';
    const { fullThrust } = deriveVehicle(veh);
    const ranges = d.throttleIntervals;
    if (band) {
      if (setup.hold !== 'zoh') throw new RangeError("min-propellant-band needs zero-order hold (hold: 'zoh')");
      if (ranges !== undefined && ranges.length !== 2 * (N - 1)) throw new RangeError(`throttleIntervals: ${ranges.length} entries (must be 2 × (nodes − 1) = ${2 * (N - 1)})`);
      for (let k = 0; k + 1 < N; k++) {
        const hi = ranges ? ranges[2 * k + 1] : veh.throttleMax;
        const mu = hi * fullThrust * Math.exp(-zRef[k]);
        const r = e.orthRow(1 / S.accel);
        e.g(r, idx(k, NODE.sigma), 1);
        e.g(r, idx(k, NODE.z), mu);
        e.h(r, mu * (1 + zRef[k]));
      }
    }
    const rate = veh.throttleRate ?? null;
    if (rate !== null) {
      // |σ_{k+1} − σ_k| ≤ c_k on the magnitude slack (both signs: two rows per interval).
      for (let k = 0; k + 1 < N; k++) {
        const c = throttleRateStep(rate, fullThrust, alpha, rho2, dt, zRef[k + 1], zMax[k + 1]);
        for (const sign of [1, -1]) {
          const r = e.orthRow(1 / S.accel);
          e.g(r, idx(k + 1, NODE.sigma), sign);
          e.g(r, idx(k, NODE.sigma), -sign);
          e.h(r, c);
        }
      }
    }
    if (con.minAltitude !== null) {
      for (let k = 1; k < last; k++) {
        const r = e.orthRow(1 / S.length);
        e.g(r, idx(k, NODE.r + 2), -1);
        e.h(r, -(d.target[2] + con.minAltitude));
      }
    }

    // ── second-order cones ───────────────────────────────────────────────────
    for (let k = 0; k < N; k++) {
      const t0 = e.soc(4, 1 / S.accel);
      e.g(t0, idx(k, NODE.sigma), -1);
      for (let i = 0; i < 3; i++) e.g(t0 - 1 - i, idx(k, NODE.u + i), -1);
    }
    if (rho1 > 0) {
      for (let k = 0; k < N; k++) {
        const mu1 = rho1 * Math.exp(-zRef[k]);
        const t0 = e.soc(3, 1 / S.accel);
        e.g(t0, idx(k, NODE.sigma), -1);
        e.g(t0, idx(k, NODE.z), -mu1);
        e.h(t0, -mu1 * zRef[k] - mu1 / 2);
        e.g(t0 - 1, idx(k, NODE.z), -mu1);
        e.h(t0 - 1, -mu1 * zRef[k]);
        e.g(t0 - 2, idx(k, NODE.sigma), -1);
        e.g(t0 - 2, idx(k, NODE.z), -mu1);
        e.h(t0 - 2, -mu1 * zRef[k] - (3 * mu1) / 2);
      }
    }
    if (band) {
      // Lower end of each interval's range at the interval's END (node k + 1): same rotated cone as above.
      for (let k = 0; k + 1 < N; k++) {
        const lo = Math.max(ranges ? ranges[2 * k] : veh.throttleMin, BAND_THROTTLE_FLOOR);
        const zr = zRef[k + 1];
        const mu1 = lo * fullThrust * Math.exp(-zr);
        const t0 = e.soc(3, 1 / S.accel);
        e.g(t0, idx(k, NODE.sigma), -1);
        e.g(t0, idx(k + 1, NODE.z), -mu1);
        e.h(t0, -mu1 * zr - mu1 / 2);
        e.g(t0 - 1, idx(k + 1, NODE.z), -mu1);
        e.h(t0 - 1, -mu1 * zr);
        e.g(t0 - 2, idx(k, NODE.sigma), -1);
        e.g(t0 - 2, idx(k + 1, NODE.z), -mu1);
        e.h(t0 - 2, -mu1 * zr - (3 * mu1) / 2);
      }
    }
    if (con.glideSlope !== null) {
      const cot = 1 / Math.tan(con.glideSlope);
      // Minimum propellant lands on the target itself: the cone's apex is data, not a variable, which
      // keeps every node's cone off the last node's columns (a sparser KKT factor).
      const apexFixed = landsOnTarget(kind);
      for (let k = 1; k < last; k++) {
        const t0 = e.soc(3, 1 / S.length);
        e.g(t0, idx(k, NODE.r + 2), -cot);
        if (apexFixed) {
          e.h(t0, -cot * d.target[2]);
        } else {
          e.g(t0, idx(last, NODE.r + 2), cot);
          e.h(t0, con.gateHeight * cot);
        }
        for (let i = 0; i < 2; i++) {
          e.g(t0 - 1 - i, idx(k, NODE.r + i), -1);
          if (apexFixed) e.h(t0 - 1 - i, -d.target[i]);
          else e.g(t0 - 1 - i, idx(last, NODE.r + i), 1);
        }
      }
    }
    if (con.maxSpeed !== null) {
      for (let k = 1; k < N; k++) {
        const t0 = e.soc(4, 1 / S.velocity);
        e.h(t0, con.maxSpeed);
        for (let i = 0; i < 3; i++) e.g(t0 - 1 - i, idx(k, NODE.v + i), -1);
      }
    }
    if (kind === 'min-landing-error') {
      const t0 = e.soc(3, 1 / S.length);
      e.g(t0, this.errorVariable, -1);
      for (let i = 0; i < 2; i++) {
        e.g(t0 - 1 - i, idx(last, NODE.r + i), -1);
        e.h(t0 - 1 - i, -d.target[i]);
      }
      e.c(this.errorVariable, 1 / S.length);
      e.c(idx(last, NODE.z), -MIN_ERROR_PROPELLANT_WEIGHT);
    } else if (kind === 'max-divert') {
      const dir = d.direction;
      if (!dir || !(Math.abs(Math.hypot(dir[0], dir[1]) - 1) < 1e-9)) {
        throw new RangeError(`direction: ${dir ? `[${dir.join(', ')}]` : 'missing'} (max-divert needs a unit east–north direction)`);
      }
      e.c(idx(last, NODE.r), -dir[0] / S.length);
      e.c(idx(last, NODE.r + 1), -dir[1] / S.length);
    } else {
      e.c(idx(last, NODE.z), -1);
    }
  }
}

/**
 * The bound c on |σ_{k+1} − σ_k| that keeps the thrust-magnitude change over one step within the throttle-rate
 * limit, |T_{k+1} − T_k| ≤ R F Δt (R the rate in full thrust per second, F the full net thrust), for every
 * mass the program allows. The program's variables are mass-normalised (σ = Γ/m, Açıkmeşe & Ploen 2007), so
 * the thrust T_k = m_k σ_k (where ‖u_k‖ = σ_k) is bilinear; split
 *     T_{k+1} − T_k = m_{k+1}(σ_{k+1} − σ_k) − (m_k − m_{k+1}) σ_k
 * and bound each part over the program's mass bounds: m_{k+1} ≤ m̄_{k+1} = e^{zMax_{k+1}} (burning at the
 * lowest thrust), and (m_k − m_{k+1})σ_k ≤ α Δt ρ2 · ρ2 e^{−zRef_{k+1}} (the mass flow is at most α ρ2,
 * and σ_k ≤ ρ2/m_k ≤ ρ2 e^{−zRef_{k+1}}). So
 *     m̄_{k+1}|σ_{k+1} − σ_k| ≤ R F Δt − α Δt ρ2² e^{−zRef_{k+1}}
 * is a convex (linear) SUFFICIENT condition: conservative by the mass-loss term (α ρ2²/m per second, a few
 * thousandths of full thrust per second on the demo lander) and by the ratio m̄_{k+1}/m_{k+1} ≥ 1 of the
 * mass bounds. It constrains the flown thrust only where the relaxation is lossless (‖u_k‖ = σ_k): the
 * search checks that, and restores a flyable thrust with the rows kept where it is not (flyable.ts).
 * Returns a value ≥ 0 (0: the rate is below the mass-loss drift there; validateSetup refuses such rates).
 */
export function throttleRateStep(rate: number, fullThrust: number, alpha: number, rho2: number, dt: number, zRefNext: number, zMaxNext: number): number {
  const drift = alpha * dt * rho2 * rho2 * Math.exp(-zRefNext);
  return Math.max(0, (rate * fullThrust * dt - drift) / Math.exp(zMaxNext));
}

/** Tie-break weight of −z_final in the minimum-landing-error objective (objective in units of the length scale). */
export const MIN_ERROR_PROPELLANT_WEIGHT = 1e-4;

function assertMasked(values: Float64Array, mask: Uint8Array, name: string): void {
  let scale = 0;
  for (let i = 0; i < values.length; i++) scale = Math.max(scale, Math.abs(values[i]));
  for (let i = 0; i < values.length; i++) {
    if (!mask[i] && Math.abs(values[i]) > 1e-13 * (1 + scale)) {
      throw new Error(`internal: ${name} entry ${i} = ${values[i]} outside the sparsity pattern`);
    }
  }
}
