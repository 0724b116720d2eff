import { describe, expect, it } from 'vitest';
import { Vector3 } from 'three';
import { buildTerrainGeometry, setTerrainExaggeration, terrainIndices } from '../../../../renderer/scene/terrain-mesh.ts';
import { sampleHeight, type ElevationGrid } from '../../../../renderer/scene/elevation-grid.ts';
import { srgbToLinear, VIRIDIS } from '../../../../core/study/colormap.ts';

/** A grid whose height is f(east, north) sampled at the pixel centres. */
function gridOf(width: number, height: number, px: number, f: (e: number, n: number) => number, west = 0, north = 0): ElevationGrid {
  const heights = new Float32Array(width * height);
  for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) heights[r * width + c] = f(west + c * px, north - r * px);
  return { width, height, pixelSize_m: px, west_m: west, north_m: north, heights };
}

describe('terrain mesh', () => {
  it('places one vertex per sample at (east, north, height × exaggeration)', () => {
    const grid = gridOf(4, 3, 10, (e, n) => e + 2 * n, 100, 500);
    const g = buildTerrainGeometry(grid, { exaggeration: 3 });
    const p = g.getAttribute('position');
    expect(p.count).toBe(12);
    // Row 2, column 3: east = 100 + 30, north = 500 − 20, height = 130 + 960.
    const i = 2 * 4 + 3;
    expect([p.getX(i), p.getY(i), p.getZ(i)]).toEqual([130, 480, 3 * (130 + 960)]);
    expect(g.index!.count).toBe((4 - 1) * (3 - 1) * 6);
  });

  it('has upward normals equal to the analytic plane normal (−a, −b, 1)/‖·‖ for z = a·east + b·north', () => {
    const a = 0.3;
    const b = -0.2;
    const g = buildTerrainGeometry(gridOf(6, 5, 2, (e, n) => a * e + b * n));
    const expected = new Vector3(-a, -b, 1).normalize();
    const normal = g.getAttribute('normal');
    for (let i = 0; i < normal.count; i++) {
      expect(normal.getX(i)).toBeCloseTo(expected.x, 5);
      expect(normal.getY(i)).toBeCloseTo(expected.y, 5);
      expect(normal.getZ(i)).toBeCloseTo(expected.z, 5);
    }
  });

  it('winds every triangle counter-clockwise seen from above', () => {
    const g = buildTerrainGeometry(gridOf(5, 5, 1, () => 0));
    const idx = g.index!.array;
    const p = g.getAttribute('position');
    for (let t = 0; t < idx.length; t += 3) {
      const [i, j, k] = [idx[t], idx[t + 1], idx[t + 2]];
      const cross = (p.getX(j) - p.getX(i)) * (p.getY(k) - p.getY(i)) - (p.getY(j) - p.getY(i)) * (p.getX(k) - p.getX(i));
      expect(cross).toBeGreaterThan(0);
    }
  });

  it('leaves out exactly the cells that touch a missing sample', () => {
    const grid = gridOf(4, 4, 1, () => 1);
    grid.heights[1 * 4 + 1] = NaN; // touches the 4 cells around (1, 1)
    expect(terrainIndices(grid).length).toBe((9 - 4) * 6);
    const colors = buildTerrainGeometry(grid).getAttribute('color');
    expect(Number.isFinite(colors.getX(5))).toBe(true);
  });

  it('drapes the field with linearised viridis: lowest value → first entry, highest → last', () => {
    const grid = gridOf(3, 2, 1, (e) => e);
    const c = buildTerrainGeometry(grid, { drapeRange: [0, 2] }).getAttribute('color');
    const first = [0, 1, 2].map((k) => srgbToLinear(VIRIDIS.srgb[k]));
    const last = [0, 1, 2].map((k) => srgbToLinear(VIRIDIS.srgb[VIRIDIS.srgb.length - 3 + k]));
    expect([c.getX(0), c.getY(0), c.getZ(0)].map((v) => +v.toFixed(5))).toEqual(first.map((v) => +v.toFixed(5)));
    expect([c.getX(2), c.getY(2), c.getZ(2)].map((v) => +v.toFixed(5))).toEqual(last.map((v) => +v.toFixed(5)));
  });

  it('changes exaggeration in place without new buffers', () => {
    const grid = gridOf(3, 3, 5, (e, n) => e - n);
    const g = buildTerrainGeometry(grid, { exaggeration: 1 });
    const buffer = g.getAttribute('position').array;
    setTerrainExaggeration(g, grid, 4);
    expect(g.getAttribute('position').array).toBe(buffer);
    expect(g.getAttribute('position').getZ(2)).toBe(4 * grid.heights[2]);
    expect(g.boundingBox!.max.z).toBe(4 * Math.max(...grid.heights));
  });

  it('rejects bad grids and exaggerations with the value and the rule', () => {
    expect(() => buildTerrainGeometry({ ...gridOf(3, 3, 1, () => 0), width: 1 })).toThrow(/invalid grid width: 1/);
    expect(() => buildTerrainGeometry({ ...gridOf(3, 3, 1, () => 0), heights: new Float32Array(8) })).toThrow(/8 values for a 3 × 3 grid \(need 9\)/);
    expect(() => buildTerrainGeometry(gridOf(3, 3, 1, () => 0), { exaggeration: 0 })).toThrow(/invalid exaggeration: 0/);
  });
});

describe('bilinear height', () => {
  it('reproduces a plane exactly between samples and is NaN outside', () => {
    const grid = gridOf(5, 5, 10, (e, n) => 2 * e - n, -20, 20);
    expect(sampleHeight(grid, 3.7, -11.2)).toBeCloseTo(2 * 3.7 + 11.2, 4);
    expect(sampleHeight(grid, 20, -20)).toBeCloseTo(60, 4);
    expect(sampleHeight(grid, 21, 0)).toBeNaN();
  });
});
