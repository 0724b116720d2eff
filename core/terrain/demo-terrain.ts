/**
 * Seeded generator of the INVENTED demo site ("Meridian Shoal", an invented place on an invented
 * mission — not a real location): a rolling plain, a crater population, a few ridges, boulder fields
 * (roughness) and an escarpment (a slope hazard). Deterministic from its seed.
 *
 * Morphometry (sources named; values recalled from memory, not re-checked against the papers):
 * - Fresh simple craters: depth ≈ 0.196 D and rim height ≈ 0.036 D — R. J. Pike (1977), "Size-dependence
 *   in the shape of fresh impact craters on the Moon", in Impact and Explosion Cratering (Roddy, Pepin,
 *   Merrill, eds.), Pergamon, pp. 489–509. Older craters are shallower (a random degradation factor).
 * - Ejecta blanket thickness falling off as (r/R)^−3 — T. R. McGetchin, M. Settle, J. W. Head (1973),
 *   "Radial thickness variation in impact crater ejecta", Earth Planet. Sci. Lett. 20:226–236.
 * - Size–frequency: cumulative N(>D) ∝ D^−2, the equilibrium slope of small lunar craters — D. E. Gault
 *   (1970), "Saturation and equilibrium conditions for impact cratering on the lunar surface", Radio
 *   Science 5(2):273–291 (from memory; common practice for small-crater populations).
 */
import type { ElevationGrid } from './grid.ts';
import { checkDimensions, makeGrid, TerrainInputError } from './grid.ts';

export const DEMO_SITE_NAME = 'Meridian Shoal (invented demo site)';

export interface DemoTerrainOptions {
  seed?: number;
  width?: number;
  height?: number;
  pixelSize_m?: number;
  /** Mean plain height (m). */
  baseHeight_m?: number;
  craterCount?: number;
  craterMinDiameter_m?: number;
  craterMaxDiameter_m?: number;
  ridgeCount?: number;
  boulderFieldCount?: number;
  /** Include the escarpment (default true). */
  escarpment?: boolean;
}

export const DEMO_TERRAIN_DEFAULTS = {
  seed: 20261201,
  width: 512,
  height: 512,
  pixelSize_m: 2,
  baseHeight_m: -1200,
  craterCount: 220,
  craterMinDiameter_m: 8,
  craterMaxDiameter_m: 240,
  ridgeCount: 3,
  boulderFieldCount: 5,
  escarpment: true,
} as const satisfies Required<DemoTerrainOptions>;

export interface DemoCrater { east_m: number; north_m: number; diameter_m: number; depth_m: number; rimHeight_m: number }
export interface DemoFeatures {
  craters: DemoCrater[];
  ridges: { east_m: number; north_m: number; azimuth_deg: number; length_m: number; height_m: number; width_m: number }[];
  boulderFields: { east_m: number; north_m: number; radius_m: number; boulders: number }[];
  escarpment: { north_m: number; drop_m: number; width_m: number } | null;
}

/** mulberry32: a small, well-mixed 32-bit PRNG (public domain); deterministic across JS engines. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Simple-crater height change at distance r from the centre: a parabolic bowl from the floor (−depth,
 * Pike 1977) to the rim crest (+rim) at r = R, then ejecta falling as (r/R)^−3 (McGetchin et al. 1973),
 * shifted and scaled to reach 0 at r = 3R so the crater joins the plain without a step.
 */
export function craterProfile(r: number, radius: number, depth: number, rim: number): number {
  const x = r / radius;
  if (x <= 1) return -depth + (depth + rim) * x * x;
  if (x >= 3) return 0;
  return (rim * (x ** -3 - 1 / 27)) / (1 - 1 / 27);
}

export function generateDemoTerrain(options: DemoTerrainOptions = {}): { grid: ElevationGrid; features: DemoFeatures; options: Required<DemoTerrainOptions> } {
  const o = { ...DEMO_TERRAIN_DEFAULTS, ...options } as Required<DemoTerrainOptions>;
  checkDimensions(o.width, o.height, 'demo terrain');
  if (!(o.pixelSize_m > 0)) throw new TerrainInputError(`invalid pixelSize_m: ${o.pixelSize_m} (must be > 0)`);
  if (!(o.craterMinDiameter_m > 0 && o.craterMaxDiameter_m > o.craterMinDiameter_m)) {
    throw new TerrainInputError(`invalid crater diameters ${o.craterMinDiameter_m}…${o.craterMaxDiameter_m} m (need 0 < min < max)`);
  }
  const rnd = seededRandom(o.seed);
  const w = o.width, h = o.height, px = o.pixelSize_m;
  const sizeE = w * px, sizeN = h * px;
  const z = new Float64Array(w * h).fill(o.baseHeight_m);
  const east = (c: number) => (c + 0.5) * px;
  const north = (r: number) => -(r + 0.5) * px; // local frame: origin at the NW corner

  // Rolling plain: a sum of random plane waves, amplitude falling with wavenumber.
  for (let i = 0; i < 12; i++) {
    const wavelength = 1500 / 1.6 ** i;
    const amp = 0.003 * wavelength * (0.5 + rnd());
    const az = 2 * Math.PI * rnd(), phase = 2 * Math.PI * rnd();
    const kx = (2 * Math.PI * Math.cos(az)) / wavelength, ky = (2 * Math.PI * Math.sin(az)) / wavelength;
    for (let r = 0; r < h; r++) for (let c = 0; c < w; c++) z[r * w + c] += amp * Math.sin(kx * east(c) + ky * north(r) + phase);
  }

  const features: DemoFeatures = { craters: [], ridges: [], boulderFields: [], escarpment: null };

  // Escarpment: an east–west scarp, wavy, stepping down to the south (tanh profile).
  if (o.escarpment) {
    const y0 = -sizeN * (0.68 + 0.1 * rnd());
    const drop = 14 + 6 * rnd(), width = 14 + 6 * rnd();
    const waveAmp = 25 + 20 * rnd(), waveLen = 300 + 200 * rnd(), ph = 2 * Math.PI * rnd();
    for (let r = 0; r < h; r++) for (let c = 0; c < w; c++) {
      const line = y0 + waveAmp * Math.sin((2 * Math.PI * east(c)) / waveLen + ph);
      z[r * w + c] += (drop / 2) * Math.tanh((north(r) - line) / (width / 2));
    }
    features.escarpment = { north_m: y0, drop_m: drop, width_m: width };
  }

  // Ridges: Gaussian cross-section, tapered ends.
  for (let i = 0; i < o.ridgeCount; i++) {
    const ce = sizeE * rnd(), cn = -sizeN * rnd(), az = Math.PI * rnd();
    const length = 300 + 400 * rnd(), height = 8 + 14 * rnd(), width = 40 + 50 * rnd();
    const ux = Math.cos(az), uy = Math.sin(az);
    for (let r = 0; r < h; r++) for (let c = 0; c < w; c++) {
      const dx = east(c) - ce, dy = north(r) - cn;
      const along = dx * ux + dy * uy, across = -dx * uy + dy * ux;
      const t = Math.abs(along) / (length / 2);
      if (t >= 1) continue;
      z[r * w + c] += height * Math.exp(-((across / (width / 2)) ** 2)) * (1 - t * t) ** 2;
    }
    features.ridges.push({ east_m: ce, north_m: cn, azimuth_deg: (az * 180) / Math.PI, length_m: length, height_m: height, width_m: width });
  }

  // Craters: truncated power law N(>D) ∝ D^−2 (inverse CDF), degraded by a random factor.
  const b = 2;
  const ratio = (o.craterMinDiameter_m / o.craterMaxDiameter_m) ** b;
  for (let i = 0; i < o.craterCount; i++) {
    const D = o.craterMinDiameter_m * (1 - rnd() * (1 - ratio)) ** (-1 / b);
    const ce = sizeE * rnd(), cn = -sizeN * rnd();
    const fresh = 0.35 + 0.65 * rnd() ** 0.5;
    const depth = 0.196 * D * fresh, rim = 0.036 * D * fresh;
    const R = D / 2, reach = 3 * R;
    const c0 = Math.max(0, Math.floor((ce - reach) / px)), c1 = Math.min(w - 1, Math.ceil((ce + reach) / px));
    const r0 = Math.max(0, Math.floor((-cn - reach) / px)), r1 = Math.min(h - 1, Math.ceil((-cn + reach) / px));
    for (let r = r0; r <= r1; r++) for (let c = c0; c <= c1; c++) {
      const d = Math.hypot(east(c) - ce, north(r) - cn);
      if (d < reach) z[r * w + c] += craterProfile(d, R, depth, rim);
    }
    features.craters.push({ east_m: ce, north_m: cn, diameter_m: D, depth_m: depth, rimHeight_m: rim });
  }

  // Boulder fields: clusters of small Gaussian bumps (0.3–1.5 m tall), seen as roughness.
  for (let i = 0; i < o.boulderFieldCount; i++) {
    const ce = sizeE * (0.1 + 0.8 * rnd()), cn = -sizeN * (0.1 + 0.8 * rnd()), radius = 30 + 60 * rnd();
    const count = Math.round(radius * radius * 0.02);
    for (let j = 0; j < count; j++) {
      const a = 2 * Math.PI * rnd(), rr = radius * Math.sqrt(rnd());
      const be = ce + rr * Math.cos(a), bn = cn + rr * Math.sin(a);
      const bh = 0.3 + 1.2 * rnd() ** 2, bw = 1 + 1.5 * rnd();
      const c0 = Math.max(0, Math.floor((be - 3 * bw) / px)), c1 = Math.min(w - 1, Math.ceil((be + 3 * bw) / px));
      const r0 = Math.max(0, Math.floor((-bn - 3 * bw) / px)), r1 = Math.min(h - 1, Math.ceil((-bn + 3 * bw) / px));
      for (let r = r0; r <= r1; r++) for (let c = c0; c <= c1; c++) {
        z[r * w + c] += bh * Math.exp(-((east(c) - be) ** 2 + (north(r) - bn) ** 2) / (bw * bw));
      }
    }
    features.boulderFields.push({ east_m: ce, north_m: cn, radius_m: radius, boulders: count });
  }

  const grid = makeGrid({ width: w, height: h, pixelSizeX_m: px, pixelSizeY_m: px, originEast_m: 0, originNorth_m: 0 }, Float32Array.from(z));
  return { grid, features, options: o };
}
