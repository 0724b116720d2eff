/**
 * Flyable thrust from a relaxed solution that is not lossless.
 *
 * Lossless convexification (Açıkmeşe & Ploen 2007) proves ‖u_k‖ = σ_k at the optimum of the relaxed problem
 * under conditions that a discretised problem does not always meet: near the edge of the feasible times of
 * flight, with a throttle range too narrow to steer, or where the discrete switching instants want a thrust
 * below the lower bound. There the relaxation "burns" σ_k while thrusting less, a thrust the engine cannot
 * produce. The relaxed optimum is still a certified LOWER bound on the true minimum.
 *
 * An UPPER bound comes from a convex restriction: at each node where the relaxation is lossy, fix the thrust
 * direction d_k to the relaxed solution's and require d_kᵀu_k ≥ σ_k (with ‖u_k‖ ≤ σ_k this gives ‖u_k‖ = σ_k:
 * a flyable thrust). Any solution of the restricted problem is feasible for the original non-convex
 * problem. The restricted solve may make other nodes lossy; they are added and the solve repeated (a few
 * rounds of this successive restriction, in the spirit of successive convexification: Mao, Szmuk &
 * Açıkmeşe 2016 convexify about the previous solution and repeat).
 */
import { isSolved } from '../conic/types.ts';
import type { Vec3 } from './constants.ts';
import { NODE } from './program.ts';
import type { IgnitionState } from './setup.ts';
import type { DescentSolver, FixedTimeSolve } from './solver.ts';
import { deriveVehicle } from './vehicle.ts';
import { LOSSLESS_TOLERANCE } from './trajectory.ts';

/** Rounds of successive restriction before giving up on a time of flight. */
const MAX_ROUNDS = 4;

/** max_k (σ_k − ‖u_k‖) relative to the full-throttle acceleration at ignition, from a solution's x. */
export function relativeLosslessnessGap(solver: DescentSolver, r: FixedTimeSolve, ignition: IgnitionState): number {
  return lossyNodes(solver, r, ignition, 0).gap;
}

export function lossyNodes(solver: DescentSolver, r: FixedTimeSolve, ignition: IgnitionState, threshold: number): { gap: number; nodes: number[] } {
  const program = solver.program(r.kind);
  const accel = deriveVehicle(solver.setup.vehicle).rho2 / ignition.mass;
  const x = r.solution.x;
  let gap = 0;
  const nodes: number[] = [];
  for (let k = 0; k < solver.setup.nodes; k++) {
    const o = k * NODE.size;
    const un = Math.hypot(program.value(x, o + NODE.u), program.value(x, o + NODE.u + 1), program.value(x, o + NODE.u + 2));
    const rel = (program.value(x, o + NODE.sigma) - un) / accel;
    gap = Math.max(gap, rel);
    if (rel > threshold) nodes.push(k);
  }
  return { gap, nodes };
}

/**
 * How the fixed direction d_k of a lossy node is chosen. The relaxed direction first (the usual case: a
 * short stretch where the relaxation throttles below the bound); where the relaxation wastes thrust by
 * steering it sideways, or where it reverses the thrust between two nodes, that direction is wrong, so the
 * direction of the nearest lossless node's thrust is tried next (earlier node first, then later node
 * first: either side of a reversal), then the local mean of the relaxed thrust vectors (which cancels
 * sideways waste).
 */
type DirectionRule = 'relaxed' | 'nearest-lossless' | 'next-lossless' | 'local-mean';
const RULES: readonly DirectionRule[] = ['relaxed', 'nearest-lossless', 'next-lossless', 'local-mean'];

/**
 * A flyable minimum-propellant solve at this time of flight, starting from a relaxed solve there: the relaxed
 * solve itself when it is lossless, else the restricted problem's solution (the first direction rule that
 * gives one); null when no rule does within a few rounds.
 */
export function flyableAt(solver: DescentSolver, relaxed: FixedTimeSolve, target: Vec3, ignition: IgnitionState): FixedTimeSolve | null {
  if (!isSolved(relaxed.status)) return null;
  if (lossyNodes(solver, relaxed, ignition, LOSSLESS_TOLERANCE).nodes.length === 0) return relaxed;
  // Fixing only the lossy nodes is the least restrictive; where the lossy node just moves along (a thrust
  // reversal walks one node per round), fix every node's direction instead: always flyable when feasible.
  const few = restrict(solver, relaxed, target, ignition, 'relaxed', false);
  if (few) return few;
  for (const rule of RULES) {
    const all = restrict(solver, relaxed, target, ignition, rule, true);
    if (all) return all;
  }
  return null;
}

function restrict(solver: DescentSolver, relaxed: FixedTimeSolve, target: Vec3, ignition: IgnitionState, rule: DirectionRule, everyNode: boolean): FixedTimeSolve | null {
  const N = solver.setup.nodes;
  const dirs = new Float64Array(3 * N);
  const relaxedProgram = solver.program(relaxed.kind);
  const uRelaxed = (k: number): Vec3 => [0, 1, 2].map((i) => relaxedProgram.value(relaxed.solution.x, k * NODE.size + NODE.u + i)) as unknown as Vec3;
  const lossless = new Set<number>();
  {
    const lossy = new Set(lossyNodes(solver, relaxed, ignition, LOSSLESS_TOLERANCE).nodes);
    for (let k = 0; k < N; k++) if (!lossy.has(k) && Math.hypot(...uRelaxed(k)) > 1e-9) lossless.add(k);
  }
  const unit = (v: Vec3): Vec3 | null => {
    const n = Math.hypot(...v);
    return n > 1e-9 ? [v[0] / n, v[1] / n, v[2] / n] : null;
  };
  if (everyNode) for (const k of lossless) dirs.set(unit(uRelaxed(k))!, 3 * k);
  let current = relaxed;
  for (let round = 0; round <= MAX_ROUNDS; round++) {
    const { nodes } = lossyNodes(solver, current, ignition, LOSSLESS_TOLERANCE);
    if (nodes.length === 0) return current;
    if (round === MAX_ROUNDS) return null;
    const program = solver.program(current.kind);
    const x = current.solution.x;
    const u = (k: number): Vec3 => [0, 1, 2].map((i) => program.value(x, k * NODE.size + NODE.u + i)) as unknown as Vec3;
    for (const k of nodes) {
      let d: Vec3 | null = null;
      if (rule === 'relaxed') {
        for (let off = 0; off < N && !d; off++) {
          for (const j of [k - off, k + off]) if (!d && j >= 0 && j < N) d = unit(u(j));
        }
      } else if (rule === 'nearest-lossless' || rule === 'next-lossless') {
        for (let off = 1; off < N && !d; off++) {
          for (const j of rule === 'nearest-lossless' ? [k - off, k + off] : [k + off, k - off]) if (!d && lossless.has(j)) d = unit(uRelaxed(j));
        }
      } else {
        const sum: [number, number, number] = [0, 0, 0];
        for (let j = Math.max(0, k - 2); j <= Math.min(N - 1, k + 2); j++) {
          const v = uRelaxed(j);
          for (let i = 0; i < 3; i++) sum[i] += v[i];
        }
        d = unit(sum);
      }
      dirs.set(d ?? [0, 0, 1], 3 * k);
    }
    current = solver.solveFixed('min-propellant-flyable', relaxed.timeOfFlight, target, ignition, { thrustDirections: dirs });
    if (!isSolved(current.status)) return null;
  }
  return null;
}
