/**
 * Footprint exports: grid CSV, GeoJSON (RFC 7946) and the versioned JSON report. All pure: data in, text
 * out. Units are in every column and property name.
 */
import { TARGET, type FootprintField } from '../footprint/field.ts';
import type { FootprintSummary } from '../footprint/studyFootprint.ts';
import { APP_VERSION, CAUTION } from '../study/provenance.ts';

export { footprintGeoJson, rightHandRule, type FootprintGeoJsonInput, type FootprintLonLat, type GeoJsonSite, type LocalToLonLat } from './footprintGeoJson.ts';
export type { FootprintSummary } from '../footprint/studyFootprint.ts';

const STATUS_NAME = ['pending', 'reachable', 'unreachable', 'failed', 'over-budget', 'relaxation-gap', 'undecided'] as const;

/** `between_nodes`: the dense re-simulation's verdict (empty: not checked). */
const BETWEEN_NODES_NAME = ['', 'met', 'missed'] as const;

const num = (v: number, digits: number) => (Number.isFinite(v) ? Number(v.toFixed(digits)).toString() : '');

/** Targets not computed (status pending): a run stopped early leaves them. */
function pendingCount(field: FootprintField): number {
  let n = 0;
  for (const s of field.status) if (s === TARGET.pending) n++;
  return n;
}

/**
 * Whether target k is reachable with the reserve kept (minimum propellant ≤ `budget_kg`): 1 yes, 0 certainly
 * not (above the budget, over budget, or unreachable), null not computed or not established (failed, or a
 * relaxation-gap target whose best flyable trajectory is above the budget). One rule for the CSV's
 * `within_budget` column and the reachable-with-reserve raster.
 */
export function withinBudget(field: FootprintField, k: number, budget_kg: number): 0 | 1 | null {
  const st = field.status[k];
  if (st === TARGET.reachable) return field.propellant_kg[k] <= budget_kg ? 1 : 0;
  if (st === TARGET.unreachable || st === TARGET.overBudget) return 0;
  // A flyable trajectory within the budget proves it; above it, only the (unstored) lower bound could.
  if (st === TARGET.relaxationGap && field.propellant_kg[k] <= budget_kg) return 1;
  return null;
}

/** The line a partial result's CSV carries after the caution (a complete run never leaves targets pending). */
export function partialResultLine(field: FootprintField): string | null {
  const pending = pendingCount(field);
  return pending > 0 ? `# STOPPED EARLY: partial result; ${pending} of ${field.nx * field.ny} targets not computed (status pending)` : null;
}

/**
 * One row per target. `between_nodes` is `met` when the re-simulated trajectory meets every constraint between its
 * nodes, `missed` when one is missed beyond tolerance, empty when not checked. `within_budget` is 1 where the minimum propellant is at most `budget_kg` (the usable
 * propellant less the reserve), 0 where it is certainly above it or unreachable, empty where not computed or
 * not established (a relaxation-gap target whose best flyable trajectory is above the budget, an undecided one).
 * A partial field (a run stopped early) gets a second comment line saying so.
 */
export function footprintCsv(field: FootprintField, budget_kg: number): string {
  const partial = partialResultLine(field);
  const lines = [
    `# ${CAUTION}`,
    ...(partial ? [partial] : []),
    'east_m,north_m,status,propellant_kg,time_of_flight_s,peak_tilt_deg,miss_m,solves,within_budget,between_nodes',
  ];
  for (let j = 0; j < field.ny; j++) {
    for (let i = 0; i < field.nx; i++) {
      const k = j * field.nx + i;
      const st = field.status[k];
      const w = withinBudget(field, k, budget_kg);
      const within = w === null ? '' : String(w);
      lines.push(
        [
          num(field.east[i], 3),
          num(field.north[j], 3),
          STATUS_NAME[st],
          num(field.propellant_kg[k], 3),
          num(field.timeOfFlight_s[k], 3),
          num(field.peakTilt_deg[k], 2),
          num(field.miss_m[k], 2),
          String(field.solves[k]),
          within,
          BETWEEN_NODES_NAME[field.betweenNodes[k]],
        ].join(','),
      );
    }
  }
  return lines.join('\n') + '\n';
}


export interface FootprintReportInput {
  studyName: string;
  inputsHash: string;
  inputs: unknown;
  summary: FootprintSummary;
  field: FootprintField;
  contourLevels_kg: number[];
}

/**
 * The versioned JSON report ("landreach-footprint" version 2). It holds what the inputs determine and
 * nothing that varies between runs of the same inputs (version 1's `createdAt` and `summary.elapsed_s` are
 * gone: the command line keeps them in its run record, the manifest), so equal inputs give equal bytes.
 * `stoppedEarly` repeats `summary.cancelled` where a reader looks first.
 */
export function footprintReport(r: FootprintReportInput): string {
  const f = r.field;
  const arr = (a: ArrayLike<number>, digits: number) => Array.from(a, (v) => (Number.isFinite(v) ? Number(v.toFixed(digits)) : null));
  return JSON.stringify(
    {
      format: 'landreach-footprint',
      version: 2,
      caution: CAUTION,
      appVersion: APP_VERSION,
      stoppedEarly: r.summary.cancelled,
      study: r.studyName,
      inputsHash: r.inputsHash,
      inputs: r.inputs,
      summary: r.summary,
      contourLevels_kg: r.contourLevels_kg,
      grid: {
        nx: f.nx,
        ny: f.ny,
        east_m: arr(f.east, 3),
        north_m: arr(f.north, 3),
        layout: 'row-major, index = row · nx + column, rows from south to north',
        status: Array.from(f.status, (s) => STATUS_NAME[s]),
        propellant_kg: arr(f.propellant_kg, 3),
        timeOfFlight_s: arr(f.timeOfFlight_s, 3),
        peakTilt_deg: arr(f.peakTilt_deg, 2),
        miss_m: arr(f.miss_m, 2),
        solves: Array.from(f.solves),
      },
    },
    null,
    1,
  );
}
