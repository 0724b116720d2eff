/**
 * P(touchdown on unsafe ground) against closed forms: the Gaussian ellipse model (gaussianUnsafeProbability)
 * and Monte Carlo touchdowns drawn from our per-sample streams through a full covariance's Cholesky factor
 * (isSafeAt), over hazard maps whose answer is known:
 *   - a half-plane hazard {east > d}: P = 1 − Φ(d/σ_n), σ_n² = nᵀCn along the boundary's normal n;
 *   - a safe disc of radius r about the mean, isotropic σ: P(safe) = 1 − exp(−r²/2σ²) (the χ²₂ / Rayleigh CDF);
 *   - an offset safe disc: P(safe) = F_{χ'²₂}(r²/σ²; λ = |μ − c|²/σ²), the non-central χ² (Rice) CDF;
 *   - the χ² ellipse coverage: P(Mahalanobis² ≤ k²) = 1 − exp(−k²/2) for a 2-D Gaussian.
 * Φ and the non-central χ² CDF come from SciPy (python3-scipy); the rest is derived here.
 * Tolerances, derived (not fitted):
 *   - the model's midpoint rule over cells of side h: |error| ≤ (h²/24)∫(|f_xx| + |f_yy|) ≤ h²/(6 λ_min), since
 *     ∫|f_xx| ≤ 2 (C⁻¹)_xx ≤ 2/λ_min for a Gaussian density f;
 *   - a disc laid on cells (a cell is in when its centre is): the two differ only within h/√2 of the circle,
 *     an area ≤ 2π(r + h)·h√2 at density ≤ the largest density on that annulus;
 *   - Monte Carlo with M samples: the count is Binomial(M, P); 4σ = 4√(P(1 − P)/M) (false alarm < 1e-4;
 *     the streams are seeded, so the test is deterministic anyway).
 */
import { describe, expect, it } from 'vitest';
import { applyFactor, covarianceFactor } from '../../../core/uncertainty/covariance.ts';
import { gaussianUnsafeProbability, isSafeAt, type HazardLayer } from '../../../core/uncertainty/hazardLayer.ts';
import { sampleStream } from '../../../core/uncertainty/random.ts';
import { ellipseRadiusForProbability } from '../../../core/footprint/ellipse.ts';
import { referenceToolsReady } from '../../support/reference-tools.ts';
import { scipy } from './scipy.ts';

/** A hazard layer of side 2·half (m), cells of side h, the nominal target at the DEM's centre (0, 0). */
function layer(half: number, h: number, safeAt: (e: number, n: number) => boolean): HazardLayer {
  const width = Math.round((2 * half) / h);
  const safe = new Uint8Array(width * width);
  for (let r = 0; r < width; r++) for (let c = 0; c < width; c++) safe[r * width + c] = safeAt(-half + (c + 0.5) * h, half - (r + 0.5) * h) ? 1 : 0;
  return { width, height: width, pixelSizeX_m: h, pixelSizeY_m: h, originEast_m: -half, originNorth_m: half, safe, clear: safe, target_m: [0, 0], jacobian: [1, 0, 0, 1] };
}

function eigenMin(C: number[][]): number {
  const [a, b, d] = [C[0][0], C[0][1], C[1][1]];
  return (a + d) / 2 - Math.sqrt(((a - d) / 2) ** 2 + b * b);
}

/** Share of M Gaussian draws N(mean, C) landing on unsafe cells. */
function monteCarloUnsafe(L: HazardLayer, mean: [number, number], C: number[][], M: number, seed: number): number {
  const f = covarianceFactor('test covariance', C, 2, 'm²');
  let unsafe = 0;
  for (let i = 0; i < M; i++) {
    const s = sampleStream(seed, i);
    const [x, y] = applyFactor(f, [s.normal(), s.normal()], [0, 0]);
    if (!isSafeAt(L, mean[0] + x, mean[1] + y)) unsafe++;
  }
  return unsafe / M;
}

const M = 20000;
const binomial4 = (P: number) => 4 * Math.sqrt((P * (1 - P)) / M);

describe.runIf(referenceToolsReady('scipy'))('P(unsafe touchdown) against closed forms', () => {
  it('half-plane hazard {east > d}: 1 − Φ(d/σ_n), full covariance', () => {
    const C = [[900, 360], [360, 400]]; // σ_e = 30 m, σ_n = 20 m, correlation 0.6
    const h = 1;
    const mean: [number, number] = [3, -4];
    for (const d of [0, 25, 60]) {
      const L = layer(260, h, (e) => e < d); // d on a cell edge: the boundary is exact
      const sigma = Math.sqrt(C[0][0]);
      const exact = scipy<number>('print(json.dumps(float(stats.norm.sf(x))))', (d - mean[0]) / sigma);
      const model = gaussianUnsafeProbability(L, mean, [C[0][0], C[0][1], C[1][1]]);
      expect(Math.abs(model - exact), `model, d = ${d}`).toBeLessThan((h * h) / (6 * eigenMin(C)));
      const mc = monteCarloUnsafe(L, mean, C, M, 11 + d);
      expect(Math.abs(mc - exact), `Monte Carlo, d = ${d}`).toBeLessThan(binomial4(exact));
    }
  });

  it('safe disc about the mean: P(safe) = 1 − exp(−r²/2σ²); offset disc: the non-central χ² (Rice) CDF', () => {
    const sigma = 20;
    const C = [[sigma * sigma, 0], [0, sigma * sigma]];
    const h = 0.5;
    for (const [r, cx, cy] of [[30, 0, 0], [15, 0, 0], [30, 12, -9]] as [number, number, number][]) {
      const L = layer(170, h, (e, n) => (e - cx) ** 2 + (n - cy) ** 2 <= r * r);
      const lambda = (cx * cx + cy * cy) / (sigma * sigma);
      const safeExact = cx === 0 && cy === 0
        ? 1 - Math.exp((-r * r) / (2 * sigma * sigma)) // derived: |x|²/σ² ~ χ²₂, CDF 1 − e^{−t/2}
        : scipy<number>('print(json.dumps(float(stats.ncx2.cdf(x[0], 2, x[1]))))', [(r * r) / (sigma * sigma), lambda]);
      if (cx === 0 && cy === 0) {
        const viaScipy = scipy<number>('print(json.dumps(float(stats.chi2.cdf(x, 2))))', (r * r) / (sigma * sigma));
        expect(Math.abs(viaScipy - safeExact)).toBeLessThan(1e-14);
      }
      const dist = Math.hypot(cx, cy);
      const fMax = Math.exp(-(Math.max(0, r - dist - h) ** 2) / (2 * sigma * sigma)) / (2 * Math.PI * sigma * sigma);
      const boundary = 2 * Math.PI * (r + h) * h * Math.SQRT2 * fMax;
      const model = gaussianUnsafeProbability(L, [0, 0], [C[0][0], 0, C[1][1]]);
      expect(Math.abs(1 - model - safeExact), `model r = ${r}, centre ${cx}, ${cy}`).toBeLessThan((h * h) / (6 * sigma * sigma) + boundary);
      const mc = monteCarloUnsafe(L, [0, 0], C, M, 100 + r);
      expect(Math.abs(1 - mc - safeExact), `Monte Carlo r = ${r}`).toBeLessThan(binomial4(safeExact) + boundary);
    }
  });

  it('χ² ellipse coverage: the share of draws inside the k-ellipse is 1 − exp(−k²/2)', () => {
    const C = [[400, -150], [-150, 225]];
    const f = covarianceFactor('test covariance', C, 2, 'm²');
    const det = C[0][0] * C[1][1] - C[0][1] ** 2;
    for (const P of [0.5, 0.9, 0.997]) {
      const k = ellipseRadiusForProbability(P);
      const viaScipy = scipy<number>('print(json.dumps(float(stats.chi2.cdf(x, 2))))', k * k);
      expect(Math.abs(viaScipy - P)).toBeLessThan(1e-12);
      let inside = 0;
      for (let i = 0; i < M; i++) {
        const s = sampleStream(5, i);
        const [x, y] = applyFactor(f, [s.normal(), s.normal()], [0, 0]);
        const m2 = (C[1][1] * x * x - 2 * C[0][1] * x * y + C[0][0] * y * y) / det;
        if (m2 <= k * k) inside++;
      }
      expect(Math.abs(inside / M - P), `P = ${P}`).toBeLessThan(binomial4(P));
    }
  });
});
