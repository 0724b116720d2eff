/**
 * Projected CRSs of DEMs, through maintained libraries: `geotiff-geokeys-to-proj4` turns a GeoTIFF's
 * GeoKeys (an EPSG code, or user-defined keys as GDAL writes them for IAU_2015 codes and PROJ strings)
 * into a PROJ string, and `proj4` (proj4js) does the projection both ways between the CRS's easting/
 * northing and longitude/latitude on the CRS's own body (its sphere or ellipsoid, no datum shift).
 *
 * Only projection methods whose round trip is checked against GDAL/PROJ in
 * test/reference/terrain/gdal-projections.test.ts are accepted (PROJECTIONS_CHECKED); any other CRS is
 * refused with a TerrainInputError naming it, when the DEM is read, before anything is computed. Pure.
 */
import proj4 from 'proj4';
import { toProj4 } from 'geotiff-geokeys-to-proj4';
import { TerrainInputError } from './grid.ts';

const DEG = Math.PI / 180;

/** PROJ projection names this program accepts, each checked against GDAL/PROJ on Mars- and Moon-sized bodies (and UTM / Lambert conformal conic on Earth). */
export const PROJECTIONS_CHECKED: Readonly<Record<string, string>> = Object.freeze({
  tmerc: 'transverse Mercator',
  stere: 'polar stereographic',
  eqc: 'equirectangular',
  sinu: 'sinusoidal',
  ortho: 'orthographic',
  lcc: 'Lambert conformal conic',
});

/** GeoTIFF ProjCoordTransGeoKey codes (OGC GeoTIFF 1.1, Annex / GeoTIFF 1.0 §6.3.3.3) whose keys we correct below. */
const CT_POLAR_STEREOGRAPHIC = 15;
const CT_EQUIRECTANGULAR = 17;
/** GeoTIFF "user-defined" code. */
const USER_DEFINED = 32767;

/** A projected CRS as this program keeps it: a PROJ string and a name for messages. */
export interface ProjectedCrs {
  /** PROJ string (as proj4js reads it). */
  readonly proj4: string;
  /** e.g. "EPSG:32633" or the file's citation "Moon (2015) - Sphere / Ocentric / South Polar". */
  readonly name: string;
  /**
   * True when the CRS's latitudes are planetocentric on an ellipsoid (the IAU "Ocentric" CRSs): PROJ strings
   * cannot say it and proj4js's latitudes are geodetic (planetographic), so makeProjection converts.
   */
  readonly planetocentric?: boolean;
  /**
   * The GeoKeys the CRS was read from (by name, as geotiff.js gives them), kept so that rasters written in
   * the DEM's CRS (tiff-writer.ts) carry the very keys GDAL reads the DEM with.
   */
  readonly geoKeys?: Readonly<Record<string, unknown>>;
}

type Params = Map<string, string | true>;

function parseProj(def: string): Params {
  const m: Params = new Map();
  for (const tok of def.trim().split(/\s+/)) {
    const t = tok.replace(/^\+/, '');
    const eq = t.indexOf('=');
    if (eq < 0) m.set(t, true);
    else m.set(t.slice(0, eq), t.slice(eq + 1));
  }
  return m;
}

function writeProj(m: Params): string {
  return [...m].map(([k, v]) => (v === true ? `+${k}` : `+${k}=${v}`)).join(' ');
}

/**
 * Corrections to geotiff-geokeys-to-proj4 2024.4.13 for user-defined keys, following the GeoTIFF 1.1
 * meaning of the keys (and what GDAL writes and reads back, checked by the reference tests):
 * - Polar stereographic (CT 15): ProjStraightVertPoleLongGeoKey is the longitude down from the pole
 *   (+lon_0; the converter drops it) and ProjNatOriginLatGeoKey is the latitude of true scale: ±90 is
 *   variant A (scale k at the pole), anything else is variant B (+lat_0=±90 +lat_ts=φ; the converter puts φ
 *   in +lat_0, a different projection).
 * - Equirectangular (CT 17): ProjStdParallel1GeoKey is the latitude of true scale, which proj4js reads as
 *   +lat_ts (the converter writes +lat_1, which proj4js's eqc ignores).
 */
function correctUserDefined(m: Params, keys: Record<string, unknown>): void {
  const ct = Number(keys.ProjCoordTransGeoKey);
  if (ct === CT_POLAR_STEREOGRAPHIC && m.get('proj') === 'stere') {
    const poleLon = Number(keys.ProjStraightVertPoleLongGeoKey ?? 0);
    const trueScaleLat = Number(keys.ProjNatOriginLatGeoKey ?? 90);
    m.set('lon_0', String(poleLon));
    if (Math.abs(trueScaleLat) !== 90) {
      m.set('lat_0', trueScaleLat < 0 ? '-90' : '90');
      m.set('lat_ts', String(trueScaleLat));
      m.delete('k_0');
    }
  }
  if (ct === CT_EQUIRECTANGULAR && m.get('proj') === 'eqc' && m.has('lat_1')) {
    m.set('lat_ts', m.get('lat_1')!);
    m.delete('lat_1');
  }
}

/** GeoKeys that define a horizontal CRS (model type, citations, geographic and projected keys): not the raster type nor vertical keys. */
const CRS_KEY = /^(GTModelType|GTCitation|Geog|Geographic|Geodetic|PrimeMeridian|Ellipsoid|Projected|PCS|Projection|Proj)/;

function crsName(keys: Record<string, unknown>): string {
  const code = Number(keys.ProjectedCSTypeGeoKey);
  if (Number.isInteger(code) && code > 0 && code !== USER_DEFINED) return `EPSG:${code}`;
  const citation = typeof keys.GTCitationGeoKey === 'string' ? keys.GTCitationGeoKey.replace(/\|$/, '').trim() : '';
  return citation && citation !== 'unknown' ? `user-defined CRS "${citation}"` : 'user-defined CRS';
}

/**
 * The projected CRS of a GeoTIFF from its GeoKeys (GTModelTypeGeoKey 1), or a TerrainInputError naming it
 * when it cannot be handled: no definition, a conversion the library does not know, or a projection
 * method outside PROJECTIONS_CHECKED.
 */
export function projectedCrsFromGeoKeys(keys: Record<string, unknown>, source: string): ProjectedCrs {
  const name = crsName(keys);
  const refuse = (why: string): never => {
    throw new TerrainInputError(
      `${source}: projected CRS ${name} cannot be used: ${why}; reproject the DEM to one of ${describeChecked()} (gdalwarp -t_srs …), or to geographic longitude/latitude`,
    );
  };
  const code = Number(keys.ProjectedCSTypeGeoKey);
  const userDefined = !(Number.isInteger(code) && code > 0 && code !== USER_DEFINED);
  if (userDefined && keys.ProjCoordTransGeoKey === undefined) refuse('the file gives neither an EPSG code nor projection parameters (ProjCoordTransGeoKey)');
  let result: ReturnType<typeof toProj4>;
  try {
    // The library's key type lists every key as required; the file gives some of them.
    result = toProj4(keys as unknown as Parameters<typeof toProj4>[0]);
  } catch (err) {
    return refuse(`the GeoKeys cannot be converted (${err instanceof Error ? err.message : String(err)})`);
  }
  // bothGCSAndPCSAreSet is raised for every user-defined projected CRS (GDAL writes GeographicTypeGeoKey
  // 32767 beside ProjectedCSTypeGeoKey 32767); the PROJ string is still the projected one, checked below.
  const errors = Object.entries(result.errors ?? {}).filter(([k]) => k !== 'bothGCSAndPCSAreSet' && !k.startsWith('Vertical') && !k.startsWith('vertical'));
  if (errors.length > 0) refuse(`the GeoKeys are not understood (${errors.map(([k, v]) => `${k} ${String(v)}`).join(', ')})`);
  if (result.isGCS) refuse('its GeoKeys describe a geographic CRS although GTModelTypeGeoKey says projected');
  if (result.coordinatesUnits !== 'metre') refuse(`its coordinates are in ${result.coordinatesUnits}, not a length`);
  const m = parseProj(result.proj4);
  if (userDefined) correctUserDefined(m, keys);
  m.delete('axis'); // east, north is what a north-up GeoTIFF means
  // GeoKeys cannot say that latitudes are planetocentric; the IAU CRSs say it in their names ("Ocentric"),
  // which GDAL writes into the citations and reads back the same way. It matters only on an ellipsoid.
  const citations = [keys.GTCitationGeoKey, keys.GeogCitationGeoKey, keys.PCSCitationGeoKey].filter((c) => typeof c === 'string').join(' ');
  const a = Number(m.get('a')), b = Number(m.get('b'));
  const planetocentric = /\bocentric\b/i.test(citations) && Number.isFinite(a) && Number.isFinite(b) && a !== b;
  const crsKeys = Object.fromEntries(Object.entries(keys).filter(([k]) => CRS_KEY.test(k)));
  return checkedCrs({ proj4: writeProj(m), name, ...(planetocentric ? { planetocentric: true } : {}), geoKeys: crsKeys }, source);
}

/** The checked projection methods in words, for messages. */
export const CHECKED_PROJECTIONS_TEXT = [...new Set(Object.values(PROJECTIONS_CHECKED))].join(', ');
const describeChecked = () => CHECKED_PROJECTIONS_TEXT;

/** The CRS itself, refused (TerrainInputError naming it) unless its method is in PROJECTIONS_CHECKED and proj4js parses it. */
export function checkedCrs(crs: ProjectedCrs, source: string): ProjectedCrs {
  const method = String(parseProj(crs.proj4).get('proj') ?? '');
  if (!(method in PROJECTIONS_CHECKED)) {
    throw new TerrainInputError(
      `${source}: projected CRS ${crs.name} uses the projection "${method || 'none'}" (${crs.proj4}), which is not among those checked against GDAL/PROJ (${describeChecked()}); reproject the DEM to one of them (gdalwarp -t_srs …)`,
    );
  }
  try {
    makeProjection(crs);
  } catch (err) {
    throw new TerrainInputError(`${source}: projected CRS ${crs.name} (${crs.proj4}) cannot be set up: ${err instanceof Error ? err.message : String(err)}; reproject the DEM (gdalwarp -t_srs …)`);
  }
  return crs;
}

/** The projected CRS of an EPSG code, through the same converter (e.g. UTM zones, EPSG:2227), checked as above. */
export function projectedCrsFromEpsg(epsg: number, source: string): ProjectedCrs {
  return projectedCrsFromGeoKeys({ GTModelTypeGeoKey: 1, ProjectedCSTypeGeoKey: epsg }, source);
}

/** A projected CRS ready for use: frame metres ↔ longitude/latitude on its own body, and its figure. */
export interface Projection {
  readonly crs: ProjectedCrs;
  /** Semi-major and semi-minor axes of the CRS's body, m. */
  readonly a: number;
  readonly b: number;
  /** Metres per CRS unit (1 for metres; 0.3048006096 for US survey feet). */
  readonly unit_m: number;
  /** [longitude, latitude] (degrees, latitude as the CRS defines it) → [easting, northing] in metres. */
  forward(lon_deg: number, lat_deg: number): [number, number];
  /** [easting, northing] in metres → [longitude, latitude] (degrees, latitude as the CRS defines it). */
  inverse(east_m: number, north_m: number): [number, number];
  /** As forward, with the geodetic (planetographic) latitude whatever the CRS's: for ground metres (M, N). */
  forwardGeodetic(lon_deg: number, lat_deg: number): [number, number];
  /** As inverse, giving the geodetic (planetographic) latitude. */
  inverseGeodetic(east_m: number, north_m: number): [number, number];
}

/** Keys of a PROJ string that define the body (figure and datum), copied to the geographic CRS. */
const FIGURE_KEYS = ['a', 'b', 'R', 'rf', 'f', 'es', 'e', 'ellps', 'datum', 'towgs84', 'pm'];

/**
 * Sets a PROJ string up for proj4js 2.22.0, without changing the projection:
 * - the false easting/northing (+x_0, +y_0, metres in PROJ) are taken out and added by makeProjection:
 *   proj4js's sinusoidal forward leaves them out while its inverse subtracts them (and without them its
 *   inverse returns NaN), so applying the offset ourselves is the same map for every method;
 * - transverse Mercator: proj4js's default (Poder/Engsager) refuses a sphere, its "+approx" series is exact
 *   on one; on an ellipsoid the default is kept (the converter adds +approx to every user-defined tmerc).
 */
function forProj4js(def: string): { def: string; x0: number; y0: number } {
  const m = parseProj(def);
  const x0 = Number(m.get('x_0') ?? 0);
  const y0 = Number(m.get('y_0') ?? 0);
  m.set('x_0', '0');
  m.set('y_0', '0');
  if (m.get('proj') === 'tmerc') {
    m.set('approx', true);
    const sphere = (proj4.Proj(writeProj(m)) as unknown as { es: number }).es === 0;
    if (!sphere) m.delete('approx');
  }
  return { def: writeProj(m), x0, y0 };
}

export function makeProjection(crs: ProjectedCrs): Projection {
  const { def, x0, y0 } = forProj4js(crs.proj4);
  if (!Number.isFinite(x0) || !Number.isFinite(y0)) throw new TerrainInputError(`projected CRS ${crs.name}: false easting/northing ${x0}, ${y0} are not numbers`);
  const m = parseProj(def);
  const geo: Params = new Map([['proj', 'longlat']]);
  for (const k of FIGURE_KEYS) if (m.has(k)) geo.set(k, m.get(k)!);
  geo.set('no_defs', true);
  // Same body on both sides, so proj4js applies no datum shift: longitude/latitude are the CRS's own.
  const conv = proj4(writeProj(geo), def);
  const P = proj4.Proj(def) as unknown as { a: number; b: number; to_meter?: number };
  const unit = P.to_meter ?? 1;
  const forwardGeodetic = (lon: number, lat: number): [number, number] => {
    const [x, y] = conv.forward([lon, lat]);
    return [x0 + x * unit, y0 + y * unit];
  };
  const inverseGeodetic = (e: number, n: number): [number, number] => {
    const [lon, lat] = conv.inverse([(e - x0) / unit, (n - y0) / unit]);
    return [lon, lat];
  };
  // Planetocentric ψ and geodetic φ on the ellipsoid: tan ψ = (b²/a²) tan φ (Snyder 1987, eq. 3-28).
  const q = (P.b * P.b) / (P.a * P.a);
  const toCentric = (lat: number) => Math.atan(q * Math.tan(lat * DEG)) / DEG;
  const toGeodetic = (lat: number) => Math.atan(Math.tan(lat * DEG) / q) / DEG;
  return {
    crs,
    a: P.a,
    b: P.b,
    unit_m: unit,
    forwardGeodetic,
    inverseGeodetic,
    forward: crs.planetocentric ? (lon, lat) => forwardGeodetic(lon, toGeodetic(lat)) : forwardGeodetic,
    inverse: crs.planetocentric
      ? (e, n) => {
        const [lon, lat] = inverseGeodetic(e, n);
        return [lon, toCentric(lat)];
      }
      : inverseGeodetic,
  };
}

/**
 * Radii of curvature of the body at latitude φ: meridian M = a(1 − e²)/(1 − e² sin²φ)^{3/2} and prime
 * vertical N = a/(1 − e² sin²φ)^{1/2} (Snyder 1987, USGS PP 1395, eqs. 4-18, 4-20); both R on a sphere.
 */
export function radiiOfCurvature(a: number, b: number, lat_deg: number): { M: number; N: number } {
  const e2 = 1 - (b * b) / (a * a);
  const w = 1 - e2 * Math.sin(lat_deg * DEG) ** 2;
  return { M: (a * (1 - e2)) / w ** 1.5, N: a / Math.sqrt(w) };
}
