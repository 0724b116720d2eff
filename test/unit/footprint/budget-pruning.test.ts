/**
 * Reachable-set runs stop a target's search once the propellant is certainly above the budget. The
 * certificate is the cutting-plane lower bound of a convex J(t_f) (Kelley 1960, J. SIAM 8(4)): the
 * tangents at two points either side of the optimum meet below it. Checked here against the exact minimum
 * of the same targets from an unpruned run (whose propellant is checked against CVXOPT elsewhere).
 */
import { describe, expect, it } from 'vitest';
import { descentEvaluator } from '../../../core/footprint/descentEvaluator.ts';
import { solveRow } from '../../../core/footprint/engine.ts';
import { TARGET } from '../../../core/footprint/field.ts';
import { lowPropellantDemo } from '../../support/scenarios.ts';

describe('propellant-budget pruning', () => {
  it('stops only targets whose exact minimum is above the budget, with a bound between the two', () => {
    const { ctx } = lowPropellantDemo(20);
    // 500 m apart: neighbours' optima move enough that the searches need their cutting-plane steps.
    const east = Float64Array.from({ length: 9 }, (_, i) => -2000 + 500 * i);
    const job = { context: null, row: 0, north_m: 600, east_m: east, tfHint: null };
    const exact = solveRow(job, descentEvaluator(ctx));
    const costs = Array.from(exact.propellant_kg).filter((_, i) => exact.status[i] === TARGET.reachable).sort((a, b) => a - b);
    expect(costs.length).toBe(9);
    const budget = costs[Math.floor(costs.length / 2)] + 0.5;
    const pruned = solveRow(job, descentEvaluator({ ...ctx, propellantBudget_kg: budget }));
    let stopped = 0;
    for (let i = 0; i < east.length; i++) {
      if (exact.status[i] !== TARGET.reachable) {
        expect(pruned.status[i]).toBe(exact.status[i]);
        continue;
      }
      const p = exact.propellant_kg[i];
      if (pruned.status[i] === TARGET.overBudget) {
        stopped++;
        expect(p).toBeGreaterThan(budget);
        // The best trajectory found when the search stopped: an upper bound on the minimum (the exact
        // run's value is itself within the search's 0.05 kg tolerance of it).
        expect(pruned.propellant_kg[i]).toBeGreaterThanOrEqual(p - 0.06);
      } else {
        expect(pruned.status[i]).toBe(TARGET.reachable);
        expect(Math.abs(pruned.propellant_kg[i] - p)).toBeLessThan(0.06);
      }
    }
    expect(stopped).toBeGreaterThan(0);
  }, 120_000);
});
