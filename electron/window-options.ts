import type { BrowserWindowConstructorOptions } from 'electron';

/**
 * Options for the main window. The security-relevant web preferences are fixed here, in one place,
 * and asserted by test/unit/electron/window-options.test.ts. `build.packaged` is Electron's
 * app.isPackaged: a packaged (production) build has no DevTools.
 */
export function createWindowOptions(preloadPath: string, build: { packaged: boolean }): BrowserWindowConstructorOptions {
  if (!preloadPath.endsWith('.cjs')) {
    // Sandboxed preloads must be CommonJS; catching a wrong path here beats a blank window.
    throw new Error(`invalid preloadPath: ${preloadPath} (must be the compiled preload.cjs)`);
  }
  return {
    width: 1440,
    height: 900,
    minWidth: 960,
    minHeight: 600,
    title: 'Landreach',
    show: false,
    backgroundColor: '#101418',
    webPreferences: {
      preload: preloadPath,
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
      experimentalFeatures: false,
      navigateOnDragDrop: false,
      spellcheck: false,
      // DevTools in development only: in a production build they would let anyone at the keyboard run
      // code in the page (and so reach the bridge).
      devTools: !build.packaged,
    },
  };
}
