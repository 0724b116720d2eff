/**
 * CVXOPT 1.3 (Debian python3-cvxopt, conelp) on the very same discretised problems as our solver:
 * the optimal propellant must agree to 1e-5 relative, and infeasible problems must be infeasible for
 * both. The problems are built once by core/descent and handed unchanged to both solvers.
 */
import { describe, expect, it } from 'vitest';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { isPrimalInfeasible, isSolved } from '../../../core/conic/types.ts';
import { cvxoptAvailable } from '../cvxopt.ts';
import { cvxoptBackend } from './cvxoptBackend.ts';
import { SCENARIOS } from './scenarios.ts';
import { BLACKMORE_2010_CASE_2, marsSetup } from './marsExamples.ts';

describe.runIf(cvxoptAvailable())('descent problems: our solver vs CVXOPT', () => {
  for (const sc of SCENARIOS) {
    it(`${sc.name}: same propellant at fixed times of flight, and at our free-final-time optimum`, () => {
      const ours = new DescentSolver(sc.setup, landreachConicBackend(), sc.ignition);
      const ref = new DescentSolver(sc.setup, cvxoptBackend(), sc.ignition);
      const best = searchFreeFinalTime(ours, sc.target, sc.ignition);
      expect(best.status).toBe('solved');
      for (const tf of [sc.feasibleTime, best.timeOfFlight]) {
        const a = ours.solveFixed('min-propellant', tf, sc.target, sc.ignition);
        const b = ref.solveFixed('min-propellant', tf, sc.target, sc.ignition);
        expect(a.status).toBe('solved');
        expect(b.status).toBe('solved');
        expect(Math.abs(a.propellant - b.propellant) / b.propellant).toBeLessThan(1e-5);
      }
      // The minimum-landing-error problem too (here the target is reachable, so the miss is ~0 for both).
      const a = ours.solveFixed('min-landing-error', best.timeOfFlight, sc.target, sc.ignition);
      const b = ref.solveFixed('min-landing-error', best.timeOfFlight, sc.target, sc.ignition);
      expect(isSolved(a.status) && isSolved(b.status)).toBe(true);
      expect(a.miss).toBeLessThan(1e-2);
      expect(b.miss).toBeLessThan(1e-2);
    });
  }

  it('Blackmore 2010 case 2: both find the propellant problem infeasible and agree on the smallest miss', () => {
    const setup = marsSetup({ glideSlope: true, rotation: true });
    const ign = BLACKMORE_2010_CASE_2;
    const ours = new DescentSolver(setup, landreachConicBackend(), ign);
    const ref = new DescentSolver(setup, cvxoptBackend(), ign);
    const r = searchFreeFinalTime(ours, [0, 0, 0], ign);
    expect(r.status).toBe('unreachable');
    for (const tf of [60, r.timeOfFlight, 90]) {
      expect(isPrimalInfeasible(ours.solveFixed('min-propellant', tf, [0, 0, 0], ign).status)).toBe(true);
      expect(isPrimalInfeasible(ref.solveFixed('min-propellant', tf, [0, 0, 0], ign).status)).toBe(true);
    }
    const a = ours.solveFixed('min-landing-error', r.timeOfFlight, [0, 0, 0], ign);
    const b = ref.solveFixed('min-landing-error', r.timeOfFlight, [0, 0, 0], ign);
    expect(Math.abs(a.miss - b.miss) / b.miss).toBeLessThan(1e-5);
  });
});
