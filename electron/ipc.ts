/**
 * IPC handlers behind the bridge. Each handler checks its sender, validates its arguments, and then
 * calls the file service. Dialogs, the recent list and the recovery store are parameters, so the
 * whole table is exercised in tests with fakes.
 */
import * as path from 'node:path';
import { EXPORT_KINDS, INVOKE_CHANNELS, TERRAIN_EXTENSIONS, type OpenStudyResult, type OpenTerrainResult, type WriteResult } from './bridge-api.ts';
import { FileServiceError, atomicWriteFile, readStudyFile, readTerrainFile, withExtension, writeStudyFile, type FileSystem } from './file-service.ts';
import { assertTrustedSender, expectDocumentState, expectExportRequest, expectFileName, expectNoArguments, expectText, IpcValidationError, type SenderInfo } from './ipc-validate.ts';
import type { RecentFiles } from './recent-files.ts';
import type { RecoveryStore } from './recovery.ts';

export const STUDY_EXTENSION = 'landreach.json';

export interface FileFilter {
  name: string;
  extensions: string[];
}

/** Native dialogs, resolved to a path or null when cancelled. */
export interface Dialogs {
  chooseOpenPath(filters: FileFilter[]): Promise<string | null>;
  chooseSavePath(defaultName: string, filters: FileFilter[]): Promise<string | null>;
}

/** What the main process remembers about the open document. */
export interface DocumentSession {
  currentPath: string | null;
  dirty: boolean;
  title: string;
}

export interface IpcDependencies {
  appUrl: string;
  appVersion: string;
  dialogs: Dialogs;
  recent: RecentFiles;
  recovery: RecoveryStore;
  session: DocumentSession;
  fs?: FileSystem;
  /** Called after the recent list changed (rebuild the menu) or the document state changed (retitle). */
  onChange?: (what: 'recent' | 'document') => void;
}

export type InvokeHandler = (event: SenderInfo, ...args: unknown[]) => Promise<unknown>;

/** The part of Electron's ipcMain used here. */
export interface IpcRegistrar {
  handle(channel: string, listener: InvokeHandler): void;
}

const STUDY_FILTERS: FileFilter[] = [{ name: 'Landreach study', extensions: ['json'] }];
const TERRAIN_FILTERS: FileFilter[] = [{ name: 'Elevation model (GeoTIFF, 16-bit PNG, JSON grid)', extensions: [...TERRAIN_EXTENSIONS] }];

function errorMessage(error: unknown): string {
  if (error instanceof FileServiceError) return error.message;
  return `The file operation failed: ${(error as Error).message ?? String(error)}`;
}

/** Build the handler table (channel → handler). Exported for tests; `registerIpcHandlers` wires it. */
export function createIpcHandlers(deps: IpcDependencies): Record<string, InvokeHandler> {
  const { dialogs, recent, recovery, session } = deps;
  const fs = deps.fs;

  const guarded =
    (handler: (...args: unknown[]) => Promise<unknown>): InvokeHandler =>
    async (event, ...args) => {
      assertTrustedSender(event, deps.appUrl);
      return handler(...args);
    };

  async function openPath(file: string): Promise<OpenStudyResult> {
    try {
      const text = await readStudyFile(file, fs);
      session.currentPath = path.resolve(file);
      await recent.add(file);
      deps.onChange?.('recent');
      return { status: 'opened', path: session.currentPath, name: path.basename(file), text };
    } catch (error) {
      return { status: 'error', message: errorMessage(error) };
    }
  }

  async function saveTo(file: string, text: string): Promise<WriteResult> {
    try {
      await writeStudyFile(file, text, fs);
      session.currentPath = path.resolve(file);
      session.dirty = false;
      await recent.add(file);
      await recovery.clear();
      deps.onChange?.('recent');
      return { status: 'written', path: session.currentPath, name: path.basename(file) };
    } catch (error) {
      return { status: 'error', message: errorMessage(error) };
    }
  }

  async function saveAs(text: string, suggestedName: string): Promise<WriteResult> {
    const chosen = await dialogs.chooseSavePath(withExtension(suggestedName, STUDY_EXTENSION), STUDY_FILTERS);
    if (!chosen) return { status: 'cancelled' };
    return saveTo(chosen, text);
  }

  return {
    [INVOKE_CHANNELS.openStudy]: guarded(async () => {
      const chosen = await dialogs.chooseOpenPath(STUDY_FILTERS);
      return chosen ? openPath(chosen) : { status: 'cancelled' };
    }),
    [INVOKE_CHANNELS.openRecent]: guarded(async (file) => {
      const wanted = expectText(file, 'recent file path', 4096);
      // Only paths the main process itself put in the list: the page cannot name arbitrary files.
      if (!recent.has(wanted)) throw new IpcValidationError('invalid recent file path: not in the recent list');
      return openPath(wanted);
    }),
    [INVOKE_CHANNELS.saveStudy]: guarded(async (text, suggestedName) => {
      const body = expectText(text, 'study text');
      const name = expectFileName(suggestedName, 'suggestedName');
      return session.currentPath ? saveTo(session.currentPath, body) : saveAs(body, name);
    }),
    [INVOKE_CHANNELS.saveStudyAs]: guarded(async (text, suggestedName) =>
      saveAs(expectText(text, 'study text'), expectFileName(suggestedName, 'suggestedName')),
    ),
    [INVOKE_CHANNELS.newStudy]: guarded(async () => {
      session.currentPath = null;
      session.dirty = false;
      deps.onChange?.('document');
    }),
    [INVOKE_CHANNELS.exportFile]: guarded(async (request) => {
      const { kind, suggestedName, data } = expectExportRequest(request);
      const spec = EXPORT_KINDS[kind];
      const chosen = await dialogs.chooseSavePath(withExtension(suggestedName, spec.extension), [{ name: spec.label, extensions: [spec.extension] }]);
      if (!chosen) return { status: 'cancelled' };
      try {
        await atomicWriteFile(chosen, data, fs);
        return { status: 'written', path: chosen, name: path.basename(chosen) };
      } catch (error) {
        return { status: 'error', message: errorMessage(error) };
      }
    }),
    [INVOKE_CHANNELS.openTerrainFile]: guarded(async (...args): Promise<OpenTerrainResult> => {
      // The page names no path: only a file the user chose in the dialog is read.
      expectNoArguments(args, 'openTerrainFile');
      const chosen = await dialogs.chooseOpenPath(TERRAIN_FILTERS);
      if (!chosen) return { status: 'cancelled' };
      try {
        return { status: 'opened', name: path.basename(chosen), bytes: await readTerrainFile(chosen, fs) };
      } catch (error) {
        return { status: 'error', message: errorMessage(error) };
      }
    }),
    [INVOKE_CHANNELS.listRecent]: guarded(async () => recent.entries()),
    [INVOKE_CHANNELS.writeRecovery]: guarded(async (text) => {
      await recovery.write(expectText(text, 'recovery text'), session.currentPath);
    }),
    [INVOKE_CHANNELS.readRecovery]: guarded(async () => recovery.read()),
    [INVOKE_CHANNELS.clearRecovery]: guarded(async () => recovery.clear()),
    [INVOKE_CHANNELS.setDocumentState]: guarded(async (state) => {
      const { dirty, title } = expectDocumentState(state);
      session.dirty = dirty;
      session.title = title;
      deps.onChange?.('document');
    }),
    [INVOKE_CHANNELS.appVersion]: guarded(async () => deps.appVersion),
  };
}

export function registerIpcHandlers(ipc: IpcRegistrar, deps: IpcDependencies): void {
  for (const [channel, handler] of Object.entries(createIpcHandlers(deps))) ipc.handle(channel, handler);
}
