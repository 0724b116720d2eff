/**
 * Seeded mutations of a study file, for the study fuzz test (test/unit/study/study-fuzz.test.ts) and the
 * offline run (test/fuzz/study-fuzz.ts). Mutation `index` of a run with seed `seed` depends on nothing
 * else, so any reported case can be replayed alone (`studyMutation(base, seed, index)`).
 *
 * The operators follow common fuzzing practice: replace one value by a boundary or extreme value, scale
 * it by a random power of ten or nudge it by up to a factor of 3, set it just beside a related field (the places where cross-field rules
 * live), change its type, remove or add keys, and damage the bytes (byte-order mark, invalid UTF-8,
 * truncation, deep nesting, flipped bytes). One to three operators per mutation.
 */
import { Rng } from './random.ts';

export interface StudyMutation {
  /** What was done, e.g. `vehicle.engineCount = 20000`; enough to rebuild the case by hand. */
  readonly label: string;
  /** The file's bytes. */
  readonly bytes: Uint8Array;
}

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

/** Optional fields a study may leave out: a mutation may add them. */
const OPTIONAL_PATHS = [
  'ignition.mass_kg',
  'planet.gravity_mps2',
  'planet.siderealPeriod_h',
  'vehicle.propellantReserve_kg',
  'vehicle.cantAngle_deg',
  'vehicle.pointingLimit_deg',
  'target.z_m',
  'constraints.minAltitude_m',
];

/** Pairs of fields tied by a rule or by physics: a value is set just beside its partner's. */
const PARTNERS: [string, string][] = [
  ['vehicle.throttleMin', 'vehicle.throttleMax'],
  ['vehicle.dryMass_kg', 'vehicle.wetMass_kg'],
  ['vehicle.propellantReserve_kg', 'vehicle.wetMass_kg'],
  ['ignition.mass_kg', 'vehicle.wetMass_kg'],
  ['ignition.mass_kg', 'vehicle.dryMass_kg'],
  ['constraints.gateDescentRate_mps', 'constraints.maxSpeed_mps'],
  ['constraints.gateHeight_m', 'ignition.position_m.2'],
  ['constraints.minAltitude_m', 'ignition.position_m.2'],
  ['constraints.minAltitude_m', 'constraints.gateHeight_m'],
  ['target.z_m', 'ignition.position_m.2'],
  ['constraints.maxSpeed_mps', 'ignition.velocity_mps.2'],
  ['constraints.maxSpeed_mps', 'ignition.velocity_mps.0'],
  ['ignition.position_m.2', 'constraints.gateHeight_m'],
];

const SPECIAL_NUMBERS = [
  0, -1, 1, 0.5, 2, 5, 1e-9, -1e-9, 1e-300, 5e-324, 1e-12, 1e12, 1e300, 1.7976931348623157e308, 20000, 2 ** 31, 2 ** 53 + 2,
  1 - 1e-12, 1 + 1e-12, 79.9999, 80, 89.999, 90, 179.9, 180, -90, 1000, 2000, 2001, 1001, 4, 5.5, -0.5, 3.9e5,
];

const SPECIAL_VALUES: Json[] = [null, true, false, '', '12', 'NaN', [], {}, [1, 2, 3], { value: 1 }];

function leafPaths(value: Json, prefix: string, out: string[]): string[] {
  if (Array.isArray(value)) value.forEach((v, i) => leafPaths(v, prefix ? `${prefix}.${i}` : String(i), out));
  else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) leafPaths(v, prefix ? `${prefix}.${k}` : k, out);
  } else out.push(prefix);
  return out;
}

function getAt(doc: Json, path: string): Json | undefined {
  let cur: Json | undefined = doc;
  for (const key of path.split('.')) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string, Json>)[key];
  }
  return cur;
}

function setAt(doc: Json, path: string, value: Json | undefined): void {
  const keys = path.split('.');
  let cur = doc as Record<string, Json>;
  for (const key of keys.slice(0, -1)) {
    if (cur[key] === null || typeof cur[key] !== 'object') cur[key] = {};
    cur = cur[key] as Record<string, Json>;
  }
  const last = keys[keys.length - 1];
  if (value === undefined) {
    if (Array.isArray(cur)) cur.splice(Number(last), 1);
    else delete cur[last];
  } else {
    // defineProperty, so that a key such as "__proto__" becomes an own property JSON.stringify writes.
    Object.defineProperty(cur, last, { value, enumerable: true, writable: true, configurable: true });
  }
}

const pick = <T>(rng: Rng, list: readonly T[]): T => list[Math.floor(rng.next() * list.length)];

/** One value-level operator on the document; returns its label. */
function mutateValue(doc: Json, rng: Rng): string {
  const leaves = [...leafPaths(doc, '', []), ...OPTIONAL_PATHS];
  if (rng.next() < 0.25) {
    // A plausible edit: a number moved by up to a factor of 3 either way (mostly still a valid study).
    const numeric = leaves.filter((p) => typeof getAt(doc, p) === 'number');
    const path = pick(rng, numeric);
    const v = (getAt(doc, path) as number) * 3 ** rng.uniform(-1, 1);
    setAt(doc, path, v);
    return `${path} = ${v} (nudged)`;
  }
  const op = rng.next();
  if (op < 0.3) {
    const path = pick(rng, leaves);
    const v = pick(rng, SPECIAL_NUMBERS) * (rng.next() < 0.1 ? -1 : 1);
    setAt(doc, path, v);
    return `${path} = ${v}`;
  }
  if (op < 0.5) {
    const path = pick(rng, leaves);
    const old = getAt(doc, path);
    const base = typeof old === 'number' && old !== 0 ? old : 1;
    const v = base * 10 ** rng.uniform(-12, 12);
    setAt(doc, path, v);
    return `${path} = ${v} (scaled)`;
  }
  if (op < 0.7) {
    const [a, b] = pick(rng, PARTNERS);
    const [path, partner] = rng.next() < 0.5 ? [a, b] : [b, a];
    const other = getAt(doc, partner);
    const ref = typeof other === 'number' ? other : 0;
    const v = ref + pick(rng, [0, 1e-9, -1e-9, 0.2, -0.2, 1, -1]) * Math.max(1, Math.abs(ref)) ** (rng.next() < 0.5 ? 0 : 1);
    setAt(doc, path, v);
    return `${path} = ${v} (beside ${partner} = ${ref})`;
  }
  if (op < 0.78) {
    const path = pick(rng, leaves);
    const v = pick(rng, SPECIAL_VALUES);
    setAt(doc, path, structuredClone(v));
    return `${path} = ${JSON.stringify(v)}`;
  }
  if (op < 0.86) {
    const path = pick(rng, leaves);
    setAt(doc, path, undefined);
    return `${path} removed`;
  }
  if (op < 0.9) {
    const path = pick(rng, ['planet.body', 'discretisation.hold', 'format', 'version', 'planet.siderealPeriod_h']);
    const v = pick(rng, ['custom', 'moon', 'mars', 'venus', 'zoh', 'foh', 'landreach-study', 2, 0, null] as Json[]);
    setAt(doc, path, v);
    return `${path} = ${JSON.stringify(v)}`;
  }
  if (op < 0.94) {
    const parent = pick(rng, ['', 'vehicle', 'planet', 'site', 'ignition', 'constraints', 'discretisation', 'target']);
    const key = pick(rng, ['extra', 'thrust_N', '__proto__', 'constructor', 'Vehicle', 'name']);
    setAt(doc, parent ? `${parent}.${key}` : key, 1);
    return `${parent ? `${parent}.` : ''}${key} = 1 added`;
  }
  const path = pick(rng, leaves);
  const v = pick(rng, ['x'.repeat(100000), 'Ünïcødé name ✓', '\u0000', '\ud800', 'a\nb']);
  setAt(doc, path, v);
  return `${path} = string of ${v.length} characters`;
}

const encoder = new TextEncoder();

const concat = (...parts: Uint8Array[]): Uint8Array => new Uint8Array(Buffer.concat(parts));

/** One byte-level operator on the file's text; returns the bytes and a label. */
function mutateBytes(text: string, rng: Rng): { bytes: Uint8Array; label: string } {
  const op = rng.next();
  if (op < 0.2) return { bytes: concat(Uint8Array.of(0xef, 0xbb, 0xbf), encoder.encode(text)), label: 'UTF-8 byte-order mark' };
  if (op < 0.4) {
    // Invalid UTF-8 inside a name: a lone continuation byte, an overlong form or a truncated sequence.
    const at = text.indexOf('"name": "') >= 0 ? text.indexOf('"name": "') + 9 : text.indexOf('"name":"') + 8;
    const bad = pick(rng, [[0x80], [0xc0, 0xaf], [0xe2, 0x82], [0xff], [0xed, 0xa0, 0x80]]);
    return { bytes: concat(encoder.encode(text.slice(0, at)), Uint8Array.from(bad), encoder.encode(text.slice(at))), label: `invalid UTF-8 [${bad.map((b) => b.toString(16)).join(' ')}] in a name` };
  }
  if (op < 0.55) {
    const depth = pick(rng, [100, 1000, 5000, 20000, 100000]);
    const open = pick(rng, ['[', '{"a":']);
    const close = open === '[' ? ']' : '}';
    const where = pick(rng, ['"description": ', '"name": ', '"ignition": ', '"extra": ']);
    const nested = open.repeat(depth) + close.repeat(depth);
    const replaced = where === '"extra": '
      ? text.replace(/^\{/, `{"extra": ${nested}, `)
      : text.replace(new RegExp(`${where.replace(/[[\]{}]/g, '\\$&')}("[^"]*"|\\{[^}]*\\})`), `${where}${nested}`);
    return { bytes: encoder.encode(replaced), label: `${open} nested ${depth} deep at ${where.trim()}` };
  }
  if (op < 0.7) {
    const n = Math.floor(rng.next() * text.length);
    return { bytes: encoder.encode(text.slice(0, n)), label: `truncated to ${n} characters` };
  }
  if (op < 0.85) {
    const bytes = encoder.encode(text);
    const flips = rng.int(1, 4);
    for (let i = 0; i < flips; i++) bytes[Math.floor(rng.next() * bytes.length)] ^= 1 << rng.int(0, 7);
    return { bytes, label: `${flips} flipped bit(s)` };
  }
  // Numbers JSON.parse reads as ±Infinity or as rounding edge cases.
  const big = pick(rng, ['1e400', '-1e400', '1e-400', '123456789012345678901234567890']);
  const numbers = [...text.matchAll(/-?\d+(\.\d+)?(e-?\d+)?/g)];
  const m = pick(rng, numbers);
  const at = m.index ?? 0;
  return { bytes: encoder.encode(text.slice(0, at) + big + text.slice(at + m[0].length)), label: `a number written as ${big}` };
}

/** Mutation `index` of the run with `seed`: a pure function of (base, seed, index). */
export function studyMutation(base: object, seed: number, index: number): StudyMutation {
  const rng = new Rng((Math.imul(seed, 0x9e3779b1) ^ Math.imul(index + 1, 0x85ebca6b)) >>> 0);
  const doc = structuredClone(base) as Json;
  const labels: string[] = [];
  const count = rng.int(1, 3);
  for (let i = 0; i < count; i++) labels.push(mutateValue(doc, rng));
  const text = JSON.stringify(doc, null, rng.next() < 0.5 ? 2 : 0);
  if (rng.next() < 0.2) {
    const m = mutateBytes(text, rng);
    return { label: [...labels, m.label].join('; '), bytes: m.bytes };
  }
  return { label: labels.join('; '), bytes: encoder.encode(text) };
}
