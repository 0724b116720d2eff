/**
 * Bridge to CVXOPT (Debian python3-cvxopt), used only as an outside reference in tests and benchmarks.
 * Problems are sent as JSON on stdin to test/reference/py/cvxopt_conelp.py.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import type { ConicProblem } from '../../core/conic/types.ts';
import type { CscMatrix } from '../../core/linalg/csc.ts';
import { REFERENCE_PYTHON, referenceToolsReady } from '../support/reference-tools.ts';

const SCRIPT = fileURLToPath(new URL('./py/cvxopt_conelp.py', import.meta.url));
const PYTHON = REFERENCE_PYTHON;

export interface CvxoptResult {
  status: 'optimal' | 'primal infeasible' | 'dual infeasible' | 'unknown' | 'error';
  x: number[] | null;
  y: number[] | null;
  z: number[] | null;
  s: number[] | null;
  primalObjective: number | null;
  dualObjective: number | null;
  iterations: number;
  seconds: number;
  error?: string;
}

function triplets(M: CscMatrix) {
  const rows: number[] = [];
  const cols: number[] = [];
  const vals: number[] = [];
  for (let j = 0; j < M.n; j++) {
    for (let p = M.colPtr[j]; p < M.colPtr[j + 1]; p++) {
      rows.push(M.rowIdx[p]);
      cols.push(j);
      vals.push(M.values[p]);
    }
  }
  return { m: M.m, n: M.n, rows, cols, vals };
}

/** JSON form of a problem for the Python side. */
export function problemToJson(p: ConicProblem, options: Record<string, number | string> = {}) {
  return {
    n: p.c.length,
    c: Array.from(p.c),
    A: triplets(p.A),
    b: Array.from(p.b),
    G: triplets(p.G),
    h: Array.from(p.h),
    nonnegative: p.cones.nonnegative,
    secondOrder: [...p.cones.secondOrder],
    options,
  };
}

/**
 * True when the reference Python (LANDREACH_PYTHON, default /usr/bin/python3) imports CVXOPT.
 * When it cannot: false with a visible warning on a developer machine, an error under CI=true
 * (test/support/reference-tools.ts). Use as `describe.runIf(cvxoptAvailable())`.
 */
export function cvxoptAvailable(): boolean {
  return referenceToolsReady('cvxopt');
}

/** Solves every problem with CVXOPT conelp in one Python process. */
export function solveWithCvxopt(problems: ConicProblem[], options: Record<string, number | string> = {}): CvxoptResult[] {
  const input = JSON.stringify(problems.map((p) => problemToJson(p, options)));
  const r = spawnSync(PYTHON, [SCRIPT], { input, encoding: 'utf8', maxBuffer: 1 << 30 });
  if (r.status !== 0) throw new Error(`CVXOPT reference failed (exit ${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout) as CvxoptResult[];
}
