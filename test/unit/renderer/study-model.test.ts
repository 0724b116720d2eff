import { describe, expect, it } from 'vitest';
import { createLocalStudyModel, formatNumber, STUDY_FORMAT, STUDY_VERSION } from '../../../renderer/study/study-model.ts';
import * as envelope from '../../../electron/study-envelope.ts';
import { FIELDS, GROUPS } from '../../../renderer/study/field-table.ts';

const model = createLocalStudyModel();
const defaults = () => Object.fromEntries(FIELDS.map((f) => [f.id, f.defaultValue]));

describe('field table', () => {
  it('has one group per trade area, every field in a known group, ids unique, defaults in range', () => {
    expect(GROUPS.map((g) => g.id)).toEqual(['planet', 'vehicle', 'ignition', 'constraints', 'reserve', 'grid', 'terrain']);
    expect(new Set(FIELDS.map((f) => f.id)).size).toBe(FIELDS.length);
    for (const f of FIELDS) {
      expect(GROUPS.some((g) => g.id === f.group), f.id).toBe(true);
      expect(f.id.startsWith(`${f.group}.`), f.id).toBe(true);
      expect(model.checkField(f.id, formatNumber(f.defaultValue)), f.id).toEqual({ ok: true, value: f.defaultValue });
    }
  });

  it('names the unit of every dimensional field in its id (house rule: units in names at boundaries)', () => {
    const suffix: Record<string, string> = { kg: '_kg', s: '_s', N: '_N', m: '_m', 'm/s': '_mps', 'm/s²': '_mps2', '°': '_deg' };
    for (const f of FIELDS.filter((x) => x.unit)) expect(f.id.endsWith(suffix[f.unit]), f.id).toBe(true);
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
    expect(model.checkField('ignition.east_m', '-.5')).toEqual({ ok: true, value: -0.5 });
  });

  it('enforces whole numbers and exclusive minimums', () => {
    expect(model.checkField('grid.directions', '12.5')).toMatchObject({ ok: false, message: expect.stringMatching(/not a whole number\. Enter a whole number from 4 to 720/) });
    expect(model.checkField('vehicle.throttleMax', '0')).toMatchObject({ ok: false, message: expect.stringMatching(/above 0 and up to 1/) });
    expect(model.checkField('vehicle.throttleMin', '0')).toEqual({ ok: true, value: 0 });
  });
});

describe('cross-field rules', () => {
  const issuesFor = (changes: Record<string, number>) => model.crossIssues({ ...defaults(), ...changes });

  it('dry mass must be below the mass at ignition', () => {
    const [issue] = issuesFor({ 'vehicle.dryMass_kg': 2500 });
    expect(issue).toMatchObject({ field: 'vehicle.dryMass_kg', severity: 'error' });
    expect(issue.message).toMatch(/Dry mass 2500 kg must be less than the mass at ignition 2400 kg\. Lower the dry mass or raise/);
  });

  it('the reserve must leave propellant to fly with (on board = 2400 − 1700 = 700 kg)', () => {
    expect(issuesFor({ 'reserve.propellantReserve_kg': 699 })).toEqual([]);
    expect(issuesFor({ 'reserve.propellantReserve_kg': 700 })[0].message).toMatch(/only 700 kg of propellant is on board/);
  });

  it('throttle and flight-time bounds must be ordered', () => {
    expect(issuesFor({ 'vehicle.throttleMin': 0.8 }).map((i) => i.field)).toEqual(['vehicle.throttleMin']);
    expect(issuesFor({ 'constraints.flightTimeMin_s': 200 }).map((i) => i.field)).toEqual(['constraints.flightTimeMin_s']);
  });

  it('limits the grid size and proposes a spacing that fits', () => {
    // 2 × 3000 / 10 + 1 = 601 targets per side → 361 201 > 401² = 160 801.
    const [issue] = issuesFor({ 'grid.spacing_m': 10 });
    expect(issue.message).toMatch(/361,201 targets, more than the 160,801 allowed\. Use a spacing of at least 15 m/);
    // The proposal really fits: 2 × 3000 / 15 + 1 = 401.
    expect(issuesFor({ 'grid.spacing_m': 15 })).toEqual([]);
    expect(issuesFor({ 'grid.spacing_m': 5000 })[0].message).toMatch(/only one target/);
  });

  it('warns (does not block) when thrust cannot hold the vehicle at ignition', () => {
    // Weight 2400 kg × 3.71 m/s² = 8904 N; at 0.8 throttle hover needs 8904 / 0.8 = 11 130 N of maximum thrust.
    expect(issuesFor({ 'vehicle.thrustMax_N': 11200 })).toEqual([]);
    const [issue] = issuesFor({ 'vehicle.thrustMax_N': 11100 });
    expect(issue).toMatchObject({ field: 'vehicle.thrustMax_N', severity: 'warning' });
    expect(issue.message).toMatch(/thrust-to-weight ratio at ignition is 0\.997 \(≤ 1\)/);
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

  it('fills missing inputs with defaults and lists them', () => {
    const doc = model.toDocument('x', defaults()) as Record<string, Record<string, unknown>>;
    delete doc.vehicle.isp_s;
    const back = model.fromText(JSON.stringify(doc));
    expect(back.missing).toEqual(['vehicle.isp_s']);
    expect(back.raw['vehicle.isp_s']).toBe('228');
  });

  it('rejects non-studies and newer versions with a message', () => {
    expect(() => model.fromText('{')).toThrow(/not valid JSON/);
    expect(() => model.fromText('{"format":"x"}')).toThrow(/not a Landreach study/);
    expect(() => model.fromText(JSON.stringify({ format: STUDY_FORMAT, version: 99 }))).toThrow(/version 99 .*newer Landreach/);
  });
});
