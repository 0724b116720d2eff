/**
 * Landing ellipses from 2-D Gaussian dispersions. For a bivariate normal, the squared Mahalanobis radius
 * k² is χ²-distributed with 2 degrees of freedom, so the probability inside the k-ellipse is
 * P = 1 − exp(−k²/2) and k = √(−2 ln(1 − P)) (e.g. Papoulis & Pillai, Probability, Random Variables and
 * Stochastic Processes, 4th ed., the Rayleigh distribution): 99.7 % ↔ k = 3.409; k = 3 ↔ 98.89 %.
 */

/** Probability inside the ellipse of Mahalanobis radius k (2-D). */
export function ellipseProbability(k: number): number {
  if (!(k >= 0)) throw new RangeError(`Mahalanobis radius ${k}: must be zero or positive`);
  return 1 - Math.exp((-k * k) / 2);
}

/** Mahalanobis radius k of the ellipse holding probability p (2-D). */
export function ellipseRadiusForProbability(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`probability ${p}: must be between 0 and 1 (exclusive), e.g. 0.997`);
  return Math.sqrt(-2 * Math.log(1 - p));
}

export interface Ellipse {
  centreEast_m: number;
  centreNorth_m: number;
  /** Semi-axes, m (major ≥ minor). */
  semiMajor_m: number;
  semiMinor_m: number;
  /** Orientation of the major axis, degrees counter-clockwise from east. */
  orientation_deg: number;
  probability: number;
}

/** Sample mean and covariance of 2-D points. */
export function sampleMoments(east: ArrayLike<number>, north: ArrayLike<number>): { mean: [number, number]; cov: [number, number, number] } {
  const n = east.length;
  if (n < 3 || north.length !== n) throw new RangeError(`need at least 3 landing points of both coordinates, got ${n}`);
  let me = 0;
  let mn = 0;
  for (let i = 0; i < n; i++) {
    me += east[i];
    mn += north[i];
  }
  me /= n;
  mn /= n;
  let see = 0;
  let snn = 0;
  let sen = 0;
  for (let i = 0; i < n; i++) {
    const de = east[i] - me;
    const dn = north[i] - mn;
    see += de * de;
    snn += dn * dn;
    sen += de * dn;
  }
  return { mean: [me, mn], cov: [see / (n - 1), sen / (n - 1), snn / (n - 1)] };
}

/** The ellipse of probability p of a 2-D Gaussian with the given mean and covariance [σee, σen, σnn]. */
export function dispersionEllipse(mean: readonly [number, number], cov: readonly [number, number, number], p: number): Ellipse {
  const [a, b, c] = cov;
  const tr = a + c;
  const disc = Math.sqrt(((a - c) / 2) ** 2 + b * b);
  const l1 = tr / 2 + disc;
  const l2 = Math.max(0, tr / 2 - disc);
  const k = ellipseRadiusForProbability(p);
  const angle = Math.abs(b) < 1e-300 && a >= c ? 0 : Math.atan2(l1 - a, b);
  return {
    centreEast_m: mean[0],
    centreNorth_m: mean[1],
    semiMajor_m: k * Math.sqrt(l1),
    semiMinor_m: k * Math.sqrt(l2),
    orientation_deg: (angle * 180) / Math.PI,
    probability: p,
  };
}
