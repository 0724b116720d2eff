/**
 * The app page is served from a custom `app://` scheme instead of file://, as Electron's security
 * checklist recommends: the page then has a real origin of its own ('self' in the CSP means exactly
 * the app's files, not the whole file system), and only files inside the built renderer folder can
 * be requested. The resolver is pure and tested; main.ts registers the scheme with Electron.
 */
import type { CustomScheme } from 'electron';
import * as path from 'node:path';

export const APP_SCHEME = 'app';
export const APP_HOST = 'landreach';
/** The page URL the window loads. */
export const APP_URL = `${APP_SCHEME}://${APP_HOST}/index.html`;

/** Privileges the scheme needs: standard (relative URLs, origin), secure context, fetch for modules. */
export const APP_SCHEME_PRIVILEGES: CustomScheme = {
  scheme: APP_SCHEME,
  privileges: { standard: true, secure: true, supportFetchAPI: true, corsEnabled: true },
};

const CONTENT_TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.json': 'application/json',
  '.map': 'application/json',
  '.wasm': 'application/wasm',
  '.woff2': 'font/woff2',
};

/**
 * Map a request URL to a file inside `rootDir`, or null when the request must be refused: another
 * scheme or host, a path that escapes the folder (`..`, encoded or not), or a NUL byte.
 */
export function resolveAppRequest(requestUrl: string, rootDir: string): { file: string; contentType: string } | null {
  let url: URL;
  try {
    url = new URL(requestUrl);
  } catch {
    return null;
  }
  if (url.protocol !== `${APP_SCHEME}:` || url.host !== APP_HOST) return null;
  let pathname: string;
  try {
    pathname = decodeURIComponent(url.pathname);
  } catch {
    return null;
  }
  if (pathname.includes('\0') || pathname.includes('\\')) return null;
  if (pathname === '/' || pathname === '') pathname = '/index.html';
  const root = path.resolve(rootDir);
  const file = path.resolve(root, `.${pathname}`);
  if (file !== root && !file.startsWith(root + path.sep)) return null;
  const contentType = CONTENT_TYPES[path.extname(file).toLowerCase()] ?? 'application/octet-stream';
  return { file, contentType };
}
