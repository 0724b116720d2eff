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

/**
 * Bracketing from a feasible start: steps of `h` (growing by the golden ratio) downhill from x until
 * the cost rises, is infeasible (+∞) or the bound is hit. Returns [a, b] holding the minimiser and the
 * best point seen. With a warm start near the optimum this replaces shrinking the whole physical bracket.
 * Returns at once when a value at or below `stopBelow` is found.
 */
export function bracketFrom(
  f: (x: number) => number, x: number, fx: number, h: number, lo: number, hi: number, stopBelow = -Infinity,
): { a: number; b: number; x: number; fx: number } {
  const GROW = 1.618033988749895;
  const up = Math.min(hi, x + h);
  const fUp = up > x ? f(up) : Infinity;
  if (fUp <= stopBelow) return { a: x, b: up, x: up, fx: fUp };
  if (fUp < fx) {
    let a = x;
    let xb = up;
    let fb = fUp;
    let step = h;
    while (xb < hi) {
      step *= GROW;
      const nx = Math.min(hi, xb + step);
      const fn = f(nx);
      if (fn <= stopBelow) return { a: xb, b: nx, x: nx, fx: fn };
      if (!(fn < fb)) return { a, b: nx, x: xb, fx: fb };
      a = xb;
      xb = nx;
      fb = fn;
    }
    return { a, b: hi, x: xb, fx: fb };
  }
  const down = Math.max(lo, x - h);
  const fDown = down < x ? f(down) : Infinity;
  if (fDown <= stopBelow) return { a: down, b: x, x: down, fx: fDown };
  if (fDown < fx) {
    let b = x;
    let xb = down;
    let fb = fDown;
    let step = h;
    while (xb > lo) {
      step *= GROW;
      const nx = Math.max(lo, xb - step);
      const fn = f(nx);
      if (fn <= stopBelow) return { a: nx, b: xb, x: nx, fx: fn };
      if (!(fn < fb)) return { a: nx, b, x: xb, fx: fb };
      b = xb;
      xb = nx;
      fb = fn;
    }
    return { a: lo, b, x: xb, fx: fb };
  }
  return { a: down, b: up, x, fx };
}
