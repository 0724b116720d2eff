/**
 * Derivative-based minimisation of a unimodal cost on an interval whose ends may be infeasible:
 * once the minimiser is bracketed by slopes of opposite sign, each step goes to the minimiser of the
 * cubic Hermite interpolant of (f, f′) at the two ends (Nocedal & Wright 2006, eq. 3.59), kept 5 %
 * inside the bracket, or to the secant root of f′ when the cubic has none; next to an infeasible end
 * it bisects. It stops when the bracket is shorter than `tol`, or when convexity bounds the remaining
 * gain below `fTol`: f* ≥ f_e − |f′_e| (b − a) for either end e.
 *
 * Used for the free final time, where the derivative of the optimal propellant with respect to t_f
 * comes almost for free from the dual solution (envelope theorem, see DescentSolver.timeDerivative).
 */
export interface Probe {
  /** False when the problem at this point is infeasible (cost +∞, no derivative). */
  feasible: boolean;
  f: number;
  g: number;
  /** Good enough: stop the search here (e.g. a zero landing error). */
  stop?: boolean;
}

export interface SecantResult {
  x: number;
  f: number;
  evaluations: number;
}

export function secantMinimise(
  probe: (x: number) => Probe, x0: number, p0: Probe, lo: number, hi: number, tol: number, step: number, maxEvaluations: number,
  fTol = 0,
): SecantResult {
  let best = { x: x0, f: p0.f };
  let evaluations = 0;
  let stopped = false;
  const look = (x: number): Probe => {
    const p = probe(x);
    evaluations++;
    if (p.feasible && (p.f < best.f || p.stop)) best = { x, f: p.f };
    if (p.stop) stopped = true;
    return p;
  };
  // a: feasible with g < 0 (minimiser to its right); b: feasible with g > 0, or infeasible, or the bound.
  let a!: number, ga!: number, b!: number, gb!: number, fa!: number, fb!: number;
  let bFeasible!: boolean;
  let aFeasible!: boolean;
  if (p0.g === 0 || p0.stop) return { x: x0, f: p0.f, evaluations };
  const dir = p0.g < 0 ? 1 : -1;
  // Expansion: walk downhill until the slope changes sign or feasibility ends.
  let x = x0;
  let g = p0.g;
  let fx = p0.f;
  let h = step;
  for (;;) {
    if (evaluations >= maxEvaluations) return { ...best, evaluations };
    const edge = dir > 0 ? hi : lo;
    let nx = x + dir * h;
    if ((nx - edge) * dir >= 0) nx = edge;
    if (nx === x) return { ...best, evaluations };
    const p = look(nx);
    if (stopped) return { ...best, evaluations };
    if (!p.feasible || p.g * dir > 0) {
      // Bracketed between x (downhill slope) and nx.
      if (dir > 0) { a = x; ga = g; fa = fx; aFeasible = true; b = nx; gb = p.g; fb = p.f; bFeasible = p.feasible; }
      else { b = x; gb = g; fb = fx; bFeasible = true; a = nx; ga = p.g; fa = p.f; aFeasible = p.feasible; }
      break;
    }
    // Still downhill: secant extrapolation of the slope, at least doubling, at most ×4.
    const grow = p.g !== g ? Math.min(4, Math.max(2, Math.abs(p.g / (g - p.g)))) : 2;
    x = nx;
    g = p.g;
    fx = p.f;
    h *= grow;
    if (x === edge) return { ...best, evaluations };
  }
  while (b - a > tol && evaluations < maxEvaluations) {
    if (fTol > 0) {
      const gapA = aFeasible ? best.f - fa + Math.abs(ga) * (b - a) : Infinity;
      const gapB = bFeasible ? best.f - fb + Math.abs(gb) * (b - a) : Infinity;
      if (Math.min(gapA, gapB) < fTol) break;
    }
    let nx: number;
    if (aFeasible && bFeasible) {
      const d1 = ga + gb - (3 * (fa - fb)) / (a - b);
      const disc = d1 * d1 - ga * gb;
      if (disc >= 0) {
        const d2 = Math.sqrt(disc);
        nx = b - ((b - a) * (gb + d2 - d1)) / (gb - ga + 2 * d2);
      } else {
        nx = a - (ga * (b - a)) / (gb - ga);
      }
      const margin = 0.05 * (b - a);
      if (!Number.isFinite(nx)) nx = 0.5 * (a + b);
      nx = Math.min(b - margin, Math.max(a + margin, nx));
    } else {
      nx = 0.5 * (a + b);
    }
    const p = look(nx);
    if (stopped) break;
    if (!p.feasible) {
      if (!aFeasible) a = nx;
      else if (!bFeasible) b = nx;
      else break;
      continue;
    }
    if (p.g < 0) {
      a = nx; ga = p.g; fa = p.f; aFeasible = true;
    } else if (p.g > 0) {
      b = nx; gb = p.g; fb = p.f; bFeasible = true;
    } else {
      break;
    }
  }
  return { ...best, evaluations };
}
