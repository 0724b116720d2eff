import { describe, expect, it } from 'vitest';
import { applyContentsRules, applySessionRules, isAppOrigin, isAppPage, type GuardedContents, type GuardedSession } from '../../../electron/security.ts';

const APP = 'file:///opt/landreach/resources/app/dist/index.html';

type Listener = (event: { preventDefault(): void; url?: string }, url?: string) => void;

function fakeContents() {
  const listeners = new Map<string, Listener[]>();
  let openHandler: ((d: { url: string }) => { action: string }) | undefined;
  const contents = {
    setWindowOpenHandler(handler: (d: { url: string }) => { action: string }) {
      openHandler = handler;
    },
    on(event: string, listener: Listener) {
      listeners.set(event, [...(listeners.get(event) ?? []), listener]);
      return contents;
    },
  };
  const fire = (event: string, url?: string) => {
    let prevented = false;
    for (const l of listeners.get(event) ?? []) l({ preventDefault: () => (prevented = true), url }, url);
    return prevented;
  };
  return { contents: contents as unknown as GuardedContents, fire, open: (url: string) => openHandler?.({ url }), listeners };
}

describe('window and navigation rules', () => {
  it('denies every new window, whatever the URL', () => {
    const f = fakeContents();
    applyContentsRules(f.contents, APP);
    expect(f.open('https://example.invalid/')).toEqual({ action: 'deny' });
    expect(f.open(APP)).toEqual({ action: 'deny' });
  });

  it('blocks navigation and redirects away from the app page, allows the page itself', () => {
    const f = fakeContents();
    applyContentsRules(f.contents, APP);
    expect(f.fire('will-navigate', 'https://example.invalid/')).toBe(true);
    expect(f.fire('will-navigate', 'file:///etc/passwd')).toBe(true);
    expect(f.fire('will-redirect', 'http://127.0.0.1:9/')).toBe(true);
    expect(f.fire('will-navigate', `${APP}#top`)).toBe(false);
  });

  it('blocks every frame navigation (will-frame-navigate) but the main frame going to the app page', () => {
    const f = fakeContents();
    applyContentsRules(f.contents, APP);
    const frame = (url: string, isMainFrame: boolean) => {
      let prevented = false;
      for (const l of f.listeners.get('will-frame-navigate') ?? []) {
        (l as unknown as (e: { url: string; isMainFrame: boolean; preventDefault(): void }) => void)({ url, isMainFrame, preventDefault: () => (prevented = true) });
      }
      return prevented;
    };
    expect(f.listeners.get('will-frame-navigate')?.length).toBe(1);
    expect(frame('https://example.invalid/', true)).toBe(true);
    expect(frame('https://example.invalid/', false)).toBe(true);
    // The app has no frames (its CSP says frame-src 'none'): a sub-frame navigating anywhere is refused.
    expect(frame(APP, false)).toBe(true);
    expect(frame(`${APP}#top`, true)).toBe(false);
  });

  it('refuses <webview> attachment', () => {
    const f = fakeContents();
    applyContentsRules(f.contents, APP);
    expect(f.fire('will-attach-webview')).toBe(true);
  });
});

describe('permission rules', () => {
  it('denies every permission request and check', () => {
    let request: ((c: unknown, p: string, cb: (g: boolean) => void) => void) | undefined;
    let check: ((c: unknown, p: string) => boolean) | undefined;
    const session: GuardedSession = {
      setPermissionRequestHandler: (h) => (request = h),
      setPermissionCheckHandler: (h) => (check = h),
    };
    applySessionRules(session);
    for (const permission of ['media', 'geolocation', 'notifications', 'clipboard-read', 'openExternal', 'fullscreen']) {
      let granted: boolean | undefined;
      request!(null, permission, (g) => (granted = g));
      expect(granted, permission).toBe(false);
      expect(check!(null, permission), permission).toBe(false);
    }
  });
});

describe('origin helpers', () => {
  it('matches the app page and its folder only', () => {
    expect(isAppPage(APP, APP)).toBe(true);
    expect(isAppPage('file:///opt/landreach/resources/app/dist/other.html', APP)).toBe(false);
    expect(isAppOrigin('file:///opt/landreach/resources/app/dist/index.html?x=1', APP)).toBe(true);
    expect(isAppOrigin('file:///home/user/evil.html', APP)).toBe(false);
    expect(isAppOrigin('http://127.0.0.1:5173/index.html', 'http://127.0.0.1:5173/')).toBe(true);
    expect(isAppOrigin('http://127.0.0.1:5174/index.html', 'http://127.0.0.1:5173/')).toBe(false);
    expect(isAppOrigin('not a url', APP)).toBe(false);
  });
});
