/**
 * Transverse Mercator on an ellipsoid (Krüger's series to third order in the third flattening n, in the
 * form given by Karney (2011), "Transverse Mercator with an accuracy of a few nanometers", J. Geodesy 85;
 * the truncation error is of order n⁴·a ≈ 0.05 mm within a UTM zone); the inverse's conformal → geodetic
 * latitude step is iterated to rounding instead of a series. Used to turn UTM grid metres of a
 * projected DEM back into longitude and latitude. Pure; degrees at the boundary, radians inside.
 */

export interface Ellipsoid {
  /** Semi-major axis, m. */
  readonly a: number;
  /** Flattening. */
  readonly f: number;
}

/** WGS 84: a = 6 378 137 m, 1/f = 298.257223563 (NIMA TR8350.2; the defining constants). */
export const WGS84: Ellipsoid = Object.freeze({ a: 6378137, f: 1 / 298.257223563 });

export interface TransverseMercator {
  readonly ellipsoid: Ellipsoid;
  readonly centralMeridian_deg: number;
  /** Scale on the central meridian (UTM: 0.9996). */
  readonly scaleFactor: number;
  readonly falseEasting_m: number;
  readonly falseNorthing_m: number;
}

const DEG = Math.PI / 180;

interface Series {
  /** Rectifying radius A = a/(1+n)·(1 + n²/4 + n⁴/64). */
  A: number;
  alpha: [number, number, number];
  beta: [number, number, number];
  /** 2√n/(1+n): the first eccentricity e. */
  e: number;
}

function series({ a, f }: Ellipsoid): Series {
  const n = f / (2 - f);
  const n2 = n * n;
  const n3 = n2 * n;
  return {
    A: (a / (1 + n)) * (1 + n2 / 4 + (n2 * n2) / 64),
    alpha: [n / 2 - (2 * n2) / 3 + (5 * n3) / 16, (13 * n2) / 48 - (3 * n3) / 5, (61 * n3) / 240],
    beta: [n / 2 - (2 * n2) / 3 + (37 * n3) / 96, n2 / 48 + n3 / 15, (17 * n3) / 480],
    e: (2 * Math.sqrt(n)) / (1 + n),
  };
}

/** [longitude, latitude] (degrees) → [easting, northing] (m). */
export function transverseMercatorForward(p: TransverseMercator, lon_deg: number, lat_deg: number): [number, number] {
  const s = series(p.ellipsoid);
  const phi = lat_deg * DEG;
  const dLambda = (lon_deg - p.centralMeridian_deg) * DEG;
  const sinPhi = Math.sin(phi);
  const t = Math.sinh(Math.atanh(sinPhi) - s.e * Math.atanh(s.e * sinPhi));
  const xi = Math.atan2(t, Math.cos(dLambda));
  const eta = Math.atanh(Math.sin(dLambda) / Math.sqrt(1 + t * t));
  let x = eta;
  let y = xi;
  for (let j = 1; j <= 3; j++) {
    x += s.alpha[j - 1] * Math.cos(2 * j * xi) * Math.sinh(2 * j * eta);
    y += s.alpha[j - 1] * Math.sin(2 * j * xi) * Math.cosh(2 * j * eta);
  }
  const k = p.scaleFactor * s.A;
  return [p.falseEasting_m + k * x, p.falseNorthing_m + k * y];
}

/**
 * Geodetic latitude from conformal latitude χ, by the fixed-point iteration of Snyder (1987) eq. 7-9:
 * φ = 2 atan(tan(π/4 + χ/2)·((1 + e sin φ)/(1 − e sin φ))^(e/2)) − π/2. Exact to rounding (no series
 * truncation); each step gains about a factor e² ≈ 0.007.
 */
function geodeticFromConformal(chi: number, e: number): number {
  const base = Math.tan(Math.PI / 4 + chi / 2);
  let phi = chi;
  for (let k = 0; k < 20; k++) {
    const es = e * Math.sin(phi);
    const next = 2 * Math.atan(base * Math.pow((1 + es) / (1 - es), e / 2)) - Math.PI / 2;
    if (Math.abs(next - phi) < 1e-15) return next;
    phi = next;
  }
  return phi;
}

/** [easting, northing] (m) → [longitude, latitude] (degrees). */
export function transverseMercatorInverse(p: TransverseMercator, easting_m: number, northing_m: number): [number, number] {
  const s = series(p.ellipsoid);
  const k = p.scaleFactor * s.A;
  const xi = (northing_m - p.falseNorthing_m) / k;
  const eta = (easting_m - p.falseEasting_m) / k;
  let xiP = xi;
  let etaP = eta;
  for (let j = 1; j <= 3; j++) {
    xiP -= s.beta[j - 1] * Math.sin(2 * j * xi) * Math.cosh(2 * j * eta);
    etaP -= s.beta[j - 1] * Math.cos(2 * j * xi) * Math.sinh(2 * j * eta);
  }
  const chi = Math.asin(Math.sin(xiP) / Math.cosh(etaP));
  const lon = p.centralMeridian_deg + Math.atan2(Math.sinh(etaP), Math.cos(xiP)) / DEG;
  return [lon, geodeticFromConformal(chi, s.e) / DEG];
}

/**
 * The UTM zone of an EPSG code on WGS 84: 32601–32660 (north, false northing 0) and 32701–32760 (south,
 * false northing 10 000 000 m); null for any other code. Zone z has central meridian 6z − 183°, scale
 * 0.9996 and false easting 500 000 m (the UTM definition, NIMA TM8358.2).
 */
export function utmProjection(epsg: number): (TransverseMercator & { zone: number; hemisphere: 'north' | 'south' }) | null {
  const north = epsg >= 32601 && epsg <= 32660;
  const south = epsg >= 32701 && epsg <= 32760;
  if (!north && !south) return null;
  const zone = epsg - (north ? 32600 : 32700);
  return {
    ellipsoid: WGS84,
    centralMeridian_deg: 6 * zone - 183,
    scaleFactor: 0.9996,
    falseEasting_m: 500000,
    falseNorthing_m: north ? 0 : 10000000,
    zone,
    hemisphere: north ? 'north' : 'south',
  };
}

/**
 * Meridian convergence and point scale at a point, from the forward map of a short step due north
 * (1e-5°, about 1 m): `convergence_deg` is the angle from grid north to true north, positive when true
 * north points grid-east; `scale` is grid length over ground length, the ground length being the meridian
 * arc M·Δφ with M = a(1 − e²)/(1 − e² sin² φ)^{3/2}.
 */
export function gridFactors(p: TransverseMercator, lon_deg: number, lat_deg: number): { convergence_deg: number; scale: number } {
  const step = 1e-5;
  const [e0, n0] = transverseMercatorForward(p, lon_deg, lat_deg - step / 2);
  const [e1, n1] = transverseMercatorForward(p, lon_deg, lat_deg + step / 2);
  const { a, f } = p.ellipsoid;
  const e2 = f * (2 - f);
  const M = (a * (1 - e2)) / (1 - e2 * Math.sin(lat_deg * DEG) ** 2) ** 1.5;
  return { convergence_deg: Math.atan2(e1 - e0, n1 - n0) / DEG, scale: Math.hypot(e1 - e0, n1 - n0) / (M * step * DEG) };
}
