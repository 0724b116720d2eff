/**
 * Terrain frame ↔ longitude/latitude. The GeoTIFF reader maps every DEM into a local east–north frame in
 * metres; this module holds that map for geographic DEMs (one source of truth: the reader calls
 * `geographicToLocal` / `localFrameScale`) and its inverse, and, for projected DEMs, the CRS's projection
 * both ways through proj4js (projection.ts): the DEM's frame is the CRS's own easting/northing in metres.
 * Pure.
 */
import type { GridGeoreference } from './grid.ts';
import { TerrainInputError } from './grid.ts';
import { checkedCrs, makeProjection, projectedCrsFromEpsg, type Projection } from './projection.ts';

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
  /** [longitude, latitude] in degrees → terrain-frame metres: the inverse of toLonLat. */
  fromLonLat(lon_deg: number, lat_deg: number): [number, number];
  /** True when the coordinates are WGS 84 (as RFC 7946 GeoJSON assumes). */
  readonly wgs84: boolean;
  /** The DEM's CRS, e.g. "EPSG:32633", "EPSG:4326", "geographic CRS without an EPSG code", or a user-defined CRS's citation. */
  readonly sourceCrs: string;
  /** What the longitude/latitude refer to, in words. */
  readonly datum: string;
}

/**
 * The projection of a projected terrain (its CRS from the file, else from its EPSG code), or null when the
 * terrain is not projected. Throws TerrainInputError naming the CRS when it cannot be handled.
 */
export function terrainProjection(georeference: GridGeoreference | undefined, source = 'terrain'): Projection | null {
  if (georeference?.model !== 'projected') return null;
  const epsg = georeference.projectedEpsg;
  if (georeference.projectedCrs) return makeProjection(checkedCrs(georeference.projectedCrs, source));
  if (epsg !== undefined) return makeProjection(projectedCrsFromEpsg(epsg, source));
  throw new TerrainInputError(
    `${source}: projected CRS without an EPSG code or projection parameters cannot be converted to longitude/latitude; give the DEM its CRS (gdal_edit.py -a_srs …) or reproject it (gdalwarp -t_srs …)`,
  );
}

/** An Earth-sized figure (semi-major axis within 6 370–6 390 km): Earth CRSs other than WGS 84 need a datum shift. */
const isEarthSized = (a: number) => a > 6.37e6 && a < 6.39e6;

/** WGS 84 per the PROJ string: +datum=WGS84, or +ellps=WGS84 with no +towgs84 (how EPSG codes on the WGS 84 datum come out of the converter). */
function onWgs84(proj: string): boolean {
  return /\+datum=WGS84\b/.test(proj) || (/\+ellps=WGS84\b/.test(proj) && !/\+towgs84=/.test(proj));
}

/**
 * Longitude/latitude of a terrain's frame, or null when the terrain has no georeference (a PNG heightmap,
 * a JSON grid, a GeoTIFF without a CRS). Throws TerrainInputError naming the CRS when the terrain is
 * georeferenced in a CRS this module cannot invert.
 *
 * Supported: geographic DEMs in EPSG:4326 (WGS 84) and geographic DEMs on a sphere without an EPSG code
 * (another body: longitude/latitude on that sphere, as the file gives them); projected DEMs in the
 * projections of projection.ts (PROJECTIONS_CHECKED) on another body (longitude/latitude on that body's
 * sphere or ellipsoid) or on WGS 84 (UTM and others). Earth CRSs on another datum are refused (no datum
 * shifts here).
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
      fromLonLat: (lon, lat) => geographicToLocal(frame, lon, lat),
      wgs84: epsg === 4326,
      sourceCrs: epsg === 4326 ? 'EPSG:4326' : 'geographic CRS without an EPSG code',
      datum:
        epsg === 4326
          ? `WGS 84 longitude/latitude (EPSG:4326), as in the DEM; local metres on a sphere of radius ${sphere}`
          : `longitude/latitude of the DEM's own geographic CRS, on a sphere of radius ${sphere} (not WGS 84)`,
    };
  }
  const p = terrainProjection(georeference, source)!;
  const name = p.crs.name;
  const wgs84 = onWgs84(p.crs.proj4);
  if (!wgs84 && isEarthSized(p.a)) {
    throw new TerrainInputError(
      `${source}: projected CRS ${name} cannot be converted to longitude/latitude on WGS 84 here: it is on another Earth datum (${p.crs.proj4}) and no datum shift is made; reproject the DEM (gdalwarp -t_srs EPSG:4326, or to its UTM zone)`,
    );
  }
  const epsg = georeference.projectedEpsg;
  const utmZone = epsg !== undefined && ((epsg >= 32601 && epsg <= 32660) || (epsg >= 32701 && epsg <= 32760)) ? `UTM zone ${epsg % 100}${epsg < 32700 ? 'N' : 'S'} ` : '';
  const figure = p.a === p.b ? `sphere of radius ${p.a} m` : `ellipsoid a = ${p.a} m, b = ${p.b} m, ${p.crs.planetocentric ? 'planetocentric' : 'planetographic (geodetic)'} latitude`;
  // The reader's frame for a projected DEM is the CRS's own easting/northing, in metres.
  return {
    toLonLat: (e, n) => p.inverse(e, n),
    fromLonLat: (lon, lat) => p.forward(lon, lat),
    wgs84,
    sourceCrs: name,
    datum: wgs84
      ? `WGS 84 longitude/latitude from ${utmZone ? `${utmZone}(${name})` : name}; local metres are the projection's grid metres`
      : `longitude/latitude on the DEM's own body (${figure}; not WGS 84), from ${name}; local metres are the projection's grid metres`,
  };
}
