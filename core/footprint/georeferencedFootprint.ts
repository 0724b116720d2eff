/**
 * Longitude/latitude for a footprint laid on a georeferenced terrain. The footprint's local metres (east,
 * north of the nominal target) are placed in the terrain's frame with the nominal target at `target_m`,
 * the same placement `landreach hazard --study` uses for the safe reachable set, then converted with
 * core/terrain's `terrainLonLat`. Pure; shared by the command line and (later) the desktop app.
 */
import type { ElevationGrid, GridGeoreference } from '../terrain/grid.ts';
import { terrainLonLat, terrainProjection } from '../terrain/georeference.ts';
import { crsIdentity, type CrsIdentity } from '../terrain/crsIdentity.ts';
import { groundFrameOnDem } from '../terrain/groundFrame.ts';

/** Converts local east–north metres (from the nominal target) to [longitude, latitude] in degrees. */
export type LocalToLonLat = (east_m: number, north_m: number) => [number, number];

/** Longitude/latitude for the footprint and what they refer to. */
export interface FootprintLonLat {
  toLonLat: LocalToLonLat;
  /** True when the coordinates are WGS 84, as RFC 7946 assumes. */
  wgs84: boolean;
  /** What the coordinates refer to, in words (e.g. "WGS 84 longitude/latitude (EPSG:4326)"). */
  datum: string;
  /** The body the study is on (e.g. "mars"). */
  body: string;
  /** Anything else a reader must know (e.g. how local metres relate to the DEM's grid). */
  note?: string;
}

/** Millimetres, without a "-0.000". */
const metres = (v: number) => (Math.round(v * 1000) / 1000 + 0).toFixed(3);

/**
 * Null when the terrain has no georeference; throws core/terrain's TerrainInputError (naming the CRS)
 * when its CRS cannot be converted. `body` is the study's planet body ("mars", "moon", "custom").
 */
export function footprintLonLat(grid: Pick<ElevationGrid, 'georeference'>, target_m: readonly [number, number], body: string, source = 'terrain'): FootprintLonLat | null {
  const ref = terrainLonLat(grid.georeference, source);
  if (!ref) return null;
  const [tE, tN] = target_m;
  const ground = groundFrameOnDem(grid.georeference, target_m, source);
  const toLonLat = (e: number, n: number) => ref.toLonLat(...ground.toDem(e, n));
  const notes = [`The nominal target is at ${metres(tE)} m east, ${metres(tN)} m north in the DEM's frame (${ref.sourceCrs}).`];
  const frame = grid.georeference?.localFrame;
  const [a, b, c, d] = ground.jacobian;
  if (a !== 1 || b !== 0 || c !== 0 || d !== 1) {
    const gamma = ground.convergence_rad / (Math.PI / 180);
    // gamma > 0: true north points grid-east, so grid north lies west of true north.
    const north = `grid north is ${Math.abs(gamma).toFixed(4)}° ${gamma > 0 ? 'west' : 'east'} of true north (meridian convergence)`;
    notes.push(
      ground.conformal
        ? `At the target ${north} and grid metres are ${ground.scale.toFixed(6)} × ground metres (point scale); local metres are ground metres, rotated and scaled by these onto the grid (what remains is their change across the footprint).`
        : `At the target ${north}; the projection is not conformal: one ground metre east is (${a.toFixed(6)}, ${c.toFixed(6)}) and one ground metre north is (${b.toFixed(6)}, ${d.toFixed(6)}) grid metres (east, north); local metres are ground metres, mapped onto the grid by this linear map (what remains is its change across the footprint).`,
    );
  } else if (frame) {
    notes.push(
      `The DEM's flat frame is equirectangular about ${frame.originLatitude_deg.toFixed(6)}°, ${frame.originLongitude_deg.toFixed(6)}° on a sphere of radius ${frame.bodyRadius_m} m; its east scale is off by up to ${(100 * frame.maxEastScaleError).toPrecision(2)} % over the DEM.`,
    );
  }
  const studyBody = body.toLowerCase();
  if (ref.wgs84 && studyBody !== 'custom' && studyBody !== 'earth') {
    notes.push(`The DEM is in an Earth CRS (WGS 84) but the study's body is ${body}: the coordinates are the DEM's own.`);
  }
  return {
    toLonLat,
    wgs84: ref.wgs84,
    datum: ref.datum,
    body: ref.wgs84 ? 'earth' : body,
    note: notes.join(' '),
  };
}

/**
 * The footprint in the DEM's own projected CRS: where each local point (east, north of the nominal target,
 * ground metres) lies in the DEM's easting/northing — the same ground frame `footprintLonLat` and
 * `landreach hazard --study` use (core/terrain/groundFrame.ts: DEM offset = J · ground offset) — and how the
 * CRS is named: its registered code when it has one (core/terrain/crsIdentity.ts), else its PROJ string.
 */
export interface FootprintPlace {
  /** Local metres → the DEM CRS's easting, northing (m). */
  toCrs(east_m: number, north_m: number): [number, number];
  /** The nominal target in the DEM's CRS, m. */
  readonly target_m: readonly [number, number];
  /** DEM metres per ground metre at the target, row-major [∂E/∂east, ∂E/∂north, ∂N/∂east, ∂N/∂north]. */
  readonly jacobian: readonly [number, number, number, number];
  /** The DEM's georeference (its CRS travels with rasters written from it). */
  readonly georeference: GridGeoreference;
  /** The CRS's registered code and URI, or null (then `proj4` is all there is). */
  readonly identity: CrsIdentity | null;
  /** The CRS as a PROJ string and a name for readers. */
  readonly proj4: string;
  readonly crsName: string;
}

/**
 * Null unless the terrain is projected (a geographic DEM's frame is not a CRS of its own: its exports keep
 * longitude/latitude). Throws core/terrain's TerrainInputError (naming the CRS) when the CRS cannot be used.
 */
export function footprintPlace(grid: Pick<ElevationGrid, 'georeference'>, target_m: readonly [number, number], source = 'terrain'): FootprintPlace | null {
  const georeference = grid.georeference;
  if (georeference?.model !== 'projected') return null;
  const projection = terrainProjection(georeference, source)!;
  const ground = groundFrameOnDem(georeference, target_m, source);
  return {
    toCrs: (e, n) => ground.toDem(e, n),
    target_m: [target_m[0], target_m[1]],
    jacobian: ground.jacobian,
    georeference,
    identity: crsIdentity(georeference),
    proj4: projection.crs.proj4,
    crsName: projection.crs.name,
  };
}
