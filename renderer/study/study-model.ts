/**
 * The seam between the workspace and the study definition. The workspace sees only `StudyModel`:
 * which groups and fields exist, how one raw input is checked, which cross-field rules apply, and how
 * values become a study document and back. `localStudyModel` implements it from the field table; a
 * model built on core/study's zod schema will implement the same interface and replace it here.
 */
import { FIELDS, GROUPS, MAX_GRID_TARGETS, type FieldSpec, type GroupSpec } from './field-table.ts';

/** Must equal electron/study-envelope.ts (a unit test checks); both move to core/study when it lands. */
export const STUDY_FORMAT = 'landreach-study';
export const STUDY_VERSION = 1;

/** Raw text of every field, keyed by field id: what the user typed, kept even when invalid. */
export type RawValues = Record<string, string>;
/** Parsed values of every field, SI as named. */
export type Values = Record<string, number>;

export type FieldCheck = { ok: true; value: number } | { ok: false; message: string };

/** A problem involving several fields, shown on `field`. Warnings do not block a run. */
export interface CrossIssue {
  field: string;
  severity: 'error' | 'warning';
  message: string;
}

export interface StudyDocumentContent {
  name: string;
  raw: RawValues;
  /** Fields absent from the file, filled with defaults (the workspace tells the user). */
  missing?: string[];
}

export interface StudyModel {
  groups: readonly GroupSpec[];
  fields: readonly FieldSpec[];
  field(id: string): FieldSpec;
  defaults(): RawValues;
  checkField(id: string, raw: string): FieldCheck;
  crossIssues(values: Values): CrossIssue[];
  toDocument(name: string, values: Values): object;
  /** Parse a study document's text; throws StudyFormatError with a user-facing message. */
  fromText(text: string): StudyDocumentContent;
}

export class StudyFormatError extends Error {
  override readonly name = 'StudyFormatError';
}

/** Shortest text that round-trips the number (no "0.30000000000000004" in the fields). */
export function formatNumber(value: number): string {
  return String(Number(value.toPrecision(12)));
}

function rangeText(spec: FieldSpec): string {
  const unit = spec.unit ? ` ${spec.unit}` : '';
  const low = spec.minExclusive ? `above ${formatNumber(spec.min)}` : `${formatNumber(spec.min)}`;
  return spec.minExclusive ? `a value ${low} and up to ${formatNumber(spec.max)}${unit}` : `a value from ${low} to ${formatNumber(spec.max)}${unit}`;
}

export function checkFieldValue(spec: FieldSpec, raw: string): FieldCheck {
  const text = raw.trim();
  const unit = spec.unit ? ` ${spec.unit}` : '';
  const wanted = spec.integer ? `a whole number from ${spec.min} to ${spec.max}` : rangeText(spec);
  if (text === '') return { ok: false, message: `${spec.label} is empty. Enter ${wanted}.` };
  // Number('') and Number(' ') are 0 and Number('0x10') is 16: accept decimal notation only.
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text)) {
    return { ok: false, message: `“${text}” is not a number. Enter ${wanted} (decimal point, no unit).` };
  }
  const value = Number(text);
  if (!Number.isFinite(value)) return { ok: false, message: `“${text}” is too large. Enter ${wanted}.` };
  if (spec.integer && !Number.isInteger(value)) return { ok: false, message: `${text} is not a whole number. Enter ${wanted}.` };
  if (value < spec.min || (spec.minExclusive && value === spec.min)) {
    return { ok: false, message: `${text}${unit} is below the allowed range. Enter ${wanted}.` };
  }
  if (value > spec.max) return { ok: false, message: `${text}${unit} is above the allowed range. Enter ${wanted}.` };
  return { ok: true, value };
}

export function localCrossIssues(v: Values): CrossIssue[] {
  const issues: CrossIssue[] = [];
  const has = (...ids: string[]) => ids.every((id) => Number.isFinite(v[id]));
  const kg = (x: number) => `${formatNumber(x)} kg`;
  if (has('vehicle.wetMass_kg', 'vehicle.dryMass_kg') && v['vehicle.dryMass_kg'] >= v['vehicle.wetMass_kg']) {
    issues.push({ field: 'vehicle.dryMass_kg', severity: 'error', message: `Dry mass ${kg(v['vehicle.dryMass_kg'])} must be less than the mass at ignition ${kg(v['vehicle.wetMass_kg'])}. Lower the dry mass or raise the mass at ignition.` });
  } else if (has('vehicle.wetMass_kg', 'vehicle.dryMass_kg', 'reserve.propellantReserve_kg')) {
    const onBoard = v['vehicle.wetMass_kg'] - v['vehicle.dryMass_kg'];
    if (v['reserve.propellantReserve_kg'] >= onBoard) {
      issues.push({ field: 'reserve.propellantReserve_kg', severity: 'error', message: `A reserve of ${kg(v['reserve.propellantReserve_kg'])} leaves nothing to fly with: only ${kg(onBoard)} of propellant is on board (mass at ignition − dry mass). Lower the reserve or raise the mass at ignition.` });
    }
  }
  if (has('vehicle.throttleMin', 'vehicle.throttleMax') && v['vehicle.throttleMin'] >= v['vehicle.throttleMax']) {
    issues.push({ field: 'vehicle.throttleMin', severity: 'error', message: `Minimum throttle ${formatNumber(v['vehicle.throttleMin'])} must be below maximum throttle ${formatNumber(v['vehicle.throttleMax'])}. Lower the minimum or raise the maximum.` });
  }
  if (has('constraints.flightTimeMin_s', 'constraints.flightTimeMax_s') && v['constraints.flightTimeMin_s'] >= v['constraints.flightTimeMax_s']) {
    issues.push({ field: 'constraints.flightTimeMin_s', severity: 'error', message: `Shortest flight time ${formatNumber(v['constraints.flightTimeMin_s'])} s must be below the longest ${formatNumber(v['constraints.flightTimeMax_s'])} s. Lower the shortest or raise the longest.` });
  }
  if (has('grid.halfWidth_m', 'grid.spacing_m')) {
    const perSide = 2 * Math.floor(v['grid.halfWidth_m'] / v['grid.spacing_m']) + 1;
    if (perSide < 3) {
      issues.push({ field: 'grid.spacing_m', severity: 'error', message: `Spacing ${formatNumber(v['grid.spacing_m'])} m leaves only one target across the ${formatNumber(2 * v['grid.halfWidth_m'])} m grid. Use a spacing of at most ${formatNumber(v['grid.halfWidth_m'])} m.` });
    } else if (perSide * perSide > MAX_GRID_TARGETS) {
      const finest = (2 * v['grid.halfWidth_m']) / (Math.sqrt(MAX_GRID_TARGETS) - 1);
      issues.push({ field: 'grid.spacing_m', severity: 'error', message: `This grid has ${(perSide * perSide).toLocaleString('en')} targets, more than the ${MAX_GRID_TARGETS.toLocaleString('en')} allowed. Use a spacing of at least ${formatNumber(Math.ceil(finest))} m or a smaller half-width.` });
    }
  }
  if (has('vehicle.thrustMax_N', 'vehicle.throttleMax', 'vehicle.wetMass_kg', 'planet.surfaceGravity_mps2')) {
    const ratio = (v['vehicle.thrustMax_N'] * v['vehicle.throttleMax']) / (v['vehicle.wetMass_kg'] * v['planet.surfaceGravity_mps2']);
    if (ratio <= 1) {
      issues.push({ field: 'vehicle.thrustMax_N', severity: 'warning', message: `At maximum throttle the thrust-to-weight ratio at ignition is ${ratio.toFixed(3)} (≤ 1): the vehicle cannot hover, and most targets will be unreachable. Raise the thrust or lower the mass.` });
    }
  }
  return issues;
}

function setPath(doc: Record<string, unknown>, dotted: string, value: unknown): void {
  const parts = dotted.split('.');
  let node = doc;
  for (const part of parts.slice(0, -1)) node = (node[part] ??= {}) as Record<string, unknown>;
  node[parts[parts.length - 1]] = value;
}

function getPath(doc: unknown, dotted: string): unknown {
  return dotted.split('.').reduce<unknown>((node, part) => (node && typeof node === 'object' ? (node as Record<string, unknown>)[part] : undefined), doc);
}

export function createLocalStudyModel(): StudyModel {
  const byId = new Map(FIELDS.map((f) => [f.id, f]));
  const field = (id: string): FieldSpec => {
    const spec = byId.get(id);
    if (!spec) throw new Error(`unknown study field: ${id}`);
    return spec;
  };
  return {
    groups: GROUPS,
    fields: FIELDS,
    field,
    defaults: () => Object.fromEntries(FIELDS.map((f) => [f.id, formatNumber(f.defaultValue)])),
    checkField: (id, raw) => checkFieldValue(field(id), raw),
    crossIssues: localCrossIssues,
    toDocument(name, values) {
      const doc: Record<string, unknown> = { format: STUDY_FORMAT, version: STUDY_VERSION, name };
      for (const f of FIELDS) setPath(doc, f.id, values[f.id]);
      return doc;
    },
    fromText(text) {
      let doc: unknown;
      try {
        doc = JSON.parse(text);
      } catch (error) {
        throw new StudyFormatError(`The study is not valid JSON (${(error as Error).message}).`);
      }
      const record = (doc ?? {}) as Record<string, unknown>;
      if (record.format !== STUDY_FORMAT) throw new StudyFormatError(`This is not a Landreach study (its "format" is ${JSON.stringify(record.format)}).`);
      if (typeof record.version !== 'number' || record.version > STUDY_VERSION) {
        throw new StudyFormatError(`Study version ${JSON.stringify(record.version)} is not one this build reads (up to ${STUDY_VERSION}). Open it with a newer Landreach.`);
      }
      const raw: RawValues = {};
      const missing: string[] = [];
      for (const f of FIELDS) {
        const value = getPath(doc, f.id);
        if (typeof value === 'number' && Number.isFinite(value)) raw[f.id] = formatNumber(value);
        else {
          // Keep going with the default, and say so: the user sees which values were filled in.
          missing.push(f.id);
          raw[f.id] = formatNumber(f.defaultValue);
        }
      }
      if (missing.length === FIELDS.length) throw new StudyFormatError('The study holds none of the expected inputs.');
      const name = typeof record.name === 'string' && record.name.trim() ? record.name : 'Untitled study';
      return { name, raw, ...(missing.length ? { missing } : {}) };
    },
  };
}
