import { describe, expect, it } from 'vitest';
import { emptyField, TARGET } from '../../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../../core/footprint/grid.ts';
import { footprintFigures } from '../../../../core/footprint/studyFootprint.ts';
import { footprintOutlines, propellantGrid, propellantRange } from '../../../../renderer/compute/footprint-view.ts';
import { resampleToTerrain } from '../../../../renderer/scene/resample.ts';
import { checkRunSettings } from '../../../../renderer/compute/run-settings.ts';

/** A 5 × 5 field on ±200 m whose propellant is a plane p = 100 + 0.1·east + 0.2·north (kg), all reachable. */
function planeField() {
  const grid = makeTargetGrid({ halfWidthEast_m: 200, halfWidthNorth_m: 200, nx: 5, ny: 5 });
  const field = emptyField(grid);
  for (let j = 0; j < 5; j++) {
    for (let i = 0; i < 5; i++) {
      const k = j * 5 + i;
      field.status[k] = TARGET.reachable;
      field.propellant_kg[k] = 100 + 0.1 * grid.east[i] + 0.2 * grid.north[j];
    }
  }
  return field;
}

describe('footprint drape', () => {
  it('puts the northern row first (terrain layout) and keeps east increasing along a row', () => {
    const g = propellantGrid(planeField());
    expect(g).toMatchObject({ width: 5, height: 5, pixelSize_m: 100, west_m: -200, north_m: 200 });
    // North-west corner: 100 − 20 + 40 = 120 kg; south-east: 100 + 20 − 40 = 80 kg.
    expect(g.values[0]).toBeCloseTo(120, 4);
    expect(g.values[24]).toBeCloseTo(80, 4);
  });

  it('resamples onto terrain samples exactly for a plane (bilinear interpolation is exact for planes)', () => {
    const terrain = { width: 9, height: 9, pixelSize_m: 50, west_m: -200, north_m: 200, heights: new Float32Array(81) };
    const values = resampleToTerrain(propellantGrid(planeField()), terrain);
    for (let r = 0; r < 9; r++) {
      for (let c = 0; c < 9; c++) {
        const east = -200 + 50 * c;
        const north = 200 - 50 * r;
        expect(values[r * 9 + c]).toBeCloseTo(100 + 0.1 * east + 0.2 * north, 3);
      }
    }
  });

  it('leaves unreachable and pending targets out of the drape and of its range', () => {
    const field = planeField();
    field.status[0] = TARGET.unreachable; // south-west corner, the cheapest: 100 − 20 − 40 = 40 kg
    field.status[24] = TARGET.pending; // north-east corner, the dearest: 160 kg
    expect(propellantGrid(field).values[20]).toBeNaN();
    const [lo, hi] = propellantRange(field)!;
    expect(lo).toBeCloseTo(50, 4); // next cheapest: (east −100, north −200) → 100 − 10 − 40
    expect(hi).toBeCloseTo(150, 4);
    field.status.fill(TARGET.pending);
    expect(propellantRange(field)).toBeNull();
  });

  it('outlines the contours below the budget and the reserve boundary, the boundary emphasised', () => {
    const figures = footprintFigures(planeField(), { usable_kg: 140, reserve_kg: 20 }, { cancelled: false }, [90, 110, 120]);
    const outlines = footprintOutlines(figures);
    // The budget is 140 − 20 = 120 kg: the 120 kg band is the reserve boundary itself, drawn once, in bold.
    expect(outlines.map((o) => [o.level_kg, o.emphasis])).toEqual([[90, false], [110, false], [120, true]]);
    // Region {p ≤ 120} of the plane inside the grid: where 0.1 e + 0.2 n ≤ 20. Its area is a check of the
    // pieces being wired, not of marching squares (core's contour tests do that): strictly between 0 and 16 ha.
    expect(figures.summary.reachableArea_m2).toBeGreaterThan(0);
    expect(figures.summary.reachableArea_m2).toBeLessThan(400 * 400);
  });
});

describe('run settings', () => {
  it('accepts a square grid and builds it', () => {
    const r = checkRunSettings({ side: '7', halfWidth_m: '3500' });
    expect(r.ok && [r.grid.nx, r.grid.ny, r.grid.east[0], r.grid.north[6], r.grid.spacingEast_m]).toEqual([7, 7, -3500, 3500, 7000 / 6]);
  });

  it.each([
    [{ side: '1', halfWidth_m: '100' }, 'side', /whole number from 2 to 1001/],
    [{ side: '7.5', halfWidth_m: '100' }, 'side', /Targets per side “7\.5”/],
    [{ side: '7', halfWidth_m: '0' }, 'halfWidth_m', /half-width “0” m: enter a distance above 0/],
    [{ side: '7', halfWidth_m: '1 km' }, 'halfWidth_m', /“1 km”/],
  ])('%j is refused, naming the input and the fix', (text, field, message) => {
    const r = checkRunSettings(text);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.field).toBe(field);
    expect(!r.ok && r.message).toMatch(message);
  });
});
