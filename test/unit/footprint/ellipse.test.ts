import { describe, expect, it } from 'vitest';
import { dispersionEllipse, ellipseProbability, ellipseRadiusForProbability, sampleMoments } from '../../../core/footprint/ellipse.ts';
import { Rng } from '../../support/random.ts';

describe('2-D dispersion ellipses', () => {
  it('matches the published χ²(2) constants: 99.7 % ↔ k = 3.409, 3σ ↔ 98.9 %', () => {
    // P = 1 − exp(−k²/2) for 2 degrees of freedom (closed form of the χ² CDF with ν = 2).
    expect(ellipseRadiusForProbability(0.997)).toBeCloseTo(3.409, 3);
    expect(ellipseProbability(3)).toBeCloseTo(0.9889, 4);
    expect(ellipseProbability(1)).toBeCloseTo(0.3935, 4);
    for (const p of [0.5, 0.9, 0.99, 0.999]) expect(ellipseProbability(ellipseRadiusForProbability(p))).toBeCloseTo(p, 12);
    expect(() => ellipseRadiusForProbability(1)).toThrow(/between 0 and 1/);
  });

  it('Monte Carlo coverage of a seeded correlated Gaussian stays within binomial error', () => {
    const rng = new Rng(2026);
    const n = 20000;
    // Covariance [[400, 150], [150, 100]] m² via its Cholesky factor.
    const L = [
      [20, 0],
      [7.5, Math.sqrt(100 - 7.5 * 7.5)],
    ];
    const e = new Float64Array(n);
    const nn = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const u = rng.normal();
      const v = rng.normal();
      e[i] = 50 + L[0][0] * u;
      nn[i] = -20 + L[1][0] * u + L[1][1] * v;
    }
    const { mean, cov } = sampleMoments(e, nn);
    expect(cov[0]).toBeCloseTo(400, -1);
    expect(cov[1]).toBeCloseTo(150, -1);
    const ell = dispersionEllipse(mean, cov, 0.997);
    const th = (ell.orientation_deg * Math.PI) / 180;
    let inside = 0;
    for (let i = 0; i < n; i++) {
      const de = e[i] - ell.centreEast_m;
      const dn = nn[i] - ell.centreNorth_m;
      const u = de * Math.cos(th) + dn * Math.sin(th);
      const v = -de * Math.sin(th) + dn * Math.cos(th);
      if ((u / ell.semiMajor_m) ** 2 + (v / ell.semiMinor_m) ** 2 <= 1) inside++;
    }
    const frac = inside / n;
    const sigma = Math.sqrt((0.997 * 0.003) / n);
    // 4 binomial σ, plus 0.001 for drawing the ellipse from the sample covariance rather than the true one.
    expect(Math.abs(frac - 0.997)).toBeLessThan(4 * sigma + 0.001);
  });
});
