/**
 * Runs one study file through `landreach trajectory` (in process) and classifies the ending: a result
 * (exit 0), an input error that names a field (exit 2, "  field: value — message"), or anything else — an
 * internal error, which the study fuzz test forbids. A study the command accepts must also be accepted by
 * the footprint's setup (the same validation for every command and the app).
 *
 * `--no-refine`: the 2N − 1-node check refuses studies of 1,001 to 2,000 nodes with exit 1 (issue 11, a
 * separate defect); drop the flag once that is fixed.
 */
import { writeFileSync } from 'node:fs';
import { main } from '../../core/cli/main.ts';
import { DescentSolver } from '../../core/descent/solver.ts';
import { landreachConicBackend } from '../../core/descent/conicBackend.ts';
import { footprintContext, FOOTPRINT_NODES } from '../../core/footprint/studyFootprint.ts';
import { searchFreeFinalTime } from '../../core/descent/search.ts';
import { decodeStudyBytes, parseStudyJson, parseStudyText, StudySchema, studyDescentProblem, studyToDescent } from '../../core/study/index.ts';
import { captureIo } from './cli-io.ts';

export type FuzzOutcome =
  | { kind: 'result'; status: string }
  | { kind: 'input-error'; field: string }
  | { kind: 'internal'; exit: number; message: string };

/** A StudyError line as the command prints it: two spaces, the field, ": ", the value, " — ", the fix. */
const FIELD_LINE = /^ {2}(\S[^\n]*?): ([^\n]*?) — ([^\n]+)$/m;

export async function runStudyFile(file: string, bytes: Uint8Array): Promise<FuzzOutcome> {
  writeFileSync(file, bytes);
  const { io, out, err } = captureIo();
  let exit: number;
  try {
    exit = await main(['trajectory', file, '--no-refine'], io);
  } catch (e) {
    return { kind: 'internal', exit: -1, message: `threw: ${(e as Error).message}` };
  }
  const stderr = err.join('');
  if (exit === 2) {
    const m = FIELD_LINE.exec(stderr);
    return m ? { kind: 'input-error', field: m[1] } : { kind: 'internal', exit, message: `exit 2 naming no field: ${stderr.slice(0, 300)}` };
  }
  if (exit !== 0) return { kind: 'internal', exit, message: `${stderr}${out.join('')}`.slice(0, 400) };
  const status = /status\s+(\S+)/.exec(out.join(''))?.[1] ?? '?';
  // The footprint builds its own setup (dry mass without the reserve, its own node count): it must
  // accept every study the trajectory command accepted.
  try {
    const study = parseStudyText(decodeStudyBytes(bytes, file), file);
    const ctx = footprintContext(study, FOOTPRINT_NODES);
    new DescentSolver(ctx.setup, landreachConicBackend(), ctx.ignition);
  } catch (e) {
    return { kind: 'internal', exit: 0, message: `trajectory accepted it but the footprint setup did not: ${(e as Error).message}` };
  }
  return { kind: 'result', status };
}

/**
 * For a study refused by the burn-time rule only (the lowest thrust burns the usable propellant before any
 * descent could reach the landing plane): the solver run anyway, at most 30 nodes, to check that the rule
 * refuses nothing the solver could land. Returns the search's status, or null for any other study.
 */
export function solveDespiteBurnTimeRule(bytes: Uint8Array): string | null {
  let study;
  try {
    const r = StudySchema.safeParse(parseStudyJson(decodeStudyBytes(bytes)));
    if (!r.success) return null;
    study = r.data;
  } catch {
    return null;
  }
  if (studyDescentProblem(study)?.rule !== 'burn-time') return null;
  const d = studyToDescent(study);
  const setup = { ...d.setup, nodes: Math.min(30, d.setup.nodes) };
  // validateLanding is the rule under test; the solver itself checks only the setup and the ignition.
  const solver = new DescentSolver(setup, landreachConicBackend(), d.ignition);
  try {
    return searchFreeFinalTime(solver, d.target, d.ignition, { decode: false }).status;
  } catch (err) {
    return `threw (${(err as Error).message.slice(0, 60)})`;
  }
}
