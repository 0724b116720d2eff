import { describe, expect, it } from 'vitest';
import {
  HAZARD_MARGIN, HAZARD_ROUGHNESS, HAZARD_SLOPE, HAZARD_UNKNOWN, MAX_FOOTPRINT_CELLS, TerrainInputError, gridFromFunction, hazardMap, readJsonGrid, resolveLimits,
} from '../../../core/terrain/index.ts';

const DEG = Math.PI / 180;

describe('hazard map', () => {
  it('flags a plane steeper than the limit and passes a gentler one', () => {
    const spec = { width: 30, height: 30, pixelSizeX_m: 1, pixelSizeY_m: 1 };
    const steep = hazardMap(gridFromFunction(spec, (x) => Math.tan(12 * DEG) * x), { maxSlope_deg: 10, landerDiameter_m: 4 });
    const gentle = hazardMap(gridFromFunction(spec, (x) => Math.tan(8 * DEG) * x), { maxSlope_deg: 10, landerDiameter_m: 4 });
    const k = 15 * 30 + 15;
    expect(steep.flags[k]).toBe(HAZARD_SLOPE);
    expect(gentle.flags[k]).toBe(0);
    // The 2-cell ring nearer the edge than the lander radius is unknown (counted unsafe).
    expect(gentle.flags[1 * 30 + 15]).toBe(HAZARD_UNKNOWN);
    expect(gentle.safeCells).toBe(26 * 26);
    expect(gentle.safeFraction).toBeCloseTo((26 * 26) / 900, 12);
  });

  it('flags a boulder as roughness and buffers it by the safety margin', () => {
    const g = gridFromFunction({ width: 41, height: 41, pixelSizeX_m: 1, pixelSizeY_m: 1 }, (x, y) =>
      Math.hypot(x - 20.5, y + 20.5) < 0.1 ? 1.0 : 0,
    );
    const m = hazardMap(g, { landerDiameter_m: 4, maxRoughness_m: 0.3, safetyMargin_m: 5 });
    const centre = 20 * 41 + 20;
    expect(m.flags[centre] & HAZARD_ROUGHNESS).toBeTruthy();
    // Centred on the bump, the 13-cell disc leaves a residual of 12/13 m (see footprint-fit tests);
    // the bump stays in the disc of every cell within 2 m, and leaves it beyond.
    expect(m.flags[20 * 41 + 22] & HAZARD_ROUGHNESS).toBeTruthy();
    expect(m.flags[20 * 41 + 23] & HAZARD_ROUGHNESS).toBe(0);
    // Margin: cells closer than 5 m (centre to centre) to a rough cell are HAZARD_MARGIN.
    // The rough cell nearest column 26 / 27 is column 22: 4 m (inside the margin) and 5 m (not closer than 5 m).
    expect(m.flags[20 * 41 + 26]).toBe(HAZARD_MARGIN);
    expect(m.flags[20 * 41 + 27]).toBe(0);
    expect(m.hazardDistance_m[20 * 41 + 27]).toBeCloseTo(5, 6);
  });

  it('does not assess roughness when the DEM is coarser than half the lander', () => {
    const g = gridFromFunction({ width: 20, height: 20, pixelSizeX_m: 5, pixelSizeY_m: 5 }, () => 0);
    const m = hazardMap(g, { landerDiameter_m: 4 });
    expect(m.roughnessAssessed).toBe(false);
    expect(m.flags[10 * 20 + 10]).toBe(0);
  });

  it('refuses a footprint fit hundreds of pixels wide (tiny or wrong pixel size) before allocating it', () => {
    // A 4 m lander on 1e-4 m pixels is 2·⌊2 / 1e-4⌋ + 1 = 40 001 pixels across (1.6e9 disc cells); on 1e-9 m
    // pixels about 4e9 (⌊2 / 1e-9⌋ is 1 999 999 999 in binary floating point).
    for (const pixel of [1e-4, 1e-9]) {
      const across = 2 * Math.floor(2 / pixel) + 1;
      const json = JSON.stringify({ format: 'landreach-elevation-grid', version: 1, width: 64, height: 64, pixelSizeX_m: pixel, pixelSizeY_m: pixel, heights_m: new Array(64 * 64).fill(100) });
      const grid = readJsonGrid(json);
      expect(() => hazardMap(grid, { landerDiameter_m: 4 })).toThrow(TerrainInputError);
      expect(() => hazardMap(grid, { landerDiameter_m: 4 })).toThrow(
        new RegExp(`landerDiameter_m 4 spans ${across} × ${across} DEM pixels of ${pixel} × ${pixel} m, over the limit of ${MAX_FOOTPRINT_CELLS} cells.*gdalwarp -tr`),
      );
    }
    // Just inside the limit (255 × 255 ≤ 65 536): computed, with the 127-cell rim unknown.
    const fine = gridFromFunction({ width: 300, height: 300, pixelSizeX_m: 4 / 254, pixelSizeY_m: 4 / 254 }, () => 5);
    const map = hazardMap(fine, { landerDiameter_m: 4 });
    expect(map.flags[150 * 300 + 150]).toBe(0);
    expect(map.flags[0]).toBe(HAZARD_UNKNOWN);
  });

  it('rejects bad limits with the field, the value and the range', () => {
    expect(() => resolveLimits({ maxSlope_deg: -3 })).toThrow(TerrainInputError);
    expect(() => resolveLimits({ maxSlope_deg: -3 })).toThrow('invalid maxSlope_deg: -3 (must be a number from 0 to 89)');
    expect(() => resolveLimits({ landerDiameter_m: NaN })).toThrow(/landerDiameter_m: NaN/);
    expect(resolveLimits({}).maxSlope_deg).toBe(10);
  });
});
