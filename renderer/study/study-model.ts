/**
 * The seam between the workspace and the study definition. The workspace sees only `StudyModel`:
 * which groups and fields exist, how one raw input is checked, which cross-field rules apply, and how
 * values become a study document and back. `createLocalStudyModel` implements it from the field table
 * (numeric fields at their core/study paths); the parts of a study that are not numeric fields (names,
 * planet body, hold, …) ride along unchanged in the raw values under BASE_DOCUMENT_KEY, so opening and
 * saving a study loses nothing. Whole documents are validated by core/study's zod schema (toCoreStudy).
 */
import { BAND_HIGH_FIELD, BAND_LOW_FIELD, FIELDS, GROUPS, type FieldSpec, type GroupSpec } from './field-table.ts';
import { STUDY_FORMAT, STUDY_VERSION } from '../../core/study/schema.ts';
import { MARS_SURFACE_GRAVITY, MOON_SURFACE_GRAVITY } from '../../core/descent/planet.ts';
import { parseStudyJson, StudyError } from '../../core/study/load.ts';

export { STUDY_FORMAT, STUDY_VERSION };

/**
 * Raw-values key holding the JSON of the study's non-field parts (never an input field id: ids are
 * dotted paths of letters and digits).
 */
export const BASE_DOCUMENT_KEY = '$document';

/** The non-field parts of the invented demo study (assets/demo/demo-lander.study.json): a new study starts from them. */
const DEMO_BASE: Record<string, unknown> = {
  format: STUDY_FORMAT,
  version: STUDY_VERSION,
  name: 'Untitled study',
  description: 'INVENTED demo data: the vehicle, the site and the ignition state are made up for illustration and match no real mission or vehicle.',
  planet: { body: 'mars' },
  site: { name: 'Orvessa Plain (invented)', invented: true },
  vehicle: { name: 'LR-Demo lander (invented)', invented: true },
  ignition: {},
  constraints: { minAltitude_m: null },
  discretisation: { hold: 'foh' },
  target: { x_m: 0, y_m: 0 },
};

/** Values core/study's schema fills in when a file leaves these out (core/study/schema.ts); 0 = none. */
const SCHEMA_DEFAULTS: Record<string, number> = {
  'vehicle.propellantReserve_kg': 0,
  'vehicle.cantAngle_deg': 0,
  'vehicle.pointingLimit_deg': 180,
  'vehicle.throttleRate_perS': 0,
  [BAND_LOW_FIELD]: 0,
  [BAND_HIGH_FIELD]: 0,
  'constraints.glideSlope_deg': 0,
  'constraints.maxSpeed_mps': 0,
  'constraints.gateHeight_m': 0,
  'constraints.gateDescentRate_mps': 0,
  'discretisation.nodes': 50,
};

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
  /** The study document; `raw` carries the non-field parts (BASE_DOCUMENT_KEY) of an opened study. */
  toDocument(name: string, values: Values, raw?: RawValues): object;
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
  const high = spec.maxExclusive ? `below ${formatNumber(spec.max)}` : `up to ${formatNumber(spec.max)}`;
  const none = spec.zeroMeansNone ? ' (0 for none)' : '';
  if (spec.minExclusive) return `a value above ${formatNumber(spec.min)} and ${high}${unit}${none}`;
  if (spec.maxExclusive) return `a value from ${formatNumber(spec.min)} and ${high}${unit}${none}`;
  return `a value from ${formatNumber(spec.min)} to ${formatNumber(spec.max)}${unit}${none}`;
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
  if (value > spec.max || (spec.maxExclusive && value === spec.max)) return { ok: false, message: `${text}${unit} is above the allowed range. Enter ${wanted}.` };
  return { ok: true, value };
}

export function localCrossIssues(v: Values): CrossIssue[] {
  const issues: CrossIssue[] = [];
  const has = (...ids: string[]) => ids.every((id) => Number.isFinite(v[id]));
  const kg = (x: number) => `${formatNumber(x)} kg`;
  if (has('vehicle.wetMass_kg', 'vehicle.dryMass_kg') && v['vehicle.dryMass_kg'] >= v['vehicle.wetMass_kg']) {
    issues.push({ field: 'vehicle.dryMass_kg', severity: 'error', message: `Dry mass ${kg(v['vehicle.dryMass_kg'])} must be less than the mass at ignition ${kg(v['vehicle.wetMass_kg'])}. Lower the dry mass or raise the mass at ignition.` });
  } else if (has('vehicle.wetMass_kg', 'vehicle.dryMass_kg', 'vehicle.propellantReserve_kg')) {
    const onBoard = v['vehicle.wetMass_kg'] - v['vehicle.dryMass_kg'];
    if (v['vehicle.propellantReserve_kg'] >= onBoard) {
      issues.push({ field: 'vehicle.propellantReserve_kg', severity: 'error', message: `A reserve of ${kg(v['vehicle.propellantReserve_kg'])} leaves nothing to fly with: only ${kg(onBoard)} of propellant is on board (mass at ignition − dry mass). Lower the reserve or raise the mass at ignition.` });
    }
  }
  if (has('vehicle.throttleMin', 'vehicle.throttleMax') && v['vehicle.throttleMin'] >= v['vehicle.throttleMax']) {
    issues.push({ field: 'vehicle.throttleMin', severity: 'error', message: `Minimum throttle ${formatNumber(v['vehicle.throttleMin'])} must be below maximum throttle ${formatNumber(v['vehicle.throttleMax'])}. Lower the minimum or raise the maximum.` });
  }
  const thrust = ['vehicle.engineCount', 'vehicle.thrustPerEngine_N', 'vehicle.cantAngle_deg', 'vehicle.throttleMax', 'vehicle.wetMass_kg', 'planet.gravity_mps2'];
  if (has(...thrust)) {
    const net = v['vehicle.engineCount'] * v['vehicle.thrustPerEngine_N'] * Math.cos((v['vehicle.cantAngle_deg'] * Math.PI) / 180);
    const ratio = (net * v['vehicle.throttleMax']) / (v['vehicle.wetMass_kg'] * v['planet.gravity_mps2']);
    if (ratio <= 1) {
      issues.push({ field: 'vehicle.thrustPerEngine_N', severity: 'warning', message: `At maximum throttle the net thrust-to-weight ratio at ignition is ${ratio.toFixed(3)} (≤ 1): the vehicle cannot hover, and most targets will be unreachable. Raise the thrust or lower the mass.` });
    }
  }
  return issues;
}

/** Sets a dotted path, creating objects, or arrays where the next part is an index. */
function setPath(doc: Record<string, unknown>, dotted: string, value: unknown): void {
  const parts = dotted.split('.');
  let node = doc;
  parts.slice(0, -1).forEach((part, k) => {
    const container = /^\d+$/.test(parts[k + 1]) ? [] : {};
    const existing = node[part];
    if (existing === null || typeof existing !== 'object') node[part] = container;
    node = node[part] as Record<string, unknown>;
  });
  node[parts[parts.length - 1]] = value;
}

/** A copy of the document without the numeric field values (what rides along in BASE_DOCUMENT_KEY). */
function baseOf(doc: Record<string, unknown>): Record<string, unknown> {
  const base = structuredClone(doc);
  for (const f of FIELDS) {
    const parts = f.id.split('.');
    const parent = getPath(base, parts.slice(0, -1).join('.')) as Record<string, unknown> | undefined;
    if (parent && typeof parent === 'object' && !Array.isArray(parent)) delete parent[parts[parts.length - 1]];
  }
  // The first band rides in its two fields; the others stay in the base document.
  const vehicle = base.vehicle as Record<string, unknown> | undefined;
  if (vehicle && typeof vehicle === 'object' && Array.isArray(vehicle.throttleBands)) vehicle.throttleBands = vehicle.throttleBands.slice(1);
  for (const vector of ['ignition.position_m', 'ignition.velocity_mps']) {
    const [group, key] = vector.split('.');
    const g = base[group] as Record<string, unknown> | undefined;
    if (g && typeof g === 'object') delete g[key];
  }
  return base;
}

/** Edge (0: lower, 1: upper) of the document's first forbidden throttle band; null when it has none. */
function firstBandEdge(doc: unknown, edge: 0 | 1): unknown {
  const bands = getPath(doc, 'vehicle.throttleBands');
  if (bands === undefined) return undefined;
  return Array.isArray(bands) && Array.isArray(bands[0]) ? bands[0][edge] : null;
}

/**
 * The two band fields (written by setPath as vehicle.throttleBandLow/High) back into `vehicle.throttleBands`:
 * both 0 (null) is no first band; otherwise [lo, hi] first, the file's further bands after it (core/study
 * then checks the list and names `vehicle.throttleBands.0` if the pair is not a valid band).
 */
function bandFieldsToList(doc: Record<string, unknown>): void {
  const vehicle = doc.vehicle as Record<string, unknown>;
  const lo = vehicle[BAND_LOW_FIELD.split('.')[1]];
  const hi = vehicle[BAND_HIGH_FIELD.split('.')[1]];
  delete vehicle[BAND_LOW_FIELD.split('.')[1]];
  delete vehicle[BAND_HIGH_FIELD.split('.')[1]];
  const rest = Array.isArray(vehicle.throttleBands) ? vehicle.throttleBands : [];
  const set = (typeof lo === 'number' && lo !== 0) || (typeof hi === 'number' && hi !== 0);
  vehicle.throttleBands = set ? [[lo ?? 0, hi ?? 0], ...rest] : rest;
}

function presetGravity(doc: unknown): number | undefined {
  const body = getPath(doc, 'planet.body');
  return body === 'mars' ? MARS_SURFACE_GRAVITY : body === 'moon' ? MOON_SURFACE_GRAVITY : undefined;
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
    defaults: () => ({ ...Object.fromEntries(FIELDS.map((f) => [f.id, formatNumber(f.defaultValue)])), [BASE_DOCUMENT_KEY]: JSON.stringify(DEMO_BASE) }),
    checkField: (id, raw) => checkFieldValue(field(id), raw),
    crossIssues: localCrossIssues,
    toDocument(name, values, raw) {
      let base = DEMO_BASE;
      const carried = raw?.[BASE_DOCUMENT_KEY];
      if (carried) {
        try {
          base = JSON.parse(carried) as Record<string, unknown>;
        } catch {
          base = DEMO_BASE;
        }
      }
      const doc: Record<string, unknown> = { ...structuredClone(base), format: STUDY_FORMAT, version: STUDY_VERSION, name };
      for (const f of FIELDS) setPath(doc, f.id, f.zeroMeansNone && values[f.id] === 0 ? null : values[f.id]);
      bandFieldsToList(doc);
      return doc;
    },
    fromText(text) {
      let doc: unknown;
      try {
        // core/study's reading: a byte-order mark allowed, nesting bounded (JSON.stringify below would overflow).
        doc = parseStudyJson(text);
      } catch (error) {
        if (!(error instanceof StudyError)) throw error;
        const p = error.problems[0];
        throw new StudyFormatError(p.value === 'not JSON' ? `The study is not valid JSON (${p.message.replace(/; fix the JSON syntax$/, '')}).` : `The study cannot be opened: ${p.field} holds ${p.value}; ${p.message}.`);
      }
      if (doc === null || typeof doc !== 'object' || Array.isArray(doc)) throw new StudyFormatError('This is not a Landreach study (it is not a JSON object).');
      const record = doc as Record<string, unknown>;
      if (record.format !== STUDY_FORMAT) throw new StudyFormatError(`This is not a Landreach study (its "format" is ${JSON.stringify(record.format)}).`);
      if (typeof record.version !== 'number' || record.version > STUDY_VERSION) {
        throw new StudyFormatError(`Study version ${JSON.stringify(record.version)} is not one this build reads (up to ${STUDY_VERSION}). Open it with a newer Landreach.`);
      }
      const raw: RawValues = {};
      const missing: string[] = [];
      for (const f of FIELDS) {
        let value = f.id === BAND_LOW_FIELD || f.id === BAND_HIGH_FIELD ? firstBandEdge(doc, f.id === BAND_LOW_FIELD ? 0 : 1) : getPath(doc, f.id);
        if (value === undefined && f.id === 'planet.gravity_mps2') value = presetGravity(doc);
        if (value === null && f.zeroMeansNone) value = 0;
        if (value === undefined && f.id in SCHEMA_DEFAULTS) value = SCHEMA_DEFAULTS[f.id];
        if (typeof value === 'number' && Number.isFinite(value)) raw[f.id] = formatNumber(value);
        else {
          // Keep going with the default, and say so: the user sees which values were filled in.
          missing.push(f.id);
          raw[f.id] = formatNumber(f.defaultValue);
        }
      }
      if (missing.length === FIELDS.length) throw new StudyFormatError('The study holds none of the expected inputs.');
      raw[BASE_DOCUMENT_KEY] = JSON.stringify(baseOf(record));
      const name = typeof record.name === 'string' && record.name.trim() ? record.name : 'Untitled study';
      return { name, raw, ...(missing.length ? { missing } : {}) };
    },
  };
}
