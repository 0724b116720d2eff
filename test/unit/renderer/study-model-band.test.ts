/** The Vehicle group's throttle fields: the first forbidden band as two fields, further bands kept, the rate limit. */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { createLocalStudyModel } from '../../../renderer/study/study-model.ts';
import { BAND_HIGH_FIELD, BAND_LOW_FIELD } from '../../../renderer/study/field-table.ts';
import { parseStudy } from '../../../core/study/index.ts';

const model = createLocalStudyModel();
const demoText = readFileSync(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url), 'utf8');
const numbers = (raw: Record<string, string>) => Object.fromEntries(Object.entries(raw).filter(([, v]) => /^[-\d.e+]+$/.test(v)).map(([k, v]) => [k, Number(v)]));

describe('throttle band and rate in the Vehicle group', () => {
  it('a version-1 study opens with no band and no rate limit, and saves as a valid version-2 study', () => {
    const opened = model.fromText(demoText);
    expect(opened.missing).toBeUndefined();
    expect(opened.raw[BAND_LOW_FIELD]).toBe('0');
    expect(opened.raw[BAND_HIGH_FIELD]).toBe('0');
    expect(opened.raw['vehicle.throttleRate_perS']).toBe('0');
    const doc = model.toDocument(opened.name, numbers(opened.raw), opened.raw);
    expect((doc as { version: number }).version).toBe(2);
    const study = parseStudy(doc);
    expect(study.vehicle.throttleBands).toEqual([]);
    expect(study.vehicle.throttleRate_perS).toBeNull();
  });

  it('shows the first band in its two fields, keeps the others, and removes the first when both are 0', () => {
    const demo = JSON.parse(demoText);
    const text = JSON.stringify({ ...demo, version: 2, vehicle: { ...demo.vehicle, throttleBands: [[0.4, 0.5], [0.6, 0.7]], throttleRate_perS: 0.5 } });
    const opened = model.fromText(text);
    expect([opened.raw[BAND_LOW_FIELD], opened.raw[BAND_HIGH_FIELD], opened.raw['vehicle.throttleRate_perS']]).toEqual(['0.4', '0.5', '0.5']);
    const values = numbers(opened.raw);
    expect(parseStudy(model.toDocument('x', { ...values, [BAND_LOW_FIELD]: 0.3 }, opened.raw)).vehicle.throttleBands).toEqual([[0.3, 0.5], [0.6, 0.7]]);
    const none = model.toDocument('x', { ...values, [BAND_LOW_FIELD]: 0, [BAND_HIGH_FIELD]: 0, 'vehicle.throttleRate_perS': 0 }, opened.raw);
    const study = parseStudy(none);
    expect(study.vehicle.throttleBands).toEqual([[0.6, 0.7]]);
    expect(study.vehicle.throttleRate_perS).toBeNull();
  });
});
