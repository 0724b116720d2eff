/**
 * The application menu as a template (plain data). Clipboard, window and zoom items use Electron's
 * standard roles so their shortcuts follow each platform's convention. Undo/redo act on the study's
 * input history, not on a text field, so they are app commands; their accelerators are displayed but
 * not registered, because the page handles the same keys itself (the web build needs that anyway).
 */
import type { MenuItemConstructorOptions } from 'electron';
import * as path from 'node:path';
import type { MenuCommand } from './bridge-api.ts';

export interface MenuContext {
  platform: NodeJS.Platform;
  appName: string;
  recent: readonly string[];
  /** Adds reload and developer tools. */
  developerMode: boolean;
  send(command: MenuCommand): void;
  openRecent(file: string): void;
  clearRecent(): void;
}

export function buildMenuTemplate(ctx: MenuContext): MenuItemConstructorOptions[] {
  const mac = ctx.platform === 'darwin';
  const command = (label: string, cmd: MenuCommand, accelerator?: string, registerAccelerator = true): MenuItemConstructorOptions => ({
    label,
    ...(accelerator ? { accelerator, registerAccelerator } : {}),
    click: () => ctx.send(cmd),
  });

  const recentItems: MenuItemConstructorOptions[] = ctx.recent.length
    ? [
        ...ctx.recent.map((file) => ({ label: path.basename(file), toolTip: file, click: () => ctx.openRecent(file) })),
        { type: 'separator' as const },
        { label: 'Clear List', click: () => ctx.clearRecent() },
      ]
    : [{ label: 'No Recent Studies', enabled: false }];

  const template: MenuItemConstructorOptions[] = [];
  if (mac) {
    template.push({
      label: ctx.appName,
      submenu: [
        command(`About ${ctx.appName}`, 'about'),
        { type: 'separator' },
        { role: 'services' },
        { type: 'separator' },
        { role: 'hide' },
        { role: 'hideOthers' },
        { role: 'unhide' },
        { type: 'separator' },
        { role: 'quit' },
      ],
    });
  }
  template.push({
    label: 'File',
    submenu: [
      command('New Study', 'new-study', 'CmdOrCtrl+N'),
      command('Open Study…', 'open-study', 'CmdOrCtrl+O'),
      { label: 'Open Recent', submenu: recentItems },
      { type: 'separator' },
      command('Save', 'save-study', 'CmdOrCtrl+S'),
      command('Save As…', 'save-study-as', 'Shift+CmdOrCtrl+S'),
      { type: 'separator' },
      mac ? { role: 'close' } : { role: 'quit' },
    ],
  });
  template.push({
    label: 'Edit',
    submenu: [
      command('Undo Input Edit', 'undo', 'CmdOrCtrl+Z', false),
      command('Redo Input Edit', 'redo', mac ? 'Shift+CmdOrCtrl+Z' : 'CmdOrCtrl+Y', false),
      { type: 'separator' },
      { role: 'cut' },
      { role: 'copy' },
      { role: 'paste' },
      { role: 'selectAll' },
    ],
  });
  template.push({
    label: 'View',
    submenu: [
      command('Top View', 'view-top', 'CmdOrCtrl+1'),
      command('Oblique View', 'view-oblique', 'CmdOrCtrl+2'),
      { type: 'separator' },
      { role: 'resetZoom' },
      { role: 'zoomIn' },
      { role: 'zoomOut' },
      { type: 'separator' },
      { role: 'togglefullscreen' },
      ...(ctx.developerMode ? [{ type: 'separator' as const }, { role: 'reload' as const }, { role: 'toggleDevTools' as const }] : []),
    ],
  });
  template.push({ role: 'windowMenu' });
  template.push({ role: 'help', submenu: mac ? [] : [command(`About ${ctx.appName}`, 'about')] });
  return template;
}
