import { describe, expect, it } from 'vitest';
import { Color, type Line, type LineBasicMaterial, type Mesh } from 'three';
import { buildMarkerObjects, TRAJECTORY_COLOURS } from '../../../../renderer/scene/scene-objects.ts';
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

  it('adds the landing ellipse only when given', () => {
    const names = (e: boolean) => buildMarkerObjects(grid, 1, { ignition: null, trajectories: [], ellipse: e ? { semiMajor_m: 200, semiMinor_m: 80, azimuth_deg: 30 } : null }).map((o) => o.name);
    expect(names(true)).toContain('landing-ellipse');
    expect(names(false)).not.toContain('landing-ellipse');
  });
});
