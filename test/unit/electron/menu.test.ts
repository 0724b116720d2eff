import { describe, expect, it } from 'vitest';
import type { MenuItemConstructorOptions } from 'electron';
import { buildMenuTemplate, type MenuContext } from '../../../electron/menu.ts';
import { MENU_COMMANDS, type MenuCommand } from '../../../electron/bridge-api.ts';

function build(platform: NodeJS.Platform, recent: string[] = [], developerMode = false) {
  const sent: MenuCommand[] = [];
  const opened: string[] = [];
  const ctx: MenuContext = { platform, appName: 'Landreach', recent, developerMode, send: (c) => sent.push(c), openRecent: (f) => opened.push(f), clearRecent: () => undefined };
  return { template: buildMenuTemplate(ctx), sent, opened };
}

function flatten(items: MenuItemConstructorOptions[]): MenuItemConstructorOptions[] {
  return items.flatMap((item) => [item, ...(Array.isArray(item.submenu) ? flatten(item.submenu) : [])]);
}

const click = (item: MenuItemConstructorOptions) => (item.click as unknown as () => void)();

describe('application menu', () => {
  it.each(['linux', 'win32', 'darwin'] as const)('uses standard roles for clipboard and window items on %s', (platform) => {
    const roles = flatten(build(platform).template).map((i) => i.role).filter(Boolean);
    for (const role of ['cut', 'copy', 'paste', 'selectAll', 'resetZoom', 'zoomIn', 'zoomOut', 'togglefullscreen', 'windowMenu']) {
      expect(roles, role).toContain(role);
    }
    expect(roles).toContain(platform === 'darwin' ? 'close' : 'quit');
    expect(roles.includes('toggleDevTools')).toBe(false);
  });

  it('puts the app menu first on macOS only', () => {
    expect(build('darwin').template[0].label).toBe('Landreach');
    expect(build('linux').template[0].label).toBe('File');
  });

  it('sends every app command from some item, and shows but does not register undo/redo keys', () => {
    const { template, sent } = build('linux');
    const items = flatten(template).filter((i) => i.click && !i.role);
    items.forEach(click);
    expect(new Set(sent)).toEqual(new Set(MENU_COMMANDS.filter((c) => c !== 'open-recent')));
    const undo = items.find((i) => i.label === 'Undo Input Edit')!;
    expect(undo.accelerator).toBe('CmdOrCtrl+Z');
    expect(undo.registerAccelerator).toBe(false);
  });

  it('lists recent studies by file name and opens the full path', () => {
    const { template, opened } = build('linux', ['/data/studies/rim.landreach.json']);
    const item = flatten(template).find((i) => i.label === 'rim.landreach.json')!;
    click(item);
    expect(opened).toEqual(['/data/studies/rim.landreach.json']);
    const empty = flatten(build('linux').template).find((i) => i.label === 'No Recent Studies')!;
    expect(empty.enabled).toBe(false);
  });

  it('offers reload and developer tools only in developer mode', () => {
    const roles = flatten(build('linux', [], true).template).map((i) => i.role);
    expect(roles).toContain('toggleDevTools');
    expect(roles).toContain('reload');
  });
});
