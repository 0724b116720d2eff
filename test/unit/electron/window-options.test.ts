import { describe, expect, it } from 'vitest';
import { createWindowOptions } from '../../../electron/window-options.ts';

describe('main window options', () => {
  const options = createWindowOptions('/app/dist-electron/preload.cjs', { packaged: true });
  const web = options.webPreferences!;

  it('isolates the page from Node and Electron (Electron security checklist)', () => {
    expect(web.contextIsolation).toBe(true);
    expect(web.sandbox).toBe(true);
    expect(web.nodeIntegration).toBe(false);
    expect(web.nodeIntegrationInWorker).toBe(false);
    expect(web.nodeIntegrationInSubFrames).toBe(false);
  });

  it('keeps web security on and refuses webviews and insecure content', () => {
    expect(web.webSecurity).toBe(true);
    expect(web.allowRunningInsecureContent).toBe(false);
    expect(web.webviewTag).toBe(false);
    expect(web.experimentalFeatures).toBe(false);
    expect(web.navigateOnDragDrop).toBe(false);
  });

  it('loads the compiled CommonJS preload and rejects anything else', () => {
    expect(web.preload).toBe('/app/dist-electron/preload.cjs');
    expect(() => createWindowOptions('/app/electron/preload.cts', { packaged: true })).toThrow(/invalid preloadPath.*preload\.cjs/);
  });

  it('has no DevTools in a packaged (production) build, and DevTools while developing', () => {
    expect(web.devTools).toBe(false);
    expect(createWindowOptions('/app/dist-electron/preload.cjs', { packaged: false }).webPreferences!.devTools).toBe(true);
  });

  it('starts hidden so the first paint is the finished page', () => {
    expect(options.show).toBe(false);
  });
});
