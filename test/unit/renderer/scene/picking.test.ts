import { describe, expect, it } from 'vitest';
import { Mesh, MeshBasicMaterial, PerspectiveCamera, Vector3 } from 'three';
import { isClick, pickGround, toNdc } from '../../../../renderer/scene/picking.ts';
import { buildTerrainGeometry } from '../../../../renderer/scene/terrain-mesh.ts';
import type { ElevationGrid } from '../../../../renderer/scene/elevation-grid.ts';

/** Flat ground at 40 m, 1 km square around the origin. */
function flat(height_m: number): ElevationGrid {
  const size = 21;
  return { width: size, height: size, pixelSize_m: 50, west_m: -500, north_m: 500, heights: new Float32Array(size * size).fill(height_m) };
}

function camera(position: [number, number, number], target: [number, number, number]): PerspectiveCamera {
  const c = new PerspectiveCamera(40, 1.5, 1, 1e6);
  c.up.set(0, 0, 1);
  c.position.set(...position);
  c.lookAt(...target);
  c.updateMatrixWorld();
  return c;
}

describe('ground picking', () => {
  it('returns the analytic ray–plane intersection on flat ground, with exaggeration divided out', () => {
    const mesh = new Mesh(buildTerrainGeometry(flat(40), { exaggeration: 3 }), new MeshBasicMaterial());
    mesh.updateMatrixWorld();
    const cam = camera([-800, -900, 1500], [0, 0, 120]);
    for (const ndc of [{ x: 0, y: 0 }, { x: 0.3, y: -0.2 }, { x: -0.25, y: 0.1 }]) {
      const pick = pickGround(mesh, cam, ndc)!;
      // Ray from the camera through the NDC point, intersected with the plane z = 40 × 3 = 120.
      const dir = new Vector3(ndc.x, ndc.y, 0.5).unproject(cam).sub(cam.position).normalize();
      const t = (120 - cam.position.z) / dir.z;
      const expected = cam.position.clone().addScaledVector(dir, t);
      expect(pick.east_m).toBeCloseTo(expected.x, 3);
      expect(pick.north_m).toBeCloseTo(expected.y, 3);
      expect(pick.height_m).toBeCloseTo(40, 4);
    }
  });

  it('returns null when the ray misses the terrain', () => {
    const mesh = new Mesh(buildTerrainGeometry(flat(0)), new MeshBasicMaterial());
    mesh.updateMatrixWorld();
    expect(pickGround(mesh, camera([0, 0, 1000], [0, 0, 0]), { x: 0.99, y: 0.99 })).toBeNull();
  });

  it('maps pointer positions to normalised device coordinates and tells clicks from drags', () => {
    expect(toNdc(150, 50, { left: 100, top: 0, width: 100, height: 100 })).toEqual({ x: 0, y: 0 });
    expect(toNdc(100, 100, { left: 100, top: 0, width: 100, height: 100 })).toEqual({ x: -1, y: -1 });
    expect(isClick({ x: 10, y: 10 }, { x: 12, y: 12 })).toBe(true);
    expect(isClick({ x: 10, y: 10 }, { x: 20, y: 10 })).toBe(false);
  });
});
