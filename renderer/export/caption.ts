/**
 * The caption stamped on every exported figure and written into its metadata: study name, a short
 * hash of the study's inputs (so a figure can be matched to the inputs that made it), app version,
 * date and the caution line.
 */
import { CAUTION_LINE } from '../caution.ts';

export interface CaptionFacts {
  studyName: string;
  /** Hex digest of the study text (see inputsHash). */
  inputsHash: string;
  appVersion: string;
  date: Date;
}

/** First 12 hex digits of SHA-256 (FIPS 180-4) of the study text. */
export async function inputsHash(studyText: string): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', new TextEncoder().encode(studyText));
  return Array.from(new Uint8Array(digest).slice(0, 6), (b) => b.toString(16).padStart(2, '0')).join('');
}

export function captionLines(f: CaptionFacts): [string, string] {
  const stamp = f.date.toISOString().replace(/\.\d{3}Z$/, 'Z');
  return [`${f.studyName} · inputs ${f.inputsHash} · Landreach ${f.appVersion} · ${stamp}`, CAUTION_LINE];
}

/** PNG metadata for the same facts (keywords predefined by the PNG specification). */
export function captionMetadata(f: CaptionFacts): Record<string, string> {
  return {
    Title: f.studyName,
    Software: `Landreach ${f.appVersion}`,
    'Creation Time': f.date.toISOString(),
    Description: `Study inputs SHA-256 prefix ${f.inputsHash}`,
    Disclaimer: CAUTION_LINE,
  };
}
