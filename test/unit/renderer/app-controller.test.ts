import { describe, expect, it } from 'vitest';
import { AppController, suggestedFileName, type Notice } from '../../../renderer/app-controller.ts';
import { Workspace } from '../../../renderer/state/workspace.ts';
import { createLocalStudyModel } from '../../../renderer/study/study-model.ts';
import { createBrowserBridge } from '../../../renderer/bridge.ts';
import type { LandreachBridge, OpenStudyResult, WriteResult } from '../../../electron/bridge-api.ts';

/** A bridge that records calls; results are set per test. */
function fakeBridge(overrides: Partial<LandreachBridge> = {}) {
  const calls: string[] = [];
  let recovery: string | null = null;
  const base = createBrowserBridge();
  const bridge: LandreachBridge = {
    ...base,
    openStudy: async () => ({ status: 'cancelled' }) as OpenStudyResult,
    saveStudy: async (_text, name) => ({ status: 'written', path: `/s/${name}.landreach.json`, name: `${name}.landreach.json` }) as WriteResult,
    saveStudyAs: async () => ({ status: 'cancelled' }) as WriteResult,
    newStudy: async () => void calls.push('newStudy'),
    writeRecovery: async (text) => {
      calls.push('writeRecovery');
      recovery = text;
    },
    readRecovery: async () => (recovery ? { text: recovery, originalPath: null, savedAt: '2026-01-01T00:00:00Z' } : null),
    clearRecovery: async () => {
      calls.push('clearRecovery');
      recovery = null;
    },
    setDocumentState: async () => undefined,
    ...overrides,
  };
  return { bridge, calls };
}

function setup(overrides: Partial<LandreachBridge> = {}, discard = true) {
  const workspace = new Workspace(createLocalStudyModel());
  const notices: Notice[] = [];
  const asked: string[] = [];
  const { bridge, calls } = fakeBridge(overrides);
  const controller = new AppController(workspace, bridge, {
    notify: (n) => notices.push(n),
    confirmDiscard: async (action) => {
      asked.push(action);
      return discard;
    },
  });
  return { workspace, controller, notices, asked, calls };
}

describe('file actions', () => {
  it('saves valid inputs, marks the study clean and drops the recovery copy', async () => {
    const { workspace, controller, notices, calls } = setup();
    workspace.rename('Crater rim — trade A');
    expect(await controller.save()).toBe(true);
    expect(workspace.snapshot()).toMatchObject({ dirty: false, fileName: 'crater-rim-trade-a.landreach.json' });
    expect(calls).toContain('clearRecovery');
    expect(notices.at(-1)).toEqual({ kind: 'info', text: 'Saved crater-rim-trade-a.landreach.json.' });
  });

  it('does not save invalid inputs and says which ones', async () => {
    const { workspace, controller, notices } = setup();
    workspace.edit('vehicle.isp_s', 'x');
    expect(await controller.save()).toBe(false);
    expect(notices[0]).toMatchObject({ kind: 'error', text: expect.stringMatching(/Specific impulse/) });
    expect(workspace.snapshot().dirty).toBe(true);
  });

  it('shows the main process error and keeps the study dirty when a write is refused', async () => {
    const { workspace, controller, notices } = setup({ saveStudy: async () => ({ status: 'error', message: 'Not saved, to protect the existing file: …' }) });
    workspace.edit('vehicle.isp_s', '300');
    expect(await controller.save()).toBe(false);
    expect(notices[0]).toEqual({ kind: 'error', text: 'Not saved, to protect the existing file: …' });
    expect(workspace.snapshot().dirty).toBe(true);
  });

  it('asks before discarding unsaved changes, and keeps them when the answer is no', async () => {
    const { workspace, controller, asked } = setup({}, false);
    workspace.edit('vehicle.isp_s', '300');
    await controller.newStudy();
    expect(asked).toEqual(['start a new study']);
    expect(workspace.draft.raw['vehicle.isp_s']).toBe('300');
  });

  it('opens a file, and reports a bad one without touching the current study', async () => {
    const good = JSON.stringify({ format: 'landreach-study', version: 1, name: 'Opened', vehicle: { isp_s: 310 } });
    const { workspace, controller, notices } = setup({ openStudy: async () => ({ status: 'opened', path: '/a.json', name: 'a.json', text: good }) });
    await controller.open();
    expect(workspace.draft.raw['vehicle.isp_s']).toBe('310');
    expect(notices[0]).toMatchObject({ kind: 'warning', text: expect.stringMatching(/a\.json lacked \d+ inputs .*defaults were filled in/) });

    const bad = setup({ openStudy: async () => ({ status: 'opened', path: '/b.json', name: 'b.json', text: '{"format":"nope"}' }) });
    bad.workspace.edit('vehicle.isp_s', '301');
    await bad.controller.open();
    expect(bad.notices[0].text).toMatch(/b\.json was not opened: This is not a Landreach study.*Your current study is unchanged\./);
    expect(bad.workspace.draft.raw['vehicle.isp_s']).toBe('301');
  });

  it('autosaves only unsaved, changed drafts, and restores them after a crash', async () => {
    const { workspace, controller, calls } = setup();
    expect(await controller.autosave()).toBe(false);
    workspace.edit('vehicle.isp_s', 'not yet valid');
    expect(await controller.autosave()).toBe(true);
    expect(await controller.autosave()).toBe(false);
    expect(calls.filter((c) => c === 'writeRecovery')).toHaveLength(1);
    const copy = await controller.pendingRecovery();
    const fresh = new Workspace(createLocalStudyModel());
    const notices: Notice[] = [];
    await new AppController(fresh, fakeBridge().bridge, { notify: (n) => notices.push(n), confirmDiscard: async () => true }).restore(copy!);
    expect(fresh.draft.raw['vehicle.isp_s']).toBe('not yet valid');
    expect(fresh.snapshot().dirty).toBe(true);
  });
});

describe('document state', () => {
  it('tells the shell only when the title or dirty flag changes', async () => {
    const states: unknown[] = [];
    const { workspace, controller } = setup({ setDocumentState: async (s) => void states.push(s) });
    await controller.syncDocumentState();
    workspace.edit('vehicle.isp_s', '3');
    await controller.syncDocumentState();
    workspace.edit('vehicle.isp_s', '30');
    await controller.syncDocumentState();
    workspace.rename('B');
    await controller.syncDocumentState();
    expect(states).toEqual([{ dirty: false, title: 'Untitled study' }, { dirty: true, title: 'Untitled study' }, { dirty: true, title: 'B' }]);
  });
});

describe('file names from study names', () => {
  it('keeps letters and digits, folds accents, never returns empty', () => {
    expect(suggestedFileName('Crater rim — trade A')).toBe('crater-rim-trade-a');
    expect(suggestedFileName('Étude n°2')).toBe('etude-n-2');
    expect(suggestedFileName('///')).toBe('study');
  });
});
