/**
 * Reading a study: JSON text → validated study with defaults, or an error that names every bad
 * field, its value and how to fix it. Never throws on user input with anything but StudyError.
 */
import type { Study } from './schema.ts';
import { STUDY_FORMAT, STUDY_VERSION, StudySchema, VERSION_2_VEHICLE_FIELDS } from './schema.ts';
import { studyDescentProblem } from './toDescent.ts';

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

/** Longest value shown in a problem, characters. */
const SHOW_LENGTH = 60;

/**
 * A short JSON preview of a value. Walks at most a few levels and a few characters, so a value nested
 * thousands of levels deep (JSON.parse reads those; JSON.stringify overflows the stack on them) is
 * shown, not thrown.
 */
function show(v: unknown): string {
  if (v === undefined) return 'missing';
  const s = preview(v, 4);
  return s.length > SHOW_LENGTH ? `${s.slice(0, SHOW_LENGTH - 3)}...` : s;
}

function preview(v: unknown, depth: number): string {
  if (v === null || typeof v !== 'object') return JSON.stringify(v) ?? String(v);
  if (depth === 0) return Array.isArray(v) ? '[...]' : '{...}';
  const parts: string[] = [];
  let length = 0;
  const entries = Array.isArray(v) ? v.map((x) => [null, x] as const) : Object.entries(v);
  for (const [key, x] of entries) {
    const part = `${key === null ? '' : `${JSON.stringify(key)}:`}${preview(x, depth - 1)}`;
    parts.push(part);
    length += part.length;
    if (length > SHOW_LENGTH) break;
  }
  return Array.isArray(v) ? `[${parts.join(',')}]` : `{${parts.join(',')}}`;
}

/**
 * Older format versions are migrated here, one step at a time, before validation. The input is never
 * modified (a copy is returned), so the user's document stays as it was.
 * 1 → 2: version 2 only adds optional vehicle fields (throttleBands, throttleRate_perS), so a version-1
 * study reads as the same study; a version-1 file that already carries one of them is refused (it was
 * written by hand against the newer format), naming the fix.
 */
export function migrate(raw: Record<string, unknown>): { study: Record<string, unknown>; problems: StudyProblem[] } {
  const problems: StudyProblem[] = [];
  let study = raw;
  if (raw.version === 1) {
    const vehicle = raw.vehicle;
    if (vehicle !== null && typeof vehicle === 'object' && !Array.isArray(vehicle)) {
      for (const f of VERSION_2_VEHICLE_FIELDS) {
        if (f in vehicle) {
          problems.push({ field: `vehicle.${f}`, value: show((vehicle as Record<string, unknown>)[f]), message: 'is a study format version 2 field: set "version": 2 at the top of the file to use it' });
        }
      }
    }
    study = { ...raw, version: 2 };
  }
  return { study, problems };
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
  const migrated = migrate(raw);
  if (migrated.problems.length > 0) throw new StudyError(migrated.problems, source);
  const r = StudySchema.safeParse(migrated.study, { reportInput: true });
  if (r.success) {
    // The values are each in range; now the study as a descent (derived quantities, cross-field physics).
    const p = studyDescentProblem(r.data);
    if (p) throw new StudyError([{ field: p.field, value: show(p.value), message: p.message }], source);
    return r.data;
  }
  const problems: StudyProblem[] = r.error.issues.map((i) => {
    const field = i.path.length ? i.path.map(String).join('.') : '(top level)';
    if (i.code === 'unrecognized_keys') {
      return { field: field === '(top level)' ? i.keys.join(', ') : `${field}.${i.keys.join(', ')}`, value: 'present', message: 'unknown field: remove it or check its spelling' };
    }
    return { field, value: show((i as { input?: unknown }).input), message: i.message };
  });
  throw new StudyError(problems, source);
}

/** Deepest nesting of arrays and objects a study may have (its own is 3: ignition.position_m[i]). */
export const MAX_STUDY_NESTING = 32;

/** Depth of the deepest array or object in a parsed JSON value, counted without recursion. */
function nesting(value: unknown, limit: number): { depth: number; path: string } {
  const stack: { v: unknown; depth: number; path: string }[] = [{ v: value, depth: 0, path: '' }];
  let deepest = { depth: 0, path: '' };
  while (stack.length) {
    const { v, depth, path } = stack.pop()!;
    if (v === null || typeof v !== 'object') continue;
    if (depth + 1 > deepest.depth) deepest = { depth: depth + 1, path };
    if (deepest.depth > limit) break;
    for (const [k, x] of Object.entries(v)) stack.push({ v: x, depth: depth + 1, path: path ? `${path}.${k}` : k });
  }
  return deepest;
}

/**
 * Parses a study's JSON text: a leading byte-order mark is skipped (editors on some systems write one),
 * a syntax error or nesting deeper than MAX_STUDY_NESTING is a StudyError naming where.
 */
export function parseStudyJson(text: string, source = 'study'): unknown {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let json: unknown;
  try {
    json = JSON.parse(body);
  } catch (err) {
    throw new StudyError([{ field: '(file)', value: 'not JSON', message: `${(err as Error).message}; fix the JSON syntax` }], source);
  }
  const deep = nesting(json, MAX_STUDY_NESTING);
  if (deep.depth > MAX_STUDY_NESTING) {
    const field = deep.path.split('.').slice(0, 3).join('.') || '(top level)';
    throw new StudyError([{
      field, value: `arrays or objects nested more than ${MAX_STUDY_NESTING} levels deep`,
      message: `a study nests at most 3 levels (e.g. ignition.position_m); replace the value with the one the field expects`,
    }], source);
  }
  return json;
}

/** Parses JSON text (a leading byte-order mark allowed), reporting any problem as a StudyError. */
export function parseStudyText(text: string, source = 'study'): Study {
  return parseStudy(parseStudyJson(text, source), source);
}

/**
 * A study file's bytes as text: UTF-8, with or without a byte-order mark. Bytes that are not UTF-8 are
 * refused with their offset and line (a decoder that replaced them would silently change a name).
 */
export function decodeStudyBytes(bytes: Uint8Array, source = 'study'): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    const at = firstInvalidUtf8(bytes);
    let line = 1;
    for (let i = 0; i < at; i++) if (bytes[i] === 0x0a) line++;
    throw new StudyError([{
      field: '(file)', value: `byte ${at} (line ${line})`,
      message: 'is not valid UTF-8 text; save the file as UTF-8 (any text editor can) and check the names near that line',
    }], source);
  }
}

/** Offset of the first byte that is not part of valid UTF-8: the longest prefix a streaming decoder accepts. */
function firstInvalidUtf8(bytes: Uint8Array): number {
  const valid = (n: number) => {
    try {
      new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(0, n), { stream: true });
      return true;
    } catch {
      return false;
    }
  };
  // valid() is monotone in n (a prefix of a valid prefix is valid), so bisect for the last valid length.
  let lo = 0;
  let hi = bytes.length;
  while (lo < hi) {
    const mid = Math.ceil((lo + hi) / 2);
    if (valid(mid)) lo = mid;
    else hi = mid - 1;
  }
  // The decoder holds back an unfinished sequence: if one is pending at `lo`, it starts at its lead byte.
  let k = lo;
  while (k > 0 && lo - k < 3 && (bytes[k - 1] & 0xc0) === 0x80) k--;
  const lead = k > 0 ? bytes[k - 1] : 0;
  const length = lead >= 0xf0 ? 4 : lead >= 0xe0 ? 3 : lead >= 0xc0 ? 2 : 1;
  return length > lo - (k - 1) ? k - 1 : lo;
}
