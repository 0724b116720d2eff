import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import * as fs from 'node:fs/promises';
import * as os from 'node:os';
import * as path from 'node:path';
import { INVOKE_CHANNELS } from '../../../electron/bridge-api.ts';
import { createIpcHandlers, registerIpcHandlers, type DocumentSession, type InvokeHandler } from '../../../electron/ipc.ts';
import { RecentFiles } from '../../../electron/recent-files.ts';
import { RecoveryStore } from '../../../electron/recovery.ts';
import { STUDY_FORMAT, STUDY_VERSION } from '../../../electron/study-envelope.ts';

const APP = 'file:///opt/landreach/dist/index.html';
const trusted = { senderFrame: { url: APP, parent: null } };
const study = (name = 'invented demo') => JSON.stringify({ format: STUDY_FORMAT, version: STUDY_VERSION, name });
const PNG = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 1, 2, 3]);

let dir: string;
let handlers: Record<string, InvokeHandler>;
let session: DocumentSession;
let nextOpen: string | null;
let nextSave: string | null;
let saveDialogNames: string[];
let changes: string[];

beforeEach(async () => {
  dir = await fs.mkdtemp(path.join(os.tmpdir(), 'landreach-ipc-'));
  session = { currentPath: null, dirty: true, title: 't' };
  nextOpen = null;
  nextSave = null;
  saveDialogNames = [];
  changes = [];
  handlers = createIpcHandlers({
    appUrl: APP,
    appVersion: '9.9.9',
    dialogs: {
      chooseOpenPath: async () => nextOpen,
      chooseSavePath: async (name) => {
        saveDialogNames.push(name);
        return nextSave;
      },
    },
    recent: new RecentFiles(path.join(dir, 'settings', 'recent.json')),
    recovery: new RecoveryStore(path.join(dir, 'settings', 'recovery.json')),
    session,
    onChange: (what) => changes.push(what),
  });
});
afterEach(async () => {
  await fs.rm(dir, { recursive: true, force: true });
});

const call = (channel: string, ...args: unknown[]) => handlers[channel](trusted, ...args);

describe('handler table', () => {
  it('registers exactly one handler per bridge channel', () => {
    const registered: string[] = [];
    registerIpcHandlers({ handle: (channel) => registered.push(channel) }, {
      appUrl: APP, appVersion: '1', dialogs: { chooseOpenPath: async () => null, chooseSavePath: async () => null },
      recent: new RecentFiles('/nowhere/r.json'), recovery: new RecoveryStore('/nowhere/x.json'), session,
    });
    expect(registered.sort()).toEqual(Object.values(INVOKE_CHANNELS).sort());
  });

  it.each(Object.values(INVOKE_CHANNELS))('%s refuses foreign, sub-frame and vanished senders', async (channel) => {
    await expect(handlers[channel]({ senderFrame: { url: 'https://example.invalid/', parent: null } })).rejects.toThrow(/not the app page/);
    await expect(handlers[channel]({ senderFrame: { url: APP, parent: {} } })).rejects.toThrow(/sub-frame/);
    await expect(handlers[channel]({ senderFrame: null })).rejects.toThrow(/frame is gone/);
  });
});

describe('open and save', () => {
  it('opens a chosen study, remembers it as current and recent', async () => {
    const file = path.join(dir, 'site.landreach.json');
    await fs.writeFile(file, study());
    nextOpen = file;
    const result = await call(INVOKE_CHANNELS.openStudy);
    expect(result).toEqual({ status: 'opened', path: file, name: 'site.landreach.json', text: study() });
    expect(session.currentPath).toBe(file);
    expect(await call(INVOKE_CHANNELS.listRecent)).toEqual([file]);
    expect(changes).toEqual(['recent']);
  });

  it('reports a corrupt study as an error result, not an exception', async () => {
    const file = path.join(dir, 'broken.landreach.json');
    await fs.writeFile(file, '{');
    nextOpen = file;
    const result = (await call(INVOKE_CHANNELS.openStudy)) as { status: string; message: string };
    expect(result.status).toBe('error');
    expect(result.message).toMatch(/broken\.landreach\.json cannot be read/);
    expect(session.currentPath).toBeNull();
  });

  it('returns cancelled when a dialog is dismissed', async () => {
    expect(await call(INVOKE_CHANNELS.openStudy)).toEqual({ status: 'cancelled' });
    expect(await call(INVOKE_CHANNELS.saveStudyAs, study(), 'x')).toEqual({ status: 'cancelled' });
  });

  it('save without a current file asks for a path, then saves in place', async () => {
    const file = path.join(dir, 'new.landreach.json');
    nextSave = file;
    await fs.mkdir(path.join(dir, 'settings'));
    await call(INVOKE_CHANNELS.writeRecovery, study('unsaved'));
    const first = await call(INVOKE_CHANNELS.saveStudy, study('v1'), 'My study');
    expect(first).toEqual({ status: 'written', path: file, name: 'new.landreach.json' });
    expect(saveDialogNames).toEqual(['My study.landreach.json']);
    expect(session.dirty).toBe(false);
    expect(await call(INVOKE_CHANNELS.readRecovery)).toBeNull();
    nextSave = null;
    await call(INVOKE_CHANNELS.saveStudy, study('v2'), 'My study');
    expect(saveDialogNames).toHaveLength(1);
    expect(JSON.parse(await fs.readFile(file, 'utf8')).name).toBe('v2');
  });

  it('save over a newer-version file is refused with a message and leaves it untouched', async () => {
    const file = path.join(dir, 'future.landreach.json');
    const newer = JSON.stringify({ format: STUDY_FORMAT, version: STUDY_VERSION + 3 });
    await fs.writeFile(file, newer);
    nextSave = file;
    const result = (await call(INVOKE_CHANNELS.saveStudyAs, study(), 'future')) as { status: string; message: string };
    expect(result.status).toBe('error');
    expect(result.message).toMatch(/newer Landreach/);
    expect(await fs.readFile(file, 'utf8')).toBe(newer);
  });

  it('openRecent accepts only paths in the recent list', async () => {
    await fs.writeFile(path.join(dir, 'secret.txt'), 'x');
    await expect(call(INVOKE_CHANNELS.openRecent, path.join(dir, 'secret.txt'))).rejects.toThrow(/not in the recent list/);
    await expect(call(INVOKE_CHANNELS.openRecent, 42)).rejects.toThrow(/invalid recent file path: expected a string/);
  });

  it('validates arguments with messages naming the argument', async () => {
    await expect(call(INVOKE_CHANNELS.saveStudy, 12, 'x')).rejects.toThrow(/invalid study text: expected a string, got number/);
    await expect(call(INVOKE_CHANNELS.saveStudyAs, study(), '../../etc/passwd')).rejects.toThrow(/invalid suggestedName/);
    await expect(call(INVOKE_CHANNELS.setDocumentState, { dirty: 'yes', title: 't' })).rejects.toThrow(/"dirty" must be a boolean/);
  });
});

describe('export', () => {
  it('writes a PNG export atomically with the right extension proposed', async () => {
    const file = path.join(dir, 'figure.png');
    nextSave = file;
    const result = await call(INVOKE_CHANNELS.exportFile, { kind: 'png', suggestedName: 'figure', data: PNG });
    expect(result).toEqual({ status: 'written', path: file, name: 'figure.png' });
    expect(saveDialogNames).toEqual(['figure.png']);
    expect(new Uint8Array(await fs.readFile(file))).toEqual(PNG);
  });

  it('writes through the atomic write: temp file in the folder, flushed, renamed over the chosen file', async () => {
    // Injected file system that records what the handler does; a direct write to the chosen path (or a
    // write through another module) would leave no temp file, sync or rename in the record.
    const calls: string[] = [];
    const real = await import('../../../electron/file-service.ts');
    const traced = {
      ...real.realFileSystem,
      open: (async (file: string, flags?: string, mode?: number) => {
        const handle = await real.realFileSystem.open(file, flags, mode);
        calls.push(`open ${path.basename(file)} ${flags}`);
        const sync = handle.sync.bind(handle);
        handle.sync = async () => {
          calls.push(`sync ${path.basename(file)}`);
          return sync();
        };
        return handle;
      }) as typeof real.realFileSystem.open,
      rename: async (from: Parameters<typeof fs.rename>[0], to: Parameters<typeof fs.rename>[1]) => {
        calls.push(`rename ${path.basename(String(from))} -> ${path.basename(String(to))}`);
        if (String(to).endsWith('fails.csv')) throw new Error('simulated crash before rename');
        return real.realFileSystem.rename(from, to);
      },
    };
    const withTrace = createIpcHandlers({
      appUrl: APP, appVersion: '1', session,
      dialogs: { chooseOpenPath: async () => null, chooseSavePath: async () => nextSave },
      recent: new RecentFiles(path.join(dir, 'settings', 'recent.json')), recovery: new RecoveryStore(path.join(dir, 'settings', 'recovery.json')),
      fs: traced,
    });
    nextSave = path.join(dir, 'table.csv');
    await fs.writeFile(nextSave, 'old table');
    await withTrace[INVOKE_CHANNELS.exportFile](trusted, { kind: 'csv', suggestedName: 'table', data: 'a,b\n1,2\n' });
    expect(await fs.readFile(nextSave, 'utf8')).toBe('a,b\n1,2\n');
    const temp = calls.find((c) => /^open \.table\.csv\..*\.tmp wx$/.test(c));
    expect(temp, calls.join('; ')).toBeDefined();
    const tempName = temp!.split(' ')[1];
    expect(calls.indexOf(`sync ${tempName}`)).toBeGreaterThan(calls.indexOf(temp!));
    expect(calls.indexOf(`rename ${tempName} -> table.csv`)).toBeGreaterThan(calls.indexOf(`sync ${tempName}`));
    expect(calls.some((c) => c.startsWith('open table.csv'))).toBe(false);
    // A crash before the rename leaves the old export whole and no temporary file.
    nextSave = path.join(dir, 'fails.csv');
    await fs.writeFile(nextSave, 'old');
    const result = await withTrace[INVOKE_CHANNELS.exportFile](trusted, { kind: 'csv', suggestedName: 'fails', data: 'new' });
    expect(result).toMatchObject({ status: 'error' });
    expect(await fs.readFile(nextSave, 'utf8')).toBe('old');
    expect((await fs.readdir(dir)).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('rejects unknown kinds, wrong data types and bytes that are not PNG', async () => {
    await expect(call(INVOKE_CHANNELS.exportFile, { kind: 'exe', suggestedName: 'a', data: 'x' })).rejects.toThrow(/invalid export kind: "exe"/);
    await expect(call(INVOKE_CHANNELS.exportFile, { kind: 'csv', suggestedName: 'a', data: PNG })).rejects.toThrow(/csv export data: expected a string/);
    await expect(call(INVOKE_CHANNELS.exportFile, { kind: 'png', suggestedName: 'a', data: new Uint8Array([1, 2, 3]) })).rejects.toThrow(/PNG signature/);
    // A GeoTIFF export must start with the little-endian TIFF header "II", 42 (TIFF 6.0 §2); a PNG is refused.
    await expect(call(INVOKE_CHANNELS.exportFile, { kind: 'tif', suggestedName: 'a', data: PNG })).rejects.toThrow(/TIFF header/);
    await expect(call(INVOKE_CHANNELS.exportFile, { kind: 'tif', suggestedName: 'a', data: 'II*' })).rejects.toThrow(/tif export data: expected bytes/);
    expect(saveDialogNames).toEqual([]);
  });
});

describe('document state and version', () => {
  it('records dirty flag and title and notifies', async () => {
    await call(INVOKE_CHANNELS.setDocumentState, { dirty: true, title: 'Crater rim trade' });
    expect(session).toMatchObject({ dirty: true, title: 'Crater rim trade' });
    expect(changes).toEqual(['document']);
    expect(await call(INVOKE_CHANNELS.appVersion)).toBe('9.9.9');
  });

  it('new study forgets the current file', async () => {
    session.currentPath = '/x/y.landreach.json';
    await call(INVOKE_CHANNELS.newStudy);
    expect(session.currentPath).toBeNull();
  });
});

describe('open an elevation model', () => {
  it('returns the chosen file’s bytes and name, and does not touch the study session', async () => {
    const file = path.join(dir, 'site.tif');
    // Little-endian TIFF header (TIFF 6.0 §2): "II", 42. The content is judged by core/terrain, not here.
    const bytes = new Uint8Array([0x49, 0x49, 42, 0, 8, 0, 0, 0, 9, 9]);
    await fs.writeFile(file, bytes);
    nextOpen = file;
    const result = (await call(INVOKE_CHANNELS.openTerrainFile)) as { status: string; name: string; bytes: Uint8Array };
    expect(result.status).toBe('opened');
    expect(result.name).toBe('site.tif');
    expect([...result.bytes]).toEqual([...bytes]);
    expect(session.currentPath).toBeNull();
  });

  it('cancels, and refuses a page that passes a path', async () => {
    expect(await call(INVOKE_CHANNELS.openTerrainFile)).toEqual({ status: 'cancelled' });
    await expect(call(INVOKE_CHANNELS.openTerrainFile, '/etc/passwd')).rejects.toThrow(/invalid openTerrainFile call: expected no arguments, got 1/);
  });

  it('names the file and the fix for a wrong extension, a folder and a missing file', async () => {
    const text = path.join(dir, 'notes.txt');
    await fs.writeFile(text, 'x');
    nextOpen = text;
    expect(await call(INVOKE_CHANNELS.openTerrainFile)).toEqual({ status: 'error', message: expect.stringMatching(/^notes\.txt is not an elevation model: choose a GeoTIFF/) });
    const folder = path.join(dir, 'dem.tif');
    await fs.mkdir(folder);
    nextOpen = folder;
    expect(await call(INVOKE_CHANNELS.openTerrainFile)).toEqual({ status: 'error', message: 'dem.tif is not a file. Choose an elevation model file.' });
    nextOpen = path.join(dir, 'gone.tiff');
    expect(await call(INVOKE_CHANNELS.openTerrainFile)).toEqual({ status: 'error', message: expect.stringMatching(/^gone\.tiff no longer exists/) });
  });

  it('refuses a file above the size limit with its size and the fix', async () => {
    const { readTerrainFile } = await import('../../../electron/file-service.ts');
    const file = path.join(dir, 'big.tif');
    await fs.writeFile(file, new Uint8Array(3 * 1048576));
    await expect(readTerrainFile(file, undefined, 2 * 1048576)).rejects.toThrow(/big\.tif is 3\.0 MiB, larger than the 2 MiB .*Cut a window/);
  });
});
