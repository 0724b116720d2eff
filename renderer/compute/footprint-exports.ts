/**
 * The footprint's export files, built with core/study's exporters from the field the app holds (pure). They
 * hold what the inputs determine and no date, so the same inputs give the same bytes (as the CLI's files).
 */
import type { FootprintField } from '../../core/footprint/field.ts';
import type { FootprintFigures } from '../../core/footprint/studyFootprint.ts';
import { footprintMapSvg } from '../../core/export/footprintSvg.ts';
import { footprintCsv, footprintGeoJson, footprintReport, partialResultLine } from '../../core/export/footprintExport.ts';
import type { Study } from '../../core/study/schema.ts';

export type FootprintExportKind = 'csv' | 'geojson' | 'json' | 'svg';

export interface FootprintResult {
  study: Study;
  field: FootprintField;
  figures: FootprintFigures;
  /** What was run (hashed into the exports). */
  inputs: { study: Study; grid: { nx: number; ny: number; extent_m: number }; nodes: number; reserve_kg: number };
  inputsHash: string;
  appVersion: string;
}

export function footprintExportText(kind: FootprintExportKind, r: FootprintResult): string {
  const { field, figures } = r;
  switch (kind) {
    case 'csv':
      return footprintCsv(field, figures.summary.budget_kg);
    case 'geojson':
      return JSON.stringify(footprintGeoJson({ contours: figures.bands, reachable: figures.reachable, reserve_kg: figures.summary.reserve_kg, stoppedEarly: partialResultLine(field)?.replace(/^# /, '') }));
    case 'json':
      return footprintReport({ studyName: r.study.name, inputsHash: r.inputsHash, inputs: r.inputs, summary: figures.summary, field, contourLevels_kg: figures.levels_kg });
    case 'svg':
      return footprintMapSvg(field, figures, {
        title: `Divert footprint — ${r.study.name}`,
        caption: [
          `${r.study.name} — ${field.nx} × ${field.ny} targets, N = ${r.inputs.nodes}, reserve ${figures.summary.reserve_kg} kg${figures.summary.cancelled ? ' — STOPPED EARLY: partial result' : ''}`,
          `Landreach ${r.appVersion}, inputs ${r.inputsHash.slice(0, 16)}`,
        ],
      });
  }
}
