/**
 * Reading a study: JSON text → validated study with defaults, or an error that names every bad
 * field, its value and how to fix it. Never throws on user input with anything but StudyError.
 */
import type { Study } from './schema.ts';
import { STUDY_FORMAT, STUDY_VERSION, StudySchema } from './schema.ts';

export interface StudyProblem {
  /** Dotted path of the field, e.g. "vehicle.dryMass_kg". */
  field: string;
  /** The offending value as JSON (or "missing"). */
  value: string;
  /** What is expected. */
  message: string;
}

export class StudyError extends Error {
  constructor(readonly problems: StudyProblem[], readonly source = 'study') {
    super(`${source}: ${problems.length === 1 ? 'invalid value' : `${problems.length} invalid values`}\n` +
      problems.map((p) => `  ${p.field}: ${p.value} — ${p.message}`).join('\n'));
    this.name = 'StudyError';
  }
}

function show(v: unknown): string {
  if (v === undefined) return 'missing';
  const s = JSON.stringify(v);
  return s.length > 60 ? `${s.slice(0, 57)}...` : s;
}

/** Older format versions are migrated here, one step at a time, before validation. */
function migrate(raw: Record<string, unknown>): Record<string, unknown> {
  // Version 1 is the first format; future versions add a step per version.
  return raw;
}

export function parseStudy(input: unknown, source = 'study'): Study {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    throw new StudyError([{ field: '(file)', value: show(input), message: `must be a JSON object with "format": "${STUDY_FORMAT}"` }], source);
  }
  const raw = input as Record<string, unknown>;
  if (raw.format !== STUDY_FORMAT) {
    throw new StudyError([{ field: 'format', value: show(raw.format), message: `must be "${STUDY_FORMAT}": is this a Landreach study file?` }], source);
  }
  if (typeof raw.version === 'number' && raw.version > STUDY_VERSION) {
    throw new StudyError([{ field: 'version', value: show(raw.version), message: `this program reads versions up to ${STUDY_VERSION}; use a newer Landreach` }], source);
  }
  const r = StudySchema.safeParse(migrate(raw), { reportInput: true });
  if (r.success) return r.data;
  const problems: StudyProblem[] = r.error.issues.map((i) => {
    const field = i.path.length ? i.path.map(String).join('.') : '(top level)';
    if (i.code === 'unrecognized_keys') {
      return { field: field === '(top level)' ? i.keys.join(', ') : `${field}.${i.keys.join(', ')}`, value: 'present', message: 'unknown field: remove it or check its spelling' };
    }
    return { field, value: show((i as { input?: unknown }).input), message: i.message };
  });
  throw new StudyError(problems, source);
}

/** Parses JSON text, reporting a syntax error as a StudyError. */
export function parseStudyText(text: string, source = 'study'): Study {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new StudyError([{ field: '(file)', value: 'not JSON', message: `${(err as Error).message}; fix the JSON syntax` }], source);
  }
  return parseStudy(json, source);
}
