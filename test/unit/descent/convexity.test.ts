/**
 * With only thrust bounds active and a fixed time of flight, the descent problem is a convex program whose
 * data depend on the target only through the right-hand side b; its optimal value is then a convex
 * function of the target (Boyd & Vandenberghe 2004, Convex Optimization, §5.6.1: the optimal value of a
 * convex problem is convex in a right-hand-side perturbation). Checked as midpoint convexity on random
 * triples. The cost is the program's objective, −ln(m_final) (propellant is an increasing function of it).
 */
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { parseStudyText, studyToDescent } from '../../../core/study/index.ts';

const d = studyToDescent(parseStudyText(readFileSync(fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url)), 'utf8')));
const setup = {
  ...d.setup,
  nodes: 25,
  constraints: { glideSlope: null, maxSpeed: null, gateHeight: 0, gateDescentRate: 0, minAltitude: null },
  vehicle: { ...d.setup.vehicle, pointingLimit: Math.PI },
};

describe('optimal cost over targets (fixed t_f, thrust bounds only)', () => {
  it('is midpoint-convex on random target pairs', () => {
    const solver = new DescentSolver(setup, landreachConicBackend(), d.ignition);
    const cost = (e: number, n: number) => {
      const r = solver.solveFixed('min-propellant', 45, [e, n, 0], d.ignition);
      expect(r.status).toBe('solved');
      return r.solution.info.primalObjective;
    };
    const coord = fc.double({ min: -800, max: 800, noNaN: true });
    fc.assert(
      fc.property(coord, coord, coord, coord, (ae, an, be, bn) => {
        const mid = cost((ae + be) / 2, (an + bn) / 2);
        const avg = (cost(ae, an) + cost(be, bn)) / 2;
        // Slack: the solver's 1e-8 relative gap on each of the three values.
        expect(mid).toBeLessThanOrEqual(avg + 1e-7 * (1 + Math.abs(avg)));
      }),
      { numRuns: 15, seed: 4242 },
    );
  });
});
