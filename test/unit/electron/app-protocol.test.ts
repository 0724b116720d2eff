import { describe, expect, it } from 'vitest';
import * as path from 'node:path';
import * as fs from 'node:fs';
import * as os from 'node:os';
import { APP_URL, createAppRequestHandler, resolveAppRequest } from '../../../electron/app-protocol.ts';
import { APP_PAGE_CSP, APP_WORKER_CSP } from '../../../electron/content-policy.ts';
import { PRODUCTION_CSP, WORKER_CSP } from '../../../renderer/csp.ts';
import { isAppOrigin, isAppPage } from '../../../electron/security.ts';

const ROOT = path.resolve('/opt/landreach/dist');

describe('app:// scheme', () => {
  it('serves files inside the renderer folder with their content type', () => {
    expect(resolveAppRequest(APP_URL, ROOT)).toMatchObject({ file: path.join(ROOT, 'index.html'), contentType: 'text/html; charset=utf-8' });
    expect(resolveAppRequest('app://landreach/assets/index-abc.js', ROOT)).toMatchObject({ file: path.join(ROOT, 'assets', 'index-abc.js'), contentType: 'text/javascript; charset=utf-8' });
    expect(resolveAppRequest('app://landreach/', ROOT)!.file).toBe(path.join(ROOT, 'index.html'));
    expect(resolveAppRequest('app://landreach/icon.svg?v=2#x', ROOT)!.contentType).toBe('image/svg+xml');
  });

  it.each(['app://landreach/../../etc/passwd', 'app://landreach/%2e%2e/%2e%2e/etc/passwd'])('keeps %s inside the folder (the URL parser folds the dots away)', (url) => {
    const resolved = resolveAppRequest(url, ROOT);
    expect(resolved === null || resolved.file.startsWith(ROOT + path.sep)).toBe(true);
    expect(resolved?.file).toBe(path.join(ROOT, 'etc', 'passwd'));
  });

  it.each([
    'app://landreach/assets/%2e%2e%2f%2e%2e%2fsecret',
    'app://landreach/a%00.js',
    'app://landreach/..%5c..%5cwindows',
    'app://other-host/index.html',
    'file:///opt/landreach/dist/index.html',
    'app://landreach/%E0%A4%A',
    'not a url',
  ])('refuses %s', (url) => {
    expect(resolveAppRequest(url, ROOT)).toBeNull();
  });

  it('works with the navigation and sender rules', () => {
    expect(isAppPage(`${APP_URL}#a`, APP_URL)).toBe(true);
    expect(isAppPage('app://landreach/other.html', APP_URL)).toBe(false);
    expect(isAppOrigin('app://landreach/index.html', APP_URL)).toBe(true);
    expect(isAppOrigin('app://evil/index.html', APP_URL)).toBe(false);
  });
});

describe('content security policy as a response header on app://', () => {
  it("the main process copy of the policies is the renderer's single source, exactly", () => {
    expect(APP_PAGE_CSP).toBe(PRODUCTION_CSP);
    expect(APP_WORKER_CSP).toBe(WORKER_CSP);
    // Workers get no policy from the page's <meta>: theirs is the page's plus WebAssembly compilation
    // (the solver's kernels compile in workers), nothing else.
    expect(WORKER_CSP).toBe(PRODUCTION_CSP.replace("script-src 'self'", "script-src 'self' 'wasm-unsafe-eval'").replace("connect-src 'self'", "connect-src 'self' data:"));
  });

  it("every response carries it: the page's policy on documents, the worker policy on scripts", () => {
    const page = resolveAppRequest(APP_URL, ROOT)!;
    expect(page.headers).toEqual({ 'content-type': 'text/html; charset=utf-8', 'content-security-policy': PRODUCTION_CSP, 'x-content-type-options': 'nosniff' });
    const worker = resolveAppRequest('app://landreach/assets/footprint.worker-abc.js', ROOT)!;
    expect(worker.headers['content-security-policy']).toBe(WORKER_CSP);
    expect(resolveAppRequest('app://landreach/icon.svg', ROOT)!.headers['content-security-policy']).toBe(PRODUCTION_CSP);
  });

  it('the request handler main.ts registers sends those headers with the file, and 404 otherwise', async () => {
    const root = fs.mkdtempSync(path.join(os.tmpdir(), 'landreach-app-'));
    try {
      fs.writeFileSync(path.join(root, 'index.html'), '<!doctype html><title>t</title>');
      fs.mkdirSync(path.join(root, 'assets'));
      fs.writeFileSync(path.join(root, 'assets', 'w.js'), 'self.onmessage = () => {};');
      const handle = createAppRequestHandler(root);
      const page = await handle(new Request(APP_URL));
      expect(page.status).toBe(200);
      expect(page.headers.get('content-security-policy')).toBe(PRODUCTION_CSP);
      expect(await page.text()).toBe('<!doctype html><title>t</title>');
      const worker = await handle(new Request('app://landreach/assets/w.js'));
      expect(worker.headers.get('content-security-policy')).toBe(WORKER_CSP);
      expect(worker.headers.get('content-type')).toBe('text/javascript; charset=utf-8');
      expect((await handle(new Request('app://landreach/missing.js'))).status).toBe(404);
      expect((await handle(new Request('app://landreach/%2e%2e%2f%2e%2e%2fetc/passwd'))).status).toBe(404);
    } finally {
      fs.rmSync(root, { recursive: true, force: true });
    }
  });
});
