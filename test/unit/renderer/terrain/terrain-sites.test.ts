/**
 * The footprint laid on the DEM: safe ∩ reachable and the ranked sites, on a terrain whose hazards are known
 * in closed form — a flat plane (slope 0, roughness 0 everywhere: all safe) with one 30° ramp (tan 30° > the
 * 10° limit) — and a footprint whose propellant is a known plane, so the cheapest safe cell is known exactly.
 */
import { describe, expect, it } from 'vitest';
import { hazardMap, makeGrid } from '../../../../core/terrain/index.ts';
import { TARGET } from '../../../../core/footprint/field.ts';
import { footprintOnTerrain, shareOnDisplay } from '../../../../renderer/terrain/terrain-sites.ts';

// 200 × 200 cells of 5 m: a 1 km DEM in its own frame, west edge 0, north edge 0; the target at its centre.
const size = 200;
const pixel = 5;
const heights = new Float32Array(size * size);
// A ramp rising 30° eastwards over columns 20 … 39 (x from 100 to 200 m), flat at the ends.
for (let r = 0; r < size; r++) for (let c = 0; c < size; c++) heights[r * size + c] = Math.tan(Math.PI / 6) * pixel * Math.min(20, Math.max(0, c - 20));
const grid = makeGrid({ width: size, height: size, pixelSizeX_m: pixel, pixelSizeY_m: pixel, originEast_m: 0, originNorth_m: 0 }, heights);
const map = hazardMap(grid, { maxSlope_deg: 10, landerDiameter_m: 4 });
const target = { east_m: 500, north_m: -500 };
const display = { width: 50, height: 50, pixelSizeX_m: 20, pixelSizeY_m: 20, originEast_m: 0, originNorth_m: 0 };

/** Targets every 100 m over ±500 m; propellant 200 + 0.01 × east (kg), all reachable. */
function planeFootprint() {
  const nx = 11;
  const east = Float64Array.from({ length: nx }, (_, i) => -500 + 100 * i);
  const north = Float64Array.from(east);
  const status = new Uint8Array(nx * nx).fill(TARGET.reachable);
  const propellant_kg = new Float32Array(nx * nx);
  for (let j = 0; j < nx; j++) for (let i = 0; i < nx; i++) propellant_kg[j * nx + i] = 200 + 0.01 * east[i];
  return { nx, ny: nx, east, north, status, propellant_kg };
}

describe('footprint on the terrain', () => {
  it('ranks the cheapest safe cells first: west of the ramp, on the flat, with the propellant of the plane', () => {
    const out = footprintOnTerrain(grid, map, display, planeFootprint(), 1000, target, 3);
    expect(out.sites).toHaveLength(3);
    // The cheapest cells are the westmost the lander's disc fits on: centre 2.5 m in, i.e. DEM east 2.5 m
    // (footprint −497.5 m), at 200 − 4.975 kg; the propellant is bilinear between targets, exact on a plane.
    const first = out.sites[0];
    expect(first.rank).toBe(1);
    expect(first.east_m).toBeLessThan(-490);
    expect(first.propellant_kg).toBeCloseTo(200 + 0.01 * first.east_m, 3);
    for (const s of out.sites) {
      expect(s.east_m + target.east_m < 100 || s.east_m + target.east_m > 200).toBe(true); // never on the ramp
    }
    for (let k = 1; k < out.sites.length; k++) expect(out.sites[k].propellant_kg).toBeGreaterThanOrEqual(out.sites[k - 1].propellant_kg);
  });

  it('counts safe ∩ reachable as the reachable cells off the ramp, and lays it on the display cells', () => {
    const out = footprintOnTerrain(grid, map, display, planeFootprint(), 1000, target);
    // Reachable: the targets span ±500 m, the whole DEM, so every cell centre is between target centres;
    // unsafe: the ramp's 20 columns (and the lander's disc around its kinks), and the DEM's edge ring where
    // the disc leaves the grid (unknown counts as unsafe).
    expect(out.reachableCells).toBeGreaterThan(0.95 * size * size);
    expect(out.safeReachableCells).toBeLessThan(out.reachableCells - 20 * size * 0.9);
    expect(out.safeReachableArea_m2).toBeCloseTo(out.safeReachableCells * pixel * pixel, 6);
    // Display cells of 20 m: far west (x 20 … 40 m) all safe; on the ramp's middle (x 140 … 160 m) none.
    expect(out.displayShare[10 * display.width + 1]).toBe(1);
    expect(out.displayShare[10 * display.width + 7]).toBe(0);
  });

  it('drops targets over the budget', () => {
    // Budget 199 kg: only targets with 200 + 0.01 e ≤ 199, i.e. east ≤ −100 m, are reachable with the reserve.
    const out = footprintOnTerrain(grid, map, display, planeFootprint(), 199, target);
    for (const s of out.sites) expect(s.propellant_kg).toBeLessThanOrEqual(199);
    expect(out.displayShare[10 * display.width + 40]).toBe(0);
  });

  it('averages a mask over display cells', () => {
    const mask = new Uint8Array(size * size);
    for (let r = 0; r < size; r++) for (let c = 0; c < 2; c++) mask[r * size + c] = 1; // the westmost 10 m
    const share = shareOnDisplay(mask, grid, display);
    expect(share[0]).toBeCloseTo(0.5, 12); // 2 of the 4 columns under a 20 m display cell
    expect(share[1]).toBe(0);
  });

  it('spreads the listed sites a twentieth of the DEM apart (1 km DEM: 50 m)', () => {
    const out = footprintOnTerrain(grid, map, display, planeFootprint(), 1000, target, 5);
    expect(out.sites).toHaveLength(5);
    for (let a = 0; a < 5; a++) for (let b = a + 1; b < 5; b++) expect(Math.hypot(out.sites[a].east_m - out.sites[b].east_m, out.sites[a].north_m - out.sites[b].north_m)).toBeGreaterThanOrEqual(50);
  });
});
