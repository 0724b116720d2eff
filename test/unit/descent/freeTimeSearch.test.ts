/**
 * The one free-final-time search against independent computations: the envelope-theorem slope against a
 * central difference of the optimal value itself (two extra solves), and the slope search against Brent's
 * method on values only (Brent 1973, no derivatives) on a grid of demo-study targets.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { parseStudyText, studyToDescent } from '../../../core/study/index.ts';

const d = studyToDescent(parseStudyText(readFileSync(fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url)), 'utf8')));
const setup = { ...d.setup, nodes: 30 };

describe('envelope-theorem slope of the optimal value in t_f', () => {
  it('matches a central difference of the optimal value (Fiacco 1983, §3)', () => {
    const solver = new DescentSolver(setup, landreachConicBackend(), d.ignition);
    for (const [tf, target] of [[38, [0, 0, 0]], [36, [-200, -200, 0]], [45, [300, 100, 0]]] as const) {
      const at = solver.solveFixed('min-propellant', tf, [...target], d.ignition);
      expect(at.status).toBe('solved');
      const slope = solver.objectiveSlope(at, [...target], d.ignition);
      const h = 0.02;
      const up = solver.solveFixed('min-propellant', tf + h, [...target], d.ignition).solution.info.primalObjective;
      const down = solver.solveFixed('min-propellant', tf - h, [...target], d.ignition).solution.info.primalObjective;
      const fd = (up - down) / (2 * h);
      expect(Math.abs(slope - fd)).toBeLessThan(2e-3 * Math.abs(fd) + 1e-7);
    }
  });
});

describe('slope search, warm-started along a serpentine', () => {
  it('is never worse than Brent (values only, to 0.005 s) by more than its 0.01 kg tolerance, with fewer solves', () => {
    const fast = new DescentSolver(setup, landreachConicBackend(), d.ignition);
    const robust = new DescentSolver(setup, landreachConicBackend(), d.ignition);
    let tf: number | undefined;
    let k: number | undefined;
    let fastSolves = 0;
    let robustSolves = 0;
    for (let j = 0; j < 4; j++) {
      for (let i = 0; i < 4; i++) {
        const ii = j % 2 ? 3 - i : i;
        const target: [number, number, number] = [(ii - 1.5) * 300, (j - 1.5) * 300, 0];
        const r = searchFreeFinalTime(fast, target, d.ignition, { tfGuess: tf, curvatureGuess: k, decode: false });
        const q = searchFreeFinalTime(robust, target, d.ignition, { decode: false, tfTolerance: 0.005, useDerivative: false });
        expect(r.status).toBe(q.status);
        if (q.status !== 'solved') continue;
        expect(r.propellant - q.propellant).toBeLessThanOrEqual(0.01);
        // The certified lower bound is below what Brent found.
        expect(r.propellantLowerBound).toBeLessThanOrEqual(q.propellant + 1e-6);
        tf = r.timeOfFlight;
        if (Number.isFinite(r.curvature)) k = r.curvature;
        fastSolves += r.solves;
        robustSolves += q.solves;
      }
    }
    expect(fastSolves).toBeLessThan(0.8 * robustSolves);
  });
});
