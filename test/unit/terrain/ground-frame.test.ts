/**
 * The footprint's ground frame on a DEM (core/terrain/groundFrame.ts): a rotation by the meridian
 * convergence and a scale by the point scale on UTM DEMs (values checked against PROJ in
 * test/reference/terrain/gdal-georeference.test.ts), a plain shift elsewhere; and the reachability
 * resampling that uses it.
 */
import { describe, expect, it } from 'vitest';
import { groundFrameOnDem } from '../../../core/terrain/groundFrame.ts';
import { resampleReachability } from '../../../core/terrain/resample.ts';
import { makeGrid } from '../../../core/terrain/grid.ts';
import { gridFactors, transverseMercatorInverse, utmProjection } from '../../../core/terrain/transverse-mercator.ts';

describe('ground frame on a DEM', () => {
  it('is a shift for a DEM in local metres, and its two maps are inverses', () => {
    const f = groundFrameOnDem(undefined, [100, -50]);
    expect([f.convergence_rad, f.scale]).toEqual([0, 1]);
    expect(f.toDem(10, 20)).toEqual([110, -30]);
    expect(f.fromDem(110, -30)).toEqual([10, 20]);
  });

  it('on a UTM DEM, rotates by the convergence and scales by the point scale at the target', () => {
    const target: [number, number] = [420000, 4985000]; // zone 33N, about 14° E, 45° N
    const f = groundFrameOnDem({ model: 'projected', projectedEpsg: 32633, geoTransform: [0, 1, 0, 0, 0, -1] } as never, target);
    const utm = utmProjection(32633)!;
    const [lon, lat] = transverseMercatorInverse(utm, ...target);
    const { convergence_deg, scale } = gridFactors(utm, lon, lat);
    expect(f.convergence_rad).toBeCloseTo((convergence_deg * Math.PI) / 180, 12);
    expect(f.scale).toBeCloseTo(scale, 12);
    // True north, 1000 ground metres: γ east of grid north, k × 1000 grid metres long.
    const [E, N] = f.toDem(0, 1000);
    expect(Math.atan2(E - target[0], N - target[1])).toBeCloseTo(f.convergence_rad, 12);
    expect(Math.hypot(E - target[0], N - target[1])).toBeCloseTo(1000 * f.scale, 9);
    const back = f.fromDem(E, N);
    expect(back[0]).toBeCloseTo(0, 9);
    expect(back[1]).toBeCloseTo(1000, 9);
  });
});

describe('reachability resampled through a frame map', () => {
  it('follows the map: propellant linear in grid x reads as linear in north after a quarter turn', () => {
    // Target grid 3 × 3 of 10 m cells (centres at −10, 0, 10 m), all reachable, propellant = 100 + x.
    const reach = { width: 3, height: 3, reachable: new Uint8Array(9).fill(1), propellant_kg: Float32Array.from({ length: 9 }, (_, k) => 100 + 10 * ((k % 3) - 1)) };
    const spec = { width: 3, height: 3, pixelSizeX_m: 10, pixelSizeY_m: 10, originEast_m: -15, originNorth_m: 15 };
    const terrain = makeGrid({ width: 20, height: 20, pixelSizeX_m: 1, pixelSizeY_m: 1, originEast_m: -10, originNorth_m: 10 }, new Float32Array(400));
    const plain = resampleReachability(reach, spec, terrain);
    // The grid frame turned a quarter turn from the terrain's: grid (x, y) = (north, −east).
    const turned = resampleReachability(reach, spec, terrain, (E, N) => [N, -E]);
    let checked = 0;
    for (let r = 0; r < 20; r++) {
      for (let c = 0; c < 20; c++) {
        const k = r * 20 + c;
        const E = -10 + c + 0.5;
        const N = 10 - r - 0.5;
        expect(plain.reachable[k]).toBe(1);
        expect(turned.reachable[k]).toBe(1);
        expect(plain.propellant_kg[k]).toBeCloseTo(100 + E, 4); // bilinear reproduces a linear field
        expect(turned.propellant_kg[k]).toBeCloseTo(100 + N, 4);
        checked++;
      }
    }
    expect(checked).toBe(400);
  });
});
