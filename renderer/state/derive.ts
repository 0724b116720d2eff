/**
 * Derivations from the workspace's inputs to what the screens show, plain TypeScript so they are tested
 * without a browser. Every result (footprint, picked trajectory, trade study) is stored with the key of the
 * inputs it was computed from; whether it is stale is derived by comparing that key with the key of the
 * inputs now, never remembered, so no edit path (typing, preset, undo, opening a file) can forget to mark it.
 */
import type { Study } from '../../core/study/schema.ts';
import type { StudyKind } from '../studies/study-inputs.ts';
import { formatDuration } from './run-progress.ts';

/** What the current study text is: valid (its canonical text) or not. */
export type StudyTextNow = { ok: true; text: string } | { ok: false; message: string };

/** Canonical JSON of a run's inputs: object keys sorted, so equal inputs give equal keys. */
export function inputsKey(inputs: unknown): string {
  return JSON.stringify(inputs, (_key, value: unknown) =>
    value && typeof value === 'object' && !Array.isArray(value)
      ? Object.fromEntries(Object.entries(value as Record<string, unknown>).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)))
      : value,
  );
}

/** A footprint depends on the study and the grid (targets per side, half-width). */
export function footprintKey(studyText: string, grid: { side: number; halfWidth_m: number }): string {
  return inputsKey({ result: 'footprint', study: studyText, side: grid.side, halfWidth_m: grid.halfWidth_m });
}

/** A picked trajectory depends on the study and the target (the target is the pick itself). */
export function pickKey(studyText: string): string {
  return inputsKey({ result: 'pick', study: studyText });
}

/**
 * A trade study depends on the study, its own inputs (as checked: "1, 2" and "1,2" are the same run) and, when
 * it computes footprints, the grid.
 */
export function studyRunKey(studyText: string, kind: StudyKind, options: unknown, grid: { side: number; halfWidth_m: number } | null): string {
  return inputsKey({ result: kind, study: studyText, options, grid: grid ? { side: grid.side, halfWidth_m: grid.halfWidth_m } : null });
}

/** Stale: the inputs now are not the ones the result was computed from (or are not valid at all). */
export function isStale(result: { inputsKey: string } | null, keyNow: string | null): boolean {
  return result !== null && result.inputsKey !== keyNow;
}

/** Propellant available for the descent above the reserve, kg (wet − dry − reserve); may be ≤ 0. */
export function budgetOf(study: Pick<Study, 'vehicle'>): number {
  return study.vehicle.wetMass_kg - study.vehicle.dryMass_kg - study.vehicle.propellantReserve_kg;
}

/** Net thrust at full throttle, n · T · cos(cant), N: what the throttle fraction is a fraction of. */
export function netThrustMaxOf(study: Pick<Study, 'vehicle'>): number {
  const v = study.vehicle;
  return v.engineCount * v.thrustPerEngine_N * Math.cos((v.cantAngle_deg * Math.PI) / 180);
}

/** The problems that block a run, over every input group (study, grid, terrain), for the status bar. */
export interface InputProblems {
  /** Errors in all groups together. */
  errorCount: number;
  /** Where the first error is: a study field id, the grid, or a terrain field. */
  first: { group: 'study'; fieldId: string } | { group: 'grid'; field: string } | { group: 'terrain'; field: string } | null;
}

export function inputProblems(
  study: { problems: Record<string, { severity: 'error' | 'warning' }> },
  grid: { ok: true } | { ok: false; field: string },
  terrain: Record<string, string>,
): InputProblems {
  const studyErrors = Object.entries(study.problems).filter(([, p]) => p.severity === 'error').map(([id]) => id);
  const terrainErrors = Object.keys(terrain);
  const errorCount = studyErrors.length + (grid.ok ? 0 : 1) + terrainErrors.length;
  const first = studyErrors.length
    ? { group: 'study' as const, fieldId: studyErrors[0] }
    : !grid.ok
      ? { group: 'grid' as const, field: grid.field }
      : terrainErrors.length
        ? { group: 'terrain' as const, field: terrainErrors[0] }
        : null;
  return { errorCount, first };
}

/** Why Compute is refused, or null when it may run. */
export function computeBlockedReason(problems: InputProblems, studyRunning: boolean): string | null {
  if (problems.errorCount) return `Fix ${problems.errorCount} input${problems.errorCount > 1 ? 's' : ''} first (see the status bar)`;
  if (studyRunning) return 'A study is running: wait for it or cancel it';
  return null;
}

/** A footprint run expected to take longer than this is started only once the user says so, s (our choice). */
export const ASK_BEFORE_S = 120;

/**
 * Footprint targets per second over the worker pool before this session has measured one: about 31 /s, from
 * the run reported in issue 15 (1000 × 1000 targets in about 9 h; second-hand, one machine). Only a first
 * guess for the question below: the rate of this session's last finished run replaces it.
 */
export const FIRST_GUESS_TARGETS_PER_S = 30;

/**
 * A finished run's rate counts as measured only with at least this many targets (the default 21 × 21 grid has
 * 441): in a smaller run the workers' start-up and the first rows' warm-up weigh too much.
 */
export const MIN_TARGETS_FOR_RATE = 400;

/** Targets per second of a finished footprint run, or null when it is too small to say. */
export function measuredRate(targets: number, elapsed_s: number): number | null {
  return targets >= MIN_TARGETS_FOR_RATE && elapsed_s > 0 ? targets / elapsed_s : null;
}

/**
 * The question to ask before a long footprint run, or null when it is expected to be short: the time is the
 * targets over the rate (the last finished run's here, else the first guess), said as rough.
 */
export function longRunQuestion(targets: number, measuredRate_per_s: number | null): string | null {
  const rate = measuredRate_per_s && measuredRate_per_s > 0 ? measuredRate_per_s : FIRST_GUESS_TARGETS_PER_S;
  const seconds = targets / rate;
  if (seconds <= ASK_BEFORE_S) return null;
  const basis = measuredRate_per_s && measuredRate_per_s > 0 ? `the last run’s ${rate.toFixed(1)} targets/s` : `about ${rate} targets/s (a first guess: no run measured yet)`;
  return `This grid has ${targets.toLocaleString('en')} targets: about ${formatDuration(seconds)} at ${basis}. Start it? Cancelling keeps the finished rows.`;
}
