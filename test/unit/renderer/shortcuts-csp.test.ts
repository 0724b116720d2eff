import { describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import { shortcutFor } from '../../../renderer/shortcuts.ts';
import { DEV_SERVER_CSP, injectCsp, PRODUCTION_CSP } from '../../../renderer/csp.ts';

const key = (k: string, mods: Partial<{ ctrlKey: boolean; metaKey: boolean; shiftKey: boolean; altKey: boolean }> = {}) => ({
  key: k, ctrlKey: false, metaKey: false, shiftKey: false, altKey: false, ...mods,
});

describe('keyboard shortcuts', () => {
  it('maps undo/redo everywhere, file and view keys only in the browser', () => {
    expect(shortcutFor(key('z', { ctrlKey: true }))).toBe('undo');
    expect(shortcutFor(key('Z', { ctrlKey: true, shiftKey: true }))).toBe('redo');
    expect(shortcutFor(key('y', { ctrlKey: true }))).toBe('redo');
    expect(shortcutFor(key('s', { ctrlKey: true }))).toBe('save-study');
    expect(shortcutFor(key('s', { ctrlKey: true, shiftKey: true }))).toBe('save-study-as');
    expect(shortcutFor(key('s', { ctrlKey: true }), true)).toBeNull();
    expect(shortcutFor(key('z', { ctrlKey: true }), true)).toBe('undo');
    expect(shortcutFor(key('z'))).toBeNull();
    expect(shortcutFor(key('z', { ctrlKey: true, altKey: true }))).toBeNull();
  });

  it('uses Cmd on macOS', () => {
    expect(shortcutFor(key('z', { metaKey: true }), false, true)).toBe('undo');
    expect(shortcutFor(key('z', { ctrlKey: true }), false, true)).toBeNull();
    expect(shortcutFor(key('y', { metaKey: true }), false, true)).toBeNull();
  });
});

describe('content security policy', () => {
  it('has the required directives and nothing unsafe', () => {
    const directives = Object.fromEntries(PRODUCTION_CSP.split('; ').map((d) => [d.split(' ')[0], d.split(' ').slice(1).join(' ')]));
    expect(directives['default-src']).toBe("'self'");
    expect(directives['worker-src']).toBe("'self'");
    expect(directives['object-src']).toBe("'none'");
    expect(PRODUCTION_CSP).not.toMatch(/unsafe|data:|\*/);
    expect(DEV_SERVER_CSP).toMatch(/style-src 'self' 'unsafe-inline'/);
  });

  it('is injected right after the charset, once', () => {
    const source = fs.readFileSync(new URL('../../../renderer/index.html', import.meta.url), 'utf8');
    const html = injectCsp(source, PRODUCTION_CSP);
    expect(html.indexOf('Content-Security-Policy')).toBeGreaterThan(html.indexOf('charset'));
    expect(html.indexOf('Content-Security-Policy')).toBeLessThan(html.indexOf('<script'));
    expect(() => injectCsp(html, PRODUCTION_CSP)).toThrow(/already has a CSP/);
  });
});
