/**
 * The footprint's ground frame on a DEM (core/terrain/groundFrame.ts): on a projected DEM the projection's
 * local linear map at the target (for conformal projections a rotation by the meridian convergence and a
 * scale by the point scale), checked here against Snyder's closed forms on a sphere, and against PROJ in
 * test/reference/terrain/gdal-projections.test.ts and gdal-georeference.test.ts; a plain shift elsewhere;
 * and the reachability resampling that uses it.
 */
import { describe, expect, it } from 'vitest';
import { groundFrameOnDem } from '../../../core/terrain/groundFrame.ts';
import { resampleReachability } from '../../../core/terrain/resample.ts';
import { TerrainInputError, makeGrid, type GridGeoreference } from '../../../core/terrain/grid.ts';
import { makeProjection } from '../../../core/terrain/projection.ts';

const DEG = Math.PI / 180;
const R = 1737400; // a Moon-sized sphere (IAU_2015 value as `gdalsrsinfo IAU_2015:30100` prints it)

/** A projected georeference in the given PROJ string, and the target (lon, lat) in its frame. */
function onProjection(proj: string, lon: number, lat: number): { geo: GridGeoreference; target: [number, number] } {
  const crs = { proj4: proj, name: 'test CRS' };
  return { geo: { model: 'projected', geoTransform: [0, 1, 0, 0, 0, -1], projectedCrs: crs }, target: makeProjection(crs).forward(lon, lat) };
}

describe('ground frame on a DEM', () => {
  it('is a shift for a DEM in local metres, and its two maps are inverses', () => {
    const f = groundFrameOnDem(undefined, [100, -50]);
    expect([f.convergence_rad, f.scale]).toEqual([0, 1]);
    expect(f.jacobian).toEqual([1, 0, 0, 1]);
    expect(f.toDem(10, 20)).toEqual([110, -30]);
    expect(f.fromDem(110, -30)).toEqual([10, 20]);
  });

  it('transverse Mercator on a sphere: convergence and point scale of Snyder\'s closed forms', () => {
    // Snyder (1987), USGS PP 1395, §8, sphere: k = k0/√(1 − B²), B = cos φ sin(λ − λ0); the meridian
    // convergence is atan(tan(λ − λ0) sin φ) (formulas from memory; PROJ holds the same frames in the
    // reference tests). East of the central meridian true north points grid-west: our angle is negative.
    const k0 = 0.9999;
    const { geo, target } = onProjection(`+proj=tmerc +lat_0=10 +lon_0=20 +k_0=${k0} +x_0=100 +y_0=200 +R=${R}`, 21.5, 35);
    const f = groundFrameOnDem(geo, target);
    const dLon = 1.5 * DEG, phi = 35 * DEG;
    const B = Math.cos(phi) * Math.sin(dLon);
    expect(f.conformal).toBe(true);
    expect(f.scale).toBeCloseTo(k0 / Math.sqrt(1 - B * B), 9);
    expect(f.convergence_rad).toBeCloseTo(-Math.atan(Math.tan(dLon) * Math.sin(phi)), 9);
    // True north, 1000 ground metres: at the convergence angle, k × 1000 grid metres long; and back.
    const [E, N] = f.toDem(0, 1000);
    expect(Math.atan2(E - target[0], N - target[1])).toBeCloseTo(f.convergence_rad, 12);
    expect(Math.hypot(E - target[0], N - target[1])).toBeCloseTo(1000 * f.scale, 6);
    const back = f.fromDem(E, N);
    expect(back[0]).toBeCloseTo(0, 9);
    expect(back[1]).toBeCloseTo(1000, 9);
  });

  it('south polar stereographic on a sphere: conformal, k = 2k0/(1 − sin φ) (Snyder eq. 21-4, south pole)', () => {
    const { geo, target } = onProjection(`+proj=stere +lat_0=-90 +lon_0=45 +k_0=1 +R=${R}`, 30, -85);
    const f = groundFrameOnDem(geo, target);
    expect(f.conformal).toBe(true);
    expect(f.scale).toBeCloseTo(2 / (1 - Math.sin(-85 * DEG)), 9);
  });

  it('equirectangular and sinusoidal on a sphere: east and north scale differently, or shear (not conformal)', () => {
    // Equirectangular with true scale at φ1: x = R (λ − λ0) cos φ1, y = R φ, so one ground metre east
    // (R cos φ dλ) is cos φ1/cos φ grid metres, one metre north is one (Snyder §12).
    const eqc = onProjection(`+proj=eqc +lat_ts=-4.5 +lon_0=137.4 +R=${R}`, 137.9, 30);
    const fe = groundFrameOnDem(eqc.geo, eqc.target);
    expect(fe.conformal).toBe(false);
    const expected = [Math.cos(-4.5 * DEG) / Math.cos(30 * DEG), 0, 0, 1];
    fe.jacobian.forEach((v, k) => expect(v).toBeCloseTo(expected[k], 8));
    // Sinusoidal: x = R (λ − λ0) cos φ, y = R φ (Snyder §30): ∂x/∂east = 1, ∂x/∂north = −(λ − λ0) sin φ,
    // ∂y/∂east = 0, ∂y/∂north = 1.
    const sinu = onProjection(`+proj=sinu +lon_0=77 +R=${R}`, 79, -40);
    const fs = groundFrameOnDem(sinu.geo, sinu.target);
    const shear = [1, -(2 * DEG) * Math.sin(-40 * DEG), 0, 1];
    fs.jacobian.forEach((v, k) => expect(v).toBeCloseTo(shear[k], 8));
    // The two maps stay inverses when the map shears.
    const back = fs.fromDem(...fs.toDem(1234, -5678));
    expect(back[0]).toBeCloseTo(1234, 7);
    expect(back[1]).toBeCloseTo(-5678, 7);
  });

  it('refuses, naming the target and the CRS, a target at the pole or outside the projection', () => {
    const pole = onProjection(`+proj=stere +lat_0=-90 +lon_0=0 +k_0=1 +R=${R}`, 0, -90);
    expect(() => groundFrameOnDem(pole.geo, pole.target, 'dem.tif')).toThrow(TerrainInputError);
    expect(() => groundFrameOnDem(pole.geo, pole.target, 'dem.tif')).toThrow(/dem\.tif: the nominal target .* in test CRS\) is at a pole/);
    // Orthographic: a point beyond the visible hemisphere's rim (more than R from the centre) has no lon/lat.
    const ortho = onProjection(`+proj=ortho +lat_0=0 +lon_0=0 +R=${R}`, 0, 0);
    expect(() => groundFrameOnDem(ortho.geo, [1.5 * R, 0], 'dem.tif')).toThrow(/outside the projection's domain/);
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
