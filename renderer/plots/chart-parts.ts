/**
 * Small pieces shared by the chart builders: point series, dashed limit lines, axes with units.
 * Builders return plain chart.js configurations (no Chart instance), so they are unit-tested in Node.
 */
import type { Chart, ChartConfiguration, ChartDataset, ScaleOptionsByType } from 'chart.js';
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

/**
 * Ranges that give one unit as many pixels on x as on y (a circle is drawn round), keeping each range's centre
 * and never narrowing either: the larger of the two units per pixel is used for both.
 */
export function equalScaleRanges(x: [number, number], y: [number, number], width_px: number, height_px: number): { x: [number, number]; y: [number, number] } {
  const u = Math.max((x[1] - x[0]) / width_px, (y[1] - y[0]) / height_px);
  const cx = (x[0] + x[1]) / 2;
  const cy = (y[0] + y[1]) / 2;
  return { x: [cx - (u * width_px) / 2, cx + (u * width_px) / 2], y: [cy - (u * height_px) / 2, cy + (u * height_px) / 2] };
}

/** Options of the equal-axes plugin: the ranges the data need (the plugin widens one to the plot's shape). */
export interface EqualAxesOptions {
  x: [number, number];
  y: [number, number];
}

/**
 * Chart.js plugin: where a configuration carries `plugins.equalAxes` (plain data, so configurations stay
 * clonable), the x and y ranges are set after each layout from the plot area's size by equalScaleRanges, and
 * the units per pixel drawn are written on the canvas (data-units-per-px "x:y") for the browser tests.
 */
const equalAxesPasses = new WeakMap<Chart, { base: object; passes: number }>();
export const equalAxesPlugin = {
  id: 'equalAxes',
  afterLayout(chart: Chart) {
    // Chart.js hands every registered plugin its options (an empty object where a chart sets none).
    const base = (chart.options.plugins as { equalAxes?: Partial<EqualAxesOptions> } | undefined)?.equalAxes;
    const area = chart.chartArea;
    if (!Array.isArray(base?.x) || !Array.isArray(base?.y) || !area || area.width <= 0 || area.height <= 0) return;
    const want = equalScaleRanges(base.x as [number, number], base.y as [number, number], area.width, area.height);
    const scales = chart.options.scales as Record<string, { min?: number; max?: number }>;
    const close = (a: number | undefined, b: number, span: number) => a !== undefined && Math.abs(a - b) <= 1e-4 * span;
    const spanX = want.x[1] - want.x[0];
    const spanY = want.y[1] - want.y[0];
    const seen = equalAxesPasses.get(chart);
    const passes = seen && seen.base === base ? seen.passes : 0;
    if (close(scales.x.min, want.x[0], spanX) && close(scales.x.max, want.x[1], spanX) && close(scales.y.min, want.y[0], spanY) && close(scales.y.max, want.y[1], spanY)) {
      equalAxesPasses.set(chart, { base, passes: 0 });
      return;
    }
    // Never more than a few passes in a row for one configuration, whatever the tick labels do to the area.
    if (passes >= 4) return;
    equalAxesPasses.set(chart, { base, passes: passes + 1 });
    scales.x.min = want.x[0];
    scales.x.max = want.x[1];
    scales.y.min = want.y[0];
    scales.y.max = want.y[1];
    // The new ranges change the tick labels and so the plot area a little: lay out again (converges in a pass
    // or two, since the ranges follow the area and the area barely moves).
    queueMicrotask(() => {
      if (chart.canvas) chart.update('none');
    });
  },
  afterRender(chart: Chart) {
    const x = chart.scales.x;
    const y = chart.scales.y;
    if (!x || !y) return;
    chart.canvas.dataset.unitsPerPx = `${(x.max - x.min) / (x.right - x.left)}:${(y.max - y.min) / (y.bottom - y.top)}`;
  },
};
