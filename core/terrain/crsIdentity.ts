/**
 * The registered identity of a DEM's CRS, for exports that name it (JSON-FG `coordRefSys`): an EPSG code, or
 * an IAU_2015 code recognised from the name GDAL writes into the GeoTIFF's citation — GeoKeys cannot carry
 * an IAU code, so GDAL writes such a CRS as user-defined keys — with every parameter of the registered
 * definition (iauCrs.generated.ts, from PROJ's database) checked against the file's before the code is used.
 * URIs follow the OGC CRS register's form, http://www.opengis.net/def/crs/{authority}/{version}/{code}
 * (OGC 21-045r1 §7.5 examples for EPSG; "IAU/2015" as GDAL's JSON-FG writer and PROJ use it). Pure.
 */
import type { GridGeoreference } from './grid.ts';
import { IAU_2015_PROJECTED } from './iauCrs.generated.ts';

export interface CrsIdentity {
  /** e.g. "EPSG:32633", "IAU_2015:49910" (as PROJ and GDAL accept it). */
  readonly code: string;
  /** e.g. "http://www.opengis.net/def/crs/IAU/2015/49910". */
  readonly uri: string;
}

type Params = Map<string, string>;

function params(def: string): Params {
  const m: Params = new Map();
  for (const tok of def.trim().split(/\s+/)) {
    const [k, v = ''] = tok.replace(/^\+/, '').split('=');
    m.set(k, v);
  }
  // One spelling for the figure and the scale: a sphere's +R is a = b = R; +k is +k_0.
  const R = m.get('R');
  if (R !== undefined) {
    m.set('a', R);
    m.set('b', R);
    m.delete('R');
  }
  if (m.has('k')) {
    m.set('k_0', m.get('k')!);
    m.delete('k');
  }
  return m;
}

/** PROJ's defaults for parameters a definition may leave out. */
const DEFAULTS: Record<string, string> = { lat_0: '0', lon_0: '0', x_0: '0', y_0: '0', k_0: '1', lat_ts: '0', units: 'm' };
const IGNORED = new Set(['no_defs', 'type', 'wktext', 'axis']);

/** True when every parameter of `registered` has the same value in `file` (numbers to 1e-9 relative). */
function sameDefinition(file: string, registered: string): boolean {
  const f = params(file);
  const r = params(registered);
  for (const [k, rv] of r) {
    if (IGNORED.has(k)) continue;
    const fv = f.get(k) ?? DEFAULTS[k];
    if (fv === undefined) return false;
    const a = Number(rv);
    const b = Number(fv);
    if (Number.isFinite(a) && Number.isFinite(b)) {
      if (Math.abs(a - b) > 1e-9 * Math.max(1, Math.abs(a))) return false;
    } else if (rv !== fv) return false;
  }
  // A parameter the file sets and the registered definition does not (other than PROJ's defaults) is a different CRS.
  for (const [k, fv] of f) {
    if (IGNORED.has(k) || r.has(k)) continue;
    if (DEFAULTS[k] === undefined || Number(fv) !== Number(DEFAULTS[k])) return false;
  }
  return true;
}

/** The citation GDAL writes for a user-defined CRS (the CRS's name), without GeoTIFF's '|' terminator. */
function citation(georeference: GridGeoreference): string | null {
  const c = georeference.projectedCrs?.geoKeys?.GTCitationGeoKey;
  return typeof c === 'string' ? c.replace(/\|$/, '').trim() : null;
}

/**
 * The registered code and URI of a projected DEM's CRS, or null when it has none this module can vouch
 * for (then an export must describe the CRS by value).
 */
export function crsIdentity(georeference: GridGeoreference | undefined): CrsIdentity | null {
  if (georeference?.model !== 'projected') return null;
  const epsg = georeference.projectedEpsg;
  if (epsg !== undefined && Number.isInteger(epsg) && epsg > 0 && epsg < 32767) {
    return { code: `EPSG:${epsg}`, uri: `http://www.opengis.net/def/crs/EPSG/0/${epsg}` };
  }
  const name = citation(georeference);
  const proj = georeference.projectedCrs?.proj4;
  if (!name || !proj) return null;
  const entry = IAU_2015_PROJECTED.find((e) => e.name === name);
  if (!entry || !sameDefinition(proj, entry.proj4)) return null;
  return { code: `IAU_2015:${entry.code}`, uri: `http://www.opengis.net/def/crs/IAU/2015/${entry.code}` };
}
