/** Chart configurations for the studies: footprint area vs reserve, divert radius vs ignition altitude, landing points. */
import { linearAxis, limitLine, lineChart, markerLine, series, toPoints, type EqualAxesOptions, type LineConfig, type LineDataset } from './chart-parts.ts';
import { CHART_INK, SERIES } from './palette.ts';
import type { Ellipse } from '../../core/footprint/ellipse.ts';

export function footprintAreaChart(reserve_kg: ArrayLike<number>, area_m2: ArrayLike<number>): LineConfig {
  const km2 = Float64Array.from(area_m2, (a) => a / 1e6);
  return lineChart(
    [{ ...series('Reachable area', toPoints(reserve_kg, km2), SERIES.blue), pointRadius: 3 }],
    linearAxis('Propellant reserve (kg)'),
    { y: linearAxis('Footprint area (km²)', { min: 0 }) },
    'Footprint area vs reserve',
  );
}

/**
 * Guaranteed divert radius vs ignition altitude, with the requirement dashed (when there is one) and, when
 * a study found it, the lowest altitude meeting the requirement marked.
 */
export function divertRadiusChart(altitude_m: ArrayLike<number>, radius_m: ArrayLike<number>, requirement_m: number | null, minimumAltitude_m: number | null): LineConfig {
  if (altitude_m.length === 0) throw new Error('invalid divert study: no ignition altitudes');
  const lo = Math.min(...Array.from(altitude_m));
  const hi = Math.max(...Array.from(altitude_m));
  // A margin so the end points are not cut by the frame (and a window around a single altitude).
  const pad = hi > lo ? 0.04 * (hi - lo) : 0.1 * lo || 1;
  const [a0, a1] = [lo - pad, hi + pad];
  const top = niceCeil(Math.max(requirement_m ?? 0, ...Array.from(radius_m)) * 1.1);
  const datasets: LineDataset[] = [{ ...series('Guaranteed divert radius', toPoints(altitude_m, radius_m), SERIES.blue), pointRadius: 3 }];
  if (requirement_m !== null) datasets.push(limitLine(`Requirement ${requirement_m} m`, requirement_m, a0, a1, SERIES.vermillion));
  if (minimumAltitude_m !== null) datasets.push(markerLine(`Minimum ignition altitude ${Math.round(minimumAltitude_m)} m`, minimumAltitude_m, 0, top, SERIES.green));
  return lineChart(datasets, linearAxis('Ignition altitude (m)', { min: a0, max: a1, ticks: { includeBounds: false } as never }), { y: linearAxis('Divert radius (m)', { min: 0, max: top }) }, 'Divert radius vs ignition altitude');
}

/** The smallest 1, 2 or 5 × 10^k at or above v (1 for v ≤ 0): a round axis top. */
export function niceCeil(v: number): number {
  if (!(v > 0) || !Number.isFinite(v)) return 1;
  const p = 10 ** Math.floor(Math.log10(v));
  for (const m of [1, 2, 5, 10]) if (m * p >= v * (1 - 1e-12)) return m * p;
  return 10 * p;
}

/** A landing ellipse as core/footprint/ellipse.ts gives it (orientation: degrees counter-clockwise from east). */
export type EllipseOutline = Ellipse;

/** At most this many landing points are drawn (every k-th sample beyond it); the ellipse uses them all. */
export const MAX_LANDING_POINTS = 2000;

/**
 * Landing points of the dispersion samples (east, north) with the landing ellipse and the nominal target, on
 * equal-scaled axes (one metre as long east as north, whatever the panel's shape: chart-parts equalAxesPlugin).
 */
export function landingChart(east_m: ArrayLike<number>, north_m: ArrayLike<number>, e: EllipseOutline): LineConfig {
  const step = Math.max(1, Math.ceil(east_m.length / MAX_LANDING_POINTS));
  const points = [];
  for (let i = 0; i < east_m.length; i += step) points.push({ x: east_m[i], y: north_m[i] });
  const th = (e.orientation_deg * Math.PI) / 180;
  const outline = Array.from({ length: 97 }, (_, k) => {
    const t = (2 * Math.PI * (k % 96)) / 96;
    const a = e.semiMajor_m * Math.cos(t);
    const b = e.semiMinor_m * Math.sin(t);
    return { x: e.centreEast_m + a * Math.cos(th) - b * Math.sin(th), y: e.centreNorth_m + a * Math.sin(th) + b * Math.cos(th) };
  });
  const landings: LineDataset = { ...series(`Landing points (${east_m.length} samples)`, points, SERIES.skyBlue), showLine: false, pointRadius: 1.5, borderWidth: 0 };
  const ellipse: LineDataset = { ...series(`${(e.probability * 100).toFixed(1)} % landing ellipse`, outline, CHART_INK.limit), borderWidth: 1.5 };
  const nominal: LineDataset = { ...series('Nominal target', [{ x: 0, y: 0 }], SERIES.vermillion), showLine: false, pointRadius: 5, pointStyle: 'crossRot', borderWidth: 2 };
  const xs = [...outline.map((p) => p.x), ...points.map((p) => p.x), 0];
  const ys = [...outline.map((p) => p.y), ...points.map((p) => p.y), 0];
  const half = Math.max(Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys)) * 0.55 || 1;
  const cx = (Math.max(...xs) + Math.min(...xs)) / 2;
  const cy = (Math.max(...ys) + Math.min(...ys)) / 2;
  const base: EqualAxesOptions = { x: [cx - half, cx + half], y: [cy - half, cy + half] };
  const config = lineChart([landings, ellipse, nominal], linearAxis('East of the nominal target (m)', { min: base.x[0], max: base.x[1], ticks: { includeBounds: false } as never }), { y: linearAxis('North (m)', { min: base.y[0], max: base.y[1], ticks: { includeBounds: false } as never }) }, 'Landing dispersion without divert');
  config.options!.interaction = { mode: 'nearest', intersect: true };
  (config.options!.plugins as Record<string, unknown>).equalAxes = base;
  return config;
}
