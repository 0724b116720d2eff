/**
 * From the footprint's ground frame (true east and north of the nominal target, ground metres) to the DEM's
 * frame and back. For a UTM DEM, grid north differs from true north by the meridian convergence γ and grid
 * metres from ground metres by the point scale k (Snyder 1987, USGS PP 1395, §8); both are taken at the
 * nominal target, which leaves only their change across the footprint (second order in its size):
 *   DEM offset = k · R(γ) · ground offset,  R(γ) = [[cos γ, sin γ], [−sin γ, cos γ]]
 * (γ > 0 when true north points grid-east). Other DEM frames are used as they are (γ = 0, k = 1): a local
 * metre frame, or the geographic reader's frame, which is true east/north at its origin.
 */
import type { GridGeoreference } from './grid.ts';
import { terrainLonLat } from './georeference.ts';
import { gridFactors, utmProjection } from './transverse-mercator.ts';

const DEG = Math.PI / 180;

export interface GroundFrame {
  /** The nominal target in the DEM's frame, m. */
  readonly target_m: readonly [number, number];
  /** Meridian convergence at the target, rad (0 unless UTM). */
  readonly convergence_rad: number;
  /** Grid metres per ground metre at the target (1 unless UTM). */
  readonly scale: number;
  /** Ground offset from the target (east, north) → DEM coordinates. */
  toDem(east_m: number, north_m: number): [number, number];
  /** DEM coordinates → ground offset from the target (east, north). */
  fromDem(demEast_m: number, demNorth_m: number): [number, number];
}

export function groundFrameOnDem(georeference: GridGeoreference | undefined, target_m: readonly [number, number], source = 'terrain'): GroundFrame {
  let gamma = 0;
  let k = 1;
  const utm = georeference?.model === 'projected' ? utmProjection(georeference.projectedEpsg ?? 0) : null;
  if (utm) {
    const [lon, lat] = terrainLonLat(georeference, source)!.toLonLat(target_m[0], target_m[1]);
    const f = gridFactors(utm, lon, lat);
    gamma = f.convergence_deg * DEG;
    k = f.scale;
  }
  const c = Math.cos(gamma);
  const s = Math.sin(gamma);
  const [tE, tN] = target_m;
  return {
    target_m: [tE, tN],
    convergence_rad: gamma,
    scale: k,
    toDem: (e, n) => [tE + k * (c * e + s * n), tN + k * (-s * e + c * n)],
    fromDem: (E, N) => {
      const dE = (E - tE) / k;
      const dN = (N - tN) / k;
      return [c * dE - s * dN, s * dE + c * dN];
    },
  };
}
