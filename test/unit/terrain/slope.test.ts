import { describe, expect, it } from 'vitest';
import { gridFromFunction, hornSlope, makeGrid } from '../../../core/terrain/index.ts';

const DEG = Math.PI / 180;

describe('Horn (1981) slope, analytic cases', () => {
  it('tilted plane z = p·x + q·y: slope = atan √(p² + q²) at every interior cell', () => {
    // Analytic: every finite difference of a linear function is exact, so Horn's weighted
    // differences return p and q exactly (up to float32 storage of the heights).
    const p = Math.tan(12 * DEG) * 0.6, q = Math.tan(12 * DEG) * 0.8; // a 12° plane
    for (const [dx, dy] of [[1, 1], [2, 5]]) {
      const g = gridFromFunction({ width: 30, height: 20, pixelSizeX_m: dx, pixelSizeY_m: dy }, (x, y) => 100 + p * x + q * y);
      const s = hornSlope(g);
      for (let r = 1; r < 19; r++) for (let c = 1; c < 29; c++) expect(s[r * 30 + c]).toBeCloseTo(12 * DEG, 4);
      // 'no-data' edge mode: the outer ring has no slope.
      expect(Number.isNaN(s[0])).toBe(true);
      expect(Number.isNaN(s[5 * 30 + 29])).toBe(true);
    }
  });

  it("paraboloid bowl z = a·r²: slope = atan(2·a·r) exactly", () => {
    // Analytic: for z = a(x² + y²), the central difference ((x+h)² − (x−h)²)/(2h) = 2x is exact, and
    // Horn's 1-2-1 row weighting of ∂z/∂x does not depend on y, so Horn returns (2ax, 2ay) exactly.
    const a = 0.004;
    const g = gridFromFunction({ width: 101, height: 101, pixelSizeX_m: 1, pixelSizeY_m: 1, originEast_m: -50.5, originNorth_m: 50.5 }, (x, y) => a * (x * x + y * y));
    const s = hornSlope(g);
    let worst = 0;
    for (let r = 1; r < 100; r++) for (let c = 1; c < 100; c++) {
      const x = -50 + c, y = 50 - r;
      worst = Math.max(worst, Math.abs(s[r * 101 + c] - Math.atan(2 * a * Math.hypot(x, y))));
    }
    expect(worst).toBeLessThan(1e-5); // rad; float32 heights up to 20 m carry ~1e-6 m error
  });

  it("'extrapolate' edges: a plane keeps its exact slope on the edges; corners halve the along-row gradient", () => {
    // Derivation for z = P·col + Q·row (pixel units). Linear extrapolation 2·edge − inner is exact for a
    // plane, so every edge cell except the corners reads (P, Q). At the top-left corner the window is
    //   a = −Q, b = −Q, c = P − Q / d = 0, e = 0, f = P / g = Q, h = Q, i = P + Q   (z(0,0) = 0)
    // (the missing row extrapolated, the off-grid column replaced by column 0 itself), so
    //   8·∂z/∂col = (c + 2f + i) − (a + 2d + g) = 4P  and  8·∂z/∂row = (g + 2h + i) − (a + 2b + c) = 8Q.
    const P = 0.2, Q = 0.05;
    const g = gridFromFunction({ width: 8, height: 6, pixelSizeX_m: 1, pixelSizeY_m: 1 }, (x, y) => P * x - Q * y);
    const s = hornSlope(g, 'extrapolate');
    const exact = Math.atan(Math.hypot(P, Q));
    for (const k of [0 * 8 + 3, 5 * 8 + 4, 2 * 8 + 0, 3 * 8 + 7, 2 * 8 + 3]) expect(s[k]).toBeCloseTo(exact, 6);
    for (const k of [0, 7, 5 * 8, 5 * 8 + 7]) expect(s[k]).toBeCloseTo(Math.atan(Math.hypot(P / 2, Q)), 6);
  });

  it('a no-data neighbour gives no slope; a no-data centre always gives none', () => {
    const h = new Float32Array(25).map((_, k) => k % 5);
    h[12] = NaN;
    const g = makeGrid({ width: 5, height: 5, pixelSizeX_m: 1, pixelSizeY_m: 1 }, h);
    const s = hornSlope(g);
    expect(Number.isNaN(s[6])).toBe(true);
    expect(Number.isNaN(s[12])).toBe(true);
    const f = hornSlope(g, 'extrapolate');
    expect(Number.isNaN(f[12])).toBe(true);
    expect(Number.isFinite(f[6])).toBe(true);
  });
});
