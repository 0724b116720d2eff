import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fitFootprint, footprintDisc, gridFromFunction, makeGrid, TerrainInputError } from '../../../core/terrain/index.ts';

const DEG = Math.PI / 180;

/** Generic least squares plane through (x, y, z) by the 3 × 3 normal equations (Cramer's rule). */
function planeFit(x: number[], y: number[], z: number[]) {
  let n = 0, sx = 0, sy = 0, sxx = 0, syy = 0, sxy = 0, sz = 0, sxz = 0, syz = 0;
  for (let i = 0; i < x.length; i++) {
    n++; sx += x[i]; sy += y[i]; sxx += x[i] * x[i]; syy += y[i] * y[i]; sxy += x[i] * y[i];
    sz += z[i]; sxz += x[i] * z[i]; syz += y[i] * z[i];
  }
  const det3 = (m: number[]) => m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
  const A = [n, sx, sy, sx, sxx, sxy, sy, sxy, syy];
  const D = det3(A);
  const a = det3([sz, sx, sy, sxz, sxx, sxy, syz, sxy, syy]) / D;
  const b = det3([n, sz, sy, sx, sxz, sxy, sy, syz, syy]) / D;
  const c = det3([n, sx, sz, sx, sxx, sxz, sy, sxy, syz]) / D;
  return { a, b, c };
}

describe('footprint plane fit and roughness', () => {
  it('tilted plane: footprint slope exact, roughness 0', () => {
    const g = gridFromFunction({ width: 40, height: 40, pixelSizeX_m: 0.5, pixelSizeY_m: 0.5 }, (x, y) => 7 + Math.tan(8 * DEG) * (0.6 * x - 0.8 * y));
    const fit = fitFootprint(g, 4);
    const k = 20 * 40 + 20;
    expect(fit.slope_rad[k]).toBeCloseTo(8 * DEG, 5);
    expect(fit.roughness_m[k]).toBeLessThan(1e-4);
    // Cells nearer the edge than the footprint radius are unknown.
    expect(Number.isNaN(fit.slope_rad[2 * 40 + 20])).toBe(true);
    expect(fit.reachCols).toBe(4);
  });

  it('one bump of height H on a flat disc of n cells: max residual H(1 − 1/n), RMS H√(n−1)/n', () => {
    // Derivation: by symmetry the fitted plane is flat at the mean H/n; residuals are H − H/n at the
    // bump and −H/n elsewhere, so max = H(1 − 1/n) and RMS² = [(H(1−1/n))² + (n−1)(H/n)²]/n = H²(n−1)/n³.
    const H = 0.8;
    const h = new Float32Array(21 * 21).fill(3);
    h[10 * 21 + 10] += H;
    const g = makeGrid({ width: 21, height: 21, pixelSizeX_m: 1, pixelSizeY_m: 1 }, h);
    const n = footprintDisc(g, 6).cols.length;
    expect(n).toBe(29); // lattice points with x² + y² ≤ 9: the Gauss circle count N(3) = 29
    const max = fitFootprint(g, 6, 'max');
    const rms = fitFootprint(g, 6, 'rms');
    expect(max.roughness_m[10 * 21 + 10]).toBeCloseTo(H * (1 - 1 / n), 5);
    expect(rms.roughness_m[10 * 21 + 10]).toBeCloseTo((H * Math.sqrt(n - 1)) / n, 5);
    expect(max.slope_rad[10 * 21 + 10]).toBeCloseTo(0, 6);
  });

  it('agrees with a generic least-squares plane on random surfaces (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 31 - 1 }), fc.constantFrom([1, 1], [1, 2], [0.5, 0.7]), (seed, [dx, dy]) => {
        let s = seed;
        const rnd = () => ((s = (s * 1103515245 + 12345) % 2147483648) / 2147483648);
        const g = gridFromFunction({ width: 15, height: 15, pixelSizeX_m: dx, pixelSizeY_m: dy }, () => 100 + 3 * rnd());
        const D = 5;
        const fit = fitFootprint(g, D, 'max');
        const disc = footprintDisc(g, D);
        const r0 = 7, c0 = 7;
        const xs = disc.cols.map((c) => c * dx), ys = disc.rows.map((r) => -r * dy);
        const zs = disc.cols.map((c, j) => g.heights[(r0 + disc.rows[j]) * 15 + c0 + c]);
        const { a, b, c } = planeFit(xs, ys, zs);
        const maxRes = Math.max(...zs.map((z, j) => Math.abs(z - (a + b * xs[j] + c * ys[j]))));
        const k = r0 * 15 + c0;
        expect(fit.slope_rad[k]).toBeCloseTo(Math.atan(Math.hypot(b, c)), 5);
        expect(fit.roughness_m[k]).toBeCloseTo(maxRes, 4);
      }),
      { numRuns: 40, seed: 5 },
    );
  });

  it('a no-data cell makes every footprint touching it unknown', () => {
    const h = new Float32Array(15 * 15).fill(1);
    h[7 * 15 + 7] = NaN;
    const g = makeGrid({ width: 15, height: 15, pixelSizeX_m: 1, pixelSizeY_m: 1 }, h);
    const fit = fitFootprint(g, 4);
    expect(Number.isNaN(fit.slope_rad[7 * 15 + 9])).toBe(true); // 2 m away: inside a 2 m radius
    expect(fit.slope_rad[7 * 15 + 10]).toBe(0); // 3 m away: outside
  });

  it('rejects a lander smaller than two DEM pixels, naming the field', () => {
    const g = gridFromFunction({ width: 10, height: 10, pixelSizeX_m: 5, pixelSizeY_m: 5 }, () => 0);
    expect(() => fitFootprint(g, 4)).toThrow(TerrainInputError);
    expect(() => fitFootprint(g, 4)).toThrow(/landerDiameter_m 4/);
  });
});
