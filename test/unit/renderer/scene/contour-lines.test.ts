import { describe, expect, it } from 'vitest';
import { buildContourGeometry, computeContours, niceThresholds } from '../../../../renderer/scene/contour-lines.ts';
import type { ElevationGrid } from '../../../../renderer/scene/elevation-grid.ts';

function coneGrid(size: number, px: number): ElevationGrid {
  // h = distance from the centre sample: contour h = R is the circle of radius R (analytic).
  const half = ((size - 1) / 2) * px;
  const heights = new Float32Array(size * size);
  for (let r = 0; r < size; r++) for (let c = 0; c < size; c++) heights[r * size + c] = Math.hypot(-half + c * px, half - r * px);
  return { width: size, height: size, pixelSize_m: px, west_m: -half, north_m: half, heights };
}

describe('contour lines', () => {
  it('puts the contour of a cone on the analytic circle, in scene metres, lifted onto the terrain', () => {
    const grid = coneGrid(41, 25);
    const polygons = computeContours(grid.heights, grid.width, grid.height, [300]);
    const { geometry, labels } = buildContourGeometry(polygons, grid, { exaggeration: 2, lift_m: 1 });
    const p = geometry.getAttribute('position');
    expect(p.count).toBeGreaterThan(40);
    for (let i = 0; i < p.count; i++) {
      const radius = Math.hypot(p.getX(i), p.getY(i));
      // Linear interpolation between samples 25 m apart cuts chords of the circle: the error is
      // bounded by the sagitta-like term of the cone's curvature, well under a pixel.
      expect(Math.abs(radius - 300)).toBeLessThan(2);
      // z = (h + lift) × exaggeration with h ≈ 300 on the line.
      expect(p.getZ(i)).toBeCloseTo(2 * (radius + 1), -0.5);
    }
    expect(labels).toHaveLength(1);
    expect(labels[0].value).toBe(300);
  });

  it('maps a straight contour of an east-sloping plane to the exact east coordinate', () => {
    // h = east; contour at 12.5 m must lie on east = 12.5 (this pins d3-contour's half-pixel offset).
    const w = 10;
    const h = 6;
    const heights = new Float32Array(w * h);
    for (let r = 0; r < h; r++) for (let c = 0; c < w; c++) heights[r * w + c] = c * 5;
    const grid = { width: w, height: h, pixelSize_m: 5, west_m: 0, north_m: 25, heights };
    const { geometry } = buildContourGeometry(computeContours(heights, w, h, [12.5]), grid);
    const p = geometry.getAttribute('position');
    const interior = [...Array(p.count).keys()].filter((i) => p.getY(i) > 0.01 && p.getY(i) < 24.99);
    expect(interior.length).toBeGreaterThan(0);
    for (const i of interior) expect(p.getX(i)).toBeCloseTo(12.5, 5);
  });

  it('chooses nice thresholds strictly inside the range', () => {
    expect(niceThresholds(0, 100, 4)).toEqual([20, 40, 60, 80]);
    expect(niceThresholds(-137, 412, 5)).toEqual([-100, 0, 100, 200, 300, 400]);
    expect(niceThresholds(5, 5, 3)).toEqual([]);
  });
});
