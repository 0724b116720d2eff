/**
 * A core/descent ConicBackend that solves with CVXOPT's conelp (Debian python3-cvxopt) through the
 * test bridge. Used as the outside reference and, in the benchmark, as the comparison solver.
 */
import type { ConicProblem, ConicSolution, SolveStatus } from '../../../core/conic/types.ts';
import type { ConicBackend, ConicSession } from '../../../core/descent/backend.ts';
import { solveWithCvxopt } from '../cvxopt.ts';

const STATUS: Record<string, SolveStatus> = {
  optimal: 'solved',
  'primal infeasible': 'primal-infeasible',
  'dual infeasible': 'dual-infeasible',
  unknown: 'max-iterations',
  error: 'numerical-error',
};

export interface CvxoptBackendStats {
  solves: number;
  /** Time inside conelp as CVXOPT measured it, s (process start-up excluded). */
  solverSeconds: number;
}

/**
 * conelp tolerances for descent problems. The bridge's 1e-10 defaults make conelp stop with "domain
 * error" on several well-posed descent problems (seen on minimum-landing-error problems with a glide
 * slope); 1e-8 is CVXOPT's own default order and ample for a 1e-5 relative comparison.
 */
export const CVXOPT_DESCENT_OPTIONS: Record<string, number> = { feastol: 1e-8, abstol: 1e-8, reltol: 1e-8 };

export function cvxoptBackend(
  stats: CvxoptBackendStats = { solves: 0, solverSeconds: 0 },
  options: Record<string, number> = CVXOPT_DESCENT_OPTIONS,
): ConicBackend & { stats: CvxoptBackendStats } {
  return {
    name: 'cvxopt',
    stats,
    open(problem: ConicProblem): ConicSession {
      const p = {
        c: Float64Array.from(problem.c),
        b: Float64Array.from(problem.b),
        h: Float64Array.from(problem.h),
        A: { ...problem.A, values: Float64Array.from(problem.A.values) },
        G: { ...problem.G, values: Float64Array.from(problem.G.values) },
        cones: problem.cones,
      };
      return {
        update(v) {
          if (v.c) p.c.set(v.c);
          if (v.b) p.b.set(v.b);
          if (v.h) p.h.set(v.h);
          if (v.AValues) p.A.values.set(v.AValues);
          if (v.GValues) p.G.values.set(v.GValues);
        },
        solve(): ConicSolution {
          const [r] = solveWithCvxopt([p], options);
          stats.solves++;
          stats.solverSeconds += r.seconds ?? 0;
          const n = p.c.length;
          const status = STATUS[r.status] ?? 'numerical-error';
          return {
            status,
            x: Float64Array.from(r.x ?? new Array<number>(n).fill(NaN)),
            y: Float64Array.from(r.y ?? []),
            z: Float64Array.from(r.z ?? []),
            s: Float64Array.from(r.s ?? []),
            info: {
              iterations: r.iterations ?? 0,
              primalObjective: r.primalObjective ?? NaN,
              dualObjective: r.dualObjective ?? NaN,
              gap: NaN,
              primalResidual: NaN,
              dualResidual: NaN,
              factorisations: 0,
              solveTimeMs: (r.seconds ?? 0) * 1000,
            },
          };
        },
      };
    },
  };
}
