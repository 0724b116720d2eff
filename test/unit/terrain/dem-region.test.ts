/** Region reads of a DEM: which level, pixel window and block averaging (expected values worked out by hand below). */
import { describe, expect, it } from 'vitest';
import { TerrainInputError, groundFrameOnDem, groundRegionOnDem, hazardMargin_m, planRegionRead, type DemLevel, type GridFrame } from '../../../core/terrain/index.ts';

// A 1000 × 1000 DEM of 2 m pixels, north-west corner at (0, 2000) m, with overviews at 4 m and 8 m.
const frame: GridFrame = { width: 1000, height: 1000, pixelSizeX_m: 2, pixelSizeY_m: 2, originEast_m: 0, originNorth_m: 2000 };
const levels: DemLevel[] = [
  { level: 0, width: 1000, height: 1000, pixelSizeX_m: 2, pixelSizeY_m: 2 },
  { level: 1, width: 500, height: 500, pixelSizeX_m: 4, pixelSizeY_m: 4 },
  { level: 2, width: 250, height: 250, pixelSizeX_m: 8, pixelSizeY_m: 8 },
];
// East 100…300 m, north 1500…1700 m: columns 50…150 and rows 150…250 of the 2 m pixels.
const region = { west_m: 100, east_m: 300, south_m: 1500, north_m: 1700 };

describe('planRegionRead', () => {
  it('native: full resolution over the pixels the region touches', () => {
    expect(planRegionRead(levels, frame, region)).toEqual({ level: 0, window: [50, 150, 150, 250], decimation: 1, pixelSize_m: 2 });
  });

  it('a pixel size: the coarsest level at least that fine, then whole-pixel block averages up to it', () => {
    // 9 m: the 8 m overview; columns ⌊100/8⌋ = 12 … ⌈300/8⌉ = 38, rows ⌊300/8⌋ = 37 … ⌈500/8⌉ = 63.
    expect(planRegionRead(levels, frame, { ...region, resolution: 9 })).toEqual({ level: 2, window: [12, 37, 38, 63], decimation: 1, pixelSize_m: 8 });
    // 20 m: the 8 m overview, ⌊20/8⌋ = 2 pixels a cell; the window widened to whole 2 × 2 cells (rows 36 … 64).
    expect(planRegionRead(levels, frame, { ...region, resolution: 20 })).toEqual({ level: 2, window: [12, 36, 38, 64], decimation: 2, pixelSize_m: 16 });
    // Finer than the DEM: full resolution.
    expect(planRegionRead(levels, frame, { ...region, resolution: 1 })).toMatchObject({ level: 0, decimation: 1 });
    // Without overviews, 7 m over 2 m pixels: 3 × 3 averages, window widened to multiples of 3 (48 … 150, 150 … 252).
    expect(planRegionRead(levels.slice(0, 1), frame, { ...region, resolution: 7 })).toEqual({ level: 0, window: [48, 150, 150, 252], decimation: 3, pixelSize_m: 6 });
  });

  it("'fit': the finest resolution within the cell bound; at equal fineness the coarser level", () => {
    // 100 cells: full resolution needs 10 × 10 averages (20 m), the 4 m overview 5 × 5 (20 m, fewer pixels
    // decoded), the 8 m overview 3 × 3 (24 m).
    expect(planRegionRead(levels, frame, { ...region, resolution: 'fit', maxCells: 100 })).toEqual({ level: 1, window: [25, 75, 75, 125], decimation: 5, pixelSize_m: 20 });
    expect(planRegionRead(levels, frame, { ...region, resolution: 'fit' })).toMatchObject({ level: 0, decimation: 1 });
  });

  it('refuses, naming the region, the bound and the fix', () => {
    expect(() => planRegionRead(levels, frame, { ...region, maxCells: 9999, what: 'the footprint', fix: 'give a smaller --extent-m' })).toThrow(
      /^DEM: the footprint needs 100 × 100 = 10000 cells at full resolution \(2 × 2 m\), over the memory bound of 9999 cells \(49995 bytes of grid; .*\); give a smaller --extent-m$/,
    );
    expect(() => planRegionRead(levels, frame, { west_m: 3000, east_m: 3100, south_m: 0, north_m: 100 })).toThrow(/lies outside the DEM \(east 0…2000 m, north 0…2000 m\); place the target on the DEM/);
    expect(() => planRegionRead(levels, frame, { ...region, east_m: 50 })).toThrow(TerrainInputError);
    expect(() => planRegionRead(levels, frame, { ...region, resolution: -1 })).toThrow(/invalid resolution .*: -1/);
  });
});

describe('groundRegionOnDem', () => {
  it('on an unprojected DEM the ground rectangle about the target, the track and the margin', () => {
    const ground = groundFrameOnDem(undefined, [500, 1000]);
    expect(groundRegionOnDem(ground, { west_m: -100, east_m: 100, south_m: -50, north_m: 50 }, 6, [[-400, 20]])).toEqual({ west_m: 94, east_m: 606, south_m: 944, north_m: 1056 });
    // Lander radius 2 m + safety margin 1 m + two 2 m pixels.
    expect(hazardMargin_m(frame, 4, 1)).toBe(7);
  });
});
