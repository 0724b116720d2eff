import { describe, expect, it } from 'vitest';
import { resampleToTerrain, type ScalarGrid } from '../../../../renderer/scene/resample.ts';
import type { ElevationGrid } from '../../../../renderer/scene/elevation-grid.ts';

const terrain = (size: number, px: number): ElevationGrid => {
  const half = ((size - 1) / 2) * px;
  return { width: size, height: size, pixelSize_m: px, west_m: -half, north_m: half, heights: new Float32Array(size * size) };
};

/** f(east, north) = 2 east − 3 north + 7 sampled on a grid: bilinear interpolation reproduces it exactly. */
function planeGrid(width: number, height: number, px: number, west: number, north: number): ScalarGrid {
  const values = new Float32Array(width * height);
  for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) values[r * width + c] = 2 * (west + c * px) - 3 * (north - r * px) + 7;
  return { width, height, pixelSize_m: px, west_m: west, north_m: north, values };
}

describe('resampling onto the terrain', () => {
  it('reproduces a plane exactly inside the source and marks outside points as missing', () => {
    const t = terrain(21, 50); // −500 … 500 m
    const src = planeGrid(7, 5, 120, -300, 240); // east −300 … 420, north 240 … −240
    const out = resampleToTerrain(src, t);
    for (let r = 0; r < t.height; r++) {
      for (let c = 0; c < t.width; c++) {
        const e = t.west_m + c * 50;
        const n = t.north_m - r * 50;
        const inside = e >= -300 && e <= 420 && n <= 240 && n >= -240;
        const v = out[r * t.width + c];
        if (inside) expect(v, `${e},${n}`).toBeCloseTo(2 * e - 3 * n + 7, 3);
        else expect(v, `${e},${n}`).toBeNaN();
      }
    }
  });

  it('propagates missing source values to the points that depend on them', () => {
    const src = planeGrid(3, 3, 100, -100, 100);
    src.values[4] = NaN; // centre
    const out = resampleToTerrain(src, terrain(5, 50));
    expect(out[2 * 5 + 2]).toBeNaN();
    // A point exactly on a valid sample depends on that sample alone.
    expect(out[0 * 5 + 0]).toBeCloseTo(2 * -100 - 3 * 100 + 7, 4);
    expect(out[0 * 5 + 1]).toBeCloseTo(2 * -50 - 3 * 100 + 7, 4);
  });
});
