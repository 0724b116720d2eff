/**
 * The one slope-based minimiser of the free-final-time search: minimises a cost f(t) over an interval whose
 * ends may be infeasible, from values and slopes f′ (for the descent problems the slope of the optimal value
 * in t_f comes almost for free from the dual solution by the envelope theorem, `DescentSolver.objectiveSlope`;
 * Fiacco 1983, Introduction to Sensitivity and Stability Analysis in Nonlinear Programming, §3).
 *
 * 1. Expansion: from the best opening point, step downhill (a Newton step on the slope when a curvature is
 *    known, else a fixed step; growing by the secant extrapolation of the slope) until the slope changes sign
 *    or feasibility ends.
 * 2. Contraction: with the minimiser bracketed, probe at the minimiser of the cubic Hermite interpolant of
 *    (f, f′) at the bracket's ends (Nocedal & Wright 2006, Numerical Optimization, eq. 3.59), kept 5 % inside
 *    the bracket; next to an infeasible end, bisect.
 *
 * One stop rule, stated in the caller's units: f convex ⇒ every solved point's tangent is a lower bound
 * (Kelley's cutting planes in one dimension), so the bracket's tangents bound the minimum from below — where
 * they cross when both ends are feasible, at the infeasible end's abscissa otherwise. The search stops when
 * `gapOf(best, bound)` is within `gapTolerance` (a certified tolerance, kinks included: at a kink the two
 * tangents still bound the minimum and the bound closes as the bracket shrinks), or when the caller's `stop`
 * says a point is good enough, or when the bracket is narrower than `widthFloor` (then the gap is returned
 * uncertified-small, for the caller to report).
 */

export interface SlopePoint {
  /** Abscissa (time of flight, s). */
  t: number;
  /** False when the problem at this point is infeasible (cost +∞, no slope). */
  feasible: boolean;
  f: number;
  g: number;
  /** Good enough: stop the search here (e.g. a zero landing error). */
  stop?: boolean;
}

export interface SlopeMinimiseOptions {
  /** Open interval of admissible abscissae (infeasible or outside the physical bracket at and beyond). */
  lo: number;
  hi: number;
  /** Stop once gapOf(best, lower bound) ≤ this (caller's units, e.g. kg). */
  gapTolerance: number;
  /** Converts a cost and a lower bound on the minimum into the caller's units of the gap. */
  gapOf: (best: number, bound: number) => number;
  /** Stop when the bracket is narrower than this. */
  widthFloor: number;
  /** First step when no curvature is known. */
  step: number;
  /** Estimate of f″ near the minimum (e.g. a neighbour's), for the first Newton step. */
  curvature?: number;
  /** Largest number of further evaluations. */
  maxEvaluations: number;
  /** Stop early once the certified lower bound satisfies this (a propellant budget exceeded, say). */
  boundStop?: (bound: number) => boolean;
}

export type SlopeStop = 'converged' | 'good-enough' | 'bound-stop' | 'width' | 'evaluations' | 'edge';

export interface SlopeMinimum {
  best: SlopePoint;
  /** Certified lower bound on f over the interval (−∞ when no bracket was found). */
  bound: number;
  /** gapOf(best.f, bound). */
  gap: number;
  /** Slope difference over the final bracket, an estimate of f″ (NaN unless both ends feasible). */
  curvature: number;
  evaluations: number;
  reason: SlopeStop;
}

/** Largest step of the expansion, as a fraction of the abscissa. */
const MAX_STEP_FRACTION = 0.25;

export function slopeMinimise(evaluate: (t: number) => SlopePoint, opening: readonly SlopePoint[], o: SlopeMinimiseOptions): SlopeMinimum {
  let evaluations = 0;
  const feasible = opening.filter((p) => p.feasible);
  if (feasible.length === 0) throw new Error('internal: slopeMinimise needs a feasible opening point');
  let best = feasible.reduce((a, b) => (b.f < a.f ? b : a));
  let lo = o.lo;
  let hi = o.hi;
  // a: the rightmost point known to lie left of the minimiser (feasible, f′ < 0, or an infeasible point on
  // the left); b: the leftmost point right of it (feasible, f′ ≥ 0, or infeasible on the right).
  const ends: { a: SlopePoint | null; b: SlopePoint | null } = { a: null, b: null };
  const place = (p: SlopePoint) => {
    if (p.feasible) {
      if (p.f < best.f || p.stop) best = p;
      if (p.g < 0) { if (!ends.a || p.t > ends.a.t) ends.a = p; } else if (!ends.b || p.t < ends.b.t) ends.b = p;
    } else if (p.t < best.t) {
      if (p.t > lo) lo = p.t;
    } else if (p.t < hi) hi = p.t;
  };
  opening.forEach(place);
  const result = (reason: SlopeStop, bound = -Infinity, curvature = NaN): SlopeMinimum =>
    ({ best, bound, gap: o.gapOf(best.f, bound), curvature, evaluations, reason });
  const look = (t: number) => {
    const p = evaluate(t);
    evaluations++;
    place(p);
    return p;
  };
  if (best.stop) return result('good-enough');

  // ── expansion ──
  let last = best;
  const k0 = feasible.length >= 2 && feasible[1].t !== feasible[0].t ? (feasible[1].g - feasible[0].g) / (feasible[1].t - feasible[0].t) : o.curvature;
  let step = k0 !== undefined && k0 > 0 ? Math.abs(last.g / k0) : o.step;
  while (!(ends.a && ends.b)) {
    if (evaluations >= o.maxEvaluations) return result('evaluations');
    const dir = last.g < 0 ? 1 : -1;
    const edge = dir > 0 ? hi : lo;
    const size = Math.max(2 * o.widthFloor, Math.min(step, MAX_STEP_FRACTION * last.t));
    let t = last.t + dir * size;
    if ((t - edge) * dir >= 0) t = 0.5 * (last.t + edge);
    if (Math.abs(t - last.t) < o.widthFloor) break;
    const p = look(t);
    if (p.stop) return result('good-enough');
    // Feasibility ends downhill, or the slope changed sign: the minimiser is bracketed.
    if (!p.feasible || p.g * dir >= 0) break;
    const k = (p.g - last.g) / (p.t - last.t);
    step = k > 0 ? 1.5 * Math.abs(p.g / k) : 2 * size;
    last = p;
  }

  // ── contraction with the certified stop ──
  for (;;) {
    const left = ends.a;
    const right = ends.b;
    // Bound and next probe for the three bracket shapes.
    let bound: number;
    let next: number;
    let curvature = NaN;
    if (left && right) {
      const tc = (right.f - left.f + left.g * left.t - right.g * right.t) / (left.g - right.g);
      bound = Math.min(left.f, right.f, left.f + left.g * (tc - left.t));
      curvature = (right.g - left.g) / (right.t - left.t);
      const width = right.t - left.t;
      const d1 = left.g + right.g - (3 * (left.f - right.f)) / (left.t - right.t);
      const disc = d1 * d1 - left.g * right.g;
      let t = disc >= 0
        ? right.t - (width * (right.g + Math.sqrt(disc) - d1)) / (right.g - left.g + 2 * Math.sqrt(disc))
        : tc;
      if (!Number.isFinite(t)) t = 0.5 * (left.t + right.t);
      next = Math.min(right.t - 0.05 * width, Math.max(left.t + 0.05 * width, t));
    } else if (left) {
      // Feasible downhill point, infeasible (or bracket) bound at `hi` on the right.
      bound = left.f + left.g * (hi - left.t);
      next = 0.5 * (left.t + hi);
    } else if (right) {
      bound = right.f - right.g * (right.t - lo);
      next = 0.5 * (lo + right.t);
    } else {
      return result('edge');
    }
    const width = (right ? right.t : hi) - (left ? left.t : lo);
    const gap = o.gapOf(best.f, bound);
    if (gap <= o.gapTolerance) return result('converged', bound, curvature);
    if (o.boundStop && o.boundStop(bound)) return result('bound-stop', bound, curvature);
    if (width <= o.widthFloor || !Number.isFinite(width)) return result('width', bound, curvature);
    if (evaluations >= o.maxEvaluations) return result('evaluations', bound, curvature);
    const p = look(next);
    if (p.stop) return result('good-enough', bound, curvature);
  }
}
