import { describe, expect, it } from 'vitest';
import { altitudeSpeedChart, massChart, throttleChart, tiltAngles_deg, tiltChart } from '../../../../renderer/plots/trajectory-charts.ts';
import { divertRadiusChart, footprintAreaChart } from '../../../../renderer/plots/study-charts.ts';
import { toPoints, type LineConfig } from '../../../../renderer/plots/chart-parts.ts';
import { TRAJECTORY_COLOURS } from '../../../../renderer/plots/palette.ts';

const limits = { thrustMax_N: 20000, throttleMin: 0.3, throttleMax: 0.8 };
const byLabel = (config: LineConfig, prefix: string) => config.data.datasets.find((d) => d.label?.startsWith(prefix))!;

const one = <T,>(series: T, label = 'Target A') => [{ label, series }];

describe('throttle chart', () => {
  const t = { time_s: [0, 10, 20], thrust_N: [0, 0, 16000, 3000, 0, 4000, 0, 0, 6000] };

  it('plots |T| / thrustMax over time with both limits across the flight', () => {
    const config = throttleChart(one(t), limits);
    const throttle = byLabel(config, 'Target A');
    // |(0,0,16000)| / 20000 = 0.8; |(3000,0,4000)| = 5000 → 0.25; 6000 → 0.3.
    expect(throttle.data).toEqual([{ x: 0, y: 0.8 }, { x: 10, y: 0.25 }, { x: 20, y: 0.3 }]);
    const max = byLabel(config, 'Maximum throttle');
    const min = byLabel(config, 'Minimum throttle');
    expect(max.data).toEqual([{ x: 0, y: 0.8 }, { x: 20, y: 0.8 }]);
    expect(min.data).toEqual([{ x: 0, y: 0.3 }, { x: 20, y: 0.3 }]);
    // Limits differ by dash pattern, not only by colour.
    expect(max.borderDash).not.toEqual(min.borderDash);
  });

  it('ties the thrust axis (kN) to the throttle axis through thrustMax', () => {
    const scales = throttleChart(one(t), limits).options!.scales! as Record<string, { min?: number; max?: number; title?: { text?: string } }>;
    expect(scales.y.max! * limits.thrustMax_N / 1000).toBeCloseTo(scales.thrust.max!, 10);
    expect(scales.thrust.title!.text).toBe('Thrust (kN)');
    // Both axes keep the house tick colour when a tick count is given.
    const ticks = scales as unknown as Record<string, { ticks: { color: string; count?: number } }>;
    expect(ticks.thrust.ticks).toMatchObject({ count: 6, color: ticks.x.ticks.color });
    expect(scales.x.title!.text).toBe('Time since ignition (s)');
  });

  it('without a trajectory shows only the limits over the flight-time window', () => {
    const config = throttleChart([], limits, 110);
    expect(config.data.datasets.map((d) => d.label)).toEqual(['Maximum throttle 0.8', 'Minimum throttle 0.3']);
    expect(config.data.datasets[0].data.at(-1)!.x).toBe(110);
  });

  it('compares trajectories in the scene colours, over the window covering all of them', () => {
    const longer = { time_s: [0, 30], thrust_N: [0, 0, 10000, 0, 0, 10000] };
    const config = throttleChart([{ label: 'A', series: t }, { label: 'B', series: longer }], limits);
    expect(byLabel(config, 'A').borderColor).toBe(TRAJECTORY_COLOURS[0]);
    expect(byLabel(config, 'B').borderColor).toBe(TRAJECTORY_COLOURS[1]);
    expect(byLabel(config, 'Maximum throttle').data.at(-1)!.x).toBe(30);
  });

  it('turns animation off and parsing off (data are ready points)', () => {
    const options = throttleChart(one(t), limits).options!;
    expect(options.animation).toBe(false);
    expect(options.parsing).toBe(false);
  });
});

describe('other descent charts', () => {
  it('mass chart: propellant used = m(0) − m(t), dry mass + reserve as the floor', () => {
    const config = massChart(one({ time_s: [0, 5, 10], mass_kg: [2400, 2300, 2150] }), 1700, 80);
    expect(byLabel(config, 'Target A: propellant used').data.map((p) => p.y)).toEqual([0, 100, 250]);
    expect(byLabel(config, 'Dry mass + reserve').data[0].y).toBe(1780);
  });

  it('altitude and speed chart: altitude is the up component, speed the velocity norm', () => {
    const config = altitudeSpeedChart(one({ time_s: [0, 1], position_m: [5, 5, 100, 0, 0, 0], velocity_mps: [3, 4, 0, 0, 0, 0] }), 120);
    expect(byLabel(config, 'Target A: altitude').data.map((p) => p.y)).toEqual([100, 0]);
    expect(byLabel(config, 'Target A: speed').data.map((p) => p.y)).toEqual([5, 0]);
    expect(byLabel(config, 'Speed limit').data[0].y).toBe(120);
  });

  it('tilt is the angle from vertical: straight up 0°, 45° for (1,0,1), 90° horizontal', () => {
    expect(Array.from(tiltAngles_deg([0, 0, 5, 1, 0, 1, 0, 2, 0], 3)).map((x) => +x.toFixed(10))).toEqual([0, 45, 90]);
    const config = tiltChart(one({ time_s: [0, 1, 2], thrust_N: [0, 0, 5, 1, 0, 1, 0, 2, 0] }), 45);
    expect(byLabel(config, 'Tilt limit').data[0].y).toBe(45);
  });
});

describe('charts without a trajectory', () => {
  it('show only the limits that come from the inputs, over the flight-time window', () => {
    expect(massChart([], 1700, 80, 90).data.datasets.map((d) => [d.label, d.data.at(-1)])).toEqual([['Dry mass + reserve 1780 kg', { x: 90, y: 1780 }]]);
    expect(altitudeSpeedChart([], 110, 90).data.datasets.map((d) => d.label)).toEqual(['Speed limit 110 m/s']);
    expect(tiltChart([], 45, 90).data.datasets.map((d) => d.label)).toEqual(['Tilt limit 45°']);
    expect(throttleChart([], { thrustMax_N: 1, throttleMin: 0.1 + 0.2, throttleMax: 0.8 }).data.datasets[1].label).toBe('Minimum throttle 0.3');
  });
});

describe('study charts', () => {
  it('footprint area in km² against reserve', () => {
    const config = footprintAreaChart([0, 50, 100], [4e6, 3.5e6, 2e6]);
    expect(config.data.datasets[0].data).toEqual([{ x: 0, y: 4 }, { x: 50, y: 3.5 }, { x: 100, y: 2 }]);
  });

  it('divert radius with the requirement line and the found minimum altitude', () => {
    const config = divertRadiusChart([1000, 1500, 2000], [300, 600, 900], 500, 1333.3);
    // The requirement spans the whole x axis (the sampled range plus a 4 % margin each side).
    const x = config.options!.scales!.x as { min: number; max: number };
    expect(byLabel(config, 'Requirement 500 m').data).toEqual([{ x: x.min, y: 500 }, { x: x.max, y: 500 }]);
    expect([x.min, x.max]).toEqual([960, 2040]);
    const marker = byLabel(config, 'Minimum ignition altitude 1333 m');
    expect(marker.data.map((p) => p.x)).toEqual([1333.3, 1333.3]);
    expect(divertRadiusChart([1000], [300], 500, null).data.datasets).toHaveLength(2);
  });

  it('rejects series of unequal length', () => {
    expect(() => toPoints([1, 2], [1])).toThrow(/2 x values and 1 y values/);
  });
});

describe('chart colours follow the picks', () => {
  it('a trajectory keeps the colour of its pick even when an earlier pick has no curve', () => {
    const series = { time_s: [0, 1], thrust_N: [0, 0, 100, 0, 0, 100] };
    const config = throttleChart([{ label: 'Target 2', series, colourIndex: 1 }], { thrustMax_N: 200, throttleMin: 0.2, throttleMax: 0.8 });
    const curve = config.data.datasets.find((d) => d.label === 'Target 2')!;
    expect(curve.borderColor).toBe(TRAJECTORY_COLOURS[1]);
  });
});
