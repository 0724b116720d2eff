/**
 * Terrain frame ↔ longitude/latitude. The GeoTIFF reader maps every DEM into a local east–north frame in
 * metres; this module holds that map for geographic DEMs (one source of truth: the reader calls
 * `geographicToLocal` / `localFrameScale`) and its inverse, and the inverse of the projected CRSs whose
 * longitude/latitude this program can compute (UTM zones on WGS 84). Pure.
 */
import type { GridGeoreference } from './grid.ts';
import { TerrainInputError } from './grid.ts';
import { transverseMercatorInverse, utmProjection } from './transverse-mercator.ts';

const DEG = Math.PI / 180;

/** WGS 84 semi-major axis, m: the reader's default body radius for EPSG:4326 DEMs. */
export const WGS84_SEMI_MAJOR_AXIS_M = 6378137;

/** The flat local frame of a geographic DEM: origin (degrees) and the sphere's radius (m). */
export interface GeographicFrame {
  readonly originLatitude_deg: number;
  readonly originLongitude_deg: number;
  readonly bodyRadius_m: number;
}

/**
 * Metres per degree east and north in the flat (equirectangular) local frame:
 * east = R cos φ0 (λ − λ0), north = R (φ − φ0), angles in radians. The grid stays regular in it; meridian
 * convergence is ignored (the reader reports the worst east-scale error over the grid).
 */
export function localFrameScale(frame: GeographicFrame): { east_m_per_deg: number; north_m_per_deg: number } {
  const north = frame.bodyRadius_m * DEG;
  return { east_m_per_deg: north * Math.cos(frame.originLatitude_deg * DEG), north_m_per_deg: north };
}

/** [longitude, latitude] (degrees) → [east, north] (m) in the frame. */
export function geographicToLocal(frame: GeographicFrame, lon_deg: number, lat_deg: number): [number, number] {
  const s = localFrameScale(frame);
  return [s.east_m_per_deg * (lon_deg - frame.originLongitude_deg), s.north_m_per_deg * (lat_deg - frame.originLatitude_deg)];
}

/** [east, north] (m) in the frame → [longitude, latitude] (degrees): the exact inverse of geographicToLocal. */
export function localToGeographic(frame: GeographicFrame, east_m: number, north_m: number): [number, number] {
  const s = localFrameScale(frame);
  return [frame.originLongitude_deg + east_m / s.east_m_per_deg, frame.originLatitude_deg + north_m / s.north_m_per_deg];
}

/** Longitude/latitude for points of a georeferenced terrain, and what those coordinates refer to. */
export interface TerrainLonLat {
  /** Terrain-frame metres (the grid's east/north frame) → [longitude, latitude] in degrees. */
  toLonLat(east_m: number, north_m: number): [number, number];
  /** True when the coordinates are WGS 84 (as RFC 7946 GeoJSON assumes). */
  readonly wgs84: boolean;
  /** The DEM's CRS, e.g. "EPSG:32633", "EPSG:4326", "geographic CRS without an EPSG code". */
  readonly sourceCrs: string;
  /** What the longitude/latitude refer to, in words. */
  readonly datum: string;
}

/**
 * Longitude/latitude of a terrain's frame, or null when the terrain has no georeference (a PNG heightmap,
 * a JSON grid, a GeoTIFF without a CRS). Throws TerrainInputError naming the CRS when the terrain is
 * georeferenced in a CRS this module cannot invert.
 *
 * Supported: geographic DEMs in EPSG:4326 (WGS 84) and geographic DEMs on a sphere without an EPSG code
 * (another body: longitude/latitude on that sphere, as the file gives them); projected DEMs in UTM zones on
 * WGS 84 (EPSG:32601–32660, 32701–32760).
 */
export function terrainLonLat(georeference: GridGeoreference | undefined, source = 'terrain'): TerrainLonLat | null {
  if (!georeference || georeference.model === 'none') return null;
  if (georeference.model === 'geographic') {
    const frame = georeference.localFrame;
    if (!frame) throw new TerrainInputError(`${source}: geographic georeference without its local frame (origin and body radius); read the DEM with readGeoTiff`);
    const epsg = georeference.geographicEpsg;
    if (epsg !== undefined && epsg !== 4326) {
      throw new TerrainInputError(
        `${source}: geographic CRS EPSG:${epsg} is not WGS 84 (EPSG:4326), so its longitude/latitude cannot be written as GeoJSON coordinates; reproject the DEM (gdalwarp -t_srs EPSG:4326)`,
      );
    }
    const sphere = `${frame.bodyRadius_m} m`;
    return {
      toLonLat: (e, n) => localToGeographic(frame, e, n),
      wgs84: epsg === 4326,
      sourceCrs: epsg === 4326 ? 'EPSG:4326' : 'geographic CRS without an EPSG code',
      datum:
        epsg === 4326
          ? `WGS 84 longitude/latitude (EPSG:4326), as in the DEM; local metres on a sphere of radius ${sphere}`
          : `longitude/latitude of the DEM's own geographic CRS, on a sphere of radius ${sphere} (not WGS 84)`,
    };
  }
  const epsg = georeference.projectedEpsg;
  const utm = epsg === undefined ? null : utmProjection(epsg);
  if (!utm) {
    throw new TerrainInputError(
      `${source}: projected CRS ${epsg === undefined ? 'without an EPSG code' : `EPSG:${epsg}`} cannot be converted to longitude/latitude here (supported: UTM zones on WGS 84, EPSG:32601–32660 and 32701–32760, and geographic EPSG:4326); reproject the DEM (gdalwarp -t_srs EPSG:4326, or to its UTM zone)`,
    );
  }
  // The reader's frame for a projected DEM is the CRS's own easting/northing in metres (UTM is in metres).
  return {
    toLonLat: (e, n) => transverseMercatorInverse(utm, e, n),
    wgs84: true,
    sourceCrs: `EPSG:${epsg}`,
    datum: `WGS 84 longitude/latitude from UTM zone ${utm.zone}${utm.hemisphere === 'north' ? 'N' : 'S'} (EPSG:${epsg}); local metres are UTM grid metres`,
  };
}
