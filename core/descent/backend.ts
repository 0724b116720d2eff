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
  /**
   * Back to the state of a newly opened session, so later results depend on later data only (a backend
   * that keeps no state between solves need not have it).
   */
  reset?(): void;
}

export interface ConicBackend {
  /** Name for reports (e.g. "landreach-conic", "cvxopt"). */
  readonly name: string;
  open(problem: ConicProblem): ConicSession;
}
