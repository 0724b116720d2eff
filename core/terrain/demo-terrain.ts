/**
 * Generator of the INVENTED demo site, "Orvessa Plain (invented)": an invented place for an invented
 * lander, not a real location. One surface, defined in site metres (east, north of the site centre, which
 * is the demo study's nominal target), sampled on any raster: the shipped 20 km × 20 km DEM at 10 m and the
 * 2 km × 2 km inset at 2 m around the target are two samplings of it. Deterministic from its start value: the
 * features are drawn once, in a fixed order, whatever raster is asked for, so a window of a raster is the
 * same numbers as the same cells of the whole raster.
 *
 * What is on it (every hazard the analysis knows): a rolling plain with a gentle regional tilt (mostly
 * safe); a large fresh crater and a crater population (steep walls); a wavy escarpment (a scarp); wrinkle
 * ridges; knob fields (rough ground at the scale of the 10 m DEM: steep small hills); boulder fields
 * (roughness under a lander, seen at 2 m only). A feature narrower than a pixel (a wave shorter than two
 * pixels) is left out of that raster, as a DEM of that resolution could not record it.
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

/** The demo site's one name, used by the study, the DEM's metadata, the app and the documents. */
export const DEMO_SITE_NAME = 'Orvessa Plain (invented)';

export interface DemoTerrainOptions {
  /** Pseudo-random generator start value: the same value gives the same site. */
  seed?: number;
  /** Half the side of the square the features are placed in, m (the site spans ±halfSize_m). */
  halfSize_m?: number;
  /** Mean plain height at the site centre, m. */
  baseHeight_m?: number;
  /** Regional slope of the plain, degrees, falling toward the south-east. */
  regionalTilt_deg?: number;
  /** Random craters over the whole site (diameters from craterMinDiameter_m to craterMaxDiameter_m). */
  craterCount?: number;
  craterMinDiameter_m?: number;
  craterMaxDiameter_m?: number;
  /** One large fresh crater north-west of the centre (a landmark and a wall-slope hazard). */
  largeCrater?: boolean;
  ridgeCount?: number;
  knobFieldCount?: number;
  /** Boulder fields; the first `insetBoulderFields` of them lie within 900 m of the centre (the inset). */
  boulderFieldCount?: number;
  insetBoulderFields?: number;
  /** Include the escarpment south of the centre (default true). */
  escarpment?: boolean;
  /** Vertical step the heights are rounded to, m (1/64 m: real DEMs store a finite precision, and it compresses). */
  heightStep_m?: number;
}

export const DEMO_TERRAIN_DEFAULTS = {
  seed: 20261205,
  halfSize_m: 10000,
  baseHeight_m: -2600,
  regionalTilt_deg: 0.25,
  craterCount: 60000,
  craterMinDiameter_m: 4,
  craterMaxDiameter_m: 700,
  largeCrater: true,
  ridgeCount: 4,
  knobFieldCount: 5,
  boulderFieldCount: 16,
  insetBoulderFields: 8,
  escarpment: true,
  heightStep_m: 1 / 64,
} as const satisfies Required<DemoTerrainOptions>;

/**
 * A raster of the site: `width` × `height` square pixels of `pixelSize_m`, north-west outer corner at
 * (`west_m`, `north_m`) in site metres (east, north of the site centre).
 */
export interface DemoRaster {
  width: number;
  height: number;
  pixelSize_m: number;
  west_m: number;
  north_m: number;
}

/** The shipped DEM: 20 km × 20 km at 10 m, the whole approach and footprint with margin. */
export const DEMO_SITE_RASTER: DemoRaster = { width: 2000, height: 2000, pixelSize_m: 10, west_m: -10000, north_m: 10000 };
/** The shipped inset: 2 km × 2 km at 2 m around the nominal target, where a 4 m lander's roughness shows. */
export const DEMO_INSET_RASTER: DemoRaster = { width: 1000, height: 1000, pixelSize_m: 2, west_m: -1000, north_m: 1000 };

export interface DemoCrater { east_m: number; north_m: number; diameter_m: number; depth_m: number; rimHeight_m: number }
export interface DemoWave { wavelength_m: number; amplitude_m: number; kx: number; ky: number; phase: number }
export interface DemoRidge { east_m: number; north_m: number; azimuth_deg: number; length_m: number; height_m: number; width_m: number }
export interface DemoBump { east_m: number; north_m: number; height_m: number; width_m: number }
export interface DemoField { east_m: number; north_m: number; radius_m: number; count: number }
export interface DemoEscarpment { north_m: number; drop_m: number; width_m: number; waveAmplitude_m: number; waveLength_m: number; phase: number }
export interface DemoFeatures {
  waves: DemoWave[];
  escarpment: DemoEscarpment | null;
  ridges: DemoRidge[];
  /** The large crater first (when present), then the random population. */
  craters: DemoCrater[];
  knobFields: DemoField[];
  knobs: DemoBump[];
  boulderFields: DemoField[];
  boulders: DemoBump[];
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

function resolveOptions(options: DemoTerrainOptions): Required<DemoTerrainOptions> {
  const o = { ...DEMO_TERRAIN_DEFAULTS, ...options } as Required<DemoTerrainOptions>;
  if (!(o.halfSize_m > 0)) throw new TerrainInputError(`invalid halfSize_m: ${o.halfSize_m} (must be > 0)`);
  if (!(o.craterMinDiameter_m > 0 && o.craterMaxDiameter_m > o.craterMinDiameter_m)) {
    throw new TerrainInputError(`invalid crater diameters ${o.craterMinDiameter_m}…${o.craterMaxDiameter_m} m (need 0 < min < max)`);
  }
  if (!(o.heightStep_m >= 0)) throw new TerrainInputError(`invalid heightStep_m: ${o.heightStep_m} (must be ≥ 0; 0 keeps full precision)`);
  for (const k of ['craterCount', 'ridgeCount', 'knobFieldCount', 'boulderFieldCount', 'insetBoulderFields'] as const) {
    if (!Number.isInteger(o[k]) || o[k] < 0) throw new TerrainInputError(`invalid ${k}: ${o[k]} (must be a whole number ≥ 0)`);
  }
  return o;
}

/** Draws every feature of the site from the pseudo-random start value, in a fixed order (independent of any raster). */
export function demoSiteFeatures(options: DemoTerrainOptions = {}): DemoFeatures {
  const o = resolveOptions(options);
  const rnd = seededRandom(o.seed);
  const S = o.halfSize_m;
  const anywhere = () => S * (2 * rnd() - 1);
  const f: DemoFeatures = { waves: [], escarpment: null, ridges: [], craters: [], knobFields: [], knobs: [], boulderFields: [], boulders: [] };

  // Rolling plain: random plane waves, amplitude proportional to wavelength (slope ≈ 1° each at most).
  for (let i = 0; i < 16; i++) {
    const wavelength = (0.6 * S) / 1.6 ** i;
    const amplitude = 0.002 * wavelength * (0.5 + rnd());
    const az = 2 * Math.PI * rnd();
    const phase = 2 * Math.PI * rnd();
    f.waves.push({ wavelength_m: wavelength, amplitude_m: amplitude, kx: (2 * Math.PI * Math.cos(az)) / wavelength, ky: (2 * Math.PI * Math.sin(az)) / wavelength, phase });
  }

  // Escarpment: an east–west scarp about halfway to the southern edge, wavy, stepping down to the south.
  if (o.escarpment) {
    f.escarpment = {
      north_m: -S * (0.48 + 0.06 * rnd()),
      drop_m: 35 + 20 * rnd(),
      width_m: 60 + 30 * rnd(),
      waveAmplitude_m: 0.03 * S * (1 + rnd()),
      waveLength_m: 0.4 * S * (1 + rnd()),
      phase: 2 * Math.PI * rnd(),
    };
  }

  // Wrinkle ridges: long, low, Gaussian cross-section with tapered ends.
  for (let i = 0; i < o.ridgeCount; i++) {
    f.ridges.push({
      east_m: anywhere(), north_m: anywhere(), azimuth_deg: 180 * rnd(),
      length_m: 0.3 * S * (1 + rnd()), height_m: 15 + 25 * rnd(), width_m: 120 + 160 * rnd(),
    });
  }

  // Craters: the large one north-west of the centre, then N(>D) ∝ D^−2 truncated (inverse CDF).
  const fresh = () => 0.35 + 0.65 * rnd() ** 0.5;
  if (o.largeCrater) {
    const D = 1200 + 400 * rnd();
    const e = -S * (0.3 + 0.1 * rnd()), n = S * (0.25 + 0.1 * rnd());
    f.craters.push({ east_m: e, north_m: n, diameter_m: D, depth_m: 0.196 * D, rimHeight_m: 0.036 * D });
  }
  const ratio = (o.craterMinDiameter_m / o.craterMaxDiameter_m) ** 2;
  for (let i = 0; i < o.craterCount; i++) {
    const D = o.craterMinDiameter_m * (1 - rnd() * (1 - ratio)) ** -0.5;
    const e = anywhere(), n = anywhere(), k = fresh();
    f.craters.push({ east_m: e, north_m: n, diameter_m: D, depth_m: 0.196 * D * k, rimHeight_m: 0.036 * D * k });
  }

  // Knob fields: clusters of small steep hills (20–60 m across, 4–14 m tall) away from the centre.
  for (let i = 0; i < o.knobFieldCount; i++) {
    const a = 2 * Math.PI * rnd(), d = S * (0.35 + 0.5 * rnd());
    const field = { east_m: d * Math.cos(a), north_m: d * Math.sin(a), radius_m: 700 + 800 * rnd(), count: 0 };
    field.count = Math.round(field.radius_m * field.radius_m * 2e-4);
    for (let j = 0; j < field.count; j++) {
      const b = 2 * Math.PI * rnd(), r = field.radius_m * Math.sqrt(rnd());
      f.knobs.push({ east_m: field.east_m + r * Math.cos(b), north_m: field.north_m + r * Math.sin(b), height_m: 4 + 10 * rnd(), width_m: 20 + 40 * rnd() });
    }
    f.knobFields.push(field);
  }

  // Boulder fields: clusters of small Gaussian bumps (0.3–1.5 m tall, 2–5 m across), seen as roughness.
  for (let i = 0; i < o.boulderFieldCount; i++) {
    const near = i < o.insetBoulderFields;
    const e = near ? 900 * (2 * rnd() - 1) : anywhere(), n = near ? 900 * (2 * rnd() - 1) : anywhere();
    const field = { east_m: e, north_m: n, radius_m: 30 + 60 * rnd(), count: 0 };
    field.count = Math.round(field.radius_m * field.radius_m * 0.04);
    for (let j = 0; j < field.count; j++) {
      const b = 2 * Math.PI * rnd(), r = field.radius_m * Math.sqrt(rnd());
      f.boulders.push({ east_m: e + r * Math.cos(b), north_m: n + r * Math.sin(b), height_m: 0.3 + 1.2 * rnd() ** 2, width_m: 2 + 3 * rnd() });
    }
    f.boulderFields.push(field);
  }
  return f;
}

/** Samples the site's surface on a raster (cell centres); features narrower than a pixel are left out. */
export function renderDemoSite(features: DemoFeatures, raster: DemoRaster, options: DemoTerrainOptions = {}): ElevationGrid {
  const o = resolveOptions(options);
  const { width: w, height: h, pixelSize_m: px, west_m: west, north_m: north } = raster;
  checkDimensions(w, h, 'demo terrain');
  if (!(px > 0)) throw new TerrainInputError(`invalid pixelSize_m: ${px} (must be > 0)`);
  const east = (c: number) => west + (c + 0.5) * px;
  const nrth = (r: number) => north - (r + 0.5) * px;
  const z = new Float64Array(w * h);
  const tilt = Math.tan((o.regionalTilt_deg * Math.PI) / 180) / Math.SQRT2;
  for (let r = 0; r < h; r++) for (let c = 0; c < w; c++) z[r * w + c] = o.baseHeight_m - tilt * (east(c) - nrth(r));

  // The cells within `reach` of (e, n), clipped to the raster; empty when outside.
  const box = (e: number, n: number, reach: number) => ({
    c0: Math.max(0, Math.floor((e - reach - west) / px)), c1: Math.min(w - 1, Math.ceil((e + reach - west) / px)),
    r0: Math.max(0, Math.floor((north - n - reach) / px)), r1: Math.min(h - 1, Math.ceil((north - n + reach) / px)),
  });

  for (const wave of features.waves) {
    if (wave.wavelength_m < 2 * px) continue; // above the raster's Nyquist frequency
    for (let r = 0; r < h; r++) for (let c = 0; c < w; c++) z[r * w + c] += wave.amplitude_m * Math.sin(wave.kx * east(c) + wave.ky * nrth(r) + wave.phase);
  }

  const s = features.escarpment;
  if (s) {
    for (let r = 0; r < h; r++) for (let c = 0; c < w; c++) {
      const line = s.north_m + s.waveAmplitude_m * Math.sin((2 * Math.PI * east(c)) / s.waveLength_m + s.phase);
      z[r * w + c] += (s.drop_m / 2) * Math.tanh((nrth(r) - line) / (s.width_m / 2));
    }
  }

  for (const ridge of features.ridges) {
    const az = (ridge.azimuth_deg * Math.PI) / 180, ux = Math.cos(az), uy = Math.sin(az);
    const b = box(ridge.east_m, ridge.north_m, ridge.length_m / 2 + 2 * ridge.width_m);
    for (let r = b.r0; r <= b.r1; r++) for (let c = b.c0; c <= b.c1; c++) {
      const dx = east(c) - ridge.east_m, dy = nrth(r) - ridge.north_m;
      const along = dx * ux + dy * uy, across = -dx * uy + dy * ux;
      const t = Math.abs(along) / (ridge.length_m / 2);
      if (t >= 1) continue;
      z[r * w + c] += ridge.height_m * Math.exp(-((across / (ridge.width_m / 2)) ** 2)) * (1 - t * t) ** 2;
    }
  }

  for (const cr of features.craters) {
    if (cr.diameter_m < px) continue;
    const R = cr.diameter_m / 2, reach = 3 * R;
    const b = box(cr.east_m, cr.north_m, reach);
    for (let r = b.r0; r <= b.r1; r++) for (let c = b.c0; c <= b.c1; c++) {
      const d = Math.hypot(east(c) - cr.east_m, nrth(r) - cr.north_m);
      if (d < reach) z[r * w + c] += craterProfile(d, R, cr.depth_m, cr.rimHeight_m);
    }
  }

  // Knobs and boulders: Gaussian bumps h·exp(−d²/σ²) with σ = width / 2, cut at 3σ.
  for (const bump of [...features.knobs, ...features.boulders]) {
    if (bump.width_m < px) continue;
    const sigma = bump.width_m / 2;
    const b = box(bump.east_m, bump.north_m, 3 * sigma);
    for (let r = b.r0; r <= b.r1; r++) for (let c = b.c0; c <= b.c1; c++) {
      const d2 = (east(c) - bump.east_m) ** 2 + (nrth(r) - bump.north_m) ** 2;
      if (d2 < 9 * sigma * sigma) z[r * w + c] += bump.height_m * Math.exp(-d2 / (sigma * sigma));
    }
  }

  const step = o.heightStep_m;
  const heights = Float32Array.from(z, (v) => (step > 0 ? Math.round(v / step) * step : v));
  return makeGrid({ width: w, height: h, pixelSizeX_m: px, pixelSizeY_m: px, originEast_m: west, originNorth_m: north }, heights);
}

/**
 * The demo site on a raster (default: the shipped 20 km DEM), in site metres (east, north of the centre).
 * `raster` may be any window or resolution: the same cells get the same heights.
 */
export function generateDemoTerrain(options: DemoTerrainOptions & { raster?: DemoRaster } = {}): {
  grid: ElevationGrid;
  features: DemoFeatures;
  options: Required<DemoTerrainOptions>;
} {
  const { raster = DEMO_SITE_RASTER, ...rest } = options;
  const o = resolveOptions(rest);
  const features = demoSiteFeatures(o);
  return { grid: renderDemoSite(features, raster, o), features, options: o };
}
