/**
 * The footprint's export files, built with core/export's writers from the field the app holds (pure). They
 * hold what the inputs determine and no date, so the same inputs give the same bytes (as the CLI's files).
 * With a projected DEM under the footprint, the JSON-FG file and the two GeoTIFFs are in the DEM's own CRS.
 */
import type { FootprintField } from '../../core/footprint/field.ts';
import type { FootprintFigures } from '../../core/footprint/studyFootprint.ts';
import { footprintMapSvg } from '../../core/export/footprintSvg.ts';
import { footprintCsv, footprintGeoJson, footprintReport, partialResultLine } from '../../core/export/footprintExport.ts';
import type { Study } from '../../core/study/schema.ts';
import { footprintLonLat, footprintPlace, type FootprintLonLat, type FootprintPlace } from '../../core/footprint/georeferencedFootprint.ts';
import type { GridGeoreference } from '../../core/terrain/grid.ts';
import { footprintJsonFg } from '../../core/export/footprintJsonFg.ts';
import { footprintPropellantTiff, footprintReachableTiff } from '../../core/export/footprintRasters.ts';

/** Exports every footprint has (text). */
export type TextExportKind = 'csv' | 'geojson' | 'json' | 'svg';
export type FootprintExportKind = TextExportKind | 'jsonfg' | 'propellant-tif' | 'reachable-tif';

/** Kinds that need the footprint placed on a projected DEM (`FootprintResult.placement.place`). */
export const DEM_CRS_EXPORTS: readonly FootprintExportKind[] = ['jsonfg', 'propellant-tif', 'reachable-tif'];

/** Where a footprint lies on the DEM: set when it was computed over a projected DEM. */
export interface FootprintPlacement {
  place: FootprintPlace;
  lonLat: FootprintLonLat | null;
}

/**
 * The placement of a footprint on a DEM, its nominal target at `target_m` of the DEM's frame; null when the
 * DEM is not projected. Throws core/terrain's TerrainInputError when the CRS cannot be used there.
 */
export function footprintPlacement(georeference: GridGeoreference | null | undefined, target_m: readonly [number, number], body: string): FootprintPlacement | null {
  const grid = { georeference: georeference ?? undefined };
  const place = footprintPlace(grid, target_m);
  return place ? { place, lonLat: footprintLonLat(grid, target_m, body) } : null;
}

export interface FootprintResult {
  study: Study;
  field: FootprintField;
  figures: FootprintFigures;
  /** What was run (hashed into the exports). */
  inputs: { study: Study; grid: { nx: number; ny: number; extent_m: number }; nodes: number; reserve_kg: number };
  inputsHash: string;
  appVersion: string;
  /** Set when the footprint was computed over a projected DEM (the DEM-CRS exports need it). */
  placement?: FootprintPlacement | null;
}

/** The bytes or text of an export: the GeoTIFFs are bytes, everything else text. */
export function footprintExportData(kind: FootprintExportKind, r: FootprintResult): string | Uint8Array {
  if (kind === 'jsonfg' || kind === 'propellant-tif' || kind === 'reachable-tif') {
    const placement = r.placement;
    if (!placement) throw new Error(`${kind} export: the footprint was not computed over a projected DEM`);
    const { field, figures } = r;
    const description = `${r.study.name}, inputs ${r.inputsHash.slice(0, 16)}`;
    if (kind === 'propellant-tif') return footprintPropellantTiff(field, placement.place, description);
    if (kind === 'reachable-tif') return footprintReachableTiff(field, figures.summary.budget_kg, placement.place, description);
    const stoppedEarly = partialResultLine(field)?.replace(/^# /, '');
    return JSON.stringify(footprintJsonFg({ contours: figures.bands, reachable: figures.reachable, reserve_kg: figures.summary.reserve_kg, place: placement.place, lonLat: placement.lonLat, stoppedEarly }));
  }
  return footprintExportText(kind, r);
}

export function footprintExportText(kind: TextExportKind, r: FootprintResult): string {
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
