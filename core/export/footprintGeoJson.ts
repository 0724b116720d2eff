/**
 * Footprint GeoJSON (RFC 7946): propellant contours, the region reachable with the reserve kept, the
 * nominal target and (when given) ranked landing sites. Pure: data in, a FeatureCollection out.
 *
 * Every feature carries its shape in local metres (east, north of the nominal target) in
 * `properties.local_m`. Its `geometry` is the same shape in [longitude, latitude] degrees where the site is
 * georeferenced, and null otherwise (allowed by RFC 7946 §3.2). RFC 7946 has no `crs` member (§4) and
 * assumes WGS 84; when the coordinates refer to another body's sphere, `properties.crs_note` and
 * `properties.body` say so on every feature.
 */
import type { Feature, FeatureCollection, MultiPolygon, Point, Position } from 'geojson';
import { ringArea, type PropellantRegion } from '../footprint/contours.ts';
import { CAUTION } from '../study/provenance.ts';
import type { FootprintLonLat, LocalToLonLat } from '../footprint/georeferencedFootprint.ts';

export type { FootprintLonLat, LocalToLonLat } from '../footprint/georeferencedFootprint.ts';

/** A ranked landing site, in local metres from the nominal target. */
export interface GeoJsonSite {
  east_m: number;
  north_m: number;
  properties?: Record<string, unknown>;
}

export interface FootprintGeoJsonInput {
  contours: PropellantRegion[];
  /** The region reachable with the reserve kept: {propellant ≤ budget}. */
  reachable: PropellantRegion;
  reserve_kg: number;
  /** Longitude/latitude with their description; takes precedence over `toLonLat`. */
  lonLat?: FootprintLonLat | null;
  /** A bare converter, taken as WGS 84 on Earth. */
  toLonLat?: LocalToLonLat | null;
  sites?: readonly GeoJsonSite[];
  /** Set when the footprint is partial (the run stopped early): said in a foreign member, `stopped_early`. */
  stoppedEarly?: string | null;
}

/** Decimal places of longitude/latitude: 1e-9° is about 0.1 mm on Earth (RFC 7946 §11.2 asks for no false precision). */
const LONLAT_DIGITS = 9;

/**
 * RFC 7946 §3.1.6: exterior rings counterclockwise, holes clockwise. d3-contour returns the opposite in a
 * north-up frame, so rings are reversed where needed. The local → lon/lat maps used here (equirectangular,
 * transverse Mercator) keep orientation, so the rule holds in both.
 */
export function rightHandRule(g: MultiPolygon): MultiPolygon {
  return {
    type: 'MultiPolygon',
    coordinates: g.coordinates.map((poly) =>
      poly.map((ring, k) => {
        const a = ringArea(ring);
        return (k === 0 ? a < 0 : a > 0) ? [...ring].reverse() : ring;
      }),
    ),
  };
}

function noteFor(l: FootprintLonLat): string {
  const where = l.wgs84
    ? `geometry: [longitude, latitude] in degrees, ${l.datum}`
    : `geometry: [longitude, latitude] in degrees on ${l.body}, ${l.datum}. They are not WGS 84 coordinates, although RFC 7946 assumes WGS 84: general GIS software will draw these shapes on Earth`;
  return `${where}. Shapes in local metres (east, north of the nominal target) are in properties.local_m.${l.note ? ` ${l.note}` : ''}`;
}

/** The GeoJSON FeatureCollection of a footprint (see the file comment). */
export function footprintGeoJson(input: FootprintGeoJsonInput): FeatureCollection<MultiPolygon | Point | null> {
  const lonLat: FootprintLonLat | null =
    input.lonLat ?? (input.toLonLat ? { toLonLat: input.toLonLat, wgs84: true, datum: 'WGS 84', body: 'earth' } : null);
  // One whole-turn shift for every point, from the nominal target, so a site given in 0…360° east comes
  // out within ±180° without tearing a shape apart (shapes crossing the antimeridian are not cut, §3.1.9).
  const shift = lonLat ? -360 * Math.round(lonLat.toLonLat(0, 0)[0] / 360) : 0;
  const round = (v: number) => Number(v.toFixed(LONLAT_DIGITS));
  const position = (e: number, n: number): Position => {
    const [lon, lat] = lonLat!.toLonLat(e, n);
    return [round(lon + shift), round(lat)];
  };
  const meta = lonLat ? { body: lonLat.body, crs_note: noteFor(lonLat) } : {};
  const region = (r: PropellantRegion, kind: string, extra: Record<string, unknown>): Feature<MultiPolygon | null> => {
    const local = rightHandRule(r.geometry);
    return {
      type: 'Feature',
      geometry: lonLat ? { type: 'MultiPolygon', coordinates: local.coordinates.map((p) => p.map((ring) => ring.map(([x, y]) => position(x, y)))) } : null,
      properties: { kind, level_kg: r.level_kg, area_m2: Math.round(r.area_m2), ...extra, ...meta, local_m: local },
    };
  };
  const point = (e: number, n: number, properties: Record<string, unknown>): Feature<Point | null> => ({
    type: 'Feature',
    geometry: lonLat ? { type: 'Point', coordinates: position(e, n) } : null,
    properties: { ...properties, ...meta, local_m: { type: 'Point', coordinates: [e, n] } },
  });
  return {
    type: 'FeatureCollection',
    features: [
      region(input.reachable, 'reachable-with-reserve', { reserve_kg: input.reserve_kg }),
      ...input.contours.map((c) => region(c, 'propellant-contour', {})),
      point(0, 0, { kind: 'nominal-target' }),
      ...(input.sites ?? []).map((s, k) => point(s.east_m, s.north_m, { kind: 'landing-site', rank: k + 1, ...s.properties })),
    ],
    // Foreign members (RFC 7946 §6.1): exported reports carry the caution, and say when they are partial.
    caution: CAUTION,
    ...(input.stoppedEarly ? { stopped_early: input.stoppedEarly } : {}),
  } as FeatureCollection<MultiPolygon | Point | null>;
}
