/**
 * Peers: our conic solver against Clarabel, ECOS and CVXOPT on the footprint's own problems (exported by
 * peers/exportProblems.ts from two small footprints at N = 30 and N = 50 nodes), all at 1e-8 (gap absolute
 * and relative, feasibility, infeasibility; at most 100 iterations), like for like:
 *   - cold: every problem set up and solved from nothing — ours `solveConic` (validation, equilibration,
 *     ordering, symbolic analysis, solve) against Clarabel's DefaultSolver(...) + solve(), ECOS's
 *     ecos.solve and CVXOPT's conelp (CVXOPT on the first CVXOPT_PROBLEMS only: its conelp factorises the
 *     KKT system densely whenever there are second-order cones, ~0.1–1 s per problem here);
 *   - kept workspace: each session's pattern set up once, then new data for every later problem — ours
 *     `ConicWorkspace.update` + `solve()` from the cold starting point against Clarabel's data update
 *     (`DefaultSolver.update`) + `solve()`; and ours from the starting point the footprint gave that solve
 *     (its warm start; Clarabel has none, so that ratio compares our warm path with Clarabel's best);
 *   - one core each: one thread of ours against one Python process with BLAS pinned to one thread.
 * Time is CPU time of the solver's calls (ours: process.cpuUsage around each solve; Python: time.process_time),
 * medians per solve. Iterations per solve and the statuses are printed for each solver. Clarabel and ECOS come
 * from the bench's own virtual environment (peers/venv.ts); where pip cannot install one, the bench says so
 * and runs the others.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ConicWorkspace, solveConic } from '../../core/conic/index.ts';
import type { ConicSolution, SolveStatus } from '../../core/conic/types.ts';
import { REFERENCE_PYTHON, referenceToolsReady } from '../support/reference-tools.ts';
import { exportedToJson, exportFootprintProblems, type ExportedSolve } from './peers/exportProblems.ts';
import { peerEnvironment } from './peers/venv.ts';
import { median, type BenchResult } from './util.ts';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const PEERS_PY = join(ROOT, 'test/bench/py/peers.py');
const OUT_DIR = join(ROOT, 'test-artifacts/bench-peers');
const CVXOPT_PROBLEMS = 24;
/** Our settings for the comparison: the defaults (1e-8 everywhere, 100 iterations), stated here for the reader. */
const OURS_AT_1E8 = { feasibilityTolerance: 1e-8, gapAbsoluteTolerance: 1e-8, gapRelativeTolerance: 1e-8, infeasibilityTolerance: 1e-8, maxIterations: 100 };

interface SolveRecord {
  status: SolveStatus | string;
  iterations: number;
  cpu_s: number;
  /** Kept-workspace runs: the first solve of a session (set-up included), left out of the re-solve figures. */
  first?: boolean;
}

function cpuSeconds<T>(f: () => T): [T, number] {
  const t0 = process.cpuUsage();
  const r = f();
  const d = process.cpuUsage(t0);
  return [r, (d.user + d.system) / 1e6];
}

const record = (sol: ConicSolution, cpu_s: number, first?: boolean): SolveRecord => ({ status: sol.status, iterations: sol.info.iterations, cpu_s, first });

function oursCold(problems: ExportedSolve[]): SolveRecord[] {
  return problems.map((p) => {
    const [sol, cpu] = cpuSeconds(() => solveConic(p.problem, OURS_AT_1E8));
    return record(sol, cpu);
  });
}

/** Kept workspaces, one per session, replaying the footprint's resets; `warm` passes the footprint's starts. */
function oursKept(problems: ExportedSolve[], warm: boolean): SolveRecord[] {
  const sessions = new Map<number, ConicWorkspace>();
  return problems.map((p) => {
    let ws = sessions.get(p.session);
    if (!ws) {
      const [sol, cpu] = cpuSeconds(() => {
        ws = new ConicWorkspace(p.problem, OURS_AT_1E8);
        return ws.solve(warm && p.start ? p.start : undefined);
      });
      sessions.set(p.session, ws!);
      return record(sol, cpu, true);
    }
    const w = ws;
    const [sol, cpu] = cpuSeconds(() => {
      if (p.reset) w.reset();
      w.update({ c: p.problem.c, b: p.problem.b, h: p.problem.h, AValues: p.problem.A.values, GValues: p.problem.G.values });
      return w.solve(warm && p.start ? p.start : undefined);
    });
    return record(sol, cpu, false);
  });
}

function runPeer(python: string, solver: string, mode: string, file: string, firstK = 0): { version: string; results: SolveRecord[] } | string {
  const env = { ...process.env, OPENBLAS_NUM_THREADS: '1', OMP_NUM_THREADS: '1', MKL_NUM_THREADS: '1', RAYON_NUM_THREADS: '1' };
  const args = [PEERS_PY, solver, mode, file, ...(firstK ? [String(firstK)] : [])];
  const r = spawnSync(python, args, { encoding: 'utf8', env, maxBuffer: 1 << 28, timeout: 1_800_000 });
  if (r.status !== 0) return `${solver} ${mode} failed (exit ${r.status}): ${(r.stderr || String(r.error ?? '')).trim().split('\n').slice(-2).join(' | ')}`;
  const out = JSON.parse(r.stdout) as { version: string; results: SolveRecord[] };
  return out;
}

/** Median CPU ms, mean iterations and status counts of the re-solves (or of all, for cold runs). */
function summarise(prefix: string, recs: SolveRecord[]): Record<string, number> {
  const rs = recs.filter((r) => !r.first);
  const count = (pred: (s: string) => boolean) => rs.filter((r) => pred(r.status)).length;
  return {
    [`${prefix}_solves`]: rs.length,
    [`${prefix}_cpu_ms_median`]: median(rs.map((r) => r.cpu_s * 1000)),
    [`${prefix}_cpu_ms_mean`]: (rs.reduce((s, r) => s + r.cpu_s, 0) * 1000) / rs.length,
    [`${prefix}_iterations_mean`]: rs.reduce((s, r) => s + r.iterations, 0) / rs.length,
    [`${prefix}_iterations_max`]: rs.reduce((s, r) => Math.max(s, r.iterations), 0),
    [`${prefix}_solved`]: count((s) => s === 'solved'),
    [`${prefix}_infeasible`]: count((s) => s === 'primal-infeasible' || s === 'dual-infeasible'),
    [`${prefix}_reduced_accuracy`]: count((s) => s.startsWith('almost-')),
    [`${prefix}_failed`]: count((s) => s === 'max-iterations' || s === 'numerical-error'),
  };
}

export async function benchPeers(nodesList = [30, 50], log: (line: string) => void = console.log): Promise<BenchResult[]> {
  const env = peerEnvironment(log);
  for (const note of env.notes) log(`  peers: ${note}`);
  const cvxopt = referenceToolsReady('cvxopt');
  if (!cvxopt) log(`  peers: CVXOPT left out: ${REFERENCE_PYTHON} cannot import cvxopt (apt-get install python3-cvxopt)`);
  mkdirSync(OUT_DIR, { recursive: true });
  const results: BenchResult[] = [];
  for (const nodes of nodesList) {
    const problems = await exportFootprintProblems(nodes);
    const file = join(OUT_DIR, `footprint-problems-N${nodes}.json`);
    writeFileSync(file, exportedToJson(nodes, problems));
    // Warm-up: V8 first runs on its baseline tiers; a footprint makes thousands of solves.
    oursCold(problems);
    oursKept(problems, true);
    const cold = oursCold(problems);
    const kept = oursKept(problems, false);
    const warm = oursKept(problems, true);
    const f: Record<string, number> = { nodes, problems: problems.length, variables: problems[0].problem.c.length, ...summarise('ours_cold', cold), ...summarise('ours_kept', kept), ...summarise('ours_warm', warm) };
    const peerRuns: [string, string, string, number][] = [];
    if (env.python && env.available.has('clarabel')) peerRuns.push(['clarabel', 'cold', env.python, 0], ['clarabel', 'update', env.python, 0]);
    if (env.python && env.available.has('ecos')) peerRuns.push(['ecos', 'cold', env.python, 0]);
    if (cvxopt) peerRuns.push(['cvxopt', 'cold', REFERENCE_PYTHON, CVXOPT_PROBLEMS]);
    for (const [solver, mode, python, firstK] of peerRuns) {
      const r = runPeer(python, solver, mode, file, firstK);
      if (typeof r === 'string') {
        log(`  peers: ${r}`);
        continue;
      }
      if (nodes === nodesList[0] && mode === 'cold') log(`  peers: ${solver} ${r.version}`);
      const prefix = `${solver}_${mode === 'update' ? 'update' : 'cold'}`;
      Object.assign(f, summarise(prefix, r.results));
      // Ratios > 1: ours faster. Like for like only; CVXOPT against ours on the same first problems.
      if (mode === 'cold') {
        const oursMs = median(cold.slice(0, firstK || cold.length).map((x) => x.cpu_s * 1000));
        f[`${solver}_cold_over_ours_cold`] = f[`${prefix}_cpu_ms_median`] / oursMs;
      } else {
        f.clarabel_update_over_ours_kept = f.clarabel_update_cpu_ms_median / f.ours_kept_cpu_ms_median;
        f.clarabel_update_over_ours_warm = f.clarabel_update_cpu_ms_median / f.ours_warm_cpu_ms_median;
      }
    }
    results.push({ name: `peers N=${nodes} (footprint problems, 1e-8)`, figures: f });
  }
  return results;
}
