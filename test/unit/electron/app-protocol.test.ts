import { describe, expect, it } from 'vitest';
import * as path from 'node:path';
import { APP_URL, resolveAppRequest } from '../../../electron/app-protocol.ts';
import { isAppOrigin, isAppPage } from '../../../electron/security.ts';

const ROOT = path.resolve('/opt/landreach/dist');

describe('app:// scheme', () => {
  it('serves files inside the renderer folder with their content type', () => {
    expect(resolveAppRequest(APP_URL, ROOT)).toEqual({ file: path.join(ROOT, 'index.html'), contentType: 'text/html; charset=utf-8' });
    expect(resolveAppRequest('app://landreach/assets/index-abc.js', ROOT)).toEqual({ file: path.join(ROOT, 'assets', 'index-abc.js'), contentType: 'text/javascript; charset=utf-8' });
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
