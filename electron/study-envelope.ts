/**
 * The outer envelope of a study file: `{ "format": "landreach-study", "version": N, … }`.
 *
 * The main process only checks the envelope (is it a study, is it a version this build can read);
 * the full validation and migrations belong to core/study. When core/study lands, STUDY_FORMAT and
 * STUDY_VERSION must come from there (one source of truth) and this file shrinks to the check below.
 */

export const STUDY_FORMAT = 'landreach-study';
/** Newest study-file version this build reads and writes. */
export const STUDY_VERSION = 2;

export type EnvelopeCheck =
  | { kind: 'study'; version: number }
  | { kind: 'corrupt'; reason: string }
  | { kind: 'not-a-study'; reason: string }
  | { kind: 'newer-version'; version: number };

export function checkEnvelope(text: string): EnvelopeCheck {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (error) {
    return { kind: 'corrupt', reason: `not valid JSON (${(error as Error).message})` };
  }
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) {
    return { kind: 'not-a-study', reason: 'the file holds JSON but not an object' };
  }
  const record = doc as Record<string, unknown>;
  if (record.format !== STUDY_FORMAT) {
    return { kind: 'not-a-study', reason: `its "format" is ${JSON.stringify(record.format)}, expected "${STUDY_FORMAT}"` };
  }
  const version = record.version;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
    return { kind: 'corrupt', reason: `its "version" is ${JSON.stringify(version)}, expected a positive integer` };
  }
  if (version > STUDY_VERSION) return { kind: 'newer-version', version };
  return { kind: 'study', version };
}

/** A message for the user, naming the file, the problem and what to do. */
export function describeEnvelopeProblem(fileName: string, check: Exclude<EnvelopeCheck, { kind: 'study' }>): string {
  switch (check.kind) {
    case 'corrupt':
      return `${fileName} cannot be read: ${check.reason}. The file was left untouched; restore it from a backup or open another study.`;
    case 'not-a-study':
      return `${fileName} is not a Landreach study: ${check.reason}. Choose a .landreach.json study file.`;
    case 'newer-version':
      return `${fileName} was written by a newer Landreach (study version ${check.version}; this build reads up to ${STUDY_VERSION}). The file was left untouched; open it with a newer Landreach.`;
  }
}
