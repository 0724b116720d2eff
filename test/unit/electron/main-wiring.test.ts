import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { createRequire } from 'node:module';
import { INVOKE_CHANNELS } from '../../../electron/bridge-api.ts';

/**
 * main.ts wired against a stand-in for Electron: vi.mock with a factory replaces the module, so the
 * real 'electron' package (whose first load fetches a binary) is never loaded. This checks the glue:
 * that the window really gets the secure options, every contents the rules, the session the deny-all
 * handlers, that every bridge channel is registered and that the close guard holds a dirty window.
 */
const fake = vi.hoisted(() => {
  type Listener = (...args: unknown[]) => unknown;
  const appListeners = new Map<string, Listener>();
  const state = {
    userData: '',
    windows: [] as { options: Record<string, unknown>; listeners: Map<string, Listener>; loaded: string[]; titles: string[] }[],
    handlers: new Map<string, Listener>(),
    permissionRequest: null as null | Listener,
    privileged: [] as unknown[],
    protocolHandlers: new Map<string, Listener>(),
    permissionCheck: null as null | Listener,
    menus: 0,
    messageBoxAnswer: 0,
    appListeners,
    ready: Promise.resolve(),
  };
  class BrowserWindow {
    private record;
    webContents = { send: () => undefined };
    constructor(options: Record<string, unknown>) {
      this.record = { options, listeners: new Map<string, Listener>(), loaded: [] as string[], titles: [] as string[] };
      state.windows.push(this.record);
    }
    once(event: string, l: Listener) {
      this.record.listeners.set(event, l);
    }
    on(event: string, l: Listener) {
      this.record.listeners.set(event, l);
    }
    async loadURL(url: string) {
      this.record.loaded.push(url);
    }
    setTitle(t: string) {
      this.record.titles.push(t);
    }
    setDocumentEdited() {}
    show() {}
    isMinimized() {
      return false;
    }
    focus() {}
  }
  const electron = {
    app: {
      isPackaged: false,
      getName: () => 'Landreach',
      getVersion: () => '0.0.0-test',
      getPath: () => state.userData,
      on: (event: string, l: Listener) => appListeners.set(event, l),
      whenReady: () => state.ready,
      requestSingleInstanceLock: () => true,
      quit: () => undefined,
    },
    BrowserWindow,
    dialog: {
      showMessageBoxSync: () => state.messageBoxAnswer,
      showOpenDialog: async () => ({ canceled: true, filePaths: [] }),
      showSaveDialog: async () => ({ canceled: true }),
      showErrorBox: () => undefined,
    },
    ipcMain: { handle: (channel: string, l: Listener) => state.handlers.set(channel, l) },
    protocol: {
      registerSchemesAsPrivileged: (schemes: unknown[]) => state.privileged.push(...schemes),
      handle: (scheme: string, l: Listener) => state.protocolHandlers.set(scheme, l),
    },
    Menu: { buildFromTemplate: (t: unknown) => t, setApplicationMenu: () => void state.menus++ },
    session: {
      defaultSession: {
        setPermissionRequestHandler: (h: Listener) => (state.permissionRequest = h),
        setPermissionCheckHandler: (h: Listener) => (state.permissionCheck = h),
      },
    },
  };
  return { state, electron };
});

vi.mock('electron', () => ({ ...fake.electron, default: fake.electron }));

beforeAll(async () => {
  fake.state.userData = fs.mkdtempSync(path.join(os.tmpdir(), 'landreach-main-'));
  delete process.env.LANDREACH_DEV_URL;
  await import('../../../electron/main.ts');
  // start() runs after whenReady; let its awaits settle.
  await vi.waitFor(() => expect(fake.state.windows[0]?.loaded.length).toBe(1));
});
afterAll(() => fs.rmSync(fake.state.userData, { recursive: true, force: true }));

describe('main process wiring', () => {
  it('never loaded the real electron package', () => {
    const cache = createRequire(import.meta.url).cache;
    expect(Object.keys(cache).filter((k) => k.includes(`${path.sep}node_modules${path.sep}electron${path.sep}`))).toEqual([]);
  });

  it('opens one window with the secure web preferences and the compiled preload', () => {
    expect(fake.state.windows).toHaveLength(1);
    const web = fake.state.windows[0].options.webPreferences as Record<string, unknown>;
    expect(web).toMatchObject({ contextIsolation: true, sandbox: true, nodeIntegration: false, webSecurity: true });
    // The stand-in app is not packaged (development): DevTools follow app.isPackaged.
    expect(web.devTools).toBe(!fake.electron.app.isPackaged);
    expect(String(web.preload)).toMatch(/preload\.cjs$/);
  });

  it('loads the page from the privileged app:// scheme, served only from the renderer folder', async () => {
    expect(fake.state.windows[0].loaded[0]).toBe('app://landreach/index.html');
    expect(fake.state.privileged).toEqual([{ scheme: 'app', privileges: expect.objectContaining({ standard: true, secure: true }) }]);
    const serve = fake.state.protocolHandlers.get('app')! as (r: Request) => Promise<Response>;
    expect((await serve(new Request('app://landreach/%2e%2e%2f%2e%2e%2fpackage.json'))).status).toBe(404);
    expect((await serve(new Request('app://landreach/no-such-file.js'))).status).toBe(404);
  });

  it('applies the navigation and window rules to every web contents created', () => {
    const created = fake.state.appListeners.get('web-contents-created')!;
    let openHandler: ((d: { url: string }) => unknown) | undefined;
    const events: string[] = [];
    created({}, { setWindowOpenHandler: (h: typeof openHandler) => (openHandler = h), on: (e: string) => events.push(e) });
    expect(openHandler!({ url: 'https://example.invalid/' })).toEqual({ action: 'deny' });
    expect(events).toEqual(expect.arrayContaining(['will-navigate', 'will-frame-navigate', 'will-redirect', 'will-attach-webview']));
  });

  it('denies every permission on the default session', () => {
    let granted: boolean | undefined;
    fake.state.permissionRequest!(null, 'media', (g: boolean) => (granted = g));
    expect(granted).toBe(false);
    expect(fake.state.permissionCheck!(null, 'geolocation')).toBe(false);
  });

  it('registers exactly the bridge channels', () => {
    expect([...fake.state.handlers.keys()].sort()).toEqual(Object.values(INVOKE_CHANNELS).sort());
  });

  it('keeps a window with unsaved changes open unless discard is chosen', async () => {
    const appUrl = fake.state.windows[0].loaded[0];
    const trusted = { senderFrame: { url: appUrl, parent: null } };
    await fake.state.handlers.get(INVOKE_CHANNELS.setDocumentState)!(trusted, { dirty: true, title: 'Rim (invented)' });
    expect(fake.state.windows[0].titles.at(-1)).toBe('• Rim (invented) — Landreach');
    const close = fake.state.windows[0].listeners.get('close')!;
    let prevented = false;
    fake.state.messageBoxAnswer = 0;
    close({ preventDefault: () => (prevented = true) });
    expect(prevented).toBe(true);
    prevented = false;
    fake.state.messageBoxAnswer = 1;
    close({ preventDefault: () => (prevented = true) });
    expect(prevented).toBe(false);
  });
});
