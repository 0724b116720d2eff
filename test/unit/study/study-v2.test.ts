/**
 * Study format version 2: optional forbidden throttle bands and throttle-rate limit, and the migration that
 * keeps every version-1 file reading as the same study.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseStudy, StudyError, STUDY_VERSION, studyToDescent } from '../../../core/study/index.ts';
import { allowedThrottleIntervals } from '../../../core/descent/vehicle.ts';

const root = (p: string) => fileURLToPath(new URL(`../../../${p}`, import.meta.url));
const demo = JSON.parse(readFileSync(root('assets/demo/demo-lander.study.json'), 'utf8')) as Record<string, Record<string, unknown>>;
const v2 = (vehicle: Record<string, unknown>) => ({ ...demo, version: 2, vehicle: { ...demo.vehicle, ...vehicle } });

function problemsOf(input: unknown) {
  try {
    parseStudy(input);
  } catch (err) {
    expect(err).toBeInstanceOf(StudyError);
    return (err as StudyError).problems;
  }
  throw new Error('expected a StudyError');
}

describe('study format version 2', () => {
  it('is the version this build writes', () => {
    expect(STUDY_VERSION).toBe(2);
  });

  it('a version-1 file reads as the same study as its version-2 copy, with no band and no rate limit', () => {
    expect(demo.version).toBe(1 as unknown as Record<string, unknown>);
    const a = parseStudy(demo);
    const b = parseStudy({ ...demo, version: 2 });
    expect(a).toEqual(b);
    expect(a.vehicle.throttleBands).toEqual([]);
    expect(a.vehicle.throttleRate_perS).toBeNull();
    // The migration never touches the caller's document.
    expect(demo.version).toBe(1 as unknown as Record<string, unknown>);
    const d = studyToDescent(a);
    expect(d.setup.hold).toBe(a.discretisation.hold);
  });

  it('a version-1 file carrying a version-2 field is refused, naming the field and the fix', () => {
    const p = problemsOf({ ...demo, vehicle: { ...demo.vehicle, throttleBands: [[0.4, 0.6]] } });
    expect(p[0]).toMatchObject({ field: 'vehicle.throttleBands', value: '[[0.4,0.6]]' });
    expect(p[0].message).toMatch(/"version": 2/);
  });

  it('reads bands and a rate limit, and gives the allowed intervals between the bands', () => {
    const s = parseStudy(v2({ throttleMin: 0.2, throttleMax: 0.9, throttleBands: [[0.3, 0.4], [0.5, 0.6]], throttleRate_perS: 0.5 }));
    const d = studyToDescent(s);
    expect(d.setup.vehicle.throttleBands).toEqual([[0.3, 0.4], [0.5, 0.6]]);
    expect(d.setup.vehicle.throttleRate).toBe(0.5);
    // A band needs piecewise-constant thrust (see core/descent/band.ts).
    expect(d.setup.hold).toBe('zoh');
    expect(allowedThrottleIntervals(d.setup.vehicle)).toEqual([[0.2, 0.3], [0.4, 0.5], [0.6, 0.9]]);
  });

  it.each([
    [[[0.6, 0.4]], /lo 0.6 must be below hi 0.4/],
    [[[0.1, 0.5]], /strictly inside \[throttleMin 0.2, throttleMax 0.9\]/],
    [[[0.5, 0.95]], /strictly inside/],
    [[[0.3, 0.5], [0.45, 0.6]], /previous band's hi 0.5/],
    [[[0.5, 0.6], [0.3, 0.4]], /increasing order/],
  ])('refuses the bands %j, naming the band, its value and the fix', (bands, message) => {
    const p = problemsOf(v2({ throttleMin: 0.2, throttleMax: 0.9, throttleBands: bands }));
    expect(p[0].field).toMatch(/^vehicle\.throttleBands\.\d$/);
    expect(p[0].value).toMatch(/^\[/);
    expect(p[0].message).toMatch(message);
  });

  it('refuses a rate limit that is not positive', () => {
    const p = problemsOf(v2({ throttleRate_perS: 0 }));
    expect(p[0]).toMatchObject({ field: 'vehicle.throttleRate_perS', value: '0' });
  });
});
