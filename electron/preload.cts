/**
 * Preload: exposes ONE object, `window.landreach`, of named methods (see bridge-api.ts).
 *
 * Sandboxed preloads may only require 'electron' (and a few Node built-ins), not our own modules,
 * so the channel table is repeated here; test/unit/electron/preload.test.ts runs this file against
 * a fake Electron and checks every method maps to the channel main registers.
 */
import type { IpcRendererEvent } from 'electron';
// A sandboxed preload is CommonJS and must load Electron with require.
// eslint-disable-next-line @typescript-eslint/no-require-imports
import electron = require('electron');
import type { LandreachBridge, MenuCommand, MenuCommandDetail } from './bridge-api.ts';

const { contextBridge, ipcRenderer } = electron;

const invoke = (channel: string) => (...args: unknown[]) => ipcRenderer.invoke(channel, ...args);

const bridge: LandreachBridge = {
  openStudy: invoke('study:open') as LandreachBridge['openStudy'],
  openRecent: invoke('study:open-recent') as LandreachBridge['openRecent'],
  saveStudy: invoke('study:save') as LandreachBridge['saveStudy'],
  saveStudyAs: invoke('study:save-as') as LandreachBridge['saveStudyAs'],
  newStudy: invoke('study:new') as LandreachBridge['newStudy'],
  exportFile: invoke('export:write') as LandreachBridge['exportFile'],
  openTerrainFile: invoke('terrain:open') as LandreachBridge['openTerrainFile'],
  listRecent: invoke('recent:list') as LandreachBridge['listRecent'],
  writeRecovery: invoke('recovery:write') as LandreachBridge['writeRecovery'],
  readRecovery: invoke('recovery:read') as LandreachBridge['readRecovery'],
  clearRecovery: invoke('recovery:clear') as LandreachBridge['clearRecovery'],
  setDocumentState: invoke('document:state') as LandreachBridge['setDocumentState'],
  appVersion: invoke('app:version') as LandreachBridge['appVersion'],
  onMenuCommand(listener: (command: MenuCommand, detail: MenuCommandDetail) => void): () => void {
    // Wrap so the page never receives the IpcRendererEvent (it carries the sender object).
    const wrapped = (_event: IpcRendererEvent, command: MenuCommand, detail?: MenuCommandDetail) =>
      listener(command, { ...(typeof detail?.path === 'string' ? { path: detail.path } : {}) });
    ipcRenderer.on('menu:command', wrapped);
    return () => {
      ipcRenderer.removeListener('menu:command', wrapped);
    };
  },
};

contextBridge.exposeInMainWorld('landreach', Object.freeze(bridge));
