/**
 * Forbidden throttle bands: a band-respecting trajectory (an UPPER bound) beside the relaxation that ignores
 * the band (the certified LOWER bound).
 *
 * The thrust set {ρ_min ≤ ‖T‖ ≤ ρ_a} ∪ {ρ_b ≤ ‖T‖ ≤ ρ_max} is not convex, and neither is its lossless
 * convexification once the band splits it (Malyuta, Szmuk & Açıkmeşe study such semi-continuous input sets
 * and the conditions under which a relaxation stays lossless; our discretised problems do not meet them in
 * general). What IS convex: once every hold interval is assigned to ONE allowed throttle range, each
 * interval's thrust lies in an annulus, and Açıkmeşe & Ploen's lossless convexification applies to it
 * (program.ts, kind 'min-propellant-band': per interval [lo_k, hi_k], kept at every instant of the interval
 * with zero-order hold). Any solution of that restriction that is lossless (‖u_k‖ = σ_k, or made so by fixing
 * thrust directions as in flyable.ts) is a trajectory the engine can fly.
 *
 * Why zero-order hold: with a first-order hold a switch between a high and a low node ramps the thrust
 * linearly through the band between the nodes. Held thrust acceleration keeps each interval inside its
 * range (the thrust only drifts down with the mass, which the range rows account for); the switch itself is
 * an instantaneous step at a node.
 *
 * Which assignment: the structure of minimum-propellant throttle with a glide slope and pointing limits is
 * max–min–max (Açıkmeşe & Ploen 2007; Blackmore, Açıkmeşe & Scharf 2010; Lu 2018 for the thrust profile),
 * so the assignment is described by two switch indices i1 ≤ i2: intervals before i1 and from i2 on use the
 * highest allowed range, those between use a lower one (with several bands: the allowed range nearest the
 * relaxed optimum's throttle there). The switch indices are seeded from the relaxed optimum's throttle
 * profile and improved by a local search (±1 on either index while the cost falls), and the time of flight
 * by Brent's method on that cost, inside the same free-final-time search (search.ts). Alternating
 * assignments (needed where a long arc would hover with the hover throttle inside the band) are tried once
 * as well (alternatingRanges: sigma–delta rounding of the relaxed throttle) and kept when cheaper; no
 * further search over them. A target with no band-respecting trajectory is 'undecided', never reachable.
 */
import { isSolved } from '../conic/types.ts';
import type { Vec3 } from './constants.ts';
import { bracketFrom, brentMinimise } from './brent.ts';
import { lossyNodes } from './flyable.ts';
import { NODE } from './program.ts';
import type { IgnitionState } from './setup.ts';
import type { DescentSolver, FixedTimeSolve } from './solver.ts';
import { LOSSLESS_TOLERANCE } from './trajectory.ts';
import { allowedThrottleIntervals, deriveVehicle } from './vehicle.ts';

/** A phase assignment of the max–min–max structure: intervals [i1, i2) in the low ranges, the rest high. */
export interface BandStructure {
  i1: number;
  i2: number;
}

export interface BandSearchResult {
  /** The cheapest band-respecting fixed-time solve found (kind 'min-propellant-band'), or null. */
  best: FixedTimeSolve | null;
  /** Its max–min–max switches; null when none was found or the alternating assignment won (`alternating`). */
  structure: BandStructure | null;
  /** The returned trajectory uses the alternating assignment (alternatingRanges) rather than max–min–max. */
  alternating: boolean;
  /** Conic solves spent. */
  solves: number;
  /** Structures evaluated (each one or more solves). */
  evaluations: number;
}

export interface BandSearchOptions {
  /** Most solves the band search may spend (default 80). */
  maxSolves?: number;
  /** t_f tolerance of Brent's method on the band-respecting cost, s (default 0.05). */
  tfTolerance?: number;
  /** Only the relaxed solve's own time of flight (no search over t_f): the fixed-time problem. */
  fixedTime?: boolean;
}

/** Throttle fraction of each hold interval of a solve (thrust at the interval's start over full thrust). */
export function intervalThrottles(solver: DescentSolver, r: FixedTimeSolve): Float64Array {
  const program = solver.program(r.kind);
  const N = solver.setup.nodes;
  const { fullThrust } = deriveVehicle(solver.setup.vehicle);
  const out = new Float64Array(N - 1);
  for (let k = 0; k + 1 < N; k++) {
    const o = k * NODE.size;
    const u = Math.hypot(program.value(r.solution.x, o + NODE.u), program.value(r.solution.x, o + NODE.u + 1), program.value(r.solution.x, o + NODE.u + 2));
    out[k] = (Math.exp(program.value(r.solution.x, o + NODE.z)) * u) / fullThrust;
  }
  return out;
}

/** Index of the allowed range nearest to a throttle fraction. */
function nearestRange(ranges: readonly [number, number][], rho: number): number {
  let best = 0;
  let dist = Infinity;
  ranges.forEach(([lo, hi], i) => {
    const d = rho < lo ? lo - rho : rho > hi ? rho - hi : 0;
    if (d < dist) { dist = d; best = i; }
  });
  return best;
}

/**
 * The max–min–max structure seeded from a relaxed throttle profile: the low arc spans the intervals whose
 * throttle lies below the middle of the highest band (the first to the last of them).
 */
export function seedStructure(throttles: Float64Array, ranges: readonly [number, number][]): BandStructure {
  const top = ranges[ranges.length - 1];
  const below = ranges[ranges.length - 2];
  const mid = 0.5 * (below[1] + top[0]);
  let i1 = -1;
  let i2 = -1;
  for (let k = 0; k < throttles.length; k++) {
    if (throttles[k] < mid) {
      if (i1 < 0) i1 = k;
      i2 = k + 1;
    }
  }
  return i1 < 0 ? { i1: throttles.length, i2: throttles.length } : { i1, i2 };
}

/** Per-interval [lo, hi] of a structure: low arc intervals take the non-top range nearest the seed throttle. */
export function structureRanges(s: BandStructure, ranges: readonly [number, number][], seedThrottles: Float64Array): Float64Array {
  const n = seedThrottles.length;
  const out = new Float64Array(2 * n);
  const top = ranges.length - 1;
  const lower = ranges.slice(0, top);
  for (let k = 0; k < n; k++) {
    const i = k >= s.i1 && k < s.i2 ? nearestRange(lower, seedThrottles[k]) : top;
    out[2 * k] = ranges[i][0];
    out[2 * k + 1] = ranges[i][1];
  }
  return out;
}

/**
 * Alternating assignment: intervals whose relaxed throttle lies inside a band take the range below or above it
 * by sigma–delta rounding (the running sum of chosen edge minus relaxed throttle is kept near zero), so an
 * arc that would hold an in-band throttle, such as a hover with the hover throttle inside the band,
 * alternates between the two ranges with the same mean; intervals inside an allowed range keep it. Null when
 * no interval's throttle lies in a band (nothing to alternate).
 */
export function alternatingRanges(throttles: Float64Array, ranges: readonly [number, number][]): Float64Array | null {
  const out = new Float64Array(2 * throttles.length);
  let carry = 0;
  let any = false;
  for (let k = 0; k < throttles.length; k++) {
    const rho = throttles[k];
    let i = ranges.findIndex(([lo, hi]) => rho >= lo && rho <= hi);
    if (i < 0) {
      const above = ranges.findIndex(([lo]) => lo > rho);
      if (above <= 0) {
        i = above === 0 ? 0 : ranges.length - 1;
        carry = 0;
      } else {
        any = true;
        const a = ranges[above - 1][1];
        const b = ranges[above][0];
        const wanted = rho + carry;
        const up = wanted >= 0.5 * (a + b);
        i = up ? above : above - 1;
        carry = wanted - (up ? b : a);
      }
    } else carry = 0;
    out[2 * k] = ranges[i][0];
    out[2 * k + 1] = ranges[i][1];
  }
  return any ? out : null;
}

/** The max–min–max switches of a per-interval assignment, or null when it is not of that form. */
export function structureOf(assignment: Float64Array, ranges: readonly [number, number][]): BandStructure | null {
  const n = assignment.length / 2;
  const topLo = ranges[ranges.length - 1][0];
  let i1 = -1;
  let i2 = -1;
  for (let k = 0; k < n; k++) {
    if (assignment[2 * k] !== topLo) {
      if (i1 < 0) i1 = k;
      i2 = k + 1;
    }
  }
  if (i1 < 0) return { i1: n, i2: n };
  for (let k = i1; k < i2; k++) if (assignment[2 * k] === topLo) return null;
  return { i1, i2 };
}

/**
 * A flyable band-respecting solve at one time of flight for one structure: the restriction itself when it is
 * lossless, else the same restriction with the thrust directions fixed (d_kᵀu_k ≥ σ_k) first at the lossy
 * intervals, then at every interval (flyable.ts explains why that is flyable); null when none is.
 */
export function bandSolveAt(
  solver: DescentSolver, tf: number, target: Vec3, ignition: IgnitionState, throttleIntervals: Float64Array,
): FixedTimeSolve | null {
  const N = solver.setup.nodes;
  let r = solver.solveFixed('min-propellant-band', tf, target, ignition, { throttleIntervals });
  if (!isSolved(r.status)) return null;
  const program = solver.program('min-propellant-band');
  const dirs = new Float64Array(3 * N);
  for (let round = 0; round < 3; round++) {
    const lossy = lossyNodes(solver, r, ignition, LOSSLESS_TOLERANCE).nodes;
    if (lossy.length === 0) return r;
    if (round === 2) return null;
    const u = (k: number): Vec3 => [0, 1, 2].map((i) => program.value(r.solution.x, k * NODE.size + NODE.u + i)) as unknown as Vec3;
    const lossySet = new Set(lossy);
    const targets = round === 0 ? lossy : Array.from({ length: N }, (_, k) => k);
    for (const k of targets) {
      // The direction of the nearest lossless node (a lossy node's own direction may be a wasted sideways one).
      let d: Vec3 | null = null;
      for (let off = 0; off < N && !d; off++) {
        for (const j of [k - off, k + off]) {
          if (d || j < 0 || j >= N || (off > 0 && lossySet.has(j)) || (off === 0 && lossySet.has(k))) continue;
          const v = u(j);
          const n = Math.hypot(...v);
          if (n > 1e-9) d = [v[0] / n, v[1] / n, v[2] / n];
        }
      }
      dirs.set(d ?? [0, 0, 1], 3 * k);
    }
    r = solver.solveFixed('min-propellant-band', tf, target, ignition, { throttleIntervals, thrustDirections: dirs });
    if (!isSolved(r.status)) return null;
  }
  return null;
}

/**
 * The cheapest band-respecting trajectory found near a relaxed optimum: Brent's method on t_f, each time
 * a local search over the switch indices (i1, i2) from the best structure so far (seeded by the relaxed
 * throttle profile). `window` bounds t_f (the relaxed problem's feasible window: the band restriction is
 * infeasible wherever the relaxation is).
 */
export function bandRespectingNear(
  solver: DescentSolver, relaxed: FixedTimeSolve, target: Vec3, ignition: IgnitionState, window: { lower: number; upper: number }, options: BandSearchOptions = {},
): BandSearchResult {
  const maxSolves = options.maxSolves ?? 80;
  const tfTol = options.tfTolerance ?? 0.05;
  const start = solver.solves;
  const spent = () => solver.solves - start;
  const ranges = allowedThrottleIntervals(solver.setup.vehicle);
  const seedThrottles = intervalThrottles(solver, relaxed);
  const nInt = seedThrottles.length;
  let structure = seedStructure(seedThrottles, ranges);
  let evaluations = 0;
  let best: { solve: FixedTimeSolve; structure: BandStructure | null } | null = null;
  let alternating: Float64Array | null = null;
  const atTime = new Map<number, { solve: FixedTimeSolve; structure: BandStructure } | null>();

  const evalStructure = (tf: number, s: BandStructure): FixedTimeSolve | null => {
    evaluations++;
    return bandSolveAt(solver, tf, target, ignition, structureRanges(s, ranges, seedThrottles));
  };
  const valid = (s: BandStructure) => s.i1 >= 0 && s.i1 <= s.i2 && s.i2 <= nInt;
  const record = (found: { solve: FixedTimeSolve; structure: BandStructure | null } | null) => {
    if (found && (!best || found.solve.propellant < best.solve.propellant)) best = found;
  };
  // Local search over (i1, i2) at one t_f, from the best structure so far (`local` false: that structure only,
  // one solve: the cheap cost Brent's method steps over t_f with).
  const costAt = (tf: number, local = true): number => {
    if (local && atTime.has(tf)) return atTime.get(tf)?.solve.propellant ?? Infinity;
    if (spent() >= maxSolves) return Infinity;
    if (!local && alternating) {
      evaluations++;
      const r = bandSolveAt(solver, tf, target, ignition, alternating);
      record(r ? { solve: r, structure: null } : null);
      return r?.propellant ?? Infinity;
    }
    let cur = structure;
    let curSolve = evalStructure(tf, cur);
    if (!local) {
      record(curSolve ? { solve: curSolve, structure: cur } : null);
      return curSolve?.propellant ?? Infinity;
    }
    // A seed that is infeasible here: try the structures one step away before giving up on this t_f.
    const moves: BandStructure[] = [];
    for (;;) {
      moves.length = 0;
      for (const [a, b] of [[-1, 0], [1, 0], [0, -1], [0, 1], [-1, 1], [1, -1]]) {
        const s = { i1: cur.i1 + a, i2: cur.i2 + b };
        if (valid(s)) moves.push(s);
      }
      let improved = false;
      for (const s of moves) {
        if (spent() >= maxSolves) break;
        const r = evalStructure(tf, s);
        if (r && (!curSolve || r.propellant < curSolve.propellant - 1e-9)) {
          cur = s;
          curSolve = r;
          improved = true;
          break;
        }
      }
      if (!improved || spent() >= maxSolves) break;
    }
    const found = curSolve ? { solve: curSolve, structure: cur } : null;
    atTime.set(tf, found);
    if (found) structure = cur;
    record(found);
    return found?.solve.propellant ?? Infinity;
  };

  let t0 = relaxed.timeOfFlight;
  let f0 = costAt(t0);
  // No band-respecting trajectory at the relaxed optimum's t_f (typically at the edge of the feasible times,
  // where rounding the switch interval to one range needs up to one more step): step outward, longer first.
  for (let j = 0; j < 5 && !Number.isFinite(f0) && !options.fixedTime && spent() < maxSolves; j++) {
    for (const t of [relaxed.timeOfFlight * (1 + 0.01 * 2 ** j), relaxed.timeOfFlight * (1 - 0.01 * 2 ** j)]) {
      if (t <= window.lower || t >= window.upper || Number.isFinite(f0)) continue;
      const f = costAt(t);
      if (Number.isFinite(f)) { t0 = t; f0 = f; }
    }
  }
  // The alternating assignment, once at the relaxed optimum's t_f: kept when it beats max–min–max there.
  const alt = alternatingRanges(seedThrottles, ranges);
  if (alt && spent() < maxSolves) {
    evaluations++;
    const r = bandSolveAt(solver, relaxed.timeOfFlight, target, ignition, alt);
    if (r && (!Number.isFinite(f0) || r.propellant < f0 - 1e-9)) {
      // Rounding only the switch intervals gives a max–min–max assignment again: keep it as one.
      const asStructure = ranges.length === 2 ? structureOf(alt, ranges) : null;
      if (asStructure) structure = asStructure;
      else alternating = alt;
      t0 = relaxed.timeOfFlight;
      f0 = r.propellant;
      record({ solve: r, structure: asStructure });
    }
  }
  if (Number.isFinite(f0) && !options.fixedTime) {
    // Brent's method on t_f with the structure found at t0 (one solve per time), then the local structure
    // search again at the best time found.
    const fixed = (tf: number) => (tf === t0 ? f0 : costAt(tf, false));
    const step = Math.max(4 * tfTol, 0.03 * t0);
    const bb = bracketFrom(fixed, t0, f0, step, window.lower, window.upper, -Infinity);
    const res = brentMinimise(fixed, bb.a, bb.b, bb.x, bb.fx, tfTol, Math.max(0, Math.min(16, maxSolves - spent())), -Infinity);
    if (res.x !== t0 && Number.isFinite(res.fx) && !alternating) costAt(res.x, true);
  }
  const b = best as { solve: FixedTimeSolve; structure: BandStructure | null } | null;
  return { best: b?.solve ?? null, structure: b?.structure ?? null, alternating: b !== null && b.structure === null, solves: spent(), evaluations };
}
