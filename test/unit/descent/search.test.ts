import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { timeOfFlightBracket } from '../../../core/descent/bracket.ts';
import { brentMinimise } from '../../../core/descent/brent.ts';
import { secantMinimise } from '../../../core/descent/secant.ts';
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
    const target: [number, number, number] = [12000, 0, 0]; // 10.7 km is about the demo's limit downrange
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
    for (const tf of [100, 120]) {
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

describe('secantMinimise', () => {
  it('minimises a smooth cost next to an infeasible region using slopes', () => {
    // f(x) = e^{3/(x−1)} + x on x > 1.2 (infeasible below): f′ = 1 − 3 e^{3/(x−1)}/(x−1)²; root by bisection here.
    const f = (x: number) => Math.exp(3 / (x - 1)) + x;
    const g = (x: number) => 1 - (3 * Math.exp(3 / (x - 1))) / (x - 1) ** 2;
    let lo = 1.5;
    let hi = 50;
    for (let i = 0; i < 200; i++) {
      const mid = 0.5 * (lo + hi);
      if (g(mid) < 0) lo = mid;
      else hi = mid;
    }
    const probe = (x: number) => (x < 1.2 ? { feasible: false, f: Infinity, g: NaN } : { feasible: true, f: f(x), g: g(x) });
    const r = secantMinimise(probe, 2, probe(2), 0, 100, 1e-6, 0.5, 60);
    expect(r.x).toBeCloseTo(lo, 4);
    expect(r.evaluations).toBeLessThan(30);
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
