import { describe, expect, it } from 'vitest';
import { Color, type Line, type LineBasicMaterial, type Mesh } from 'three';
import { buildAxisObjects, buildMarkerObjects, TRAJECTORY_COLOURS } from '../../../../renderer/scene/scene-objects.ts';
import { formatAxisTick, niceTicks } from '../../../../renderer/scene/view.ts';
import type { ElevationGrid } from '../../../../renderer/scene/elevation-grid.ts';

// A tilted plane: height = 0.1 × east + 50, so the target's ground (0, 0) is at 50 m.
const grid: ElevationGrid = (() => {
  const size = 11;
  const heights = new Float32Array(size * size);
  for (let r = 0; r < size; r++) for (let c = 0; c < size; c++) heights[r * size + c] = 0.1 * (-500 + c * 100) + 50;
  return { width: size, height: size, pixelSize_m: 100, west_m: -500, north_m: 500, heights };
})();

const straightDescent = (n: number) => ({
  time_s: Float64Array.from({ length: n }, (_, i) => i),
  position_m: Float64Array.from({ length: 3 * n }, (_, k) => (k % 3 === 2 ? 100 * (1 - Math.floor(k / 3) / (n - 1)) : 0)),
  thrust_N: Float64Array.from({ length: 3 * n }, (_, k) => (k % 3 === 2 ? 1000 : 0)),
});

describe('marker objects', () => {
  it('always has the nominal-target ring on the ground', () => {
    const [ring] = buildMarkerObjects(grid, 1, { ignition: null, trajectories: [], ellipse: null });
    expect(ring.name).toBe('nominal-target');
    const p = (ring as Line).geometry.getAttribute('position');
    for (let i = 0; i < p.count; i++) expect(p.getZ(i)).toBeCloseTo(0.1 * p.getX(i) + 50 + 2, 3);
  });

  it('puts the ignition point at the target ground + altitude, exaggerated, with a drop line to the ground below it', () => {
    const objects = buildMarkerObjects(grid, 3, { ignition: { east_m: -200, north_m: 100, altitude_m: 400 }, trajectories: [], ellipse: null });
    const ball = objects.find((o) => o.name === 'ignition-point') as Mesh;
    expect(ball.position.toArray()).toEqual([-200, 100, 3 * (50 + 400)]);
    const drop = (objects.find((o) => o.name === 'ignition-drop-line') as Line).geometry.getAttribute('position');
    expect(drop.getZ(1)).toBeCloseTo(3 * (0.1 * -200 + 50 + 2), 4);
  });

  it('colours trajectories in palette order and starts each path at the target ground', () => {
    const objects = buildMarkerObjects(grid, 1, { ignition: null, trajectories: [{ samples: straightDescent(6), thrustMax_N: 2000 }, { samples: straightDescent(6), thrustMax_N: 2000 }], ellipse: null });
    const paths = objects.filter((o) => o.name.startsWith('trajectory-')) as Line[];
    expect(paths).toHaveLength(2);
    paths.forEach((path, k) => expect(((path.material as LineBasicMaterial).color as Color).getHexString()).toBe(new Color(TRAJECTORY_COLOURS[k]).getHexString()));
    const p = paths[0].geometry.getAttribute('position');
    expect(p.getZ(p.count - 1)).toBeCloseTo(50, 5); // touchdown at the target's ground height
    expect(objects.filter((o) => o.name.startsWith('thrust-vectors-'))).toHaveLength(2);
  });

  it('draws a baseline dashed in its trajectory colour, in the same frame and exaggeration, only when given', () => {
    const baseline = { position_m: Float64Array.from([-300, 0, 400, -100, 0, 150, 0, 0, 0]) };
    const objects = buildMarkerObjects(grid, 2, { ignition: null, trajectories: [{ samples: straightDescent(6), thrustMax_N: 2000 }, { samples: straightDescent(6), thrustMax_N: 2000, baseline }], ellipse: null });
    expect(objects.map((o) => o.name).filter((n) => n.startsWith('baseline-'))).toEqual(['baseline-1']);
    const dashed = objects.find((o) => o.name === 'baseline-1') as Line;
    expect((dashed.material as LineBasicMaterial).type).toBe('LineDashedMaterial');
    expect(((dashed.material as LineBasicMaterial).color as Color).getHexString()).toBe(new Color(TRAJECTORY_COLOURS[1]).getHexString());
    const p = dashed.geometry.getAttribute('position');
    expect(p.count).toBe(3);
    expect([p.getX(0), p.getY(0), p.getZ(0)]).toEqual([-300, 0, 2 * (50 + 400)]);
    expect(p.getZ(2)).toBeCloseTo(2 * 50, 5); // ends at the target's ground, exaggerated
    expect(dashed.geometry.getAttribute('lineDistance')).toBeDefined();
  });

  it('draws each picked target as two rings in its trajectory colour, centred on the pick', () => {
    const objects = buildMarkerObjects(grid, 1, { ignition: null, trajectories: [], ellipse: null, picks: [{ east_m: 100, north_m: -200 }, { east_m: 0, north_m: 0 }] });
    const rings = objects.filter((o) => o.name.startsWith('pick-')) as Line[];
    expect(rings.map((r) => r.name)).toEqual(['pick-0-outer', 'pick-0-inner', 'pick-1-outer', 'pick-1-inner']);
    expect(((rings[2].material as LineBasicMaterial).color as Color).getHexString()).toBe(new Color(TRAJECTORY_COLOURS[1]).getHexString());
    const p = rings[0].geometry.getAttribute('position');
    let e = 0;
    let n = 0;
    for (let i = 0; i < p.count - 1; i++) {
      e += p.getX(i);
      n += p.getY(i);
    }
    expect(e / (p.count - 1)).toBeCloseTo(100, 6);
    expect(n / (p.count - 1)).toBeCloseTo(-200, 6);
  });

  it('adds the landing ellipse only when given', () => {
    const names = (e: boolean) => buildMarkerObjects(grid, 1, { ignition: null, trajectories: [], ellipse: e ? { semiMajor_m: 200, semiMinor_m: 80, azimuth_deg: 30 } : null }).map((o) => o.name);
    expect(names(true)).toContain('landing-ellipse');
    expect(names(false)).not.toContain('landing-ellipse');
    // An off-centre ellipse (a dispersion's mean landing point) is drawn around its centre.
    const [ellipse] = buildMarkerObjects(grid, 1, { ignition: null, trajectories: [], ellipse: { semiMajor_m: 200, semiMinor_m: 80, azimuth_deg: 90, centreEast_m: 50, centreNorth_m: -30 } }).filter((o) => o.name === 'landing-ellipse');
    const pos = ((ellipse as unknown as { geometry: { getAttribute(n: string): { array: Float32Array } } }).geometry.getAttribute('position')).array;
    // Azimuth 90° (clockwise from north) puts the major axis east: the first point is the east tip.
    expect([pos[0], pos[1]]).toEqual([250, -30]);
  });
});

describe('metre-ticked axes', () => {
  it('ticks the south and west edges at nice distances, below the lowest ground', () => {
    const { object, labels } = buildAxisObjects(grid, 2, 5);
    const texts = labels.map((l) => l.text);
    // The grid spans −500 … 500 m both ways; a step of 200 m gives −400 … 400.
    expect(texts).toEqual(['−400 m', '−200 m', '0 m', '200 m', '400 m', '−400 m', '−200 m', '0 m', '200 m', '400 m', 'E', 'N']);
    const p = object.geometry.getAttribute('position');
    // Lowest ground is 0.1 × −500 + 50 = 0 m, highest 100 m: the frame sits 2 m below, exaggerated ×2.
    for (let i = 0; i < p.count; i++) expect(p.getZ(i)).toBeCloseTo(2 * (0 - 0.02 * 100), 5);
    // First east tick starts on the south edge at east = −400.
    expect([p.getX(4), p.getY(4)]).toEqual([-400, -500]);
  });

  it('chooses 1-2-2.5-5 steps and signs labels', () => {
    expect(niceTicks(-4000, 4000, 6)).toEqual([-4000, -2000, 0, 2000, 4000]);
    expect(niceTicks(0, 1000, 4)).toEqual([0, 250, 500, 750, 1000]);
    expect(niceTicks(3, 3, 4)).toEqual([]);
    expect([-2000, 0, 750, 1500].map(formatAxisTick)).toEqual(['−2 km', '0 m', '750 m', '1.5 km']);
  });
});
