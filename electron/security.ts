/**
 * Security rules applied to every window: deny new windows, block navigation away from the app page (in
 * any frame), refuse every permission, refuse <webview>. Takes Electron objects as parameters
 * (structural types) so it is tested without Electron.
 */

/** The part of Electron's WebContents these rules use. */
export interface GuardedContents {
  setWindowOpenHandler(handler: (details: { url: string }) => { action: 'deny' } | { action: 'allow' }): void;
  on(event: 'will-navigate' | 'will-redirect', listener: (event: { preventDefault(): void; url?: string }, url?: string) => void): unknown;
  on(event: 'will-attach-webview', listener: (event: { preventDefault(): void }) => void): unknown;
  on(event: 'will-frame-navigate', listener: (event: { preventDefault(): void; url: string; isMainFrame: boolean }) => void): unknown;
}

/** The part of Electron's Session these rules use. */
export interface GuardedSession {
  setPermissionRequestHandler(handler: (contents: unknown, permission: string, callback: (granted: boolean) => void) => void): void;
  setPermissionCheckHandler(handler: (contents: unknown, permission: string) => boolean): void;
}

/**
 * True when `url` is the app's own page (same origin and path as `appUrl`; the hash may differ).
 * For file:// pages the origin is "null", so path equality is what counts.
 */
export function isAppPage(url: string, appUrl: string): boolean {
  let a: URL;
  let b: URL;
  try {
    a = new URL(url);
    b = new URL(appUrl);
  } catch {
    return false;
  }
  return a.protocol === b.protocol && a.host === b.host && a.pathname === b.pathname;
}

/**
 * True when `url` is served by the app (same scheme and host as `appUrl`, any path). Used for IPC
 * sender checks, where the frame URL may carry a query or hash.
 */
export function isAppOrigin(url: string, appUrl: string): boolean {
  try {
    const a = new URL(url);
    const b = new URL(appUrl);
    if (a.protocol !== b.protocol || a.host !== b.host) return false;
    // file:// has no host: also require the page to live inside the app's folder.
    if (a.protocol === 'file:') {
      const dir = b.pathname.slice(0, b.pathname.lastIndexOf('/') + 1);
      return a.pathname.startsWith(dir);
    }
    return true;
  } catch {
    return false;
  }
}

export function applyContentsRules(contents: GuardedContents, appUrl: string): void {
  // No new windows at all: links the app shows open nowhere (the app shows none that need a browser).
  contents.setWindowOpenHandler(() => ({ action: 'deny' }));
  const blockForeign = (event: { preventDefault(): void; url?: string }, url?: string) => {
    const target = url ?? event.url ?? '';
    if (!isAppPage(target, appUrl)) event.preventDefault();
  };
  contents.on('will-navigate', blockForeign);
  contents.on('will-redirect', blockForeign);
  // will-navigate covers the main frame only; will-frame-navigate covers every frame. The app has no
  // frames of its own (its policy says frame-src 'none'), so a sub-frame navigating anywhere is refused.
  contents.on('will-frame-navigate', (event) => {
    if (!event.isMainFrame || !isAppPage(event.url, appUrl)) event.preventDefault();
  });
  contents.on('will-attach-webview', (event) => event.preventDefault());
}

export function applySessionRules(session: GuardedSession): void {
  // The app needs no camera, microphone, notifications, geolocation, clipboard-read… Deny all.
  session.setPermissionRequestHandler((_contents, _permission, callback) => callback(false));
  session.setPermissionCheckHandler(() => false);
}
