import { describe, expect, it } from 'vitest';
import { containsPoint, guaranteedDivertRadius, multiPolygonArea, propellantRegions, regionBounds, ringArea } from '../../../core/footprint/contours.ts';
import { emptyField, TARGET } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';

/** A field whose "propellant" is a known function of position. */
function analyticField(n: number, half: number, f: (x: number, y: number) => number, reachable = (_x: number, _y: number) => true) {
  const grid = makeTargetGrid({ halfWidthEast_m: half, halfWidthNorth_m: half, nx: n, ny: n });
  const field = emptyField(grid);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const k = j * n + i;
      const x = grid.east[i];
      const y = grid.north[j];
      if (reachable(x, y)) {
        field.status[k] = TARGET.reachable;
        field.propellant_kg[k] = f(x, y);
      } else {
        field.status[k] = TARGET.unreachable;
      }
    }
  }
  return field;
}

describe('propellant contours (d3-contour marching squares)', () => {
  it('a radially symmetric cost gives circles: area → πr² as the grid refines', () => {
    // cost = distance from the origin (kg per m, say): {cost ≤ R} is the disc of radius R, area πR².
    const R = 600;
    const errors = [41, 81, 161].map((n) => {
      const field = analyticField(n, 1000, (x, y) => Math.hypot(x, y));
      const [region] = propellantRegions(field, [R]);
      return Math.abs(region.area_m2 - Math.PI * R * R) / (Math.PI * R * R);
    });
    // Linear interpolation along cell edges: the relative area error is well under 1 % and shrinks with h.
    expect(errors[0]).toBeLessThan(0.01);
    expect(errors[2]).toBeLessThan(errors[0]);
    expect(errors[2]).toBeLessThan(1e-3);
  });

  it('places the contour in local metres: the disc is centred where the cost is lowest', () => {
    const field = analyticField(81, 1000, (x, y) => Math.hypot(x - 200, y + 300));
    const [region] = propellantRegions(field, [250]);
    expect(containsPoint(region.geometry, 200, -300)).toBe(true);
    expect(containsPoint(region.geometry, 200, -300 + 260)).toBe(false);
    expect(containsPoint(region.geometry, 200 + 240, -300)).toBe(true);
  });

  it('excludes unreachable targets whatever their stored value', () => {
    const field = analyticField(61, 1000, () => 1, (x) => x < 0);
    const [region] = propellantRegions(field, [10]);
    expect(containsPoint(region.geometry, -500, 0)).toBe(true);
    expect(containsPoint(region.geometry, 500, 0)).toBe(false);
    // The region stops at the last reachable column (x = −dx, dx = 2000/60) and at the grid's outer targets.
    const dx = 2000 / 60;
    expect(region.area_m2 / ((1000 - dx) * 2000)).toBeCloseTo(1, 2);
  });

  it('rejects a non-finite level', () => {
    const field = analyticField(5, 10, () => 1);
    expect(() => propellantRegions(field, [NaN])).toThrow(/contour level NaN/);
  });
});

describe('geometry helpers', () => {
  it('shoelace area of a unit square and of a polygon with a hole', () => {
    expect(Math.abs(ringArea([[0, 0], [1, 0], [1, 1], [0, 1]]))).toBe(1);
    const g = { type: 'MultiPolygon' as const, coordinates: [[[[0, 0], [4, 0], [4, 4], [0, 4]], [[1, 1], [2, 1], [2, 2], [1, 2]]]] };
    expect(multiPolygonArea(g)).toBe(15);
    expect(containsPoint(g, 1.5, 1.5)).toBe(false);
    expect(containsPoint(g, 3, 3)).toBe(true);
  });

  it('guaranteed divert radius of an offset disc is R − offset, and flags a region cut by the grid edge', () => {
    const field = analyticField(161, 1000, (x, y) => Math.hypot(x - 100, y));
    const [region] = propellantRegions(field, [500]);
    const r = guaranteedDivertRadius(region.geometry, 0, 0, regionBounds(field));
    expect(r.radius_m).toBeGreaterThan(400 - 2);
    expect(r.radius_m).toBeLessThan(400 + 2);
    expect(r.limitedByGrid).toBe(false);
    const wide = propellantRegions(field, [5000])[0];
    const clipped = guaranteedDivertRadius(wide.geometry, 0, 0, regionBounds(field));
    expect(clipped.limitedByGrid).toBe(true);
    expect(guaranteedDivertRadius(region.geometry, 900, 900, regionBounds(field)).radius_m).toBe(0);
  });
});
