/**
 * Conic solver benchmark: our solver against CVXOPT conelp on the same block-banded optimal-control
 * instances (3-D double integrator with thrust-norm cones) at about 300, 700 and 2,000 variables.
 *
 * Ours is timed two ways: "re-solve" (a workspace analysed once, solved again with new data values, as the
 * footprint engine uses it; median after a warm-up) and "cold" (validation, equilibration, ordering,
 * analysis and solve).
 * CVXOPT's time is measured inside Python around `solvers.conelp` only (no JSON transfer), with the same
 * 1e-8 tolerances as ours. conelp factorises the KKT system densely whenever there are second-order cones
 * (its sparse factorisation is for LPs and QPs), so it is a correctness reference more than a speed peer:
 * the specialised peers (Clarabel, ECOS) are in peers.bench.ts.
 */
import { ConicWorkspace, solveConic } from '../../core/conic/index.ts';
import { controlInstance } from '../support/socp-instances.ts';
import { solveWithCvxopt } from '../reference/cvxopt.ts';
import { median, type BenchResult } from './util.ts';

const SIZES = [
  { steps: 30, cvxoptRuns: 5, ourRuns: 200 },
  { steps: 70, cvxoptRuns: 3, ourRuns: 200 },
  { steps: 200, cvxoptRuns: 1, ourRuns: 60 },
];
/**
 * Solves before the timed ones: V8 first runs WebAssembly and JavaScript on its baseline tiers and
 * optimises the hot functions after some calls. A footprint run makes thousands of solves, so the
 * optimised state is the one that counts; the cold figure below is timed separately.
 */
const WARM_UP_SOLVES = 40;

export async function benchConic(): Promise<BenchResult[]> {
  const results: BenchResult[] = [];
  for (const { steps, cvxoptRuns, ourRuns } of SIZES) {
    // Several instances of one pattern (different initial states): the re-solve path changes b only.
    const instances = Array.from({ length: 5 }, (_, k) => controlInstance(100 + k, steps));
    const n = instances[0].problem.c.length;
    const ws = new ConicWorkspace(instances[0].problem);
    for (let r = 0; r < WARM_UP_SOLVES; r++) {
      ws.update({ b: instances[r % instances.length].problem.b });
      ws.solve();
    }
    const resolve: number[] = [];
    let iterations = 0;
    for (let r = 0; r < ourRuns; r++) {
      const inst = instances[r % instances.length];
      ws.update({ b: inst.problem.b });
      const t = performance.now();
      const sol = ws.solve();
      resolve.push(performance.now() - t);
      iterations += sol.info.iterations;
      if (sol.status !== 'solved') throw new Error(`benchmark instance not solved: ${sol.status}`);
    }
    const cold: number[] = [];
    for (let r = 0; r < Math.min(ourRuns, 10); r++) {
      const t = performance.now();
      solveConic(instances[r % instances.length].problem);
      cold.push(performance.now() - t);
    }
    const ref = solveWithCvxopt(
      Array.from({ length: cvxoptRuns }, (_, r) => instances[r % instances.length].problem),
      { abstol: 1e-8, reltol: 1e-8, feastol: 1e-8 },
    );
    const cvx = ref.map((r) => r.seconds * 1000);
    const oursMs = median(resolve);
    const cvxMs = median(cvx);
    results.push({
      name: `conic n=${n}`,
      figures: {
        variables: n,
        ours_resolve_ms: oursMs,
        ours_cold_ms: median(cold),
        ours_iterations: iterations / ourRuns,
        factor_entries: ws.factorEntries,
        cvxopt_ms: cvxMs,
        cvxopt_iterations: ref.reduce((s, r) => s + r.iterations, 0) / ref.length,
        speedup_vs_cvxopt: cvxMs / oursMs,
      },
    });
  }
  return results;
}
