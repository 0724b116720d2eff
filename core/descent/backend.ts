/**
 * The conic solver seen from core/descent: a session that is opened once per sparsity pattern and
 * then re-solved with new values. `core/conic`'s ConicWorkspace has exactly this shape; tests also
 * plug in a CVXOPT reference session.
 */
import type { ConicProblem, ConicSolution } from '../conic/types.ts';
import type { WarmStart } from '../conic/workspace.ts';
import type { ProblemValues } from './assembler.ts';

export interface ConicSession {
  update(values: Partial<ProblemValues>): void;
  /** Solves; a backend may ignore the starting point. */
  solve(start?: WarmStart): ConicSolution;
}

export interface ConicBackend {
  /** Name for reports (e.g. "landreach-conic", "cvxopt"). */
  readonly name: string;
  open(problem: ConicProblem): ConicSession;
}
