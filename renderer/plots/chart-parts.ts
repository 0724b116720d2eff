/**
 * Small pieces shared by the chart builders: point series, dashed limit lines, axes with units.
 * Builders return plain chart.js configurations (no Chart instance), so they are unit-tested in Node.
 */
import type { ChartConfiguration, ChartDataset, ScaleOptionsByType } from 'chart.js';
import { CHART_INK } from './palette.ts';

export type Point = { x: number; y: number };
export type LineConfig = ChartConfiguration<'line', Point[]>;
export type LineDataset = ChartDataset<'line', Point[]>;

export function toPoints(x: ArrayLike<number>, y: ArrayLike<number>): Point[] {
  if (x.length !== y.length) throw new Error(`invalid series: ${x.length} x values and ${y.length} y values (must be equal)`);
  const out: Point[] = new Array(x.length);
  for (let i = 0; i < x.length; i++) out[i] = { x: x[i], y: y[i] };
  return out;
}

export function series(label: string, data: Point[], color: string, yAxisID = 'y'): LineDataset {
  return { label, data, borderColor: color, backgroundColor: color, borderWidth: 2, pointRadius: 0, tension: 0, yAxisID };
}

/** A horizontal limit drawn dashed across [x0, x1]. `role: 'limit'` lets tests and legends find it. */
export function limitLine(label: string, value: number, x0: number, x1: number, color: string = CHART_INK.limit, yAxisID = 'y'): LineDataset {
  return {
    label,
    data: [{ x: x0, y: value }, { x: x1, y: value }],
    borderColor: color,
    backgroundColor: color,
    borderWidth: 1.5,
    borderDash: [6, 4],
    pointRadius: 0,
    yAxisID,
    // chart.js passes unknown dataset keys through untouched.
    ...({ role: 'limit' } as object),
  };
}

/** A vertical marker line at x across [y0, y1]. */
export function markerLine(label: string, x: number, y0: number, y1: number, color: string): LineDataset {
  return { label, data: [{ x, y: y0 }, { x, y: y1 }], borderColor: color, backgroundColor: color, borderWidth: 1.5, borderDash: [2, 3], pointRadius: 0, ...({ role: 'marker' } as object) };
}

export function linearAxis(title: string, extra: Partial<ScaleOptionsByType<'linear'>> = {}): ScaleOptionsByType<'linear'> {
  const { ticks, grid, ...rest } = extra;
  return {
    type: 'linear',
    title: { display: true, text: title, color: CHART_INK.text },
    ...rest,
    // Nested options are merged so a caller's tick count or grid flag keeps the house colours.
    ticks: { color: CHART_INK.text, ...(ticks ?? {}) },
    grid: { color: CHART_INK.grid, ...(grid ?? {}) },
  } as ScaleOptionsByType<'linear'>;
}

export function lineChart(datasets: LineDataset[], x: ScaleOptionsByType<'linear'>, y: Record<string, ScaleOptionsByType<'linear'>>, title: string): LineConfig {
  return {
    type: 'line',
    data: { datasets },
    options: {
      animation: false,
      responsive: true,
      maintainAspectRatio: false,
      parsing: false,
      normalized: true,
      interaction: { mode: 'nearest', axis: 'x', intersect: false },
      scales: { x, ...y },
      plugins: {
        title: { display: true, text: title, color: CHART_INK.text, font: { size: 13, weight: 'normal' } },
        legend: { labels: { color: CHART_INK.text, boxHeight: 2, boxWidth: 18 } },
      },
    },
  };
}
