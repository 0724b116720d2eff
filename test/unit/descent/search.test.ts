import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { timeOfFlightBracket } from '../../../core/descent/bracket.ts';
import { brentMinimise } from '../../../core/descent/brent.ts';
import { slopeMinimise, type SlopePoint } from '../../../core/descent/slopeMinimise.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { parseStudyText, studyToDescent } from '../../../core/study/index.ts';

const d = studyToDescent(parseStudyText(readFileSync(fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url)), 'utf8')));

describe('Brent minimisation with infeasible (+∞) regions', () => {
  it('finds the minimum of a parabola that is only defined on an interval', () => {
    const f = (x: number) => (x < 2 || x > 9 ? Infinity : (x - 6.3) ** 2 + 1);
    const r = brentMinimise(f, 0, 20, 8.5, f(8.5), 1e-6, 100);
    expect(r.x).toBeCloseTo(6.3, 5);
    expect(r.evaluations).toBeLessThan(40);
  });
});

describe('free-final-time search', () => {
  it('the optimum lies inside the physical bracket, and a warm start 1.5 s off reaches the same optimum', () => {
    const target: [number, number, number] = [200, 100, 0];
    const br = timeOfFlightBracket(d.setup, d.ignition, target);
    const cold = searchFreeFinalTime(new DescentSolver(d.setup, landreachConicBackend(), d.ignition), target, d.ignition, { decode: false });
    expect(cold.status).toBe('solved');
    expect(cold.timeOfFlight).toBeGreaterThan(br.lower);
    expect(cold.timeOfFlight).toBeLessThan(br.upper);
    const warm = searchFreeFinalTime(new DescentSolver(d.setup, landreachConicBackend(), d.ignition), target, d.ignition, { tfGuess: cold.timeOfFlight + 1.5, decode: false });
    expect(warm.status).toBe('solved');
    // Same optimum (the propellant is flat in t_f near it: agreement to 0.01 kg).
    expect(Math.abs(warm.propellant - cold.propellant)).toBeLessThan(0.01);
    // Nothing cheaper nearby: probe ±1 s around the optimum directly.
    const s = new DescentSolver(d.setup, landreachConicBackend(), d.ignition);
    for (const dt of [-1, 1]) {
      const r = s.solveFixed('min-propellant', cold.timeOfFlight + dt, target, d.ignition);
      expect(r.propellant).toBeGreaterThan(cold.propellant - 1e-6);
    }
  });

  it('a far target is unreachable: certificates, closest point toward the target, positive miss', () => {
    const target: [number, number, number] = [12000, 0, 0]; // the demo lands at most about 5 km away with its reserve kept (README)
    const r = searchFreeFinalTime(new DescentSolver(d.setup, landreachConicBackend(), d.ignition), target, d.ignition);
    expect(r.status).toBe('unreachable');
    expect(r.infeasibleStatuses.length).toBeGreaterThan(0);
    expect(r.miss).toBeGreaterThan(100);
    expect(r.closestPoint![0]).toBeGreaterThan(0);
    expect(Math.hypot(r.closestPoint![0] - target[0], r.closestPoint![1] - target[1])).toBeCloseTo(r.miss, 3);
  });
});

describe('envelope-theorem slope of the propellant in t_f', () => {
  it('matches a central finite difference of two full solves', () => {
    const s = new DescentSolver(d.setup, landreachConicBackend(), d.ignition);
    // Cold starts: the difference quotient divides solver error by h, so use the most accurate solves.
    s.warmStart = false;
    for (const tf of [36, 40]) {
      const r = s.solveFixed('min-propellant', tf, [0, 0, 0], d.ignition);
      const g = s.timeDerivative(r, [0, 0, 0], d.ignition);
      const h = 1e-3;
      const fd = (s.solveFixed('min-propellant', tf + h, [0, 0, 0], d.ignition).propellant - s.solveFixed('min-propellant', tf - h, [0, 0, 0], d.ignition).propellant) / (2 * h);
      expect(Math.abs(g - fd)).toBeLessThan(1e-3 * Math.abs(fd) + 1e-4);
    }
  });
});

describe('envelope-theorem slope of the landing-error objective in t_f', () => {
  it('matches a central finite difference for an unreachable target', () => {
    const s = new DescentSolver(d.setup, landreachConicBackend(), d.ignition);
    s.warmStart = false;
    const target: [number, number, number] = [12000, 0, 0];
    // Either side of the best time of flight (the slope changes sign between them), inside the window where
    // the burn can still reach the landing plane with the demo's propellant above its 150 kg reserve.
    for (const tf of [66, 78]) {
      const r = s.solveFixed('min-landing-error', tf, target, d.ignition);
      const g = s.objectiveSlope(r, target, d.ignition);
      // Step: solver noise in J (~1e-7 here) over 2h must stay well below the tolerance, and the
      // truncation error h² J‴/6 too; h = 0.01 s balances both for this smooth objective.
      const h = 1e-2;
      const J = (t: number) => s.solveFixed('min-landing-error', t, target, d.ignition).solution.info.primalObjective;
      const fd = (J(tf + h) - J(tf - h)) / (2 * h);
      expect(Math.abs(g - fd)).toBeLessThan(1e-3 * Math.abs(fd) + 1e-6);
    }
  });
});

describe('slopeMinimise', () => {
  const bisectRoot = (g: (x: number) => number, lo: number, hi: number) => {
    for (let i = 0; i < 200; i++) {
      const mid = 0.5 * (lo + hi);
      if (g(mid) < 0) lo = mid;
      else hi = mid;
    }
    return lo;
  };

  it('minimises a smooth convex cost next to an infeasible region using slopes, to the stated gap', () => {
    // f(x) = e^{3/(x−1)} + x on x > 1.2 (infeasible below), convex there: f′ = 1 − 3 e^{3/(x−1)}/(x−1)²;
    // its root by bisection is the reference.
    const f = (x: number) => Math.exp(3 / (x - 1)) + x;
    const g = (x: number) => 1 - (3 * Math.exp(3 / (x - 1))) / (x - 1) ** 2;
    const xStar = bisectRoot(g, 1.5, 50);
    const point = (x: number): SlopePoint => (x < 1.2 ? { t: x, feasible: false, f: Infinity, g: NaN } : { t: x, feasible: true, f: f(x), g: g(x) });
    const r = slopeMinimise(point, [point(2)], { lo: 0, hi: 100, gapTolerance: 1e-8, gapOf: (a, b) => a - b, widthFloor: 1e-12, step: 0.5, maxEvaluations: 60 });
    expect(r.reason).toBe('converged');
    expect(r.best.f - f(xStar)).toBeLessThanOrEqual(1e-8);
    expect(r.bound).toBeLessThanOrEqual(f(xStar));
    expect(r.evaluations).toBeLessThan(30);
  });

  it('honours its gap at a kink: the stop rule is the certified bound, not the bracket width', () => {
    // f(x) = max(2 − x, 0.02 (x − 1)) + 1: convex with a kink at its minimiser x = 1 + 1/1.02 … (f′ jumps from −1
    // to 0.02). Minimum: solve 2 − x = 0.02 (x − 1) ⇒ x* = 2.02/1.02, f* = 1 + 0.02 (x* − 1).
    const xStar = 2.02 / 1.02;
    const fStar = 1 + 0.02 * (xStar - 1);
    const point = (x: number): SlopePoint => {
      const left = 2 - x;
      const right = 0.02 * (x - 1);
      return { t: x, feasible: true, f: Math.max(left, right) + 1, g: left >= right ? -1 : 0.02 };
    };
    for (const tol of [1e-2, 1e-4, 1e-6]) {
      const r = slopeMinimise(point, [point(0.5)], { lo: -10, hi: 10, gapTolerance: tol, gapOf: (a, b) => a - b, widthFloor: 1e-12, step: 0.2, maxEvaluations: 200 });
      expect(r.reason).toBe('converged');
      expect(r.best.f - fStar).toBeLessThanOrEqual(tol);
      expect(r.bound).toBeLessThanOrEqual(fStar + 1e-12);
    }
  });

  it('stops as soon as the certified bound exceeds a budget', () => {
    const point = (x: number): SlopePoint => ({ t: x, feasible: true, f: (x - 3) ** 2 + 10, g: 2 * (x - 3) });
    const r = slopeMinimise(point, [point(0), point(1)], { lo: -10, hi: 10, gapTolerance: 1e-9, gapOf: (a, b) => a - b, widthFloor: 1e-12, step: 0.2, maxEvaluations: 50, boundStop: (b) => b > 5 });
    expect(r.reason).toBe('bound-stop');
    expect(r.bound).toBeGreaterThan(5);
    expect(r.bound).toBeLessThanOrEqual(10); // the true minimum is 10
  });
});

describe('solver failures are reported, not mistaken for infeasibility', () => {
  it('a backend that never converges gives status solver-failure', () => {
    // Test double: a session that always stops at its iteration limit without a certificate.
    const stuck = {
      name: 'stuck',
      open: () => ({
        update: () => {},
        solve: () => ({
          status: 'max-iterations' as const, x: new Float64Array(0), y: new Float64Array(0), z: new Float64Array(0), s: new Float64Array(0),
          info: { iterations: 100, primalObjective: NaN, dualObjective: NaN, gap: NaN, primalResidual: NaN, dualResidual: NaN, factorisations: 0, solveTimeMs: 0 },
        }),
      }),
    };
    const r = searchFreeFinalTime(new DescentSolver(d.setup, stuck, d.ignition), [0, 0, 0], d.ignition);
    expect(r.status).toBe('solver-failure');
    expect(r.failures).toBeGreaterThan(0);
    expect(r.warnings.join(' ')).toMatch(/neither|without a solution or a certificate|no time of flight/);
  });
});
