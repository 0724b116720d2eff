import { describe, expect, it } from 'vitest';
import { PerspectiveCamera, Vector3 } from 'three';
import { buildTrajectoryGeometry } from '../../../../renderer/scene/trajectory-lines.ts';
import { dropLinePositions, ellipsePositions } from '../../../../renderer/scene/markers.ts';
import { declutter, distanceToGround, fitPose, metresPerPixel, niceLength, northAngle, presetPose, scaleBar } from '../../../../renderer/scene/view.ts';

describe('trajectory geometry', () => {
  const n = 11;
  const samples = {
    time_s: Float64Array.from({ length: n }, (_, i) => i),
    position_m: Float64Array.from({ length: 3 * n }, (_, k) => (k % 3 === 2 ? 100 - 10 * Math.floor(k / 3) : k % 3 === 0 ? 5 * Math.floor(k / 3) : 0)),
    thrust_N: Float64Array.from({ length: 3 * n }, (_, k) => (k % 3 === 0 ? 3000 : k % 3 === 2 ? 4000 : 0)),
  };

  it('draws the path with the base height and exaggeration applied to the vertical only', () => {
    const { path } = buildTrajectoryGeometry(samples, { baseHeight_m: 20, exaggeration: 2, vectorLength_m: 50, thrustMax_N: 10000 });
    const p = path.getAttribute('position');
    expect(p.count).toBe(n);
    expect([p.getX(3), p.getY(3), p.getZ(3)]).toEqual([15, 0, 2 * (20 + 70)]);
  });

  it('draws thrust vectors every k samples and at the end, along the thrust, scaled to thrustMax', () => {
    const { vectors } = buildTrajectoryGeometry(samples, { vectorEvery: 4, vectorLength_m: 50, thrustMax_N: 10000 });
    const v = vectors.getAttribute('position');
    expect(v.count / 2).toBe(4); // samples 0, 4, 8 and the last, 10
    // |T| = 5000 N = half of thrustMax → 25 m long; direction (0.6, 0, 0.8).
    const start = new Vector3(v.getX(2), v.getY(2), v.getZ(2));
    const end = new Vector3(v.getX(3), v.getY(3), v.getZ(3));
    expect(start.toArray()).toEqual([20, 0, 60]);
    const d = end.sub(start);
    expect(d.length()).toBeCloseTo(25, 5);
    expect(d.normalize().toArray().map((x) => +x.toFixed(6))).toEqual([0.6, 0, 0.8]);
  });

  it('rejects inconsistent samples naming the problem', () => {
    expect(() => buildTrajectoryGeometry({ ...samples, thrust_N: new Float64Array(3) }, { vectorLength_m: 1, thrustMax_N: 1 })).toThrow(/3 thrust values for 11 samples \(need 33\)/);
    expect(() => buildTrajectoryGeometry({ ...samples, time_s: Float64Array.from({ length: n }, () => 0) }, { vectorLength_m: 1, thrustMax_N: 1 })).toThrow(/time_s not increasing at sample 1/);
  });
});

describe('markers', () => {
  it('puts every ellipse point on the ellipse with its major axis at the given azimuth from north', () => {
    const a = 400;
    const b = 150;
    const az = 30;
    const pts = ellipsePositions(100, -50, a, b, az, 64, () => 7);
    const u = [Math.sin((az * Math.PI) / 180), Math.cos((az * Math.PI) / 180)];
    for (let k = 0; k < pts.length / 3; k++) {
      const de = pts[3 * k] - 100;
      const dn = pts[3 * k + 1] + 50;
      const along = de * u[0] + dn * u[1];
      const across = de * u[1] - dn * u[0];
      expect((along / a) ** 2 + (across / b) ** 2).toBeCloseTo(1, 6);
      expect(pts[3 * k + 2]).toBe(7);
    }
    // Point 0 is the tip of the major axis: 400 m at 30° east of north.
    expect(pts[0] - 100).toBeCloseTo(200, 4);
    expect(pts[1] + 50).toBeCloseTo(346.4102, 3);
    expect(Array.from(pts.slice(-3))).toEqual(Array.from(pts.slice(0, 3)));
  });

  it('drops a vertical line to the ground', () => {
    expect(Array.from(dropLinePositions(1, 2, 300, 12))).toEqual([1, 2, 300, 1, 2, 12]);
  });
});

describe('view furniture', () => {
  it('picks 1-2-5 scale lengths', () => {
    expect([0.7, 1, 1.9, 2, 4.99, 5, 9.99, 730, 1000, 2600].map(niceLength)).toEqual([0.5, 1, 1, 2, 2, 5, 5, 500, 1000, 2000]);
    expect(scaleBar(10, 120)).toEqual({ length_m: 1000, pixels: 100, label: '1 km' });
    expect(scaleBar(3, 120)).toEqual({ length_m: 200, pixels: 200 / 3, label: '200 m' });
  });

  it('measures the scale-bar distance to the ground plane along the view direction', () => {
    expect(distanceToGround([0, 0, 1000], [0, 0, -1], 100)).toBeCloseTo(900, 10);
    // 30° below the horizon from 500 m above the ground: slant range 500 / sin 30° = 1000 m.
    expect(distanceToGround([0, 0, 600], [Math.cos(Math.PI / 6), 0, -Math.sin(Math.PI / 6)], 100)).toBeCloseTo(1000, 9);
    expect(distanceToGround([0, 0, 600], [1, 0, 0], 100)).toBeNull();
    expect(distanceToGround([0, 0, 50], [0, 0, -1], 100)).toBeNull();
  });

  it('fits the oblique view: every corner inside the margin, and 1 % closer one is outside', () => {
    const bounds = { minEast: -4000, maxEast: 4000, minNorth: -4000, maxNorth: 4000, minZ: -300, maxZ: 3600, focusZ: 30 };
    const aspect = 1.8;
    const pose = fitPose(presetPose('oblique', bounds, 40, aspect), bounds, 40, aspect, 0.9);
    const project = (p: readonly number[]) => {
      const camera = new PerspectiveCamera(40, aspect, 0.1, 1e9);
      camera.up.set(0, 0, 1);
      camera.position.set(p[0], p[1], p[2]);
      camera.lookAt(...pose.target);
      camera.updateMatrixWorld();
      let worst = 0;
      for (const e of [-4000, 4000]) for (const n of [-4000, 4000]) for (const z of [-300, 3600]) {
        const v = new Vector3(e, n, z).project(camera);
        worst = Math.max(worst, Math.abs(v.x), Math.abs(v.y));
      }
      return worst;
    };
    expect(project(pose.position)).toBeLessThanOrEqual(0.9 + 1e-9);
    const closer = pose.position.map((v, i) => pose.target[i] + (v - pose.target[i]) * 0.99);
    expect(project(closer)).toBeGreaterThan(0.9);
  });

  it('orbits around the focus height when given', () => {
    const pose = presetPose('top', { minEast: -1, maxEast: 1, minNorth: -1, maxNorth: 1, minZ: 0, maxZ: 100, focusZ: 10 }, 45, 1);
    expect(pose.target).toEqual([0, 0, 10]);
  });

  it('drops labels closer than the spacing to one already kept', () => {
    const labels = [{ x: 0, y: 0, v: 1 }, { x: 30, y: 0, v: 2 }, { x: 50, y: 0, v: 3 }, { x: 0, y: 49, v: 4 }];
    expect(declutter(labels, 48).map((l) => l.v)).toEqual([1, 3, 4]);
  });

  it('computes ground metres per pixel of a perspective view: 2 d tan(fov/2) / height', () => {
    expect(metresPerPixel(1000, 90, 500)).toBeCloseTo(4, 10);
  });

  it('frames the bounds from above with north up, and obliquely from the south-south-west', () => {
    const bounds = { minEast: -1000, maxEast: 1000, minNorth: -500, maxNorth: 500, minZ: 0, maxZ: 100 };
    const top = presetPose('top', bounds, 45, 2);
    expect(top.target).toEqual([0, 0, 50]);
    expect(top.position.slice(0, 2)).toEqual([0, 0]);
    const oblique = presetPose('oblique', bounds, 45, 2);
    const [dx, dy, dz] = oblique.position.map((v, i) => v - oblique.target[i]);
    expect((Math.atan2(dz, Math.hypot(dx, dy)) * 180) / Math.PI).toBeCloseTo(35, 6);
    expect(dx).toBeLessThan(0);
    expect(dy).toBeLessThan(0);
  });

  it('points the north arrow up in the top view and rotates it with the camera', () => {
    const camera = new PerspectiveCamera(45, 1, 1, 1e5);
    camera.up.set(0, 1, 0);
    camera.position.set(0, 0, 1000);
    camera.lookAt(0, 0, 0);
    camera.updateMatrixWorld();
    expect(northAngle(camera.matrixWorld.elements)).toBeCloseTo(0, 6);
    // Looking north-east from the south-west at low elevation, z up: north appears 45° left of screen-up... 
    // seen from above with screen-up = east, north is 90° anticlockwise (−90°).
    camera.up.set(1, 0, 0);
    camera.position.set(0, 0, 1000);
    camera.lookAt(0, 0, 0);
    camera.updateMatrixWorld();
    expect((northAngle(camera.matrixWorld.elements) * 180) / Math.PI).toBeCloseTo(-90, 6);
  });
});
