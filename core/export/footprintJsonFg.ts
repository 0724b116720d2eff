/**
 * Footprint as OGC Features and Geometries JSON (JSON-FG 1.0, OGC 21-045r1), written beside the RFC 7946
 * file for footprints on a projected DEM. Same features (reachable region, propellant contours, nominal
 * target, ranked sites), with:
 * - `place`: each shape in the DEM's own projected CRS (easting, northing in metres; §7.2 "Geometry"), the
 *   local shape taken there by the footprint's ground frame (core/footprint/georeferencedFootprint.ts);
 * - `coordRefSys` once, on the collection (§7.5 "Reference systems": it applies to `place`, never to
 *   `geometry`): the CRS's URI in the OGC register's form when it has a registered code (EPSG, IAU_2015),
 *   otherwise a custom object carrying its PROJ string (JSON-FG's schema allows a reference-system object of
 *   another `type`; readers that only know URIs will not understand it, so the collection says so);
 * - `geometry`: the same shape in WGS 84 longitude/latitude where the DEM is on Earth's WGS 84 (a fallback for
 *   GeoJSON readers, §7.2 "Use of geometry and/or place"), and null on any other body — GeoJSON geometry is
 *   WGS 84 by definition, so a Mars or Moon shape has no valid GeoJSON geometry;
 * - `conformsTo` (Core, and "Feature Types and Schemas" for `featureType`), `featureType` on every feature
 *   (the collection is not homogeneous), `time: null` (no temporal extent).
 * Pure: data in, an object out.
 */
import type { MultiPolygon, Position } from 'geojson';
import type { PropellantRegion } from '../footprint/contours.ts';
import type { FootprintLonLat, FootprintPlace } from '../footprint/georeferencedFootprint.ts';
import { CAUTION } from '../study/provenance.ts';
import { rightHandRule, type GeoJsonSite } from './footprintGeoJson.ts';

export const JSON_FG_CONFORMANCE = [
  'http://www.opengis.net/spec/json-fg-1/1.0/conf/core',
  'http://www.opengis.net/spec/json-fg-1/1.0/conf/types-schemas',
] as const;

/** A reference-system value: a URI, or (no registered code) a custom object with the PROJ definition. */
export type JsonFgRefSys = string | { type: 'PROJ'; value: string; name: string };

export interface FootprintJsonFgInput {
  contours: PropellantRegion[];
  reachable: PropellantRegion;
  reserve_kg: number;
  place: FootprintPlace;
  /** Longitude/latitude of the same frame: used for `geometry` only when WGS 84. */
  lonLat?: FootprintLonLat | null;
  sites?: readonly GeoJsonSite[];
  stoppedEarly?: string | null;
}

type Geometry = { type: 'MultiPolygon'; coordinates: Position[][][] } | { type: 'Point'; coordinates: Position };

export interface JsonFgFeature {
  type: 'Feature';
  featureType: string;
  time: null;
  place: Geometry;
  geometry: Geometry | null;
  properties: Record<string, unknown>;
}

export interface JsonFgFeatureCollection {
  type: 'FeatureCollection';
  conformsTo: string[];
  coordRefSys: JsonFgRefSys;
  features: JsonFgFeature[];
  [foreign: string]: unknown;
}

/** Millimetres in the projected CRS; 1e-9° in longitude/latitude (as the RFC 7946 file). */
const metres = (v: number) => Number(v.toFixed(3));
const degrees = (v: number) => Number(v.toFixed(9));

export function footprintCoordRefSys(place: FootprintPlace): JsonFgRefSys {
  return place.identity ? place.identity.uri : { type: 'PROJ', value: place.proj4, name: place.crsName };
}

/** The JSON-FG FeatureCollection of a footprint on a projected DEM (see the file comment). */
export function footprintJsonFg(input: FootprintJsonFgInput): JsonFgFeatureCollection {
  const { place } = input;
  const wgs84 = input.lonLat?.wgs84 ? input.lonLat : null;
  // As the RFC 7946 file: one whole-turn shift from the nominal target keeps longitudes within ±180°.
  const shift = wgs84 ? -360 * Math.round(wgs84.toLonLat(0, 0)[0] / 360) : 0;
  const inCrs = (e: number, n: number): Position => place.toCrs(e, n).map(metres);
  const inWgs84 = (e: number, n: number): Position => {
    const [lon, lat] = wgs84!.toLonLat(e, n);
    return [degrees(lon + shift), degrees(lat)];
  };
  const multi = (g: MultiPolygon, at: (e: number, n: number) => Position): Geometry => ({
    type: 'MultiPolygon',
    coordinates: g.coordinates.map((p) => p.map((ring) => ring.map(([x, y]) => at(x, y)))),
  });
  const region = (r: PropellantRegion, featureType: string, extra: Record<string, unknown>): JsonFgFeature => {
    // The DEM's projections keep orientation (the ground frame's Jacobian has a positive determinant), so
    // rings keep RFC 7946's right-hand rule in the projected CRS too.
    const local = rightHandRule(r.geometry);
    return {
      type: 'Feature',
      featureType,
      time: null,
      place: multi(local, inCrs),
      geometry: wgs84 ? multi(local, inWgs84) : null,
      properties: { level_kg: r.level_kg, area_m2: Math.round(r.area_m2), ...extra, local_m: local },
    };
  };
  const point = (e: number, n: number, featureType: string, properties: Record<string, unknown>): JsonFgFeature => ({
    type: 'Feature',
    featureType,
    time: null,
    place: { type: 'Point', coordinates: inCrs(e, n) },
    geometry: wgs84 ? { type: 'Point', coordinates: inWgs84(e, n) } : null,
    properties: { ...properties, local_m: { type: 'Point', coordinates: [e, n] } },
  });
  const crsText = place.identity ? `${place.identity.code} (${place.crsName})` : `${place.crsName}, PROJ definition ${place.proj4} (no registered code: coordRefSys carries the definition, which readers that only know CRS URIs will not understand)`;
  const body = input.lonLat?.body;
  return {
    type: 'FeatureCollection',
    conformsTo: [...JSON_FG_CONFORMANCE],
    coordRefSys: footprintCoordRefSys(place),
    features: [
      region(input.reachable, 'reachable-with-reserve', { reserve_kg: input.reserve_kg }),
      ...input.contours.map((c) => region(c, 'propellant-contour', {})),
      point(0, 0, 'nominal-target', {}),
      ...(input.sites ?? []).map((s, k) => point(s.east_m, s.north_m, 'landing-site', { rank: k + 1, ...s.properties })),
    ],
    // Foreign members, as in the RFC 7946 file: the caution, what the coordinates are, and partial results.
    caution: CAUTION,
    crs_note:
      `place: [easting, northing] in metres in the DEM's CRS, ${crsText}; the nominal target is at ${metres(place.target_m[0])}, ${metres(place.target_m[1])}. ` +
      (wgs84
        ? 'geometry: the same shapes in WGS 84 longitude/latitude (a fallback for GeoJSON readers).'
        : `geometry: null, because the shapes are on ${body ?? 'another body'}, not on WGS 84 (GeoJSON's only CRS).`) +
      ' properties.local_m: the shapes in local metres (east, north of the nominal target).',
    ...(body ? { body } : {}),
    ...(input.stoppedEarly ? { stopped_early: input.stoppedEarly } : {}),
  };
}
