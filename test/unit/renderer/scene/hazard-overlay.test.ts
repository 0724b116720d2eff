import { describe, expect, it } from 'vitest';
import { buildHazardGeometry, hazardStripeTexture } from '../../../../renderer/scene/hazard-overlay.ts';
import type { ElevationGrid } from '../../../../renderer/scene/elevation-grid.ts';

const grid = (): ElevationGrid => ({ width: 4, height: 4, pixelSize_m: 10, west_m: 0, north_m: 30, heights: Float32Array.from({ length: 16 }, (_, i) => i) });

describe('hazard overlay', () => {
  it('covers exactly the cells touching a hazardous sample', () => {
    const mask = new Uint8Array(16);
    mask[0] = 1; // north-west corner sample: only cell (0, 0) touches it
    expect(buildHazardGeometry(grid(), mask).index!.count).toBe(6);
    mask[5] = 1; // interior sample (1, 1): the four cells around it, one shared with the first
    expect(buildHazardGeometry(grid(), mask).index!.count).toBe(4 * 6);
    expect(buildHazardGeometry(grid(), new Uint8Array(16)).index!.count).toBe(0);
  });

  it('lifts the overlay above the (exaggerated) terrain and maps texture coordinates in metres', () => {
    const g = buildHazardGeometry(grid(), new Uint8Array(16).fill(1), { exaggeration: 3, lift_m: 2, stripe_m: 20 });
    const p = g.getAttribute('position');
    const uv = g.getAttribute('uv');
    // Sample 6 = row 1, column 2: east 20, north 20, height 6.
    expect([p.getX(6), p.getY(6), p.getZ(6)]).toEqual([20, 20, 3 * (6 + 2)]);
    expect([uv.getX(6), uv.getY(6)]).toEqual([1, 1]);
  });

  it('rejects a mask of the wrong size and makes a repeating stripe texture with transparent gaps', () => {
    expect(() => buildHazardGeometry(grid(), new Uint8Array(3))).toThrow(/3 values for 16 samples/);
    const t = hazardStripeTexture();
    const alpha = Array.from({ length: 256 }, (_, i) => (t.image.data as Uint8Array)[4 * i + 3]);
    expect(alpha.filter((a) => a === 0).length).toBeGreaterThan(100);
    expect(alpha.filter((a) => a > 0).length).toBeGreaterThan(50);
  });
});
