/**
 * The footprint's own conic problems, exported for the peer benchmark: a footprint of the invented demo study
 * (everything reachable) and of our low-propellant variant (an edge of certified-unreachable targets, so
 * infeasibility certificates count too) is computed on the calling thread exactly as a worker computes it
 * (core/footprint engine jobs, `descentEvaluator`, the footprint's solver settings), through a recording
 * backend that keeps, for every solve, the problem's full data, the starting point the footprint gave it and
 * whether its session was reset before it. Every solver of the benchmark then solves these same problems.
 *
 * File format (JSON; `problemToJson` of test/reference/cvxopt.ts per problem, which the Python peers read):
 *   { nodes, problems: [{ ...problemToJson(problem), session, reset, warmStarted }] }
 * (the starting points themselves stay in memory: only our solver can use them).
 */
import { computeFootprint } from '../../../core/footprint/engine.ts';
import { descentEvaluator, FOOTPRINT_SOLVER_SETTINGS } from '../../../core/footprint/descentEvaluator.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { footprintContext } from '../../../core/footprint/studyFootprint.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import type { ConicBackend } from '../../../core/descent/backend.ts';
import type { ConicProblem } from '../../../core/conic/types.ts';
import type { WarmStart } from '../../../core/conic/workspace.ts';
import { problemToJson } from '../../reference/cvxopt.ts';
import { demoStudy, inProcessPool, lowPropellantDemo } from '../../support/scenarios.ts';

export interface ExportedSolve {
  problem: ConicProblem;
  /** Which session (one sparsity pattern, kept workspace) solved it; sessions are numbered from 0. */
  session: number;
  /** The session was reset (TargetEvaluator.reset: a new footprint job) just before this solve. */
  reset: boolean;
  /** The starting point the footprint gave this solve (copied), or null for a cold start. */
  start: WarmStart | null;
}

const copy = (v: Float64Array | undefined) => (v ? Float64Array.from(v) : undefined);

function snapshot(p: ConicProblem): ConicProblem {
  return {
    c: Float64Array.from(p.c),
    b: Float64Array.from(p.b),
    h: Float64Array.from(p.h),
    A: { ...p.A, values: Float64Array.from(p.A.values) },
    G: { ...p.G, values: Float64Array.from(p.G.values) },
    cones: p.cones,
  };
}

/** A backend that solves with ours (the footprint's settings) and records every solve. */
function recordingBackend(out: ExportedSolve[]): ConicBackend {
  const inner = landreachConicBackend(FOOTPRINT_SOLVER_SETTINGS);
  let sessions = 0;
  return {
    name: 'recording',
    open(problem) {
      const session = sessions++;
      const ws = inner.open(problem);
      const data = snapshot(problem);
      let reset = false;
      return {
        update(v) {
          if (v.c) data.c.set(v.c);
          if (v.b) data.b.set(v.b);
          if (v.h) data.h.set(v.h);
          if (v.AValues) data.A.values.set(v.AValues);
          if (v.GValues) data.G.values.set(v.GValues);
          ws.update(v);
        },
        solve(start) {
          out.push({
            problem: snapshot(data),
            session,
            reset,
            start: start ? { x: copy(start.x), y: copy(start.y), z: copy(start.z), s: copy(start.s) } : null,
          });
          reset = false;
          return ws.solve(start);
        },
        reset() {
          reset = true;
          ws.reset?.();
        },
      };
    },
  };
}

/**
 * The problems of two small footprints at `nodes` time nodes: the demo on 5 × 5 targets over ±2.5 km and the
 * low-propellant variant on 5 × 5 over ±3.5 km (in that order, as the footprint engine sends its jobs).
 */
export async function exportFootprintProblems(nodes: number): Promise<ExportedSolve[]> {
  const out: ExportedSolve[] = [];
  const scenarios = [
    { study: demoStudy(), half: 2500 },
    { study: lowPropellantDemo(nodes).study, half: 3500 },
  ];
  for (const sc of scenarios) {
    const ctx = footprintContext(sc.study, nodes);
    const grid = makeTargetGrid({ halfWidthEast_m: sc.half, halfWidthNorth_m: sc.half, nx: 5, ny: 5 });
    const evaluator = descentEvaluator(ctx, recordingBackend(out));
    const first = out.length;
    await computeFootprint(grid, inProcessPool(evaluator), { context: ctx });
    // Sessions of a later scenario are numbered after the earlier one's.
    let offset = 0;
    for (let k = 0; k < first; k++) offset = Math.max(offset, out[k].session + 1);
    for (let k = first; k < out.length; k++) out[k].session += offset;
  }
  return out;
}

/** The JSON form (see the file header). */
export function exportedToJson(nodes: number, solves: ExportedSolve[]): string {
  return JSON.stringify({
    nodes,
    problems: solves.map((s) => ({ ...problemToJson(s.problem), session: s.session, reset: s.reset, warmStarted: s.start !== null })),
  });
}
