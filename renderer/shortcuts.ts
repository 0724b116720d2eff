/**
 * Keyboard shortcuts handled by the page. In the desktop app the menu's registered accelerators
 * handle file and view commands, so the page handles only undo/redo (whose menu accelerators are
 * shown but not registered). In a browser there is no menu, so the page handles them all.
 */
import type { MenuCommand } from '../electron/bridge-api.ts';

export interface KeyLike {
  key: string;
  ctrlKey: boolean;
  metaKey: boolean;
  shiftKey: boolean;
  altKey: boolean;
}

export function shortcutFor(event: KeyLike, desktop = false, mac = false): MenuCommand | null {
  const mod = mac ? event.metaKey : event.ctrlKey;
  if (!mod || event.altKey) return null;
  const key = event.key.toLowerCase();
  if (key === 'z') return event.shiftKey ? 'redo' : 'undo';
  if (key === 'y' && !mac && !event.shiftKey) return 'redo';
  if (desktop) return null;
  if (key === 's') return event.shiftKey ? 'save-study-as' : 'save-study';
  if (key === 'o' && !event.shiftKey) return 'open-study';
  if (key === '1' && !event.shiftKey) return 'view-top';
  if (key === '2' && !event.shiftKey) return 'view-oblique';
  return null;
}
