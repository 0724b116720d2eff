/**
 * The contract between the renderer and the main process: one typed object of named methods,
 * exposed by the preload as `window.landreach`. This file holds types and the channel table only;
 * it has no run-time dependency on Electron or Node, so the renderer may `import type` from it and
 * the unit tests may import it.
 */

/** Export kinds the main process will write, with the file extension each must carry. */
export const EXPORT_KINDS = {
  png: { extension: 'png', label: 'PNG image', binary: true },
  csv: { extension: 'csv', label: 'CSV table', binary: false },
  geojson: { extension: 'geojson', label: 'GeoJSON', binary: false },
  json: { extension: 'json', label: 'JSON report', binary: false },
  svg: { extension: 'svg', label: 'SVG map', binary: false },
  jsonfg: { extension: 'json', label: 'JSON-FG', binary: false },
  tif: { extension: 'tif', label: 'GeoTIFF', binary: true },
} as const;
export type ExportKind = keyof typeof EXPORT_KINDS;

/** Commands the application menu sends to the renderer. */
export const MENU_COMMANDS = [
  'new-study',
  'open-study',
  'open-recent',
  'save-study',
  'save-study-as',
  'undo',
  'redo',
  'about',
  'view-top',
  'view-oblique',
] as const;
export type MenuCommand = (typeof MENU_COMMANDS)[number];

/** Extra data of a menu command (only 'open-recent' has any). */
export interface MenuCommandDetail {
  path?: string;
}

/** Result of opening a study file. `text` is the file's content, still to be validated by core/study. */
export type OpenStudyResult =
  | { status: 'opened'; path: string; name: string; text: string }
  | { status: 'cancelled' }
  | { status: 'error'; message: string };

/**
 * Result of choosing an elevation model (GeoTIFF .tif/.tiff, 16-bit PNG heightmap, Landreach JSON grid).
 * `bytes` are the file's content, still to be read by core/terrain in the renderer.
 */
export type OpenTerrainResult =
  | { status: 'opened'; name: string; bytes: Uint8Array }
  | { status: 'cancelled' }
  | { status: 'error'; message: string };

/** File extensions an elevation model may carry (lower case, without the dot). */
export const TERRAIN_EXTENSIONS = ['tif', 'tiff', 'png', 'json'] as const;

/**
 * Largest elevation-model file accepted (256 MiB): the app holds the file's bytes in memory (core/terrain then
 * builds at most 4096 × 4096 cells from it, MAX_GRID_CELLS); a bigger file needs cutting to a window first,
 * or the command line, which reads a file a byte range at a time.
 */
export const MAX_TERRAIN_BYTES = 256 * 1024 * 1024;

/** Result of any write (save, save as, export). */
export type WriteResult =
  | { status: 'written'; path: string; name: string }
  | { status: 'cancelled' }
  | { status: 'error'; message: string };

/** A crash-recovery copy found at start-up. */
export interface RecoveryCopy {
  text: string;
  /** Path of the study the copy belongs to, or null for a study never saved. */
  originalPath: string | null;
  savedAt: string;
}

export interface ExportRequest {
  kind: ExportKind;
  /** File name proposed in the dialog, e.g. "study-footprint.png". */
  suggestedName: string;
  /** Text for text kinds; bytes for png. */
  data: string | Uint8Array;
}

/** The bridge object. Every method is a named request; there is no generic send(channel). */
export interface LandreachBridge {
  /** Show the open dialog and read the chosen study. */
  openStudy(): Promise<OpenStudyResult>;
  /** Re-open a file from the recent list (only paths main put in the list are accepted). */
  openRecent(path: string): Promise<OpenStudyResult>;
  /** Save to the current file of this window; behaves like saveStudyAs when there is none. */
  saveStudy(text: string, suggestedName: string): Promise<WriteResult>;
  /** Ask for a path and save there. */
  saveStudyAs(text: string, suggestedName: string): Promise<WriteResult>;
  /** Forget the current file (File ▸ New). */
  newStudy(): Promise<void>;
  exportFile(request: ExportRequest): Promise<WriteResult>;
  /** Show the open dialog for an elevation model and return its bytes (no arguments). */
  openTerrainFile(): Promise<OpenTerrainResult>;
  listRecent(): Promise<string[]>;
  /** Autosave: write a crash-recovery copy of the unsaved study. */
  writeRecovery(text: string): Promise<void>;
  readRecovery(): Promise<RecoveryCopy | null>;
  clearRecovery(): Promise<void>;
  /** Tell main whether there are unsaved changes (drives the close guard and the title). */
  setDocumentState(state: { dirty: boolean; title: string }): Promise<void>;
  /** Subscribe to menu commands; returns an unsubscribe function. 'open-recent' carries the file's path. */
  onMenuCommand(listener: (command: MenuCommand, detail: MenuCommandDetail) => void): () => void;
  /** App version, for caption stamps. */
  appVersion(): Promise<string>;
}

/** Invoke channels, one per request method. Main registers exactly these; the preload uses exactly these. */
export const INVOKE_CHANNELS = {
  openStudy: 'study:open',
  openRecent: 'study:open-recent',
  saveStudy: 'study:save',
  saveStudyAs: 'study:save-as',
  newStudy: 'study:new',
  exportFile: 'export:write',
  openTerrainFile: 'terrain:open',
  listRecent: 'recent:list',
  writeRecovery: 'recovery:write',
  readRecovery: 'recovery:read',
  clearRecovery: 'recovery:clear',
  setDocumentState: 'document:state',
  appVersion: 'app:version',
} as const satisfies Record<Exclude<keyof LandreachBridge, 'onMenuCommand'>, string>;

/** The one main → renderer event channel. */
export const MENU_CHANNEL = 'menu:command';

/** Largest study or export payload accepted over IPC (64 MiB): bigger is a renderer bug, not user data. */
export const MAX_PAYLOAD_BYTES = 64 * 1024 * 1024;
