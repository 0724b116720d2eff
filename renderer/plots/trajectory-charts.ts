/**
 * Chart configurations for descents: throttle and thrust, mass and propellant, altitude and speed,
 * thrust tilt. Several trajectories can be compared: each gets the colour it has in the 3D scene
 * (TRAJECTORY_COLOURS), limits are neutral and told apart by dash pattern and label. Inputs are plain
 * arrays (as core/descent will return them), SI units. With no trajectory yet, each chart shows the
 * limits from the inputs over [0, emptyEnd_s].
 */
import { linearAxis, limitLine, lineChart, series, toPoints, type LineConfig, type LineDataset } from './chart-parts.ts';
import { CHART_INK, TRAJECTORY_COLOURS } from './palette.ts';

export interface TrajectorySeries {
  time_s: ArrayLike<number>;
  /** Thrust vector per sample (east, north, up), N, flattened. */
  thrust_N: ArrayLike<number>;
  mass_kg: ArrayLike<number>;
  /** Position per sample (east, north, up), m, flattened. */
  position_m: ArrayLike<number>;
  velocity_mps: ArrayLike<number>;
}

/** A trajectory with the name it has in legends (e.g. the target it reaches). */
/** `colourIndex`: position of the trajectory among the picks (its scene colour); default its list position. */
export type Labelled<T> = { label: string; series: T; colourIndex?: number };

export interface ThrottleLimits {
  thrustMax_N: number;
  throttleMin: number;
  throttleMax: number;
}

const DASH_UPPER = [6, 4];
const DASH_LOWER = [2, 3];

function norms(v: ArrayLike<number>, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.hypot(v[3 * i], v[3 * i + 1], v[3 * i + 2]);
  return out;
}

/** Legend numbers without float noise. */
const formatValue = (x: number) => String(Number(x.toPrecision(6)));

/** Time window covering every trajectory, or [0, emptyEnd_s] without any. */
function span(list: readonly Labelled<{ time_s: ArrayLike<number> }>[], emptyEnd_s: number): [number, number] {
  const withData = list.filter((t) => t.series.time_s.length > 0);
  if (!withData.length) return [0, emptyEnd_s];
  return [Math.min(...withData.map((t) => t.series.time_s[0])), Math.max(...withData.map((t) => t.series.time_s[t.series.time_s.length - 1]))];
}

const colour = (k: number) => TRAJECTORY_COLOURS[k % TRAJECTORY_COLOURS.length];

function limit(label: string, value: number, t0: number, t1: number, dash: number[], axis = 'y'): LineDataset {
  return { ...limitLine(label, value, t0, t1, CHART_INK.limit, axis), borderDash: dash };
}

const timeAxis = (t0: number, t1: number) => linearAxis('Time since ignition (s)', { min: t0, max: t1 });
const rightAxis = (title: string, extra: object = {}) => linearAxis(title, { position: 'right', min: 0, grid: { drawOnChartArea: false } as never, ...extra });

/**
 * Throttle fraction (left axis) with both throttle limits, thrust magnitude in kN on the right axis
 * (the same curves: its scale is tied to the left one through thrustMax).
 */
export function throttleChart(list: readonly Labelled<Pick<TrajectorySeries, 'time_s' | 'thrust_N'>>[], limits: ThrottleLimits, emptyEnd_s = 100): LineConfig {
  if (!(limits.thrustMax_N > 0)) throw new Error(`invalid thrustMax_N: ${limits.thrustMax_N} (must be positive)`);
  const [t0, t1] = span(list, emptyEnd_s);
  const datasets = list.map((t, k) => {
    const throttle = norms(t.series.thrust_N, t.series.time_s.length).map((f) => f / limits.thrustMax_N);
    return series(t.label, toPoints(t.series.time_s, throttle), colour(t.colourIndex ?? k));
  });
  datasets.push(limit(`Maximum throttle ${formatValue(limits.throttleMax)}`, limits.throttleMax, t0, t1, DASH_UPPER));
  datasets.push(limit(`Minimum throttle ${formatValue(limits.throttleMin)}`, limits.throttleMin, t0, t1, DASH_LOWER));
  const top = 1;
  return lineChart(
    datasets,
    timeAxis(t0, t1),
    {
      // Same tick count on both axes so the thrust ticks sit on the throttle grid lines.
      y: linearAxis('Throttle fraction', { min: 0, max: top, ticks: { count: 6 } as never }),
      thrust: rightAxis('Thrust (kN)', { max: (top * limits.thrustMax_N) / 1000, ticks: { count: 6 } }),
    },
    'Throttle and thrust',
  );
}

/** Mass of each trajectory (solid) and propellant used (dashed, right axis), over the dry-mass-plus-reserve floor. */
export function massChart(list: readonly Labelled<Pick<TrajectorySeries, 'time_s' | 'mass_kg'>>[], dryMass_kg: number, reserve_kg: number, emptyEnd_s = 100): LineConfig {
  const [t0, t1] = span(list, emptyEnd_s);
  const datasets: LineDataset[] = [];
  list.forEach((t, k) => {
    const n = t.series.time_s.length;
    const m0 = n ? t.series.mass_kg[0] : 0;
    const used = Float64Array.from({ length: n }, (_, i) => m0 - t.series.mass_kg[i]);
    datasets.push(series(`${t.label}: mass`, toPoints(t.series.time_s, t.series.mass_kg), colour(t.colourIndex ?? k)));
    datasets.push({ ...series(`${t.label}: propellant used`, toPoints(t.series.time_s, used), colour(t.colourIndex ?? k), 'used'), borderDash: [5, 3] });
  });
  datasets.push(limit(`Dry mass + reserve ${formatValue(dryMass_kg + reserve_kg)} kg`, dryMass_kg + reserve_kg, t0, t1, DASH_LOWER));
  return lineChart(datasets, timeAxis(t0, t1), { y: linearAxis('Mass (kg)'), used: rightAxis('Propellant used (kg)') }, 'Mass and propellant');
}

/** Altitude above the target (solid) and speed (dashed, right axis) with the speed limit. */
export function altitudeSpeedChart(list: readonly Labelled<Pick<TrajectorySeries, 'time_s' | 'position_m' | 'velocity_mps'>>[], speedMax_mps: number, emptyEnd_s = 100): LineConfig {
  const [t0, t1] = span(list, emptyEnd_s);
  const datasets: LineDataset[] = [];
  list.forEach((t, k) => {
    const n = t.series.time_s.length;
    const altitude = Float64Array.from({ length: n }, (_, i) => t.series.position_m[3 * i + 2]);
    datasets.push(series(`${t.label}: altitude`, toPoints(t.series.time_s, altitude), colour(t.colourIndex ?? k)));
    datasets.push({ ...series(`${t.label}: speed`, toPoints(t.series.time_s, norms(t.series.velocity_mps, n)), colour(t.colourIndex ?? k), 'speed'), borderDash: [5, 3] });
  });
  datasets.push(limit(`Speed limit ${formatValue(speedMax_mps)} m/s`, speedMax_mps, t0, t1, DASH_UPPER, 'speed'));
  return lineChart(datasets, timeAxis(t0, t1), { y: linearAxis('Altitude above target (m)', { min: 0 }), speed: rightAxis('Speed (m/s)') }, 'Altitude and speed');
}

/** Tilt: angle between the thrust vector and the local vertical (up), degrees. */
export function tiltAngles_deg(thrust_N: ArrayLike<number>, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const m = Math.hypot(thrust_N[3 * i], thrust_N[3 * i + 1], thrust_N[3 * i + 2]);
    out[i] = m > 0 ? (Math.acos(Math.min(1, Math.max(-1, thrust_N[3 * i + 2] / m))) * 180) / Math.PI : NaN;
  }
  return out;
}

export function tiltChart(list: readonly Labelled<Pick<TrajectorySeries, 'time_s' | 'thrust_N'>>[], pointingLimit_deg: number, emptyEnd_s = 100): LineConfig {
  const [t0, t1] = span(list, emptyEnd_s);
  const datasets = list.map((t, k) => series(t.label, toPoints(t.series.time_s, tiltAngles_deg(t.series.thrust_N, t.series.time_s.length)), colour(t.colourIndex ?? k)));
  datasets.push(limit(`Tilt limit ${formatValue(pointingLimit_deg)}°`, pointingLimit_deg, t0, t1, DASH_UPPER));
  return lineChart(
    datasets,
    timeAxis(t0, t1),
    { y: linearAxis('Tilt from vertical (°)', { min: 0, max: Math.max(10, Math.ceil((pointingLimit_deg * 1.15) / 5) * 5) }) },
    'Thrust tilt',
  );
}
