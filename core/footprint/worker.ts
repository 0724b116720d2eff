/** Footprint worker body, shared by both adapters: serve row jobs with the descent evaluator. */
import type { WorkerPort } from '../parallel/protocol.ts';
import { serveJobs } from '../parallel/protocol.ts';
import { descentEvaluator, type DescentFootprintContext } from './descentEvaluator.ts';
import { rowJobHandler } from './engine.ts';

export function serveFootprintRows(port: WorkerPort): void {
  serveJobs(port, rowJobHandler({ fromContext: (c) => descentEvaluator(c as DescentFootprintContext) }));
}
