import { describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import { shortcutFor } from '../../../renderer/shortcuts.ts';
import { DEV_SERVER_CSP, injectCsp, PRODUCTION_CSP } from '../../../renderer/csp.ts';
import { EXPECTED_DEV_SERVER_CSP, EXPECTED_PRODUCTION_CSP } from '../../support/expected-csp.ts';

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
  it('is exactly the expected policy, directive for directive', () => {
    expect(PRODUCTION_CSP).toBe(EXPECTED_PRODUCTION_CSP);
    expect(DEV_SERVER_CSP).toBe(EXPECTED_DEV_SERVER_CSP);
    // Nothing unsafe, no data: URLs and no wildcard in what ships.
    expect(PRODUCTION_CSP).not.toMatch(/unsafe|data:|\*/);
  });

  it('is what the build writes into the page, and the dev server\'s only when serving', async () => {
    // The Vite config's own plugin, called as Vite calls it (configResolved, then transformIndexHtml) on
    // the real renderer/index.html: the built page's meta carries the expected policy exactly.
    const { default: config } = await import('../../../renderer/vite.config.ts');
    const plugin = (config.plugins ?? []).flat().find((p) => p && typeof p === 'object' && 'name' in p && p.name === 'landreach-csp') as unknown as {
      configResolved(c: { command: string; isProduction: boolean }): void;
      transformIndexHtml: { handler(html: string): string };
    };
    const source = fs.readFileSync(new URL('../../../renderer/index.html', import.meta.url), 'utf8');
    const metaPolicy = (html: string) => [...html.matchAll(/<meta http-equiv="Content-Security-Policy" content="([^"]*)"/g)].map((m) => m[1]);
    plugin.configResolved({ command: 'build', isProduction: true });
    expect(metaPolicy(plugin.transformIndexHtml.handler(source))).toEqual([EXPECTED_PRODUCTION_CSP]);
    plugin.configResolved({ command: 'serve', isProduction: true });
    expect(metaPolicy(plugin.transformIndexHtml.handler(source))).toEqual([EXPECTED_PRODUCTION_CSP]);
    plugin.configResolved({ command: 'serve', isProduction: false });
    expect(metaPolicy(plugin.transformIndexHtml.handler(source))).toEqual([EXPECTED_DEV_SERVER_CSP]);
  });

  it('is injected right after the charset, once', () => {
    const source = fs.readFileSync(new URL('../../../renderer/index.html', import.meta.url), 'utf8');
    const html = injectCsp(source, PRODUCTION_CSP);
    expect(html.indexOf('Content-Security-Policy')).toBeGreaterThan(html.indexOf('charset'));
    expect(html.indexOf('Content-Security-Policy')).toBeLessThan(html.indexOf('<script'));
    expect(() => injectCsp(html, PRODUCTION_CSP)).toThrow(/already has a CSP/);
  });
});
