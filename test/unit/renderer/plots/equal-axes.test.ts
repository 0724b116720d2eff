/** Equal-scaled axes for the landing chart (issue 15 bug 6: a 308 × 290 m ellipse looked 2:1). */
import { describe, expect, it } from 'vitest';
import { equalScaleRanges } from '../../../../renderer/plots/chart-parts.ts';
import { landingChart } from '../../../../renderer/plots/study-charts.ts';

describe('equal-scaled axes', () => {
  it('one unit spans as many pixels on x as on y; centres kept; neither range narrowed', () => {
    // A 200 × 100 m square of data in a 600 × 200 px area: x needs 1/3 m/px, y 1/2 m/px → both 1/2 m/px,
    // so x spans 300 m about its centre 50 and y keeps its 100 m about 0 (arithmetic).
    const r = equalScaleRanges([-50, 150], [-50, 50], 600, 200);
    expect(r.x[0]).toBeCloseTo(-100, 9);
    expect(r.x[1]).toBeCloseTo(200, 9);
    expect(r.y).toEqual([-50, 50]);
    const ux = (r.x[1] - r.x[0]) / 600;
    const uy = (r.y[1] - r.y[0]) / 200;
    expect(ux).toBeCloseTo(uy, 12);
  });

  it('the landing chart asks for it with square data ranges around the points (plain data, clonable)', () => {
    const e = { centreEast_m: 10, centreNorth_m: -5, semiMajor_m: 154, semiMinor_m: 145, orientation_deg: 0, probability: 0.997 };
    const c = landingChart(new Float64Array([0, 20]), new Float64Array([0, -10]), e as never);
    const eq = (c.options!.plugins as unknown as { equalAxes: { x: [number, number]; y: [number, number] } }).equalAxes;
    expect(eq.x[1] - eq.x[0]).toBeCloseTo(eq.y[1] - eq.y[0], 9);
    expect(() => structuredClone(c)).not.toThrow();
  });
});
