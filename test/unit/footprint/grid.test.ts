import { describe, expect, it } from 'vitest';
import { columnOrder, makeTargetGrid, parseGridSize, rowOrder } from '../../../core/footprint/grid.ts';
import { emptyField, emptyRow, rowBuffers, setOutcome, TARGET, writeRow, countByStatus, timeOfFlightNear } from '../../../core/footprint/field.ts';

describe('target grids', () => {
  it('spans the requested extent with the requested counts', () => {
    const g = makeTargetGrid({ halfWidthEast_m: 1000, halfWidthNorth_m: 500, nx: 41, ny: 21 });
    expect(g.east[0]).toBe(-1000);
    expect(g.east[40]).toBe(1000);
    expect(g.north[10]).toBeCloseTo(0, 12);
    expect(g.spacingEast_m).toBe(50);
    expect(g.spacingNorth_m).toBe(50);
  });

  it('rejects bad sizes naming the field', () => {
    expect(() => makeTargetGrid({ halfWidthEast_m: 0, halfWidthNorth_m: 1, nx: 3, ny: 3 })).toThrow(/grid.halfWidthEast_m: 0/);
    expect(() => makeTargetGrid({ halfWidthEast_m: 1, halfWidthNorth_m: 1, nx: 1, ny: 3 })).toThrow(/grid.nx: 1 \(must be a whole number from 2/);
    expect(() => parseGridSize('41by41')).toThrow(/--grid 41by41: expected NXxNY/);
    expect(parseGridSize('41x21')).toEqual([41, 21]);
    expect(parseGridSize('11')).toEqual([11, 11]);
  });

  it('orders rows and columns so every target after the first has a solved neighbour', () => {
    for (const [nx, ny] of [[41, 41], [10, 7], [2, 2]]) {
      const g = makeTargetGrid({ halfWidthEast_m: 100, halfWidthNorth_m: 100, nx, ny });
      const { rows, parentRow } = rowOrder(g);
      const seenRows = new Set<number>();
      rows.forEach((r, k) => {
        if (k > 0) {
          expect(seenRows.has(parentRow[r])).toBe(true);
          expect(Math.abs(parentRow[r] - r)).toBe(1);
        }
        seenRows.add(r);
      });
      expect(seenRows.size).toBe(ny);
      const { columns, previous } = columnOrder(g);
      const seen = new Set<number>();
      columns.forEach((c, k) => {
        if (k > 0) {
          expect(seen.has(previous[c])).toBe(true);
          expect(Math.abs(previous[c] - c)).toBe(1);
        }
        seen.add(c);
      });
      expect(seen.size).toBe(nx);
    }
  });
});

describe('struct-of-arrays field', () => {
  it('stores rows by index and counts outcomes; row buffers are separate transferables', () => {
    const g = makeTargetGrid({ halfWidthEast_m: 10, halfWidthNorth_m: 10, nx: 3, ny: 2 });
    const field = emptyField(g);
    const row = emptyRow(1, 3);
    setOutcome(row, 2, { code: TARGET.reachable, propellant_kg: 300, timeOfFlight_s: 70, peakTilt_deg: 20, miss_m: 0, solves: 7 });
    setOutcome(row, 0, { code: TARGET.unreachable, propellant_kg: NaN, timeOfFlight_s: NaN, peakTilt_deg: NaN, miss_m: 120, solves: 9 });
    writeRow(field, row);
    expect(field.propellant_kg[5]).toBe(300);
    expect(field.miss_m[3]).toBe(120);
    expect(countByStatus(field)).toEqual({ pending: 4, reachable: 1, unreachable: 1, failed: 0, overBudget: 0, relaxationGap: 0, undecided: 0 });
    const buffers = rowBuffers(row);
    expect(new Set(buffers).size).toBe(7);
  });
});

describe('time of flight near a point', () => {
  it('is that of the nearest computed target within one spacing, else undefined', () => {
    const grid = makeTargetGrid({ halfWidthEast_m: 100, halfWidthNorth_m: 100, nx: 3, ny: 3 });
    const field = emptyField(grid);
    field.timeOfFlight_s.set([30, 31, 32, 33, 34, 35, 36, 37, 38]);
    field.timeOfFlight_s[8] = NaN;
    expect(timeOfFlightNear(field, 0, 0)).toBe(34);
    expect(timeOfFlightNear(field, -90, -110)).toBe(30);
    expect(timeOfFlightNear(field, 100, 100)).toBeUndefined(); // not computed there
    expect(timeOfFlightNear(field, 260, 0)).toBeUndefined(); // beyond one spacing of the grid
  });
});
