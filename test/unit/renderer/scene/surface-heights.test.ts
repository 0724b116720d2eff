/**
 * Footprint drape, contours, the reserve boundary and the markers lie on the terrain surface, and where there
 * is no terrain (past the DEM's edge, no-data) on the plane of the nominal target's ground — never at an
 * arbitrary height such as 0 m, hundreds of metres above or below a site's ground. Terrains here are analytic
 * surfaces (a tilted plane, a ridge of two planes) whose height is known in closed form at every point; on a
 * plane, bilinear interpolation and the triangulated mesh both reproduce the surface exactly.
 */
import { describe, expect, it } from 'vitest';
import type { Line } from 'three';
import { buildOutlineGeometry, drapePolyline } from '../../../../renderer/scene/footprint-outlines.ts';
import { buildMarkerObjects } from '../../../../renderer/scene/scene-objects.ts';
import { buildFootprintPlaneGeometry } from '../../../../renderer/scene/footprint-plane.ts';
import type { ElevationGrid } from '../../../../renderer/scene/elevation-grid.ts';

/** A grid sampling `h(east, north)` every `pixel` m over ±half m about the target. */
function analyticGrid(h: (e: number, n: number) => number, half: number, pixel: number): ElevationGrid {
  const size = Math.round((2 * half) / pixel) + 1;
  const heights = new Float32Array(size * size);
  for (let r = 0; r < size; r++) for (let c = 0; c < size; c++) heights[r * size + c] = h(-half + c * pixel, half - r * pixel);
  return { width: size, height: size, pixelSize_m: pixel, west_m: -half, north_m: half, heights };
}

// Ground on a Mars-like datum, far below 0 m: a tilted plane, h = −1200 + 0.05 e − 0.02 n; the target's ground −1200 m.
const plane = (e: number, n: number) => -1200 + 0.05 * e - 0.02 * n;
const tilted = analyticGrid(plane, 500, 10);

describe('footprint outlines on the surface', () => {
  it('puts every vertex on the terrain + lift, and past the DEM on the target ground plane (−1200 m), not at 0 m', () => {
    // A square ring from inside the DEM (±300 m) to far outside it (±2000 m).
    const ring = [[-300, -300], [2000, -300], [2000, 2000], [-300, 2000], [-300, -300]];
    const ex = 3;
    const { geometry } = buildOutlineGeometry({ coordinates: [[ring]], level_kg: 200, emphasis: true }, tilted, ex, 2);
    const p = geometry.getAttribute('position');
    expect(p.count).toBeGreaterThan(10);
    for (let i = 0; i < p.count; i++) {
      const e = p.getX(i);
      const n = p.getY(i);
      const inside = Math.abs(e) <= 500 && Math.abs(n) <= 500;
      // Float32 positions: 1e-2 m at ~4 km of scene height is far below a pixel.
      expect(p.getZ(i), `(${e}, ${n})`).toBeCloseTo(((inside ? plane(e, n) : -1200) + 2) * ex, 1);
    }
  });

  it('follows the relief between ring vertices: a ring edge across a ridge rises over it, not through it', () => {
    // Ridge along north: h = 100 − 0.5 |e| (peak 100 m at e = 0, 0 m at e = ±200).
    const ridge = analyticGrid((e) => 100 - 0.5 * Math.abs(e), 400, 10);
    const points = drapePolyline([[-200, 0], [200, 0]], ridge, { exaggeration: 1, lift_m: 2 });
    const zs: number[] = [];
    for (let k = 0; k < points.length; k += 3) {
      const e = points[k];
      zs.push(points[k + 2]);
      // Between samples the display mesh is exact on each flank (a plane); at most one piece straddles the peak.
      expect(points[k + 2]).toBeCloseTo(100 - 0.5 * Math.abs(e) + 2, 3);
    }
    // No piece is longer than the terrain's pixel, so a vertex lies within 10 m of the crest: ≥ 100 − 0.5·10 + 2.
    expect(Math.max(...zs)).toBeGreaterThanOrEqual(97);
  });
});

describe('markers on the surface', () => {
  it('draws the landing ellipse past the DEM on the target ground plane', () => {
    const objects = buildMarkerObjects(tilted, 2, { ignition: null, trajectories: [], ellipse: { semiMajor_m: 900, semiMinor_m: 700, azimuth_deg: 30 } });
    const p = (objects.find((o) => o.name === 'landing-ellipse') as Line).geometry.getAttribute('position');
    let outside = 0;
    for (let i = 0; i < p.count; i++) {
      const e = p.getX(i), n = p.getY(i);
      if (Math.abs(e) <= 500 && Math.abs(n) <= 500) continue;
      outside++;
      // 2 m lift above the ground (scene-objects.ts), exaggeration 2.
      expect(p.getZ(i)).toBeCloseTo((-1200 + 2) * 2, 1);
    }
    expect(outside).toBeGreaterThan(10);
  });
});

describe('footprint drape past the DEM', () => {
  // Propellant on a 9 × 9 target grid ±2000 m (500 m apart), north row first; NaN = not reachable.
  const side = 9;
  const values = new Float32Array(side * side).map((_, k) => 200 + (k % side));
  values[0] = NaN;
  const field = { width: side, height: side, pixelSize_m: 500, west_m: -2000, north_m: 2000, values };

  it('draws the footprint cells with no terrain under them as a plane at the target ground, and no others', () => {
    const geometry = buildFootprintPlaneGeometry(field, tilted, { exaggeration: 4, range: [200, 208] });
    const p = geometry.getAttribute('position');
    const index = geometry.getIndex()!;
    expect(index.count % 6).toBe(0);
    const cells = new Set<string>();
    for (let k = 0; k < index.count; k++) {
      const i = index.getX(k);
      expect(p.getZ(i)).toBeCloseTo(-1200 * 4, 1);
    }
    for (let k = 0; k < index.count; k += 6) {
      // The cell's centre: the mean of the two triangles' distinct corners.
      let e = 0, n = 0;
      for (let j = 0; j < 6; j++) { e += p.getX(index.getX(k + j)) / 6; n += p.getY(index.getX(k + j)) / 6; }
      cells.add(`${Math.round(e)},${Math.round(n)}`);
      // Off the DEM (±500 m): the terrain's own drape covers the rest.
      expect(Math.abs(e) > 500 || Math.abs(n) > 500).toBe(true);
    }
    // 8 × 8 cells in all; the 4 around the target (centres ±250 m) lie on the DEM; the north-west corner cell
    // touches the unreachable target and is left out.
    expect(cells.size).toBe(64 - 4 - 1);
  });

  it('colours the plane with the same colour map and range as the drape on the terrain', () => {
    const geometry = buildFootprintPlaneGeometry(field, tilted, { exaggeration: 1, range: [200, 208] });
    const colour = geometry.getAttribute('color');
    const p = geometry.getAttribute('position');
    // Viridis at 0 is (68, 1, 84)/255 and at 1 (253, 231, 37)/255 in sRGB (Matplotlib's table; core/study/colormap.ts
    // is held to Matplotlib in test/reference), stored as linear light for three.js vertex colours (the sRGB
    // transfer function of IEC 61966-2-1): the east column (208 kg) and the west column (200 kg).
    const linear = (c: number) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4);
    let checked = 0;
    for (let i = 0; i < p.count; i++) {
      if (p.getX(i) === 2000) { expect(colour.getX(i)).toBeCloseTo(linear(253 / 255), 2); checked++; }
      if (p.getX(i) === -2000 && p.getY(i) < 2000) { expect(colour.getZ(i)).toBeCloseTo(linear(84 / 255), 2); checked++; }
    }
    expect(checked).toBe(2 * side - 1);
  });
});
