/**
 * The default view frames the whole divert — terrain, ignition point, trajectories, footprint — and keeps it
 * framed when the vertical exaggeration changes. Checked with three.js's own projection (an independent
 * perspective camera placed at the pose): every point of the divert lands inside the view.
 */
import { describe, expect, it } from 'vitest';
import { PerspectiveCamera, Vector3 } from 'three';
import { divertBounds, fitPose, poseAlong, presetPose, type CameraPose, type DivertExtent } from '../../../../renderer/scene/view.ts';

const FOV = 40;
const ASPECT = 2;

function inView(pose: CameraPose, point: [number, number, number]): boolean {
  const camera = new PerspectiveCamera(FOV, ASPECT, 0.1, 1e9);
  camera.up.set(0, 0, 1);
  camera.position.set(...pose.position);
  camera.lookAt(new Vector3(...pose.target));
  camera.updateMatrixWorld();
  const p = new Vector3(...point).project(camera);
  return p.z < 1 && Math.abs(p.x) <= 1 && Math.abs(p.y) <= 1;
}

// A 1 km DEM about the target on a datum far below 0 m, an ignition point 2.5 km west and 1.5 km above the
// target's ground, a footprint grid ±4 km (past the DEM).
const ground = -1200;
const extent: DivertExtent = {
  terrain: { west_m: -500, east_m: 500, south_m: -500, north_m: 500, lo_m: ground - 20, hi_m: ground + 20 },
  points: [[-2500, 0, ground + 1500], [-4000, -4000, ground], [4000, 4000, ground]],
};
const divert: [number, number, number][] = [[-2500, 0, ground + 1500], [-4000, -4000, ground], [4000, 4000, ground], [0, 0, ground], [500, -500, ground + 20]];

describe('framing the whole divert', () => {
  it('frames the ignition point, the footprint corners and the terrain in the default oblique view', () => {
    for (const ex of [1, 2, 10]) {
      const b = divertBounds(extent, ex);
      const pose = fitPose(presetPose('oblique', b, FOV, ASPECT), b, FOV, ASPECT);
      for (const [e, n, h] of divert) expect(inView(pose, [e, n, h * ex]), `(${e}, ${n}, ${h}) at ×${ex}`).toBe(true);
    }
  });

  it('keeps it framed, from the same direction, when the exaggeration goes ×2 → ×10 → ×1', () => {
    let b = divertBounds(extent, 2);
    let pose = fitPose(presetPose('oblique', b, FOV, ASPECT), b, FOV, ASPECT);
    const direction = (p: CameraPose) => new Vector3(...p.position).sub(new Vector3(...p.target)).normalize();
    const first = direction(pose);
    for (const ex of [10, 1]) {
      b = divertBounds(extent, ex);
      pose = poseAlong(pose, b, FOV, ASPECT);
      for (const [e, n, h] of divert) expect(inView(pose, [e, n, h * ex]), `(${e}, ${n}, ${h}) at ×${ex}`).toBe(true);
      expect(direction(pose).dot(first)).toBeCloseTo(1, 9);
    }
  });
});
