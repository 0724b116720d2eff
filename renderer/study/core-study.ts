/**
 * The workspace's inputs as a core/study Study, validated by core/study's zod schema: what every
 * computation starts from. Errors name the field, the value and the fix (core/study's StudyError).
 */
import { decodeStudyBytes, parseStudyText, StudyError, type Study } from '../../core/study/index.ts';

export type CoreStudyResult = { ok: true; study: Study; text: string } | { ok: false; message: string };

/** `studyText` is Workspace.studyText(): the document, or the field problems that must be fixed first. */
export function coreStudy(studyText: { ok: true; text: string } | { ok: false; message: string }): CoreStudyResult {
  if (!studyText.ok) return { ok: false, message: studyText.message.replace(/^Not saved:/, 'Not computed:') };
  try {
    return { ok: true, study: parseStudyText(studyText.text, 'study'), text: studyText.text };
  } catch (error) {
    if (error instanceof StudyError) {
      return { ok: false, message: `Not computed: ${error.problems.map((p) => `${p.field} = ${p.value}: ${p.message}`).join('; ')}.` };
    }
    throw error;
  }
}

/** A study file's bytes as the app opens them (browser fallback): core/study's decoding, its errors as a message. */
export function openedStudyText(name: string, bytes: Uint8Array): { status: 'opened'; path: string; name: string; text: string } | { status: 'error'; message: string } {
  try {
    return { status: 'opened', path: name, name, text: decodeStudyBytes(bytes, name) };
  } catch (error) {
    if (error instanceof StudyError) return { status: 'error', message: `${name}: ${error.problems.map((p) => `${p.value} ${p.message}`).join('; ')}.` };
    throw error;
  }
}
