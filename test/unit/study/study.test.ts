import { describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseStudy, parseStudyText, StudyError, studyJsonSchema, studyToDescent } from '../../../core/study/index.ts';

const root = (p: string) => fileURLToPath(new URL(`../../../${p}`, import.meta.url));
const demoText = readFileSync(root('assets/demo/demo-lander.study.json'), 'utf8');
const demo = JSON.parse(demoText) as Record<string, Record<string, unknown>>;

function problemsOf(input: unknown) {
  try {
    parseStudy(input);
  } catch (err) {
    expect(err).toBeInstanceOf(StudyError);
    return (err as StudyError).problems;
  }
  throw new Error('expected a StudyError');
}

describe('study file', () => {
  it('the committed JSON Schema is the one generated from the zod schema', () => {
    const generated = JSON.stringify(studyJsonSchema(), null, 2) + '\n';
    const path = root('core/study/study.schema.json');
    if (process.env.UPDATE_STUDY_SCHEMA === '1') writeFileSync(path, generated);
    expect(readFileSync(path, 'utf8')).toBe(generated);
  });

  it('the demo study is valid, marked invented, and converts to SI', () => {
    const s = parseStudyText(demoText);
    expect(s.vehicle.invented).toBe(true);
    expect(s.site.invented).toBe(true);
    const d = studyToDescent(s);
    expect(d.setup.vehicle.dryMass).toBe(1600 + 150); // dry mass + reserve (1600 kg and 150 kg in the file)
    expect(d.setup.vehicle.cantAngle).toBeCloseTo((20 * Math.PI) / 180, 15);
    expect(d.setup.constraints.glideSlope).toBeCloseTo((5 * Math.PI) / 180, 15);
    expect(d.ignition.mass).toBe(2100);
    // Mars rotation at 18.4° N: ω = Ω (0, cos λ, sin λ), Ω = 2π / 24.6229 h.
    const omega = (2 * Math.PI) / (24.6229 * 3600);
    expect(d.setup.planet.rotationRate[1]).toBeCloseTo(omega * Math.cos((18.4 * Math.PI) / 180), 12);
  });

  it('fills defaults', () => {
    const { constraints: _c, discretisation: _d, target: _t, ...minimal } = demo;
    const s = parseStudy(minimal);
    expect(s.discretisation).toEqual({ nodes: 50, hold: 'foh' });
    expect(s.constraints.gateHeight_m).toBe(0);
    expect(s.target).toEqual({ x_m: 0, y_m: 0, z_m: 0 });
  });

  it('names the field, the value and the fix for bad values', () => {
    const p = problemsOf({ ...demo, vehicle: { ...demo.vehicle, dryMass_kg: 2500, isp_s: -3 } });
    const byField = Object.fromEntries(p.map((x) => [x.field, x]));
    expect(byField['vehicle.isp_s'].value).toBe('-3');
    expect(byField['vehicle.isp_s'].message).toMatch(/positive/);
    // Cross-field check runs only once the fields parse; fix isp first, then the masses are reported.
    const q = problemsOf({ ...demo, vehicle: { ...demo.vehicle, dryMass_kg: 2500 } });
    expect(q[0].field).toBe('vehicle.dryMass_kg');
    expect(q[0].value).toBe('2500');
    expect(q[0].message).toMatch(/below wetMass_kg/);
  });

  it('reports unknown fields, wrong format and newer versions', () => {
    expect(problemsOf({ ...demo, vehicel: {} })[0]).toMatchObject({ field: 'vehicel', message: expect.stringMatching(/unknown field/) });
    expect(problemsOf({ ...demo, format: 'other' })[0].field).toBe('format');
    expect(problemsOf({ ...demo, version: 7 })[0].message).toMatch(/newer Landreach/);
    expect(() => parseStudyText('{ nope')).toThrow(/JSON/);
  });
});

describe('study cross-field checks', () => {
  it('rejects an ignition mass above the wet mass, naming ignition.mass_kg', () => {
    const p = problemsOf({ ...demo, ignition: { ...demo.ignition, mass_kg: 2500 } });
    expect(p[0]).toMatchObject({ field: 'ignition.mass_kg', value: '2500' });
    expect(p[0].message).toMatch(/at most vehicle.wetMass_kg \(2100\)/);
  });
});
