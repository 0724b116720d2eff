/**
 * Reach along a direction: the farthest landing point along a horizontal unit direction d that a
 * propellant budget allows, with free final time. For each time of flight the max-divert cone program
 * (program.ts) maximises dᵀ r_land; over t_f the reach is maximised by probing the bracket, then Brent's
 * method around the best probe (infeasible times count as no reach).
 */
import { isSolved } from '../conic/types.ts';
import { brentMinimise } from './brent.ts';
import { timeOfFlightBracket } from './bracket.ts';
import type { Vec3 } from './constants.ts';
import { NODE } from './program.ts';
import type { IgnitionState } from './setup.ts';
import type { DescentSolver } from './solver.ts';
import { relativeLosslessnessGap } from './flyable.ts';
import { LOSSLESS_TOLERANCE } from './trajectory.ts';

export interface ReachResult {
  /** Largest dᵀ(landing point) over time of flight, m (−Infinity when no time of flight is feasible). */
  reach_m: number;
  /** The landing point that attains it (east, north), m. */
  landing_m: [number, number];
  timeOfFlight_s: number;
  solves: number;
  /**
   * Relative losslessness gap max(σ − ‖u‖)/(full-throttle acceleration) of the reach trajectory (NaN when
   * none): above LOSSLESS_TOLERANCE the reach is that of the relaxation, an optimistic bound, and `lossless`
   * is false so callers can say so.
   */
  losslessnessGap: number;
  lossless: boolean;
}

const PROBES = [0.6, 0.75, 0.9, 1.0, 1.15, 1.3, 1.5, 1.8, 2.2];

export function reachAlongDirection(
  solver: DescentSolver,
  ignition: IgnitionState,
  direction: readonly [number, number],
  propellantBudget_kg: number,
  options: { targetHeight_m?: number; tfTolerance_s?: number } = {},
): ReachResult {
  const norm = Math.hypot(direction[0], direction[1]);
  if (!(norm > 0)) throw new RangeError('direction: must be a non-zero east–north vector');
  const dir: [number, number] = [direction[0] / norm, direction[1] / norm];
  const h = options.targetHeight_m ?? 0;
  const target: Vec3 = [0, 0, h];
  const br = timeOfFlightBracket(solver.setup, ignition, target);
  const start = solver.solves;
  const N = solver.setup.nodes;
  const cache = new Map<number, { reach: number; landing: [number, number]; gap: number }>();
  const evalAt = (tf: number) => {
    const hit = cache.get(tf);
    if (hit) return hit;
    const r = solver.solveFixed('max-divert', tf, target, ignition, { direction: dir, propellantBudget: propellantBudget_kg });
    let out = { reach: -Infinity, landing: [NaN, NaN] as [number, number], gap: NaN };
    if (isSolved(r.status)) {
      const program = solver.program('max-divert');
      const o = (N - 1) * NODE.size + NODE.r;
      const landing: [number, number] = [program.value(r.solution.x, o), program.value(r.solution.x, o + 1)];
      out = { reach: dir[0] * landing[0] + dir[1] * landing[1], landing, gap: relativeLosslessnessGap(solver, r, ignition) };
    }
    cache.set(tf, out);
    return out;
  };
  // The nominal target's physical bracket scaled: far divert points may need shorter or longer burns.
  const lo = Math.max(1e-3, 0.5 * br.lower);
  const hi = br.upper;
  let bestT = NaN;
  let best = -Infinity;
  for (const f of PROBES) {
    const t = Math.min(hi, f * br.lower * 1.6);
    const r = evalAt(t);
    if (r.reach > best) {
      best = r.reach;
      bestT = t;
    }
  }
  if (!Number.isFinite(best)) return { reach_m: -Infinity, landing_m: [NaN, NaN], timeOfFlight_s: NaN, solves: solver.solves - start, losslessnessGap: NaN, lossless: false };
  const tol = options.tfTolerance_s ?? 0.05;
  const sorted = [...cache.keys()].sort((a, b) => a - b);
  const k = sorted.indexOf(bestT);
  const a = k > 0 ? sorted[k - 1] : lo;
  const b = k < sorted.length - 1 ? sorted[k + 1] : hi;
  const res = brentMinimise((t) => -evalAt(t).reach, a, b, bestT, -best, tol, 30);
  const final = evalAt(res.x).reach >= best ? evalAt(res.x) : evalAt(bestT);
  const tBest = evalAt(res.x).reach >= best ? res.x : bestT;
  return {
    reach_m: final.reach, landing_m: final.landing, timeOfFlight_s: tBest, solves: solver.solves - start,
    losslessnessGap: final.gap, lossless: final.gap <= LOSSLESS_TOLERANCE,
  };
}

/** The reach boundary: the farthest landing points along K evenly spaced directions (east first, counter-clockwise). */
export function reachBoundary(
  solver: DescentSolver,
  ignition: IgnitionState,
  directions: number,
  propellantBudget_kg: number,
  options: { targetHeight_m?: number } = {},
): { angle_rad: number; result: ReachResult }[] {
  if (!Number.isInteger(directions) || directions < 3 || directions > 720) {
    throw new RangeError(`directions: ${directions} (must be a whole number from 3 to 720)`);
  }
  return Array.from({ length: directions }, (_, i) => {
    const angle = (2 * Math.PI * i) / directions;
    return { angle_rad: angle, result: reachAlongDirection(solver, ignition, [Math.cos(angle), Math.sin(angle)], propellantBudget_kg, options) };
  });
}
