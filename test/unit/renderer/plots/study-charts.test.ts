/** Study chart builders: the landing-dispersion chart, axis tops, and the divert chart without a requirement. */
import { describe, expect, it } from 'vitest';
import { divertRadiusChart, landingChart, MAX_LANDING_POINTS, niceCeil } from '../../../../renderer/plots/study-charts.ts';

describe('study charts', () => {
  it('round axis tops: 1, 2 or 5 × 10^k', () => {
    expect([niceCeil(1132.8), niceCeil(1000), niceCeil(0.031), niceCeil(0), niceCeil(3)]).toEqual([2000, 1000, 0.05, 1, 5]);
  });

  it('divert chart without a requirement has no limit line; the end points sit inside the frame', () => {
    const c = divertRadiusChart([1000, 2000], [300, 600], null, null);
    expect(c.data.datasets.map((d) => d.label)).toEqual(['Guaranteed divert radius']);
    const x = c.options!.scales!.x as { min: number; max: number };
    expect(x.min).toBeLessThan(1000);
    expect(x.max).toBeGreaterThan(2000);
  });

  it('landing chart: the ellipse outline satisfies its own equation; points are thinned past the cap', () => {
    const e = { centreEast_m: 10, centreNorth_m: -5, semiMajor_m: 300, semiMinor_m: 100, orientation_deg: 35, probability: 0.997 };
    const n = MAX_LANDING_POINTS * 2 + 1;
    const c = landingChart(new Float64Array(n), new Float64Array(n), e);
    const [points, outline, nominal] = c.data.datasets;
    expect(points.label).toBe(`Landing points (${n} samples)`);
    expect(points.data.length).toBeLessThanOrEqual(MAX_LANDING_POINTS);
    expect(outline.label).toBe('99.7 % landing ellipse');
    const th = (35 * Math.PI) / 180;
    for (const p of outline.data) {
      // Rotate back into the ellipse's axes: (u/a)² + (v/b)² = 1 (analytic).
      const dx = p.x - 10;
      const dy = p.y + 5;
      const u = dx * Math.cos(th) + dy * Math.sin(th);
      const v = -dx * Math.sin(th) + dy * Math.cos(th);
      expect((u / 300) ** 2 + (v / 100) ** 2).toBeCloseTo(1, 9);
    }
    expect(nominal.data).toEqual([{ x: 0, y: 0 }]);
  });
});
