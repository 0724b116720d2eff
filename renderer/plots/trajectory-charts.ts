/**
 * Chart configurations for one descent: throttle and thrust, mass and propellant, altitude and
 * speed, thrust tilt. Inputs are plain arrays (as core/descent will return them), SI units.
 */
import { linearAxis, limitLine, lineChart, series, toPoints, type LineConfig } from './chart-parts.ts';
import { SERIES } from './palette.ts';

export interface TrajectorySeries {
  time_s: ArrayLike<number>;
  /** Thrust vector per sample (east, north, up), N, flattened. */
  thrust_N: ArrayLike<number>;
  mass_kg: ArrayLike<number>;
  /** Position per sample (east, north, up), m, flattened. */
  position_m: ArrayLike<number>;
  velocity_mps: ArrayLike<number>;
}

export interface ThrottleLimits {
  thrustMax_N: number;
  throttleMin: number;
  throttleMax: number;
}

function norms(v: ArrayLike<number>, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.hypot(v[3 * i], v[3 * i + 1], v[3 * i + 2]);
  return out;
}

/** Legend numbers without float noise. */
const formatValue = (x: number) => String(Number(x.toPrecision(6)));

function span(time: ArrayLike<number>, fallbackEnd_s: number): [number, number] {
  return time.length ? [time[0], time[time.length - 1]] : [0, fallbackEnd_s];
}

/**
 * Throttle fraction (left axis) with both throttle limits dashed, thrust magnitude in kN on the
 * right axis (same curve: its scale is tied to the left by thrustMax). With no trajectory yet, the
 * limits are drawn over [0, emptyEnd_s] so the chart shows what a solution must respect.
 */
export function throttleChart(t: Pick<TrajectorySeries, 'time_s' | 'thrust_N'> | null, limits: ThrottleLimits, emptyEnd_s = 100): LineConfig {
  if (!(limits.thrustMax_N > 0)) throw new Error(`invalid thrustMax_N: ${limits.thrustMax_N} (must be positive)`);
  const time = t?.time_s ?? [];
  const [t0, t1] = span(time, emptyEnd_s);
  const datasets = [];
  if (t) {
    const throttle = norms(t.thrust_N, time.length).map((f) => f / limits.thrustMax_N);
    datasets.push(series('Throttle', toPoints(time, throttle), SERIES.orange));
  }
  datasets.push(limitLine(`Maximum throttle ${formatValue(limits.throttleMax)}`, limits.throttleMax, t0, t1, SERIES.vermillion));
  datasets.push(limitLine(`Minimum throttle ${formatValue(limits.throttleMin)}`, limits.throttleMin, t0, t1, SERIES.skyBlue));
  const top = 1;
  return lineChart(
    datasets,
    linearAxis('Time since ignition (s)', { min: t0, max: t1 }),
    {
      // Same tick count on both axes so the thrust ticks sit on the throttle grid lines.
      y: linearAxis('Throttle fraction', { min: 0, max: top, ticks: { count: 6 } as never }),
      thrust: linearAxis('Thrust (kN)', { position: 'right', min: 0, max: (top * limits.thrustMax_N) / 1000, ticks: { count: 6 } as never, grid: { drawOnChartArea: false } as never }),
    },
    'Throttle and thrust',
  );
}

/** Mass and propellant used; with no trajectory, only the dry-mass-plus-reserve floor over [0, emptyEnd_s]. */
export function massChart(t: Pick<TrajectorySeries, 'time_s' | 'mass_kg'> | null, dryMass_kg: number, reserve_kg: number, emptyEnd_s = 100): LineConfig {
  const time = t?.time_s ?? [];
  const [t0, t1] = span(time, emptyEnd_s);
  const datasets = [];
  if (t) {
    const n = t.time_s.length;
    const m0 = n ? t.mass_kg[0] : 0;
    const used = Float64Array.from({ length: n }, (_, i) => m0 - t.mass_kg[i]);
    datasets.push(series('Mass', toPoints(t.time_s, t.mass_kg), SERIES.blue), series('Propellant used', toPoints(t.time_s, used), SERIES.orange, 'used'));
  }
  datasets.push(limitLine(`Dry mass + reserve ${formatValue(dryMass_kg + reserve_kg)} kg`, dryMass_kg + reserve_kg, t0, t1, SERIES.vermillion));
  return lineChart(
    datasets,
    linearAxis('Time since ignition (s)', { min: t0, max: t1 }),
    { y: linearAxis('Mass (kg)'), used: linearAxis('Propellant used (kg)', { position: 'right', min: 0, grid: { drawOnChartArea: false } as never }) },
    'Mass and propellant',
  );
}

/** Altitude and speed; with no trajectory, only the speed limit over [0, emptyEnd_s]. */
export function altitudeSpeedChart(t: Pick<TrajectorySeries, 'time_s' | 'position_m' | 'velocity_mps'> | null, speedMax_mps: number, emptyEnd_s = 100): LineConfig {
  const time = t?.time_s ?? [];
  const [t0, t1] = span(time, emptyEnd_s);
  const datasets = [];
  if (t) {
    const n = t.time_s.length;
    const altitude = Float64Array.from({ length: n }, (_, i) => t.position_m[3 * i + 2]);
    datasets.push(series('Altitude', toPoints(t.time_s, altitude), SERIES.green), series('Speed', toPoints(t.time_s, norms(t.velocity_mps, n)), SERIES.purple, 'speed'));
  }
  datasets.push(limitLine(`Speed limit ${formatValue(speedMax_mps)} m/s`, speedMax_mps, t0, t1, SERIES.vermillion, 'speed'));
  return lineChart(
    datasets,
    linearAxis('Time since ignition (s)', { min: t0, max: t1 }),
    { y: linearAxis('Altitude above target (m)', { min: 0 }), speed: linearAxis('Speed (m/s)', { position: 'right', min: 0, grid: { drawOnChartArea: false } as never }) },
    'Altitude and speed',
  );
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

/** Thrust tilt from vertical; with no trajectory, only the pointing limit over [0, emptyEnd_s]. */
export function tiltChart(t: Pick<TrajectorySeries, 'time_s' | 'thrust_N'> | null, pointingLimit_deg: number, emptyEnd_s = 100): LineConfig {
  const time = t?.time_s ?? [];
  const [t0, t1] = span(time, emptyEnd_s);
  const datasets = t ? [series('Thrust tilt', toPoints(t.time_s, tiltAngles_deg(t.thrust_N, t.time_s.length)), SERIES.blue)] : [];
  datasets.push(limitLine(`Tilt limit ${formatValue(pointingLimit_deg)}°`, pointingLimit_deg, t0, t1, SERIES.vermillion));
  return lineChart(
    datasets,
    linearAxis('Time since ignition (s)', { min: t0, max: t1 }),
    { y: linearAxis('Tilt from vertical (°)', { min: 0, max: Math.max(10, Math.ceil((pointingLimit_deg * 1.15) / 5) * 5) }) },
    'Thrust tilt',
  );
}
