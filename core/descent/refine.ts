/**
 * Discretisation-error estimate: the same target solved again with half the time step
 * (2N − 1 nodes, so every coarse node is also a fine node; at most MAX_NODES), warm-started from the coarse t_f.
 */
import type { ConicBackend } from './backend.ts';
import type { Vec3 } from './constants.ts';
import { searchFreeFinalTime } from './search.ts';
import type { DescentResult } from './search.ts';
import type { DescentSetup, IgnitionState } from './setup.ts';
import { DescentSolver } from './solver.ts';
import { MAX_NODES } from './setup.ts';

export interface DiscretisationCheck {
  /** Nodes of the finer solve. */
  nodes: number;
  /** Propellant with the finer grid, kg. */
  propellant: number;
  /** Coarse minus fine propellant, kg (the coarse grid's excess cost, usually positive). */
  difference: number;
  solves: number;
}

export function discretisationCheck(
  setup: DescentSetup, backend: ConicBackend, ignition: IgnitionState, target: Vec3, coarse: DescentResult,
): DiscretisationCheck | null {
  if (coarse.status !== 'solved') return null;
  // Past MAX_NODES / 2 the check runs at the node limit instead (a smaller refinement, still a check); at the
  // limit itself there is nothing finer to compare with. Never throws: the main result stands either way.
  const nodes = Math.min(2 * setup.nodes - 1, MAX_NODES);
  if (nodes <= setup.nodes) return null;
  const fine = new DescentSolver({ ...setup, nodes }, backend, ignition);
  const r = searchFreeFinalTime(fine, target, ignition, { tfGuess: coarse.timeOfFlight, decode: false });
  if (r.status !== 'solved') return null;
  return { nodes: fine.setup.nodes, propellant: r.propellant, difference: coarse.propellant - r.propellant, solves: r.solves };
}
