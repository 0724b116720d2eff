/**
 * Summary statistics of Monte Carlo studies.
 * - Wilson score interval for a binomial proportion (Wilson 1927, JASA 22:209–212): the interval of p whose
 *   score test does not reject k successes in n; unlike the Wald interval p̂ ± z√(p̂(1−p̂)/n) it stays inside
 *   [0, 1] and keeps close to its nominal coverage for small n and p near 0 or 1 (Brown, Cai & DasGupta
 *   2001, Statistical Science 16:101–133), which is where landing-success probabilities live.
 * - Standard normal quantile by Acklam's rational approximation (relative error < 1.15e-9; the common-
 *   practice algorithm, P. J. Acklam 2003), refined by one Halley step on Φ (`normalCdf`).
 * - Sample quantiles by linear interpolation between order statistics (Hyndman & Fan 1996 definition 7,
 *   the default of R and NumPy).
 */

/** A two-sided confidence interval for a proportion. */
export interface ProportionInterval {
  /** Successes and trials. */
  successes: number;
  trials: number;
  /** Point estimate k/n (NaN when n = 0). */
  estimate: number;
  lower: number;
  upper: number;
  /** Two-sided confidence level, e.g. 0.95. */
  confidence: number;
  method: 'wilson-score';
}

/** The Wilson score interval of k successes in n trials at a two-sided confidence level. */
export function wilsonInterval(successes: number, trials: number, confidence = 0.95): ProportionInterval {
  if (!Number.isInteger(trials) || trials < 0) throw new RangeError(`trials: ${trials} (must be a whole number ≥ 0)`);
  if (!Number.isInteger(successes) || successes < 0 || successes > trials) throw new RangeError(`successes: ${successes} (must be a whole number from 0 to the trials, ${trials})`);
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`confidence: ${confidence} (must be between 0 and 1, e.g. 0.95)`);
  if (trials === 0) return { successes, trials, estimate: NaN, lower: 0, upper: 1, confidence, method: 'wilson-score' };
  const z = normalQuantile(1 - (1 - confidence) / 2);
  const n = trials;
  const p = successes / n;
  const z2n = (z * z) / n;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z / (1 + z2n)) * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
  // At k = 0 or k = n one end is exactly 0 or 1 (the formula gives it up to rounding).
  return {
    successes,
    trials,
    estimate: p,
    lower: successes === 0 ? 0 : Math.max(0, centre - half),
    upper: successes === n ? 1 : Math.min(1, centre + half),
    confidence,
    method: 'wilson-score',
  };
}

/**
 * Standard normal CDF Φ(x) = erfc(−x/√2)/2, erfc by its Taylor series near 0 and Lentz's continued fraction
 * in the tails (Abramowitz & Stegun 7.1.5 and 7.1.14); relative accuracy about 1e-14 near the centre, and
 * x²·ε in the far tail (ε = 2.2e-16: the rounding of x itself, which exp(−x²/2) magnifies).
 */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x === Infinity) return 1;
  if (x === -Infinity) return 0;
  return x < 0 ? erfc(-x / Math.SQRT2) / 2 : 1 - erfc(x / Math.SQRT2) / 2;
}

function erfc(x: number): number {
  // x ≥ 0 here.
  if (x < 2) {
    // erf(x) = 2/√π Σ (−1)^n x^(2n+1) / (n! (2n+1))
    let term = x;
    let sum = x;
    for (let n = 1; n < 200; n++) {
      term *= (-x * x) / n;
      const add = term / (2 * n + 1);
      sum += add;
      if (Math.abs(add) < 1e-17 * Math.abs(sum)) break;
    }
    return 1 - (2 / Math.sqrt(Math.PI)) * sum;
  }
  // erfc(x) = exp(−x²)/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + …))))), modified Lentz.
  const tiny = 1e-300;
  let f = x;
  let C = x;
  let D = 0;
  for (let n = 1; n < 500; n++) {
    const a = n / 2;
    D = x + a * D;
    D = Math.abs(D) < tiny ? 1 / tiny : 1 / D;
    C = x + a / C;
    if (Math.abs(C) < tiny) C = tiny;
    const delta = C * D;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(-x * x) / Math.sqrt(Math.PI) / f;
}

/** Standard normal quantile Φ⁻¹(p), 0 < p < 1. */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`probability: ${p} (must be between 0 and 1, exclusive)`);
  // Upper half by symmetry: 1 − p is exact there (Sterbenz), and the refinement then works on small numbers.
  if (p > 0.5) return -normalQuantile(1 - p);
  const a = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
  const b = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
  const c = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
  const pl = 0.02425;
  let x: number;
  if (p < pl) {
    const q = Math.sqrt(-2 * Math.log(p));
    x = (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  } else if (p <= 1 - pl) {
    const q = p - 0.5;
    const r = q * q;
    x = ((((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q) / (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1);
  } else {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    x = -(((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  // One Halley step on Φ(x) − p (Acklam's own refinement).
  const e = normalCdf(x) - p;
  const u = e * Math.sqrt(2 * Math.PI) * Math.exp((x * x) / 2);
  return x - u / (1 + (x * u) / 2);
}

/** Sample quantile of probability q (Hyndman & Fan definition 7); NaN values are ignored; NaN if none is left. */
export function sampleQuantile(values: ArrayLike<number>, q: number): number {
  if (!(q >= 0 && q <= 1)) throw new RangeError(`quantile: ${q} (must be from 0 to 1)`);
  const sorted = Float64Array.from(Array.from(values).filter((v) => !Number.isNaN(v))).sort();
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}
