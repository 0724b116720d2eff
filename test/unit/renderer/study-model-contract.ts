/**
 * What any StudyModel must do for the workspace to work. Run it against every implementation (today
 * the field-table model; tomorrow the one built on core/study's schema) so the swap is safe.
 */
import { describe, expect, it } from 'vitest';
import type { StudyModel } from '../../../renderer/study/study-model.ts';

export function studyModelContract(name: string, make: () => StudyModel): void {
  describe(`StudyModel contract: ${name}`, () => {
    const model = make();

    it('every field belongs to a listed group, and ids are unique', () => {
      const groups = new Set(model.groups.map((g) => g.id));
      expect(new Set(model.fields.map((f) => f.id)).size).toBe(model.fields.length);
      for (const f of model.fields) expect(groups.has(f.group), f.id).toBe(true);
    });

    it('the defaults are valid field by field and raise no cross-field error', () => {
      const raw = model.defaults();
      const values: Record<string, number> = {};
      for (const f of model.fields) {
        const check = model.checkField(f.id, raw[f.id]);
        expect(check.ok, `${f.id}: ${!check.ok && check.message}`).toBe(true);
        if (check.ok) values[f.id] = check.value;
      }
      expect(model.crossIssues(values).filter((i) => i.severity === 'error')).toEqual([]);
    });

    it('an invalid value gets a message naming the field and what to enter', () => {
      for (const f of model.fields) {
        for (const bad of ['', 'abc', String(f.max * 10 + 1)]) {
          const check = model.checkField(f.id, bad);
          expect(check.ok, `${f.id} accepted ${JSON.stringify(bad)}`).toBe(false);
          if (!check.ok) expect(check.message, f.id).toMatch(/Enter /);
        }
      }
    });

    it('cross-field issues name known fields', () => {
      const raw = model.defaults();
      const values = Object.fromEntries(model.fields.map((f) => [f.id, Number(raw[f.id])]));
      // Push every value to its maximum: some rules must fire, and each must point at a real field.
      const extreme = Object.fromEntries(model.fields.map((f) => [f.id, f.max]));
      for (const issue of [...model.crossIssues(values), ...model.crossIssues(extreme)]) {
        expect(model.fields.some((f) => f.id === issue.field), issue.field).toBe(true);
        expect(issue.message.length).toBeGreaterThan(20);
      }
    });

    it('a study document round-trips every value', () => {
      const raw = model.defaults();
      const values = Object.fromEntries(model.fields.map((f) => [f.id, Number(raw[f.id])]));
      const back = model.fromText(JSON.stringify(model.toDocument('Contract study (invented)', values)));
      expect(back.name).toBe('Contract study (invented)');
      for (const f of model.fields) expect(Number(back.raw[f.id]), f.id).toBe(values[f.id]);
    });

    it('text that is not a study is refused with a message', () => {
      for (const text of ['', '{', '[]', '{"format":"something-else"}']) expect(() => model.fromText(text)).toThrow(/./);
    });
  });
}
