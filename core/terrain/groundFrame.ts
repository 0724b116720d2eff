/**
 * From the footprint's ground frame (true east and north of the nominal target, ground metres on the
 * body) to the DEM's frame and back. For a projected DEM the map is the projection's local linear map at
 * the nominal target, its Jacobian J = ∂(E, N)/∂(east, north): central differences of the projection's
 * forward transform (proj4js, projection.ts) over one ground metre east (Δλ = 1/(N cos φ)) and north
 * (Δφ = 1/M), with M, N the body's radii of curvature. Only J's change across the footprint is left out
 * (second order in its size, checked against PROJ in test/reference/terrain/gdal-projections.test.ts):
 *   DEM offset = J · ground offset.
 * For a conformal projection (transverse Mercator, UTM, polar stereographic) J = k·R(γ), the point scale k
 * and the meridian convergence γ (Snyder 1987, USGS PP 1395, §8); equirectangular, sinusoidal and
 * orthographic frames also scale east and north differently, or shear. Other DEM frames are used as they
 * are (J = identity): a local metre frame, or the geographic reader's frame, which is true east/north at
 * its origin.
 */
import type { GridGeoreference } from './grid.ts';
import { TerrainInputError } from './grid.ts';
import { terrainProjection } from './georeference.ts';
import { radiiOfCurvature } from './projection.ts';

const DEG = Math.PI / 180;

export interface GroundFrame {
  /** The nominal target in the DEM's frame, m. */
  readonly target_m: readonly [number, number];
  /**
   * DEM metres per ground metre at the target, row-major [∂E/∂east, ∂E/∂north, ∂N/∂east, ∂N/∂north]
   * (identity unless the DEM is projected).
   */
  readonly jacobian: readonly [number, number, number, number];
  /** Angle from grid north to true north at the target, rad, > 0 when true north points grid-east (0 unless projected). */
  readonly convergence_rad: number;
  /** Grid metres per ground metre due north at the target (1 unless projected; the point scale of a conformal projection). */
  readonly scale: number;
  /** True when J is a rotation times a scale (to 1e-7, above the finite differences' rounding): a conformal projection, or no projection. */
  readonly conformal: boolean;
  /** Ground offset from the target (east, north) → DEM coordinates. */
  toDem(east_m: number, north_m: number): [number, number];
  /** DEM coordinates → ground offset from the target (east, north). */
  fromDem(demEast_m: number, demNorth_m: number): [number, number];
}

/** J at the target of a projected DEM; throws TerrainInputError when it cannot be formed there. */
function projectedJacobian(georeference: GridGeoreference, target_m: readonly [number, number], source: string): [number, number, number, number] {
  const p = terrainProjection(georeference, source)!;
  const [lon, lat] = p.inverseGeodetic(target_m[0], target_m[1]);
  const where = `the nominal target (${target_m[0]} m E, ${target_m[1]} m N in ${p.crs.name})`;
  // proj4js may answer a point outside the projection's domain with a clamped one (orthographic: the rim)
  // instead of NaN: require the round trip to come back (to 1 mm, far above its rounding).
  const [backE, backN] = Number.isFinite(lon) && Number.isFinite(lat) ? p.forwardGeodetic(lon, lat) : [NaN, NaN];
  if (!(Math.hypot(backE - target_m[0], backN - target_m[1]) < 1e-3)) {
    throw new TerrainInputError(`${source}: ${where} is outside the projection's domain (no longitude/latitude there); give a target on the DEM`);
  }
  const cosLat = Math.cos(lat * DEG);
  if (cosLat < 1e-9) throw new TerrainInputError(`${source}: ${where} is at a pole, where east and north are undefined; move the target off the pole`);
  const { M, N } = radiiOfCurvature(p.a, p.b, lat);
  // One ground metre: small enough that the truncation (≈ h²/R² relative) is nil, large enough that
  // rounding of coordinates of up to 10⁷ m (≈ 10⁻⁹ m) stays below 10⁻⁸ of it.
  const dLon = 1 / (N * cosLat) / DEG;
  const dLat = 1 / M / DEG;
  const [eE1, eN1] = p.forwardGeodetic(lon + dLon / 2, lat);
  const [eE0, eN0] = p.forwardGeodetic(lon - dLon / 2, lat);
  const [nE1, nN1] = p.forwardGeodetic(lon, lat + dLat / 2);
  const [nE0, nN0] = p.forwardGeodetic(lon, lat - dLat / 2);
  const J: [number, number, number, number] = [eE1 - eE0, nE1 - nE0, eN1 - eN0, nN1 - nN0];
  const det = J[0] * J[3] - J[1] * J[2];
  if (!J.every(Number.isFinite) || !(det > 0)) {
    throw new TerrainInputError(`${source}: ${where} is where the projection ${p.crs.name} is singular or folded (Jacobian ${J.map((v) => v.toPrecision(6)).join(', ')}); give a target well inside the DEM's projection`);
  }
  return J;
}

export function groundFrameOnDem(georeference: GridGeoreference | undefined, target_m: readonly [number, number], source = 'terrain'): GroundFrame {
  const J = georeference?.model === 'projected' ? projectedJacobian(georeference, target_m, source) : ([1, 0, 0, 1] as [number, number, number, number]);
  const [a, b, c, d] = J;
  const det = a * d - b * c;
  const [tE, tN] = target_m;
  const scaleNorth = Math.hypot(b, d);
  const conformal = Math.abs(a - d) <= 1e-7 * scaleNorth && Math.abs(b + c) <= 1e-7 * scaleNorth;
  return {
    target_m: [tE, tN],
    jacobian: [a, b, c, d],
    convergence_rad: Math.atan2(b, d),
    scale: scaleNorth,
    conformal,
    toDem: (e, n) => [tE + a * e + b * n, tN + c * e + d * n],
    fromDem: (E, N) => {
      const dE = E - tE;
      const dN = N - tN;
      return [(d * dE - b * dN) / det, (-c * dE + a * dN) / det];
    },
  };
}
