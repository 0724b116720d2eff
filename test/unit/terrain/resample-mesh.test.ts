import { describe, expect, it } from 'vitest';
import {
  HAZARD_SLOPE, HAZARD_UNKNOWN, decimatedMesh, demoSiteFeatures, renderDemoSite, gridFromFunction, resampleHazardFlags, resampleHeights, resampleReachability,
} from '../../../core/terrain/index.ts';

describe('resampling', () => {
  it('bilinear resampling reproduces a plane exactly inside the source', () => {
    // Analytic: bilinear interpolation is exact for functions linear in x and y.
    const plane = (x: number, y: number) => 3 + 0.2 * x - 0.05 * y;
    const src = gridFromFunction({ width: 50, height: 40, pixelSizeX_m: 2, pixelSizeY_m: 2 }, plane);
    const out = resampleHeights(src, { width: 9, height: 7, pixelSizeX_m: 10, pixelSizeY_m: 10, originEast_m: 2, originNorth_m: -2 });
    for (let r = 0; r < 7; r++) for (let c = 0; c < 9; c++) {
      expect(out.heights[r * 9 + c]).toBeCloseTo(plane(2 + (c + 0.5) * 10, -2 - (r + 0.5) * 10), 4);
    }
    const outside = resampleHeights(src, { width: 2, height: 1, pixelSizeX_m: 100, pixelSizeY_m: 10, originEast_m: 0, originNorth_m: 0 });
    expect(outside.noData[1]).toBe(1); // centre at 150 m, beyond the 100 m source
  });

  it('hazard flags resample conservatively (OR over the covered source cells)', () => {
    const src = gridFromFunction({ width: 10, height: 10, pixelSizeX_m: 1, pixelSizeY_m: 1 }, () => 0);
    const flags = new Uint8Array(100);
    flags[3 * 10 + 7] = HAZARD_SLOPE;
    const out = resampleHazardFlags(flags, src, { width: 2, height: 2, pixelSizeX_m: 5, pixelSizeY_m: 5 });
    expect(Array.from(out)).toEqual([0, HAZARD_SLOPE, 0, 0]);
    const over = resampleHazardFlags(flags, src, { width: 3, height: 1, pixelSizeX_m: 4, pixelSizeY_m: 4 });
    expect(over[2] & HAZARD_UNKNOWN).toBeTruthy(); // covers 8–12 m, past the 10 m source
  });
});

describe('footprint results onto the terrain grid', () => {
  it('propellant is bilinear (exact for a linear field) and reachability conservative at the edge', () => {
    // A 5 × 4 target grid at 20 m; propellant linear in east and north; the east column unreachable.
    const W = 5, H = 4;
    const prop = (e: number, n: number) => 300 + 0.5 * e - 0.25 * n;
    const reach = { width: W, height: H, reachable: new Uint8Array(W * H), propellant_kg: new Float32Array(W * H) };
    for (let r = 0; r < H; r++) for (let c = 0; c < W; c++) {
      reach.reachable[r * W + c] = c < W - 1 ? 1 : 0;
      reach.propellant_kg[r * W + c] = prop((c + 0.5) * 20, -(r + 0.5) * 20);
    }
    const terrain = gridFromFunction({ width: 100, height: 80, pixelSizeX_m: 1, pixelSizeY_m: 1 }, () => 0);
    const out = resampleReachability(reach, { width: W, height: H, pixelSizeX_m: 20, pixelSizeY_m: 20 }, terrain);
    // Inside the reachable targets' centres (10…70 m east, −10…−70 m north): reachable, propellant exact.
    const k = 40 * 100 + 30; // centre (30.5, −40.5)
    expect(out.reachable[k]).toBe(1);
    expect(out.propellant_kg[k]).toBeCloseTo(prop(30.5, -40.5), 3);
    expect(out.reachable[40 * 100 + 75]).toBe(0); // between the last reachable column (70 m) and the unreachable one (90 m)
    expect(out.reachable[40 * 100 + 5]).toBe(0); // west of the first target centre (10 m): outside
  });
});

describe('decimated display mesh', () => {
  it('a plane decimates with no vertical error and the right counts', () => {
    const g = gridFromFunction({ width: 64, height: 48, pixelSizeX_m: 1, pixelSizeY_m: 1 }, (x, y) => 0.1 * x + 0.3 * y);
    const m = decimatedMesh(g, 200);
    expect(m.columns * m.rows).toBeLessThanOrEqual(200);
    expect(m.stride).toBe(4); // 16 × 12 = 192 ≤ 200, stride 3 gives 22 × 16 = 352
    expect(m.indices.length).toBe((m.columns - 1) * (m.rows - 1) * 6);
    // Box means of a plane equal the plane at the block centre, so the mesh is the plane.
    expect(m.maxVerticalError_m).toBeLessThan(1e-4);
  });

  it('no-data blocks carry NaN height and no triangles', () => {
    const g = gridFromFunction({ width: 8, height: 8, pixelSizeX_m: 1, pixelSizeY_m: 1 }, (x, y) => (x < 4 && y > -4 ? NaN : 1));
    const m = decimatedMesh(g, 16); // stride 2: 4 × 4 vertices; the north-west 2 × 2 vertices are no-data
    expect(m.stride).toBe(2);
    expect(Number.isNaN(m.positions[2])).toBe(true);
    // 3 × 3 quads, 18 triangles; a triangle survives only if its three vertices are valid: quads
    // (0,0), (1,0), (0,1) lose both, quad (1,1) loses the one through vertex (1,1): 7 dropped.
    expect(m.indices.length / 3).toBe(18 - 7);
    for (const i of m.indices) expect(Number.isNaN(m.positions[3 * i + 2])).toBe(false);
  });

  it('keeps the largest features and drops sub-stride detail', () => {
    // A 10 m-tall hill (Gaussian, σ = 40 m) and a 1 m-tall, 1 m-wide spike on a 2 m grid, stride 4 (8 m).
    const hill = (x: number, y: number) => 10 * Math.exp(-((x - 204) ** 2 + (y + 204) ** 2) / (2 * 40 * 40));
    const g = gridFromFunction({ width: 256, height: 256, pixelSizeX_m: 2, pixelSizeY_m: 2 }, (x, y) =>
      hill(x, y) + (Math.abs(x - 401) < 1 && Math.abs(y + 101) < 1 ? 1 : 0),
    );
    const m = decimatedMesh(g, 64 * 64);
    expect(m.stride).toBe(4);
    const vertexNear = (e: number, n: number) => {
      const i = Math.floor((e - m.originEast_m) / (m.stride * 2));
      const j = Math.floor((m.originNorth_m - n) / (m.stride * 2));
      return m.positions[3 * (j * m.columns + i) + 2];
    };
    // Hill (peak at a vertex, block 25 spans 200–208 m): to second order the s × s box mean of a
    // Gaussian at its peak is 10·(1 − 2·s²/(24σ²)) = 10·(1 − 128/38400) ≈ 9.967 m.
    expect(vertexNear(204, -204)).toBeCloseTo(9.967, 2);
    // Spike: one 2 m cell of 1 m in a 4 × 4 block averages to 1/16 m.
    expect(vertexNear(401, -101)).toBeLessThan(0.1);
    expect(m.maxVerticalError_m).toBeGreaterThan(0.9); // the spike is the largest error
  });

  it('keeps the demo site\'s biggest crater bowl (mesh vs full resolution at the crater centre)', () => {
    // A 2 km window of the invented site at 4 m around its largest crater, the window's north-west corner
    // at a whole number of metres so block centres fall on cell boundaries as below.
    const features = demoSiteFeatures();
    const big = features.craters.reduce((a, b) => (b.diameter_m > a.diameter_m ? b : a));
    const west = Math.round(big.east_m) - 1024, north = Math.round(big.north_m) + 1024;
    const grid = renderDemoSite(features, { width: 512, height: 512, pixelSize_m: 4, west_m: west, north_m: north });
    const m = decimatedMesh(grid, 128 * 128);
    const ce = big.east_m - west, cn = big.north_m - north;
    const i = Math.floor(ce / (m.stride * 4));
    const j = Math.floor(-cn / (m.stride * 4));
    const meshFloor = m.positions[3 * (j * m.columns + i) + 2];
    const e = (i + 0.5) * m.stride * 4, n = -(j + 0.5) * m.stride * 4;
    // Box mean of a bowl a·r² over an s × s block is a(r0² + s²/6): for this bowl, well under 5 % of the depth.
    const fullFloor = grid.heights[Math.floor(-n / 4) * grid.width + Math.floor(e / 4)];
    expect(Math.abs(meshFloor - fullFloor)).toBeLessThan(0.05 * big.depth_m);
  });
});
