/**
 * Trade-study exports, shared by the CLI (`landreach study …`) and the app: CSV tables with the caution line
 * and units in every column name, and the versioned JSON report ("landreach-study-result" version 1).
 * All pure: data in, text out.
 */
import type { AltitudeStudyRow, ReserveStudyRow } from '../footprint/studies.ts';
import type { DispersionResult } from '../footprint/dispersion.ts';
import { APP_VERSION, CAUTION } from '../study/provenance.ts';

/** What the dispersion study's landing points are (its report says so). */
export const DISPERSION_MODEL = 'nominal optimal thrust flown open loop; landing point at the end of powered descent';

export type StudyKind = 'reserve' | 'ignition-altitude' | 'dispersion';

const num = (v: number, d: number) => (Number.isFinite(v) ? Number(v.toFixed(d)).toString() : '');

export const RESERVE_CSV_HEADER = 'reserve_kg,budget_kg,reachable_area_m2,guaranteed_divert_radius_m,limited_by_grid';
export const ALTITUDE_CSV_HEADER = 'ignition_altitude_m,guaranteed_divert_radius_m,limited_by_grid,nominal_propellant_kg,reachable_area_m2';
export const DISPERSION_CSV_HEADER = 'sample,landing_east_m,landing_north_m';

/** Lines of the reserve study's CSV: caution, header, one row per reserve. */
export function reserveStudyCsvLines(rows: readonly ReserveStudyRow[]): string[] {
  return [
    `# ${CAUTION}`,
    RESERVE_CSV_HEADER,
    ...rows.map((r) => [r.reserve_kg, num(r.budget_kg, 3), Math.round(r.area_m2), num(r.divertRadius_m, 1), r.limitedByGrid ? 1 : 0].join(',')),
  ];
}

/** Lines of the ignition-altitude study's CSV: caution, header, one row per altitude. */
export function altitudeStudyCsvLines(rows: readonly AltitudeStudyRow[]): string[] {
  return [
    `# ${CAUTION}`,
    ALTITUDE_CSV_HEADER,
    ...rows.map((r) => [r.altitude_m, num(r.divertRadius_m, 1), r.limitedByGrid ? 1 : 0, num(r.nominalPropellant_kg, 3), Math.round(r.area_m2)].join(',')),
  ];
}

/** Lines of the dispersion study's CSV: caution, header, one landing point per sample. */
export function dispersionCsvLines(r: Pick<DispersionResult, 'landingEast_m' | 'landingNorth_m' | 'samples'>): string[] {
  const lines = [`# ${CAUTION}`, DISPERSION_CSV_HEADER];
  for (let i = 0; i < r.samples; i++) lines.push([i, num(r.landingEast_m[i], 2), num(r.landingNorth_m[i], 2)].join(','));
  return lines;
}

/** The probability-of-reach map's CSV: one row per target (rows from south to north). */
export function reachMapCsv(grid: { nx: number; ny: number; east: ArrayLike<number>; north: ArrayLike<number> }, probability: ArrayLike<number>, samples: number, reserve_kg: number): string {
  const lines = [`# ${CAUTION}`, `# fraction of ${samples} dispersed samples reaching each target with ${reserve_kg} kg in reserve`, 'east_m,north_m,probability_of_reach'];
  for (let j = 0; j < grid.ny; j++) for (let i = 0; i < grid.nx; i++) lines.push([num(grid.east[i], 1), num(grid.north[j], 1), num(probability[j * grid.nx + i], 4)].join(','));
  return lines.join('\n') + '\n';
}

export interface StudyReportInput {
  kind: StudyKind;
  /** What was run (the study and the study's own inputs), as hashed. */
  inputs: unknown;
  inputsHash: string;
  cancelled: boolean;
  /** Study-specific figures (minimum altitude, sigmas, …), spread into the report. */
  extra: Record<string, unknown>;
  rows: unknown[];
  createdAt?: string;
  appVersion?: string;
}

/** The study result object ("landreach-study-result" version 1). */
export function studyReportObject(r: StudyReportInput): Record<string, unknown> {
  return {
    format: 'landreach-study-result',
    version: 1,
    study: r.kind,
    caution: CAUTION,
    appVersion: r.appVersion ?? APP_VERSION,
    createdAt: r.createdAt ?? new Date().toISOString(),
    inputsHash: r.inputsHash,
    inputs: r.inputs,
    cancelled: r.cancelled,
    ...r.extra,
    rows: r.rows,
  };
}

/** The study result report as JSON text. */
export function studyReport(r: StudyReportInput): string {
  return JSON.stringify(studyReportObject(r), null, 1);
}
