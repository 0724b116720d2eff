/** One number style (issue 15 bug 10): true minus signs, no signed zero, one unit style in the input groups. */
import { describe, expect, it } from 'vitest';
import { fixed, MINUS, trimmed } from '../../../renderer/format.ts';
import { TERRAIN_FIELD_LABELS, TERRAIN_FIELD_UNITS } from '../../../renderer/terrain/terrain-settings.ts';
import { FIELDS } from '../../../renderer/study/field-table.ts';

describe('number and unit style', () => {
  it('negative values carry U+2212 MINUS SIGN (ISO 80000-1), never U+002D hyphen-minus', () => {
    expect(MINUS.codePointAt(0)).toBe(0x2212);
    expect(fixed(-302.4, 0)).toBe('\u2212302');
    expect(fixed(-0.5, 2)).toBe('\u22120.50');
    expect(trimmed(-1.25, 3)).toBe('\u22121.25');
    expect(fixed(12.345, 1)).toBe('12.3');
  });

  it('a value that rounds to zero has no sign; a value that is not finite is a dash', () => {
    expect(fixed(-0.04, 1)).toBe('0.0');
    expect(trimmed(-0.0001, 3)).toBe('0');
    expect(fixed(Number.NaN, 1)).toBe('—');
  });

  it('the terrain group names units like the study inputs: in the unit column, degrees as °', () => {
    for (const label of Object.values(TERRAIN_FIELD_LABELS)) expect(label).not.toMatch(/\((m|deg)\)/);
    expect(TERRAIN_FIELD_UNITS.maxSlope_deg).toBe('°');
    const studyUnits = new Set(FIELDS.map((f) => f.unit));
    for (const unit of Object.values(TERRAIN_FIELD_UNITS)) expect(studyUnits.has(unit)).toBe(true);
  });
});
