/** Chart configurations for the studies: footprint area vs reserve, divert radius vs ignition altitude. */
import { linearAxis, limitLine, lineChart, markerLine, series, toPoints, type LineConfig } from './chart-parts.ts';
import { SERIES } from './palette.ts';

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
 * Guaranteed divert radius vs ignition altitude, with the requirement dashed and, when a study
 * found it, the lowest altitude meeting the requirement marked.
 */
export function divertRadiusChart(altitude_m: ArrayLike<number>, radius_m: ArrayLike<number>, requirement_m: number, minimumAltitude_m: number | null): LineConfig {
  if (altitude_m.length === 0) throw new Error('invalid divert study: no ignition altitudes');
  const a0 = Math.min(...Array.from(altitude_m));
  const a1 = Math.max(...Array.from(altitude_m));
  const top = Math.max(requirement_m, ...Array.from(radius_m)) * 1.1;
  const datasets = [
    { ...series('Guaranteed divert radius', toPoints(altitude_m, radius_m), SERIES.blue), pointRadius: 3 },
    limitLine(`Requirement ${requirement_m} m`, requirement_m, a0, a1, SERIES.vermillion),
  ];
  if (minimumAltitude_m !== null) datasets.push(markerLine(`Minimum ignition altitude ${Math.round(minimumAltitude_m)} m`, minimumAltitude_m, 0, top, SERIES.green));
  return lineChart(datasets, linearAxis('Ignition altitude (m)', { min: a0, max: a1 }), { y: linearAxis('Divert radius (m)', { min: 0, max: top }) }, 'Divert radius vs ignition altitude');
}
