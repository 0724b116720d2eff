/** The second-order cone program solver: public entry points. */
export { ConicWorkspace, solveConic, type ProblemUpdate, type WarmStart } from './workspace.ts';
export { DEFAULT_SETTINGS, resolveSettings, type SolverSettings } from './settings.ts';
export { iterationModule } from './wasm/iterationWasm.ts';
export {
  isDualInfeasible,
  isInfeasible,
  isPrimalInfeasible,
  isSolved,
  type ConeSpec,
  type ConicProblem,
  type ConicSolution,
  type SolveInfo,
  type SolveStatus,
} from './types.ts';
