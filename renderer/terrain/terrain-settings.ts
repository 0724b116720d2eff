/**
 * The Terrain group's own inputs, as typed: where the nominal target sits on the DEM (east/north in the DEM's
 * frame; blank = the DEM's centre, as `landreach hazard --study` places it), the hazard limits (core/terrain's
 * HazardLimits; blank = the CLI's defaults) and the two numbers a PNG heightmap needs. Run inputs of the
 * app, not part of the study file (core/study's schema has no place for terrain). Pure.
 */
import { DEFAULT_HAZARD_LIMITS, type HazardLimits } from '../../core/terrain/index.ts';
import type { PngHeightmapInputs } from './terrain-product.ts';
import { trimmed } from '../format.ts';

export interface TerrainSettingsText {
  targetEast_m: string;
  targetNorth_m: string;
  maxSlope_deg: string;
  maxRoughness_m: string;
  landerDiameter_m: string;
  safetyMargin_m: string;
  pngPixelSize_m: string;
  pngHeightStep_m: string;
}
export type TerrainField = keyof TerrainSettingsText;

export const DEFAULT_TERRAIN_SETTINGS: TerrainSettingsText = {
  targetEast_m: '',
  targetNorth_m: '',
  maxSlope_deg: String(DEFAULT_HAZARD_LIMITS.maxSlope_deg),
  maxRoughness_m: String(DEFAULT_HAZARD_LIMITS.maxRoughness_m),
  landerDiameter_m: String(DEFAULT_HAZARD_LIMITS.landerDiameter_m),
  safetyMargin_m: String(DEFAULT_HAZARD_LIMITS.safetyMargin_m),
  pngPixelSize_m: '',
  pngHeightStep_m: '',
};

/** Labels as the Terrain group shows them; messages start with them. */
export const TERRAIN_FIELD_LABELS: Record<TerrainField, string> = {
  targetEast_m: 'Target east on the DEM',
  targetNorth_m: 'Target north on the DEM',
  maxSlope_deg: 'Max slope',
  maxRoughness_m: 'Max roughness',
  landerDiameter_m: 'Lander footprint diameter',
  safetyMargin_m: 'Safety margin',
  pngPixelSize_m: 'PNG pixel size',
  pngHeightStep_m: 'PNG height step',
};

/** Units shown beside each entry, in the same style as the study inputs (renderer/study/field-table.ts). */
export const TERRAIN_FIELD_UNITS: Record<TerrainField, string> = {
  targetEast_m: 'm', targetNorth_m: 'm', maxSlope_deg: '°', maxRoughness_m: 'm', landerDiameter_m: 'm', safetyMargin_m: 'm', pngPixelSize_m: 'm', pngHeightStep_m: 'm',
};

/** The DEM's extent in its own frame (outer edges), metres. */
export interface DemExtent {
  west_m: number;
  east_m: number;
  south_m: number;
  north_m: number;
  centreEast_m: number;
  centreNorth_m: number;
}

export type TerrainSettingsCheck =
  | { ok: true; target: { east_m: number; north_m: number }; limits: Required<Omit<HazardLimits, 'roughnessMeasure'>>; png: PngHeightmapInputs }
  | { ok: false; problems: Partial<Record<TerrainField, string>> };

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const fmt = (v: number) => trimmed(v, 3);

function parse(text: string): number | null {
  const t = text.trim();
  return NUMBER.test(t) ? Number(t) : null;
}

/**
 * Checks every field; a problem names the field, the value as typed and the fix. Limits' ranges are
 * core/terrain's (`resolveLimits`), so what passes here passes there.
 */
export function checkTerrainSettings(text: TerrainSettingsText, extent: DemExtent | null): TerrainSettingsCheck {
  const problems: Partial<Record<TerrainField, string>> = {};
  // Messages name the field with its unit, as the field shows them side by side: "Max slope (°) “95”: …".
  const label = (f: TerrainField) => `${TERRAIN_FIELD_LABELS[f]} (${TERRAIN_FIELD_UNITS[f]})`;

  const position = (field: 'targetEast_m' | 'targetNorth_m', lo: number | null, hi: number | null, centre: number | null): number => {
    const raw = text[field].trim();
    if (raw === '') return centre ?? 0;
    const v = parse(raw);
    if (v === null) {
      problems[field] = `${label(field)} “${raw}”: enter a number of metres, or leave it blank for the DEM’s centre${centre === null ? '' : ` (${fmt(centre)} m)`}.`;
      return NaN;
    }
    if (lo !== null && hi !== null && (v < lo || v > hi)) {
      problems[field] = `${label(field)} “${raw}”: the target must be on the DEM, from ${fmt(lo)} to ${fmt(hi)} m (blank = its centre, ${fmt(centre!)} m).`;
    }
    return v;
  };
  const east = position('targetEast_m', extent?.west_m ?? null, extent?.east_m ?? null, extent?.centreEast_m ?? null);
  const north = position('targetNorth_m', extent?.south_m ?? null, extent?.north_m ?? null, extent?.centreNorth_m ?? null);

  const limit = (field: TerrainField, lo: number, hi: number, lowOpen: boolean, fallback: number, unit: string): number => {
    const raw = text[field].trim();
    if (raw === '') return fallback;
    const v = parse(raw);
    if (v === null || (lowOpen ? v <= lo : v < lo) || v > hi) {
      problems[field] = `${label(field)} “${raw}”: enter a number ${lowOpen ? 'above' : 'from'} ${lo}${lowOpen ? ' and up to' : ' to'} ${hi}${unit === '°' ? '' : ' '}${unit} (blank = ${fallback}).`;
      return NaN;
    }
    return v;
  };
  // The ranges of core/terrain/hazard.ts resolveLimits.
  const maxSlope_deg = limit('maxSlope_deg', 0, 89, false, DEFAULT_HAZARD_LIMITS.maxSlope_deg, '°');
  const maxRoughness_m = limit('maxRoughness_m', 0, 1e4, false, DEFAULT_HAZARD_LIMITS.maxRoughness_m, 'm');
  const landerDiameter_m = limit('landerDiameter_m', 0, 1e4, true, DEFAULT_HAZARD_LIMITS.landerDiameter_m, 'm');
  const safetyMargin_m = limit('safetyMargin_m', 0, 1e5, false, DEFAULT_HAZARD_LIMITS.safetyMargin_m, 'm');

  const optionalPositive = (field: 'pngPixelSize_m' | 'pngHeightStep_m'): number | null => {
    const raw = text[field].trim();
    if (raw === '') return null;
    const v = parse(raw);
    if (v === null || !(v > 0) || v > 1e6) {
      problems[field] = `${label(field)} “${raw}”: enter a number of metres above 0 (only PNG heightmaps use it), or leave it blank.`;
      return null;
    }
    return v;
  };
  const png = { pixelSize_m: optionalPositive('pngPixelSize_m'), heightScale_m: optionalPositive('pngHeightStep_m') };

  if (Object.keys(problems).length) return { ok: false, problems };
  return { ok: true, target: { east_m: east, north_m: north }, limits: { maxSlope_deg, maxRoughness_m, landerDiameter_m, safetyMargin_m }, png };
}
