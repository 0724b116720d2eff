/**
 * Main-process entry: wires Electron to the small modules beside it. This is the only file that
 * imports 'electron' at run time (besides the preload); everything it calls is tested without it.
 */
import { app, BrowserWindow, dialog, ipcMain, Menu, protocol, session as electronSession, type WebContents } from 'electron';
import * as path from 'node:path';
import { MENU_CHANNEL, type MenuCommand, type MenuCommandDetail } from './bridge-api.ts';
import { registerIpcHandlers, type Dialogs, type DocumentSession } from './ipc.ts';
import { buildMenuTemplate } from './menu.ts';
import { RecentFiles } from './recent-files.ts';
import { RecoveryStore } from './recovery.ts';
import { applyContentsRules, applySessionRules, type GuardedContents } from './security.ts';
import { createWindowOptions } from './window-options.ts';
import { closeDecision } from './close-guard.ts';
import { APP_SCHEME, APP_SCHEME_PRIVILEGES, APP_URL, createAppRequestHandler } from './app-protocol.ts';

const here = import.meta.dirname;
const rendererDir = path.join(here, '..', 'dist');
const devUrl = !app.isPackaged ? process.env.LANDREACH_DEV_URL : undefined;
const appUrl = devUrl ?? APP_URL;

// Must happen before the app is ready.
protocol.registerSchemesAsPrivileged([APP_SCHEME_PRIVILEGES]);

/** Serve app:// from the built renderer folder only, every response with its policy header (app-protocol.ts). */
const serveAppRequest = createAppRequestHandler(rendererDir);

const documentSession: DocumentSession = { currentPath: null, dirty: false, title: 'Untitled study' };
let mainWindow: BrowserWindow | null = null;

function send(command: MenuCommand, detail: MenuCommandDetail = {}): void {
  mainWindow?.webContents.send(MENU_CHANNEL, command, detail);
}

function retitle(): void {
  if (!mainWindow) return;
  mainWindow.setTitle(`${documentSession.dirty ? '• ' : ''}${documentSession.title} — Landreach`);
  mainWindow.setDocumentEdited(documentSession.dirty);
}

function rebuildMenu(recent: RecentFiles): void {
  const template = buildMenuTemplate({
    platform: process.platform,
    appName: app.getName(),
    recent: recent.entries(),
    developerMode: !app.isPackaged,
    send,
    // The renderer owns the unsaved-changes question, so it is asked to open; it calls openRecent.
    openRecent: (file) => send('open-recent', { path: file }),
    clearRecent: () => {
      void recent.clear().then(() => rebuildMenu(recent));
    },
  });
  Menu.setApplicationMenu(Menu.buildFromTemplate(template));
}

function createDialogs(): Dialogs {
  return {
    async chooseOpenPath(filters) {
      const options = { properties: ['openFile' as const], filters };
      const result = mainWindow ? await dialog.showOpenDialog(mainWindow, options) : await dialog.showOpenDialog(options);
      return result.canceled || result.filePaths.length === 0 ? null : result.filePaths[0];
    },
    async chooseSavePath(defaultName, filters) {
      const options = { defaultPath: defaultName, filters };
      const result = mainWindow ? await dialog.showSaveDialog(mainWindow, options) : await dialog.showSaveDialog(options);
      return result.canceled || !result.filePath ? null : result.filePath;
    },
  };
}

async function start(): Promise<void> {
  const userData = app.getPath('userData');
  const recent = new RecentFiles(path.join(userData, 'recent-studies.json'));
  const recovery = new RecoveryStore(path.join(userData, 'recovery', 'unsaved-study.json'));
  await recent.load();

  protocol.handle(APP_SCHEME, serveAppRequest);
  applySessionRules(electronSession.defaultSession);
  registerIpcHandlers(ipcMain, {
    appUrl,
    appVersion: app.getVersion(),
    dialogs: createDialogs(),
    recent,
    recovery,
    session: documentSession,
    onChange: (what) => (what === 'recent' ? rebuildMenu(recent) : retitle()),
  });

  mainWindow = new BrowserWindow(createWindowOptions(path.join(here, 'preload.cjs'), { packaged: app.isPackaged }));
  mainWindow.once('ready-to-show', () => mainWindow?.show());
  mainWindow.on('close', (event) => {
    const choice = documentSession.dirty
      ? dialog.showMessageBoxSync(mainWindow!, {
          type: 'warning',
          buttons: ['Keep Working', 'Close and Discard Changes'],
          defaultId: 0,
          cancelId: 0,
          message: `“${documentSession.title}” has unsaved changes.`,
          detail: 'Closing now discards the changes since the last save.',
        })
      : null;
    const decision = closeDecision(documentSession.dirty, choice);
    if (decision === 'stay') event.preventDefault();
    else if (decision === 'discard') void recovery.clear();
  });
  mainWindow.on('closed', () => {
    mainWindow = null;
  });
  rebuildMenu(recent);
  retitle();
  await mainWindow.loadURL(appUrl);
}

// Every web contents (the window, and anything it might try to create) gets the same rules.
app.on('web-contents-created', (_event, contents: WebContents) => {
  applyContentsRules(contents as unknown as GuardedContents, appUrl);
});

if (!app.requestSingleInstanceLock()) {
  app.quit();
} else {
  app.on('second-instance', () => {
    if (mainWindow?.isMinimized()) mainWindow.restore();
    mainWindow?.focus();
  });
  app.on('window-all-closed', () => app.quit());
  app
    .whenReady()
    .then(start)
    .catch((error: unknown) => {
      dialog.showErrorBox('Landreach could not start', String(error));
      app.quit();
    });
}
