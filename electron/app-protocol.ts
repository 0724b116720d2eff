/**
 * The app page is served from a custom `app://` scheme instead of file://, as Electron's security
 * checklist recommends: the page then has a real origin of its own ('self' in the CSP means exactly
 * the app's files, not the whole file system), and only files inside the built renderer folder can
 * be requested. The resolver is pure and tested; main.ts registers the scheme with Electron.
 */
import type { CustomScheme } from 'electron';
import { readFile } from 'node:fs/promises';
import * as path from 'node:path';
import { APP_PAGE_CSP, APP_WORKER_CSP } from './content-policy.ts';

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

export interface AppResponse {
  file: string;
  contentType: string;
  /** Response headers: content type, the content security policy, no MIME sniffing. */
  headers: Record<string, string>;
}

/**
 * The policy header of a response. A document's policy is the page's (the same as its <meta>, so the
 * two agree); a script's matters only when it starts a worker, which inherits no <meta> policy and
 * gets the worker policy (the page's plus WebAssembly compilation for the solver's kernels).
 */
function policyFor(contentType: string): string {
  return contentType.startsWith('text/javascript') ? APP_WORKER_CSP : APP_PAGE_CSP;
}

/**
 * Map a request URL to a file inside `rootDir`, or null when the request must be refused: another
 * scheme or host, a path that escapes the folder (`..`, encoded or not), or a NUL byte.
 */
export function resolveAppRequest(requestUrl: string, rootDir: string): AppResponse | null {
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
  return {
    file,
    contentType,
    headers: { 'content-type': contentType, 'content-security-policy': policyFor(contentType), 'x-content-type-options': 'nosniff' },
  };
}

/** The app:// handler main.ts registers: the file with its headers, or 404 for anything refused or missing. */
export function createAppRequestHandler(rootDir: string, read: (file: string) => Promise<Uint8Array> = readFile): (request: Request) => Promise<Response> {
  return async (request) => {
    const resolved = resolveAppRequest(request.url, rootDir);
    if (!resolved) return new Response('Not found', { status: 404 });
    try {
      return new Response((await read(resolved.file)) as Uint8Array<ArrayBuffer>, { headers: resolved.headers });
    } catch {
      return new Response('Not found', { status: 404 });
    }
  };
}
