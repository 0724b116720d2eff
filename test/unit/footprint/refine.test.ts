/**
 * Coarse-to-fine refinement of the budget boundary, checked against the full fine grid it stands in for
 * (the same evaluator on every fine target) and, for a disc, against the disc's area πR² (closed form).
 */
import { describe, expect, it } from 'vitest';
import { descentEvaluator } from '../../../core/footprint/descentEvaluator.ts';
import { computeFootprint } from '../../../core/footprint/engine.ts';
import { propellantRegions } from '../../../core/footprint/contours.ts';
import { TARGET } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { refineBudgetBoundary } from '../../../core/footprint/refine.ts';
import { discEvaluator } from '../../support/analytic-evaluator.ts';
import { inProcessPool, lowPropellantDemo } from '../../support/scenarios.ts';

describe('budget-boundary refinement', () => {
  it('matches the full fine grid on a disc, with a fraction of its targets, and comes closer to πR²', async () => {
    const R = 700;
    const pool = inProcessPool(discEvaluator(R));
    const coarseGrid = makeTargetGrid({ halfWidthEast_m: 1000, halfWidthNorth_m: 1000, nx: 9, ny: 9 });
    const coarse = (await computeFootprint(coarseGrid, pool)).field;
    const level = 360; // 300 + d/10 ≤ 360 ⇔ d ≤ 600: the budget, not reachability, bounds the region
    const refined = await refineBudgetBoundary(coarse, pool, { level_kg: level, factor: 4 });
    const fullGrid = makeTargetGrid({ halfWidthEast_m: 1000, halfWidthNorth_m: 1000, nx: 33, ny: 33 });
    const full = (await computeFootprint(fullGrid, pool)).field;
    const [fullRegion] = propellantRegions(full, [level]);
    const [coarseRegion] = propellantRegions(coarse, [level]);
    const exact = Math.PI * 600 ** 2;
    expect(Math.abs(refined.region.area_m2 - fullRegion.area_m2)).toBeLessThan(1e-3 * exact);
    expect(Math.abs(refined.region.area_m2 - exact)).toBeLessThan(Math.abs(coarseRegion.area_m2 - exact));
    expect(refined.extraTargets).toBeLessThan(0.5 * (33 * 33 - 81));
    // Filled targets lie within the budget and were not solved.
    for (let K = 0; K < refined.filled.length; K++) {
      if (refined.filled[K]) {
        expect(refined.field.status[K]).toBe(TARGET.reachable);
        expect(refined.field.propellant_kg[K]).toBeLessThanOrEqual(level);
        expect(refined.field.solves[K]).toBe(0);
      }
    }
  });

  it('refines a descent footprint edge (reachability-bounded) like the full fine grid', async () => {
    const { ctx } = lowPropellantDemo(20);
    const pool = inProcessPool(descentEvaluator(ctx));
    const spec = { halfWidthEast_m: 3000, halfWidthNorth_m: 3000 };
    const coarse = (await computeFootprint(makeTargetGrid({ ...spec, nx: 7, ny: 7 }), pool, { context: ctx })).field;
    const level = 240;
    const refined = await refineBudgetBoundary(coarse, pool, { level_kg: level, factor: 2, context: ctx });
    const full = (await computeFootprint(makeTargetGrid({ ...spec, nx: 13, ny: 13 }), pool, { context: ctx })).field;
    const [fullRegion] = propellantRegions(full, [level]);
    expect(fullRegion.area_m2).toBeGreaterThan(0);
    expect(Math.abs(refined.region.area_m2 / fullRegion.area_m2 - 1)).toBeLessThan(0.01);
    expect(refined.extraTargets).toBeLessThan(13 * 13 - 49);
    // Every target the refinement solved agrees with the full fine grid's (same position, same searches).
    for (let K = 0; K < refined.field.status.length; K++) {
      if (refined.field.solves[K] > 0 && refined.field.status[K] === TARGET.reachable) {
        expect(full.status[K]).toBe(TARGET.reachable);
        expect(Math.abs(refined.field.propellant_kg[K] - full.propellant_kg[K])).toBeLessThan(0.1);
      }
    }
  }, 240_000);

  it('rejects a bad factor with a message naming it', async () => {
    const pool = inProcessPool(discEvaluator(100));
    const coarse = (await computeFootprint(makeTargetGrid({ halfWidthEast_m: 100, halfWidthNorth_m: 100, nx: 3, ny: 3 }), pool)).field;
    await expect(refineBudgetBoundary(coarse, pool, { level_kg: 350, factor: 1 })).rejects.toThrow(/refinement factor: 1 \(must be a whole number from 2 to 8\)/);
  });
});
