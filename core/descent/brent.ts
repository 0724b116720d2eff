/**
 * Brent's minimisation (Brent 1973, "Algorithms for Minimization without Derivatives", ch. 5):
 * golden-section steps with parabolic interpolation, on [a, b] from a starting point x.
 *
 * Infeasible points are +∞. For the free-final-time problem the feasible times form an interval and
 * the cost is unimodal on it (Açıkmeşe & Ploen 2007; Blackmore et al. 2010), so as long as the start x
 * is feasible every comparison discards a part of [a, b] that holds no better feasible point.
 * `stopBelow`: return as soon as a value at or below it is found (a zero landing error needs no polish).
 */
export interface BrentResult {
  x: number;
  fx: number;
  evaluations: number;
}

const CGOLD = 0.3819660112501051;

export function brentMinimise(f: (x: number) => number, a: number, b: number, x: number, fx: number, tol: number, maxEvaluations: number, stopBelow = -Infinity): BrentResult {
  let w = x;
  let v = x;
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  let evaluations = 0;
  while (evaluations < maxEvaluations && !(fx <= stopBelow)) {
    const xm = 0.5 * (a + b);
    const tol1 = tol;
    const tol2 = 2 * tol1;
    if (Math.abs(x - xm) <= tol2 - 0.5 * (b - a)) break;
    let useGolden = true;
    if (Math.abs(e) > tol1 && Number.isFinite(fx) && Number.isFinite(fw) && Number.isFinite(fv)) {
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      q = Math.abs(q);
      const eTemp = e;
      e = d;
      if (!(Math.abs(p) >= Math.abs(0.5 * q * eTemp) || p <= q * (a - x) || p >= q * (b - x))) {
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = xm - x >= 0 ? tol1 : -tol1;
        useGolden = false;
      }
    }
    if (useGolden) {
      e = x >= xm ? a - x : b - x;
      d = CGOLD * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d >= 0 ? tol1 : -tol1);
    const fu = f(u);
    evaluations++;
    if (fu <= fx) {
      if (u >= x) a = x;
      else b = x;
      v = w; fv = fw;
      w = x; fw = fx;
      x = u; fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w; fv = fw;
        w = u; fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u; fv = fu;
      }
    }
  }
  return { x, fx, evaluations };
}
