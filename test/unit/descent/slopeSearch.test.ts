/**
 * The slope-based free-final-time search against independent computations: the envelope-theorem slope
 * against a central difference of the optimal value itself (two extra solves), and the search's result
 * against the bracketing (Brent) search on a grid of demo-study targets.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { optimalValueSlope, searchFreeFinalTimeBySlope } from '../../../core/descent/slopeSearch.ts';
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
      const slope = optimalValueSlope(solver, at, [...target], d.ignition);
      const h = 0.02;
      const up = solver.solveFixed('min-propellant', tf + h, [...target], d.ignition).solution.info.primalObjective;
      const down = solver.solveFixed('min-propellant', tf - h, [...target], d.ignition).solution.info.primalObjective;
      const fd = (up - down) / (2 * h);
      expect(Math.abs(slope - fd)).toBeLessThan(2e-3 * Math.abs(fd) + 1e-7);
    }
  });
});

describe('slope-based free-final-time search', () => {
  it('agrees with the bracketing search to 0.05 kg across a grid, with fewer solves', () => {
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
        const r = searchFreeFinalTimeBySlope(fast, target, d.ignition, { tfGuess: tf, curvatureGuess: k });
        const q = searchFreeFinalTime(robust, target, d.ignition, { decode: false, tfTolerance: 0.02, useDerivative: false });
        expect(r.result.status).toBe(q.status);
        if (q.status !== 'solved') continue;
        // The bracketing search, run to 0.02 s, is the reference; the fast one may not be worse by > 0.05 kg.
        expect(r.result.propellant - q.propellant).toBeLessThan(0.05);
        expect(r.result.propellant - q.propellant).toBeGreaterThan(-0.05);
        tf = r.result.timeOfFlight;
        if (Number.isFinite(r.curvature)) k = r.curvature;
        fastSolves += r.result.solves;
        robustSolves += q.solves;
      }
    }
    expect(fastSolves).toBeLessThan(0.8 * robustSolves);
  });
});
