import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { ReachabilityGrid } from '../../../core/terrain/index.ts';
import { TerrainInputError, checkTerrainClearance, gridFromFunction, hazardMap, rankSites, safeReachableSet } from '../../../core/terrain/index.ts';

// A 40 × 40 m flat plain at 1 m pixels with one 1 m boulder at cell (20, 10).
const grid = gridFromFunction({ width: 40, height: 40, pixelSizeX_m: 1, pixelSizeY_m: 1 }, (x, y) =>
  Math.hypot(x - 10.5, y + 20.5) < 0.1 ? 1 : 50,
);
const map = hazardMap(grid, { landerDiameter_m: 4, safetyMargin_m: 3 });

/** Synthetic footprint: reachable inside a disc of radius 15 m around (20, 20); propellant grows with distance from (30, 20). */
function reach(): ReachabilityGrid {
  const n = 40 * 40;
  const r: ReachabilityGrid = { width: 40, height: 40, reachable: new Uint8Array(n), propellant_kg: new Float32Array(n) };
  for (let row = 0; row < 40; row++) for (let c = 0; c < 40; c++) {
    const k = row * 40 + c;
    r.reachable[k] = Math.hypot(c - 20, row - 20) <= 15 ? 1 : 0;
    r.propellant_kg[k] = 100 + Math.hypot(c - 30, row - 20);
  }
  return r;
}

describe('safe reachable set and candidate sites', () => {
  it('safe reachable = reachable ∧ safe, with area = cells × cell area', () => {
    const R = reach();
    const set = safeReachableSet(map, R);
    let expected = 0;
    for (let k = 0; k < 1600; k++) if (R.reachable[k] && map.flags[k] === 0) expected++;
    expect(set.cells).toBe(expected);
    expect(set.area_m2).toBe(expected * 1);
    expect(set.cells).toBeLessThan(set.reachableCells);
    expect(set.mask[20 * 40 + 10]).toBe(0); // the boulder
  });

  it('ranks by propellant, keeps the margin and the separation', () => {
    const sites = rankSites(grid, map, reach(), { count: 5, margin_m: 3, minSeparation_m: 6 });
    expect(sites.length).toBe(5);
    // Lowest propellant is at (30, 20), which is safe, reachable (10 m from the disc centre) and far from the boulder.
    expect([sites[0].col, sites[0].row]).toEqual([30, 20]);
    for (let i = 1; i < sites.length; i++) expect(sites[i].propellant_kg).toBeGreaterThanOrEqual(sites[i - 1].propellant_kg);
    for (const s of sites) {
      expect(s.hazardDistance_m).toBeGreaterThanOrEqual(3);
      for (const t of sites) if (t !== s) expect(Math.hypot(s.east_m - t.east_m, s.north_m - t.north_m)).toBeGreaterThanOrEqual(6);
    }
    expect(sites[0].east_m).toBe(30.5);
    expect(sites[0].height_m).toBe(50);
  });

  it('equals a plain sort-and-thin on random propellant fields (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 20 }), { minLength: 1600, maxLength: 1600 }), fc.integer({ min: 1, max: 12 }), (p, count) => {
        const R = reach();
        R.propellant_kg = Float32Array.from(p); // many ties: exercises the tie-breaks
        const got = rankSites(grid, map, R, { count, margin_m: 3, minSeparation_m: 5 });
        const order = [...Array(1600).keys()]
          .filter((k) => R.reachable[k] && map.flags[k] === 0 && map.hazardDistance_m[k] >= 3)
          .sort((a, b) => R.propellant_kg[a] - R.propellant_kg[b] || map.hazardDistance_m[b] - map.hazardDistance_m[a] || a - b);
        const want: number[] = [];
        for (const k of order) {
          if (want.length >= count) break;
          const e = (k % 40) + 0.5, n = -(Math.floor(k / 40) + 0.5);
          if (want.every((j) => ((j % 40) + 0.5 - e) ** 2 + (-(Math.floor(j / 40) + 0.5) - n) ** 2 >= 25)) want.push(k);
        }
        expect(got.map((s) => s.row * 40 + s.col)).toEqual(want);
      }),
      { numRuns: 50, seed: 21 },
    );
  });

  it('refuses a reachability grid of another size, pointing to resampleReachability', () => {
    const bad: ReachabilityGrid = { width: 10, height: 10, reachable: new Uint8Array(100), propellant_kg: new Float32Array(100) };
    expect(() => safeReachableSet(map, bad)).toThrow(TerrainInputError);
    expect(() => safeReachableSet(map, bad)).toThrow(/resampleReachability/);
  });

  it('terrain clearance flags nodes below terrain + clearance and nodes off the grid', () => {
    // Flat terrain at 50 m; required clearance 10 m.
    const nodes = [
      { east_m: 5, north_m: -5, up_m: 100 }, // 50 m clear
      { east_m: 10, north_m: -10, up_m: 58 }, // 8 m: violation
      { east_m: 500, north_m: -10, up_m: 200 }, // off the grid: unknown
      { east_m: 20, north_m: -20, up_m: 50 }, // touchdown, skipped
    ];
    const rep = checkTerrainClearance(grid, nodes, 10);
    expect(rep.violations).toEqual([1]);
    expect(rep.unknown).toEqual([2]);
    expect(rep.minClearance_m).toBeCloseTo(8, 5);
    expect(rep.ok).toBe(false);
  });

  it('catches a thin ridge between two nodes that both clear it', () => {
    // Flat ground at 0 m with a 2 m-wide, 30 m-tall wall at east 50–52 m; nodes at east 10 and 90 m, 20 m up.
    const g = gridFromFunction({ width: 100, height: 10, pixelSizeX_m: 1, pixelSizeY_m: 1 }, (x) => (x > 50 && x < 52 ? 30 : 0));
    const rep = checkTerrainClearance(g, [
      { east_m: 10, north_m: -5, up_m: 20 },
      { east_m: 90, north_m: -5, up_m: 20 },
      { east_m: 95, north_m: -5, up_m: 0 },
    ], 5);
    expect(rep.violations).toEqual([]);
    expect(rep.segmentViolations).toEqual([0]);
    expect(rep.minClearance_m).toBeCloseTo(-10, 5); // 20 m − 30 m at the wall's cell centres
    expect(rep.ok).toBe(false);
  });
});
