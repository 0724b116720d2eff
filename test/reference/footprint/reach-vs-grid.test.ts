/**
 * Two methods of ours, checked against each other (a consistency check, not an outside reference): the
 * reach boundary by direction (max-divert cone programs, free final time) against the boundary of the
 * grid footprint {propellant ≤ budget} on the same scenario — along every direction within one grid
 * spacing, and the enclosed areas within the error of a 24-gon and a grid of that spacing.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { footprintInProcess, lowPropellantDemo } from '../../support/scenarios.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { reachBoundary } from '../../../core/descent/reach.ts';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { propellantRegions, rayBoundaryDistance, ringArea } from '../../../core/footprint/contours.ts';
import type { FootprintField } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';

const { ctx } = lowPropellantDemo();
const BUDGET = 240;
const SPACING = 250;
let field: FootprintField;

beforeAll(async () => {
  const grid = makeTargetGrid({ halfWidthEast_m: 3500, halfWidthNorth_m: 3500, nx: 29, ny: 29 });
  field = await footprintInProcess(grid, ctx);
}, 600_000);

describe('reach boundary by direction vs the grid footprint', () => {
  it('agrees along every direction within one grid spacing, and in area', () => {
    const [region] = propellantRegions(field, [BUDGET]);
    const solver = new DescentSolver(ctx.setup, landreachConicBackend(), ctx.ignition);
    const boundary = reachBoundary(solver, ctx.ignition, 24, BUDGET);
    const ring: [number, number][] = [];
    for (const { angle_rad, result } of boundary) {
      const fromGrid = rayBoundaryDistance(region.geometry, 0, 0, Math.cos(angle_rad), Math.sin(angle_rad));
      // The grid's boundary sits at the last reachable target (conservative), so it may fall short by up to
      // one spacing (√2 of it diagonally), never beyond the true reach by more than interpolation error.
      expect(result.reach_m - fromGrid, `direction ${(angle_rad * 180) / Math.PI}°`).toBeLessThan(Math.SQRT2 * SPACING);
      expect(fromGrid - result.reach_m, `direction ${(angle_rad * 180) / Math.PI}°`).toBeLessThan(0.25 * SPACING);
      ring.push([result.reach_m * Math.cos(angle_rad), result.reach_m * Math.sin(angle_rad)]);
    }
    const polygonArea = Math.abs(ringArea(ring));
    // A 24-gon through boundary points under-covers a smooth convex-ish region by ~1.2 % (1 − sin(2π/24)/(2π/24)),
    // the conservative grid boundary by about perimeter × spacing / 2.
    const perimeter = ring.reduce((p, [x, y], i) => p + Math.hypot(x - ring[(i + 1) % ring.length][0], y - ring[(i + 1) % ring.length][1]), 0);
    expect(Math.abs(polygonArea - region.area_m2)).toBeLessThan(0.02 * polygonArea + (perimeter * SPACING) / 2);
  }, 300_000);
});
