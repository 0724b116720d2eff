/** The project's own SOCP solver (core/conic) as the descent backend. */
import { ConicWorkspace } from '../conic/index.ts';
import type { SolverSettings } from '../conic/index.ts';
import type { ConicBackend } from './backend.ts';

export function landreachConicBackend(settings: Partial<SolverSettings> = {}): ConicBackend {
  return {
    name: 'landreach-conic',
    open(problem) {
      return new ConicWorkspace(problem, settings);
    },
  };
}
