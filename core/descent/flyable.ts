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
 * rounds of this successive restriction; Mao, Szmuk & Açıkmeşe 2016 use the same idea of convex
 * restrictions about a reference in successive convexification).
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

function lossyNodes(solver: DescentSolver, r: FixedTimeSolve, ignition: IgnitionState, threshold: number): { gap: number; nodes: number[] } {
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
 * A flyable minimum-propellant solve at this time of flight, starting from a relaxed solve there: the relaxed
 * solve itself when it is lossless, else the restricted problem's solution; null when the restriction is
 * infeasible or does not settle within a few rounds.
 */
export function flyableAt(solver: DescentSolver, relaxed: FixedTimeSolve, target: Vec3, ignition: IgnitionState): FixedTimeSolve | null {
  if (!isSolved(relaxed.status)) return null;
  const N = solver.setup.nodes;
  const dirs = new Float64Array(3 * N);
  let current = relaxed;
  for (let round = 0; round <= MAX_ROUNDS; round++) {
    const { nodes } = lossyNodes(solver, current, ignition, LOSSLESS_TOLERANCE);
    if (nodes.length === 0) return current;
    if (round === MAX_ROUNDS) return null;
    const program = solver.program(current.kind);
    const x = current.solution.x;
    const u = (k: number): Vec3 => [0, 1, 2].map((i) => program.value(x, k * NODE.size + NODE.u + i)) as unknown as Vec3;
    for (const k of nodes) {
      // The relaxed direction; where the relaxed thrust vanishes, the nearest node's that has one, else up.
      let d: Vec3 = [0, 0, 1];
      for (let off = 0; off < N; off++) {
        const cand = [k - off, k + off].find((j) => j >= 0 && j < N && Math.hypot(...u(j)) > 1e-9);
        if (cand !== undefined) {
          const v = u(cand);
          const n = Math.hypot(...v);
          d = [v[0] / n, v[1] / n, v[2] / n];
          break;
        }
      }
      dirs.set(d, 3 * k);
    }
    current = solver.solveFixed('min-propellant-flyable', relaxed.timeOfFlight, target, ignition, { thrustDirections: dirs });
    if (!isSolved(current.status)) return null;
  }
  return null;
}
