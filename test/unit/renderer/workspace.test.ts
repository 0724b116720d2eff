import { describe, expect, it } from 'vitest';
import { Workspace } from '../../../renderer/state/workspace.ts';
import { createLocalStudyModel, formatNumber } from '../../../renderer/study/study-model.ts';
import { PRESETS } from '../../../renderer/study/field-table.ts';

const model = createLocalStudyModel();

describe('workspace', () => {
  it('starts clean from the invented defaults', () => {
    const w = new Workspace(model);
    const s = w.snapshot();
    expect(s.dirty).toBe(false);
    expect(s.errorCount).toBe(0);
    expect(s.draft.raw['vehicle.isp_s']).toBe('230');
    expect(s.canUndo).toBe(false);
  });

  it('keeps invalid text as typed, reports it, and one undo restores the value before the burst', () => {
    const w = new Workspace(model);
    w.edit('vehicle.isp_s', '2');
    w.edit('vehicle.isp_s', '2x');
    const s = w.snapshot();
    expect(s.draft.raw['vehicle.isp_s']).toBe('2x');
    expect(s.problems['vehicle.isp_s'].message).toMatch(/“2x” is not a number/);
    expect(s.errorCount).toBe(1);
    expect(s.dirty).toBe(true);
    w.undo();
    expect(w.snapshot().draft.raw['vehicle.isp_s']).toBe('230');
    expect(w.snapshot().dirty).toBe(false);
  });

  it('a field error hides a cross-field message on the same field, which returns when the field is valid', () => {
    const w = new Workspace(model);
    w.edit('vehicle.dryMass_kg', '3000');
    expect(w.snapshot().problems['vehicle.dryMass_kg'].message).toMatch(/must be less than the mass at ignition/);
    w.seal();
    w.edit('vehicle.dryMass_kg', '');
    expect(w.snapshot().problems['vehicle.dryMass_kg'].message).toMatch(/Dry mass is empty/);
    w.undo();
    expect(w.snapshot().problems['vehicle.dryMass_kg'].message).toMatch(/must be less than/);
  });

  it('refuses to produce study text while inputs are invalid, naming them, and keeps the edits', () => {
    const w = new Workspace(model);
    w.edit('vehicle.isp_s', '');
    w.seal();
    w.edit('vehicle.engineCount', '4.5');
    const out = w.studyText();
    expect(out.ok).toBe(false);
    expect(!out.ok && out.message).toBe('Not saved: 2 inputs need fixing first (Specific impulse, Engines). Your edits are kept.');
    expect(w.draft.raw['vehicle.engineCount']).toBe('4.5');
  });

  it('marks saved, opens a file as a new clean history, and restores a draft as unsaved', () => {
    const w = new Workspace(model);
    w.rename('Site B (invented)');
    const text = (w.studyText() as { text: string }).text;
    w.markSaved('site-b.landreach.json');
    expect(w.snapshot()).toMatchObject({ dirty: false, fileName: 'site-b.landreach.json' });

    w.edit('vehicle.isp_s', 'oops');
    const draft = w.draftText();
    const other = new Workspace(model);
    other.restoreDraft(draft);
    expect(other.snapshot()).toMatchObject({ dirty: true, fileName: 'site-b.landreach.json' });
    expect(other.draft.raw['vehicle.isp_s']).toBe('oops');
    expect(other.draft.name).toBe('Site B (invented)');

    other.open(text, 'site-b.landreach.json');
    expect(other.snapshot()).toMatchObject({ dirty: false, canUndo: false });
    expect(other.draft.raw['vehicle.isp_s']).toBe('230');
  });

  it('marks inputs a file lacked until the user touches them or saves', () => {
    const w = new Workspace(model);
    w.open(JSON.stringify({ format: 'landreach-study', version: 1, name: 'x', vehicle: { isp_s: 310 } }), 'x.json');
    const problems = w.snapshot().problems;
    expect(problems['vehicle.isp_s']).toBeUndefined();
    expect(problems['vehicle.wetMass_kg']).toEqual({ severity: 'warning', message: 'Not in the opened file: the default 2100 kg was filled in. Check it, or type the value you mean.' });
    expect(w.snapshot().errorCount).toBe(0);
    w.edit('vehicle.wetMass_kg', '2500');
    expect(w.snapshot().problems['vehicle.wetMass_kg']).toBeUndefined();
    w.markSaved('x.json');
    expect(w.snapshot().warningCount).toBe(0);
    expect(w.fieldName('vehicle.isp_s')).toBe('Vehicle › Specific impulse');
  });

  it('a failed open changes nothing', () => {
    const w = new Workspace(model);
    w.edit('vehicle.isp_s', '300');
    expect(() => w.open('{"format":"landreach-study","version":42}', 'f.json')).toThrow(/newer Landreach/);
    expect(w.draft.raw['vehicle.isp_s']).toBe('300');
    expect(w.snapshot().dirty).toBe(true);
    expect(() => w.restoreDraft('{')).toThrow(/recovery copy is damaged/);
  });

  it('applies every preset as one undoable step, each valid without warnings', () => {
    for (const preset of PRESETS) {
      const w = new Workspace(model);
      w.edit('vehicle.isp_s', '300');
      const raw = model.defaults();
      for (const [id, value] of Object.entries(preset.values)) raw[id] = formatNumber(value);
      w.applyValues(raw);
      expect(w.snapshot().problems, preset.id).toEqual({});
      w.undo();
      expect(w.draft.raw['vehicle.isp_s'], preset.id).toBe('300');
    }
    expect(() => new Workspace(model).applyValues({ 'vehicle.bogus_kg': '1' })).toThrow(/unknown study field/);
  });

  it('notifies subscribers on every change, and not for no-op edits', () => {
    const w = new Workspace(model);
    let calls = 0;
    const off = w.subscribe(() => calls++);
    w.edit('vehicle.isp_s', '230');
    w.edit('vehicle.isp_s', '231');
    w.undo();
    w.undo();
    off();
    w.redo();
    expect(calls).toBe(2);
  });
});
