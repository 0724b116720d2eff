/**
 * Regression: one footprint row of our low-propellant scenario crossing the edge of the reachable set.
 * Warm-started solves next to the edge (nearly infeasible problems) used to end without an answer and
 * were reported as solver failures; the descent solver now retries them cold. Every target must come out
 * reachable or certified unreachable, and the edge target matches a cold single-target search.
 */
import { describe, expect, it } from 'vitest';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { descentEvaluator } from '../../../core/footprint/descentEvaluator.ts';
import { solveRow } from '../../../core/footprint/engine.ts';
import { BETWEEN_NODES, TARGET } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { lowPropellantDemo } from '../../support/scenarios.ts';

describe('a footprint row across the reachable edge', () => {
  it('has no solver failures, and its edge target agrees with a cold search', () => {
    const { ctx } = lowPropellantDemo();
    const grid = makeTargetGrid({ halfWidthEast_m: 3500, halfWidthNorth_m: 3500, nx: 41, ny: 41 });
    const row = solveRow({ context: null, row: 0, north_m: -350, east_m: grid.east, tfHint: null }, descentEvaluator(ctx));
    expect(Array.from(row.status).filter((s) => s === TARGET.failed)).toEqual([]);
    const i = Array.from(grid.east).findIndex((e) => Math.abs(e + 2975) < 1e-6);
    const cold = searchFreeFinalTime(new DescentSolver(ctx.setup, landreachConicBackend(), ctx.ignition), [-2975, -350, 0], ctx.ignition, { decode: false });
    expect(row.status[i]).toBe(cold.status === 'solved' ? TARGET.reachable : TARGET.unreachable);
    if (cold.status === 'unreachable') expect(Math.abs(row.miss_m[i] - cold.miss)).toBeLessThan(1);
    // Every reachable target's trajectory was re-simulated between its nodes; unreachable ones were not.
    for (let k = 0; k < row.status.length; k++) {
      if (row.status[k] === TARGET.reachable) expect(row.betweenNodes[k]).not.toBe(BETWEEN_NODES.unchecked);
      if (row.status[k] === TARGET.unreachable) expect(row.betweenNodes[k]).toBe(BETWEEN_NODES.unchecked);
    }
  }, 120_000);
});
