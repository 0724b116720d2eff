import { describe, expect, it } from 'vitest';
import { BASE_DOCUMENT_KEY, createLocalStudyModel, formatNumber, STUDY_FORMAT, STUDY_VERSION, StudyFormatError } from '../../../renderer/study/study-model.ts';
import { openedStudyText } from '../../../renderer/study/core-study.ts';
import { parseStudy, parseStudyText } from '../../../core/study/index.ts';
import { readFileSync } from 'node:fs';
import * as envelope from '../../../electron/study-envelope.ts';
import { FIELDS, GROUPS } from '../../../renderer/study/field-table.ts';

const model = createLocalStudyModel();
const defaults = () => Object.fromEntries(FIELDS.map((f) => [f.id, f.defaultValue]));

describe('field table', () => {
  it('has one group per trade area, every field in a known group, ids unique, defaults in range', () => {
    expect(GROUPS.map((g) => g.id)).toEqual(['planet', 'vehicle', 'ignition', 'constraints', 'reserve', 'discretisation']);
    expect(new Set(FIELDS.map((f) => f.id)).size).toBe(FIELDS.length);
    for (const f of FIELDS) {
      expect(GROUPS.some((g) => g.id === f.group), f.id).toBe(true);
      expect(model.checkField(f.id, formatNumber(f.defaultValue)), f.id).toEqual({ ok: true, value: f.defaultValue });
    }
  });

  it('names the unit of every dimensional field in its id (house rule: units in names at boundaries)', () => {
    const suffix: Record<string, string> = { kg: '_kg', s: '_s', N: '_N', m: '_m', 'm/s': '_mps', 'm/s²': '_mps2', '°': '_deg', '/s': '_perS' };
    // Vector components (ignition.position_m.2) carry the unit in the vector's name.
    for (const f of FIELDS.filter((x) => x.unit)) expect(f.id.replace(/\.\d$/, '').endsWith(suffix[f.unit]), f.id).toBe(true);
  });

  it('the default invented study has no errors or warnings', () => {
    expect(model.crossIssues(defaults())).toEqual([]);
  });
});

describe('single-field checks name the problem and the fix', () => {
  const isp = 'vehicle.isp_s';
  it.each([
    ['', /Specific impulse is empty\. Enter a value from 50 to 500 s\./],
    ['abc', /“abc” is not a number\. Enter a value from 50 to 500 s/],
    ['0x10', /“0x10” is not a number/],
    ['230 s', /“230 s” is not a number.*no unit/],
    ['20', /20 s is below the allowed range\. Enter a value from 50 to 500 s\./],
    ['1e3', /1e3 s is above the allowed range/],
  ])('%j', (raw, message) => {
    const check = model.checkField(isp, raw);
    expect(check.ok).toBe(false);
    expect(!check.ok && check.message).toMatch(message);
  });

  it('accepts decimal and exponent notation and surrounding spaces', () => {
    expect(model.checkField(isp, ' 2.5e2 ')).toEqual({ ok: true, value: 250 });
    expect(model.checkField('ignition.position_m.0', '-.5')).toEqual({ ok: true, value: -0.5 });
  });

  it('enforces whole numbers and exclusive minimums', () => {
    expect(model.checkField('vehicle.engineCount', '2.5')).toMatchObject({ ok: false, message: expect.stringMatching(/not a whole number\. Enter a whole number from 1 to 64/) });
    expect(model.checkField('vehicle.cantAngle_deg', '80')).toMatchObject({ ok: false, message: expect.stringMatching(/from 0 and below 80 °/) });
    expect(model.checkField('constraints.maxSpeed_mps', '0')).toEqual({ ok: true, value: 0 });
    expect(model.checkField('vehicle.throttleMax', '0')).toMatchObject({ ok: false, message: expect.stringMatching(/above 0 and up to 1/) });
    expect(model.checkField('vehicle.throttleMin', '0')).toEqual({ ok: true, value: 0 });
  });
});

describe('cross-field rules', () => {
  const issuesFor = (changes: Record<string, number>) => model.crossIssues({ ...defaults(), ...changes });

  it('dry mass must be below the mass at ignition', () => {
    const [issue] = issuesFor({ 'vehicle.dryMass_kg': 2500 });
    expect(issue).toMatchObject({ field: 'vehicle.dryMass_kg', severity: 'error' });
    expect(issue.message).toMatch(/Dry mass 2500 kg must be less than the mass at ignition 2100 kg\. Lower the dry mass or raise/);
  });

  it('the reserve must leave propellant to fly with (on board = 2100 − 1600 = 500 kg)', () => {
    expect(issuesFor({ 'vehicle.propellantReserve_kg': 499 })).toEqual([]);
    expect(issuesFor({ 'vehicle.propellantReserve_kg': 500 })[0].message).toMatch(/only 500 kg of propellant is on board/);
  });

  it('throttle bounds must be ordered', () => {
    expect(issuesFor({ 'vehicle.throttleMin': 0.85 }).map((i) => i.field)).toEqual(['vehicle.throttleMin']);
  });

  it('warns (does not block) when the net thrust cannot hold the vehicle at ignition', () => {
    // One upright engine (cant 0): weight 2100 kg × 3.71 m/s² = 7791 N; at 0.85 throttle hover needs
    // 7791 / 0.85 = 9165.9 N of maximum thrust.
    const single = { 'vehicle.engineCount': 1, 'vehicle.cantAngle_deg': 0 };
    expect(issuesFor({ ...single, 'vehicle.thrustPerEngine_N': 9200 })).toEqual([]);
    const [issue] = issuesFor({ ...single, 'vehicle.thrustPerEngine_N': 9100 });
    expect(issue).toMatchObject({ field: 'vehicle.thrustPerEngine_N', severity: 'warning' });
    // 9100 × 0.85 / 7791 = 0.99281…
    expect(issue.message).toMatch(/thrust-to-weight ratio at ignition is 0\.993 \(≤ 1\)/);
    // Cant counts: six engines canted 60° give half the axial thrust (cos 60° = 0.5).
    const canted = issuesFor({ 'vehicle.engineCount': 2, 'vehicle.cantAngle_deg': 60, 'vehicle.thrustPerEngine_N': 9100 });
    expect(canted[0].message).toMatch(/is 0\.993 /);
  });
});

describe('study documents', () => {
  it('uses the same envelope as the main process', () => {
    expect(STUDY_FORMAT).toBe(envelope.STUDY_FORMAT);
    expect(STUDY_VERSION).toBe(envelope.STUDY_VERSION);
  });

  it('round-trips values through a document the main process accepts', () => {
    const values = { ...defaults(), 'vehicle.isp_s': 301.5 };
    const text = JSON.stringify(model.toDocument('Rim trade (invented)', values));
    expect(envelope.checkEnvelope(text)).toEqual({ kind: 'study', version: STUDY_VERSION });
    const back = model.fromText(text);
    expect(back.name).toBe('Rim trade (invented)');
    expect(back.raw['vehicle.isp_s']).toBe('301.5');
    expect(back.missing).toBeUndefined();
    expect(JSON.parse(text).vehicle.isp_s).toBe(301.5);
  });

  it('opens a study with a byte-order mark, and names deep nesting instead of overflowing the stack', () => {
    const text = JSON.stringify(model.toDocument('Rim trade (invented)', defaults()));
    expect(model.fromText(`\uFEFF${text}`).name).toBe('Rim trade (invented)');
    const deep = text.replace(/^\{/, `{"notes": ${'['.repeat(50_000)}${']'.repeat(50_000)}, `);
    expect(() => model.fromText(deep)).toThrow(StudyFormatError);
    expect(() => model.fromText(deep)).toThrow(/notes.*nested more than 32 levels/);
  });

  it('the browser fallback decodes file bytes as the CLI does: byte-order mark dropped, invalid UTF-8 refused', () => {
    const text = JSON.stringify(model.toDocument('Rim trade (invented)', defaults()));
    const bom = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(text)]);
    expect(openedStudyText('rim.json', bom)).toEqual({ status: 'opened', path: 'rim.json', name: 'rim.json', text });
    const bad = new Uint8Array([...new TextEncoder().encode('{"name": "'), 0xff, ...new TextEncoder().encode('"}')]);
    expect(openedStudyText('rim.json', bad)).toEqual({ status: 'error', message: 'rim.json: byte 10 (line 1) is not valid UTF-8 text; save the file as UTF-8 (any text editor can) and check the names near that line.' });
  });

  it('fills missing inputs with defaults and lists them', () => {
    const doc = model.toDocument('x', defaults()) as Record<string, Record<string, unknown>>;
    delete doc.vehicle.isp_s;
    const back = model.fromText(JSON.stringify(doc));
    expect(back.missing).toEqual(['vehicle.isp_s']);
    expect(back.raw['vehicle.isp_s']).toBe('230');
  });

  it('opens the invented demo study file with every value, and saves it back unchanged', () => {
    const text = readFileSync(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url), 'utf8');
    const opened = model.fromText(text);
    expect(opened.missing).toBeUndefined();
    // The field table's defaults are the demo study's values.
    for (const f of FIELDS) expect(Number(opened.raw[f.id]), f.id).toBe(f.defaultValue);
    const values = Object.fromEntries(FIELDS.map((f) => [f.id, Number(opened.raw[f.id])]));
    const saved = model.toDocument(opened.name, values, opened.raw);
    // Through core/study's schema both are the same study; the only difference is that the saved file
    // spells out the Mars preset's surface gravity (3.71 m/s², core/descent/planet.ts).
    const original = parseStudyText(text);
    expect(parseStudy(saved)).toEqual({ ...original, planet: { ...original.planet, gravity_mps2: 3.71 } });
  });

  it('writes null for "0 = none" limits and reads null back as 0', () => {
    const values = { ...defaults(), 'constraints.glideSlope_deg': 0, 'constraints.maxSpeed_mps': 0 };
    const doc = model.toDocument('x', values) as { constraints: Record<string, unknown> };
    expect(doc.constraints).toMatchObject({ glideSlope_deg: null, maxSpeed_mps: null });
    expect(parseStudy(doc).constraints).toMatchObject({ glideSlope_deg: null, maxSpeed_mps: null });
    const back = model.fromText(JSON.stringify(doc));
    expect(back.raw['constraints.glideSlope_deg']).toBe('0');
    expect(back.missing).toBeUndefined();
  });

  it('keeps the non-numeric parts of an opened study (names, body, hold) through a save', () => {
    const doc = model.toDocument('x', defaults()) as Record<string, Record<string, unknown>>;
    doc.vehicle.name = 'Other lander (invented)';
    doc.planet = { body: 'moon', siderealPeriod_h: null };
    doc.discretisation.hold = 'zoh';
    const opened = model.fromText(JSON.stringify(doc));
    expect(JSON.parse(opened.raw[BASE_DOCUMENT_KEY])).toMatchObject({ vehicle: { name: 'Other lander (invented)' }, planet: { body: 'moon' } });
    const values = Object.fromEntries(FIELDS.map((f) => [f.id, Number(opened.raw[f.id])]));
    const study = parseStudy(model.toDocument('x', values, opened.raw));
    expect(study.vehicle.name).toBe('Other lander (invented)');
    // A file without gravity_mps2 gets the body preset's, here the Moon's 1.62 m/s² (core/descent/planet.ts).
    expect(study.planet).toEqual({ body: 'moon', siderealPeriod_h: null, gravity_mps2: 1.62 });
    expect(study.discretisation.hold).toBe('zoh');
  });

  it('a new study from the defaults is a valid core study', () => {
    expect(() => parseStudy(model.toDocument('New (invented)', defaults(), model.defaults()))).not.toThrow();
  });

  it('rejects non-studies and newer versions with a message', () => {
    expect(() => model.fromText('{')).toThrow(/not valid JSON/);
    expect(() => model.fromText('{"format":"x"}')).toThrow(/not a Landreach study/);
    expect(() => model.fromText(JSON.stringify({ format: STUDY_FORMAT, version: 99 }))).toThrow(/version 99 .*newer Landreach/);
  });
});
