/**
 * The workspace as one state, without a browser: one undo history over every input group, each undo saying
 * what it changed, and staleness derived from the inputs a result was computed from.
 */
import { describe, expect, it } from 'vitest';
import { Workspace, studyInputsWith } from '../../../renderer/state/workspace.ts';
import { ASK_BEFORE_S, budgetOf, computeBlockedReason, FIRST_GUESS_TARGETS_PER_S, longRunQuestion, measuredRate, footprintKey, inputProblems, inputsKey, isStale, netThrustMaxOf, pickKey, studyRunKey } from '../../../renderer/state/derive.ts';
import { createLocalStudyModel } from '../../../renderer/study/study-model.ts';
import { PRESETS } from '../../../renderer/study/field-table.ts';
import { defaultStudyInputs } from '../../../renderer/studies/study-inputs.ts';

const model = createLocalStudyModel();

describe('one undo history over every input', () => {
  it('undo after a grid edit takes back the grid edit, not an earlier study edit, and says so (issue 15 bug 5)', () => {
    const w = new Workspace(model);
    w.edit('vehicle.throttleMin', '0.3');
    w.seal();
    w.editRun('side', '9');
    w.seal();
    expect(w.undo()).toBe(`Grid › Targets per side 9 → ${w.draft.run.side}`);
    expect(w.draft.raw['vehicle.throttleMin']).toBe('0.3');
    expect(w.undo()).toBe('Vehicle › Minimum throttle 0.3 → 0.25');
    expect(w.redo()).toBe('Vehicle › Minimum throttle 0.25 → 0.3');
  });

  it('covers terrain settings and study inputs too, one step per typing burst', () => {
    const w = new Workspace(model);
    w.editTerrain('maxSlope_deg', '1');
    w.editTerrain('maxSlope_deg', '12');
    w.seal();
    w.editStudyInput('ignition-altitude', 'requiredRadius_m', '9');
    w.editStudyInput('ignition-altitude', 'requiredRadius_m', '900');
    expect(w.undo()).toBe('Ignition-altitude study › Required divert radius 900 → (default)');
    expect(w.draft.studies['ignition-altitude']).toBeUndefined();
    expect(w.undo()).toMatch(/^Terrain › Max slope 12 → \S+ °$/);
    expect(w.snapshot().canUndo).toBe(false);
  });

  it('a preset is one step named by its inputs; a file opened keeps the run inputs', () => {
    const w = new Workspace(model);
    w.editRun('halfWidth_m', '800');
    w.seal();
    w.applyValues(Object.fromEntries(Object.entries(PRESETS[1].values).map(([k, v]) => [k, String(v)])));
    expect(w.undo()).toMatch(/^\d+ inputs \(.+\)$|^Vehicle › /);
    w.newStudy();
    expect(w.draft.run.halfWidth_m).toBe('800');
  });

  it('a study field never typed follows the defaults of the study open now', () => {
    const w = new Workspace(model);
    w.editStudyInput('reserve', 'reserves_kg', '0, 50');
    const defaults = defaultStudyInputs({ vehicle: { wetMass_kg: 1000, dryMass_kg: 500, propellantReserve_kg: 20 } as never, ignition: { position_m: [0, 0, 1500] } as never });
    const inputs = studyInputsWith(defaults, w.draft.studies);
    expect(inputs.reserve.reserves_kg).toBe('0, 50');
    expect(inputs['ignition-altitude'].altitudes_m).toBe(defaults['ignition-altitude'].altitudes_m);
  });
});

describe('staleness derived from the inputs a result was computed from', () => {
  it('a key is the same for the same inputs whatever their key order, and differs when one changes', () => {
    expect(inputsKey({ a: 1, b: { c: 2, d: [1, 2] } })).toBe(inputsKey({ b: { d: [1, 2], c: 2 }, a: 1 }));
    expect(inputsKey({ a: 1 })).not.toBe(inputsKey({ a: 2 }));
  });

  it('a footprint is stale when the study or the grid changes; current again when they come back', () => {
    const result = { inputsKey: footprintKey('S1', { side: 21, halfWidth_m: 3000 }) };
    expect(isStale(result, footprintKey('S1', { side: 21, halfWidth_m: 3000 }))).toBe(false);
    expect(isStale(result, footprintKey('S1', { side: 9, halfWidth_m: 3000 }))).toBe(true);
    expect(isStale(result, footprintKey('S2', { side: 21, halfWidth_m: 3000 }))).toBe(true);
    // Inputs that are not valid are not the ones any result was computed from.
    expect(isStale(result, null)).toBe(true);
    expect(isStale(null, null)).toBe(false);
  });

  it('a pick depends on the study only; a study run on its own inputs and, when it uses one, the grid', () => {
    expect(isStale({ inputsKey: pickKey('S1') }, pickKey('S2'))).toBe(true);
    const run = { inputsKey: studyRunKey('S1', 'ignition-altitude', { requiredRadius_m: null }, null) };
    expect(isStale(run, studyRunKey('S1', 'ignition-altitude', { requiredRadius_m: 900 }, null))).toBe(true);
    expect(isStale(run, studyRunKey('S1', 'ignition-altitude', { requiredRadius_m: null }, null))).toBe(false);
    expect(isStale(run, studyRunKey('S1', 'reserve', { requiredRadius_m: null }, null))).toBe(true);
  });

  it('budget and net thrust follow their definitions (wet − dry − reserve; n · T · cos cant)', () => {
    const vehicle = { wetMass_kg: 1905, dryMass_kg: 1505, propellantReserve_kg: 20, engineCount: 6, thrustPerEngine_N: 3100, cantAngle_deg: 27 };
    expect(budgetOf({ vehicle } as never)).toBe(380);
    // cos 60° = 1/2 exactly (analytic).
    expect(netThrustMaxOf({ vehicle: { ...vehicle, cantAngle_deg: 60 } } as never)).toBeCloseTo(6 * 3100 * 0.5, 9);
  });
});

describe('input problems over every group (issue 15 bug 3)', () => {
  it('a terrain error counts and blocks Compute like a study error', () => {
    const p = inputProblems({ problems: {} }, { ok: true }, { maxSlope_deg: 'Max slope “abc”: …' });
    expect(p).toEqual({ errorCount: 1, first: { group: 'terrain', field: 'maxSlope_deg' } });
    expect(computeBlockedReason(p, false)).toBe('Fix 1 input first (see the status bar)');
  });

  it('counts study, grid and terrain errors together and names the first in panel order', () => {
    const p = inputProblems({ problems: { 'vehicle.isp_s': { severity: 'error' }, x: { severity: 'warning' } } }, { ok: false, field: 'side' }, { maxSlope_deg: '…' });
    expect(p.errorCount).toBe(3);
    expect(p.first).toEqual({ group: 'study', fieldId: 'vehicle.isp_s' });
    expect(computeBlockedReason(inputProblems({ problems: {} }, { ok: true }, {}), true)).toMatch(/study is running/);
    expect(computeBlockedReason(inputProblems({ problems: {} }, { ok: true }, {}), false)).toBeNull();
  });
});

describe('asking before a long run (issue 15 bug 11)', () => {
  it('a 1001 × 1001 grid at the first-guess rate: about 9 h, said before it starts', () => {
    // 1 002 001 targets / 30 per s = 33 400.03 s = 9 h 16 min 40 s (arithmetic).
    const q = longRunQuestion(1001 * 1001, null)!;
    expect(q).toMatch(/^This grid has 1,002,001 targets: about 9 h 16 min at about 30 targets\/s \(a first guess: no run measured yet\)\./);
    // With a measured rate the estimate uses it: 1 002 001 / 100 = 10 020 s = 2 h 47 min.
    expect(longRunQuestion(1001 * 1001, 100)).toMatch(/about 2 h 47 min at the last run’s 100\.0 targets\/s/);
  });

  it('a rate is measured only on a run big enough to amortise the start-up (21 × 21 yes, 7 × 7 no)', () => {
    expect(measuredRate(441, 9)).toBe(49);
    expect(measuredRate(49, 30)).toBeNull();
    expect(measuredRate(441, 0)).toBeNull();
  });

  it('no question for a run expected to be short; the boundary is the threshold itself', () => {
    expect(longRunQuestion(21 * 21, null)).toBeNull();
    expect(longRunQuestion(ASK_BEFORE_S * FIRST_GUESS_TARGETS_PER_S, null)).toBeNull();
    expect(longRunQuestion(ASK_BEFORE_S * FIRST_GUESS_TARGETS_PER_S + 1, null)).not.toBeNull();
  });
});
