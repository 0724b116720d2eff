/**
 * Study results as the app shows and exports them (pure): the table of each study, the minimum-altitude
 * verdict, the export files (core/export/studyExport.ts, the CLI's writers), the landing ellipse for the
 * scene and the probability-of-reach map as a drape.
 */
import type { Ellipse } from '../../core/footprint/ellipse.ts';
import { altitudeStudyCsvLines, DISPERSION_MODEL, dispersionCsvLines, reachMapCsv, reserveStudyCsvLines, studyReport } from '../../core/export/studyExport.ts';
import type { AltitudeStudyResult, DispersionStudyResult, ReachMap, StudyResult } from '../compute/study-session.ts';
import type { LandingEllipse } from '../scene/scene-objects.ts';
import type { ElevationGrid } from '../scene/elevation-grid.ts';
import { resampleToTerrain } from '../scene/resample.ts';

export interface StudyTable {
  columns: string[];
  rows: string[][];
}

import { fixed } from '../format.ts';

export function studyTable(r: StudyResult): StudyTable {
  switch (r.kind) {
    case 'reserve':
      return {
        columns: ['Reserve (kg)', 'Budget (kg)', 'Area (km²)', 'Divert radius (m)'],
        rows: r.rows.map((x) => [fixed(x.reserve_kg, 1), fixed(x.budget_kg, 1), fixed(x.area_m2 / 1e6, 3), `${fixed(x.divertRadius_m, 0)}${x.limitedByGrid ? ' (grid-limited)' : ''}`]),
      };
    case 'ignition-altitude':
      return {
        columns: ['Altitude (m)', 'Divert radius (m)', 'Nominal propellant (kg)', 'Area (km²)'],
        rows: r.rows.map((x) => [fixed(x.altitude_m, 0), `${fixed(x.divertRadius_m, 0)}${x.limitedByGrid ? ' (grid-limited)' : ''}`, fixed(x.nominalPropellant_kg, 1), fixed(x.area_m2 / 1e6, 3)]),
      };
    case 'dispersion': {
      const e = r.dispersion.result.ellipse;
      const rows = [
        ['Samples', String(r.dispersion.result.samples)],
        ['Ellipse probability', `${fixed(e.probability * 100, 1)} %`],
        ['Semi-major axis', `${fixed(e.semiMajor_m, 1)} m`],
        ['Semi-minor axis', `${fixed(e.semiMinor_m, 1)} m`],
        ['Major axis', `${fixed(e.orientation_deg, 1)}° from east (counter-clockwise)`],
        ['Centre', `${fixed(e.centreEast_m, 1)} m E, ${fixed(e.centreNorth_m, 1)} m N`],
        ['Nominal propellant', `${fixed(r.dispersion.nominalPropellant_kg, 1)} kg, t_f ${fixed(r.dispersion.nominalTimeOfFlight_s, 1)} s`],
      ];
      if (r.reach) rows.push(...reachSummary(r.reach).map((s) => [s.label, s.value]));
      return { columns: ['Figure', 'Value'], rows };
    }
  }
}

/** The ignition-altitude verdict, in words. */
export function minimumAltitudeText(r: AltitudeStudyResult): string {
  const required = r.inputs.requiredRadius_m;
  if (required === null) return 'No required divert radius given: enter one to find the lowest ignition altitude meeting it.';
  if (r.rows.length === 0) return 'No altitude finished.';
  const reserve = `${r.inputs.reserve_kg} kg in reserve`;
  if (r.minimum === null) {
    const top = Math.max(...r.rows.map((x) => x.altitude_m));
    return `Requirement not met in the swept range: no altitude up to ${top.toFixed(0)} m gives a ${required} m divert radius with ${reserve}.`;
  }
  const at = r.minimum.altitude_m.toFixed(0);
  return r.minimum.bracketed
    ? `Minimum ignition altitude for a ${required} m divert radius: ${at} m (with ${reserve}; interpolated between sampled altitudes).`
    : `Minimum ignition altitude for a ${required} m divert radius: at most ${at} m (the lowest altitude swept already meets it, with ${reserve}).`;
}

/** Share of targets by probability band, for the reach map's legend and summary. */
export function reachSummary(reach: ReachMap): { label: string; value: string }[] {
  const n = reach.probability.length;
  let always = 0;
  let half = 0;
  let any = 0;
  for (const p of reach.probability) {
    if (p >= 1) always++;
    if (p >= 0.5) half++;
    if (p > 0) any++;
  }
  const pct = (k: number) => `${((100 * k) / n).toFixed(0)} % of ${n} targets`;
  return [
    { label: 'Reach-map samples', value: String(reach.samples) },
    { label: 'Reached by every sample', value: pct(always) },
    { label: 'Reached by ≥ 50 %', value: pct(half) },
    { label: 'Reached by any sample', value: pct(any) },
  ];
}

/** core's ellipse (orientation counter-clockwise from east) as the scene draws it (azimuth clockwise from north). */
export function sceneEllipse(e: Ellipse): LandingEllipse {
  const azimuth = (((90 - e.orientation_deg) % 360) + 360) % 360;
  return { semiMajor_m: e.semiMajor_m, semiMinor_m: Math.max(e.semiMinor_m, 1e-3), azimuth_deg: azimuth, centreEast_m: e.centreEast_m, centreNorth_m: e.centreNorth_m };
}

/** The reach map as a drape in percent (0–100) on the terrain samples; rows flipped to terrain layout (row 0 north). */
export function reachDrape(reach: ReachMap, terrain: ElevationGrid): { values: Float32Array; range: [number, number]; title: string; note: string } {
  const { nx, ny, east, north } = reach.field;
  const values = new Float32Array(nx * ny);
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) values[(ny - 1 - j) * nx + i] = 100 * reach.probability[j * nx + i];
  const grid = { width: nx, height: ny, pixelSize_m: east[1] - east[0], west_m: east[0], north_m: north[ny - 1], values };
  return {
    values: resampleToTerrain(grid, terrain),
    range: [0, 100],
    title: 'Probability of reach (%)',
    note: `Share of ${reach.samples} dispersed samples that reach each target with the reserve kept: 0 % dark, 100 % bright.`,
  };
}

export type StudyExportKind = 'csv' | 'json' | 'reach-csv';

/** The export's file name suffix and text. `inputs` and `inputsHash` describe what was run. */
export function studyExport(kind: StudyExportKind, r: StudyResult, provenance: { inputs: unknown; inputsHash: string; appVersion: string; createdAt: string }): { suffix: string; text: string; format: 'csv' | 'json' } {
  if (kind === 'reach-csv') {
    if (r.kind !== 'dispersion' || !r.reach) throw new Error('this study result has no probability-of-reach map');
    return { suffix: `study-${r.kind}-reach`, format: 'csv', text: reachMapCsv(r.reach.field, r.reach.probability, r.reach.samples, r.study.vehicle.propellantReserve_kg) };
  }
  if (kind === 'csv') {
    const lines = r.kind === 'reserve' ? reserveStudyCsvLines(r.rows) : r.kind === 'ignition-altitude' ? altitudeStudyCsvLines(r.rows) : dispersionCsvLines(r.dispersion.result);
    return { suffix: `study-${r.kind}`, format: 'csv', text: lines.join('\n') + '\n' };
  }
  return { suffix: `study-${r.kind}`, format: 'json', text: studyReport({ kind: r.kind, ...provenance, cancelled: r.cancelled, extra: reportExtra(r), rows: reportRows(r) }) };
}

/** The same figures the CLI's report carries for each study. */
function reportExtra(r: StudyResult): Record<string, unknown> {
  switch (r.kind) {
    case 'reserve':
      return { usablePropellant_kg: r.usable_kg };
    case 'ignition-altitude':
      return {
        method: r.inputs.method,
        directions: r.inputs.method === 'directions' ? r.inputs.directions : null,
        rule: r.inputs.rule.kind,
        reserve_kg: r.inputs.reserve_kg,
        requiredRadius_m: r.inputs.requiredRadius_m,
        minimumAltitude: r.minimum,
      };
    case 'dispersion':
      return dispersionExtra(r);
  }
}

function dispersionExtra(r: DispersionStudyResult): Record<string, unknown> {
  return {
    sigmas: r.inputs.sigmas,
    samples: r.inputs.samples,
    seed: r.inputs.seed,
    nominalPropellant_kg: r.dispersion.nominalPropellant_kg,
    nominalTimeOfFlight_s: r.dispersion.nominalTimeOfFlight_s,
    model: DISPERSION_MODEL,
    reachMapSamples: r.reach?.samples ?? 0,
  };
}

function reportRows(r: StudyResult): unknown[] {
  return r.kind === 'dispersion' ? [{ ...r.dispersion.result.ellipse }] : r.rows;
}
