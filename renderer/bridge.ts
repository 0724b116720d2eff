/**
 * The only file that touches the preload API (`window.landreach`). In a plain browser (`npm run web`,
 * the browser tests) there is no preload, and a fallback gives the same interface: a file input for
 * open, a download for save and export, localStorage for the crash-recovery copy.
 */
import type {
  ExportRequest,
  LandreachBridge,
  MenuCommand,
  MenuCommandDetail,
  OpenStudyResult,
  OpenTerrainResult,
  RecoveryCopy,
  WriteResult,
} from '../electron/bridge-api.ts';

export type { ExportKind, MenuCommand, OpenStudyResult, OpenTerrainResult, WriteResult } from '../electron/bridge-api.ts';
import { MAX_TERRAIN_FILE_BYTES as MAX_TERRAIN_BYTES, TERRAIN_FILE_EXTENSIONS as TERRAIN_EXTENSIONS } from './terrain/terrain-files.ts';
import { openedStudyText } from './study/core-study.ts';

declare global {
  interface Window {
    landreach?: LandreachBridge;
  }
}


const RECOVERY_KEY = 'landreach.recovery';
const STUDY_EXTENSION = '.landreach.json';

function withExtension(name: string, extension: string): string {
  return name.toLowerCase().endsWith(extension) ? name : `${name}${extension}`;
}

/** Offer bytes or text as a download (the browser decides where it lands). */
function download(name: string, data: string | Uint8Array, type: string): void {
  const part: BlobPart = typeof data === 'string' ? data : new Uint8Array(data);
  const url = URL.createObjectURL(new Blob([part], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  a.rel = 'noopener';
  document.body.append(a);
  a.click();
  a.remove();
  // Give the download a moment to start before the URL goes.
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

function pickFile(accept: string, role = 'study-file-input'): Promise<File | null> {
  return new Promise((resolve) => {
    const input = document.createElement('input');
    input.type = 'file';
    input.accept = accept;
    input.dataset.role = role;
    input.hidden = true;
    const finish = (file: File | null) => {
      input.remove();
      resolve(file);
    };
    input.addEventListener('change', () => finish(input.files?.[0] ?? null), { once: true });
    input.addEventListener('cancel', () => finish(null), { once: true });
    document.body.append(input);
    input.click();
  });
}

const EXPORT_TYPES: Record<string, string> = {
  png: 'image/png',
  csv: 'text/csv',
  geojson: 'application/geo+json',
  json: 'application/json',
  svg: 'image/svg+xml',
  jsonfg: 'application/vnd.ogc.fg+json',
  tif: 'image/tiff',
};

/** File extension per export kind, where it is not the kind's name (electron/bridge-api.ts EXPORT_KINDS says the same). */
const EXPORT_EXTENSIONS: Record<string, string> = { jsonfg: 'json' };

/** The fallback used when the page runs outside Electron. */
export function createBrowserBridge(): LandreachBridge {
  return {
    async openStudy(): Promise<OpenStudyResult> {
      const file = await pickFile('.json,application/json');
      if (!file) return { status: 'cancelled' };
      try {
        // Bytes, not file.text(): that would replace invalid UTF-8 silently; core/study's decoding refuses it.
        return openedStudyText(file.name, new Uint8Array(await file.arrayBuffer()));
      } catch (error) {
        return { status: 'error', message: `${file.name} cannot be read: ${(error as Error).message}.` };
      }
    },
    async openTerrainFile(): Promise<OpenTerrainResult> {
      const file = await pickFile(TERRAIN_EXTENSIONS.map((e) => `.${e}`).join(','), 'terrain-file-input');
      if (!file) return { status: 'cancelled' };
      if (file.size > MAX_TERRAIN_BYTES) {
        return { status: 'error', message: `${file.name} is ${(file.size / 1048576).toFixed(1)} MiB, larger than the ${MAX_TERRAIN_BYTES / 1048576} MiB an elevation model may be here (the app holds the file in memory). Cut a window around the site first (e.g. gdal_translate -projwin), or use the command line, which reads a large DEM a window at a time.` };
      }
      try {
        return { status: 'opened', name: file.name, bytes: new Uint8Array(await file.arrayBuffer()) };
      } catch (error) {
        return { status: 'error', message: `${file.name} cannot be read: ${(error as Error).message}.` };
      }
    },
    async openRecent(): Promise<OpenStudyResult> {
      return { status: 'error', message: 'Recent studies are kept by the desktop app only. Use Open instead.' };
    },
    async saveStudy(text, suggestedName): Promise<WriteResult> {
      const name = withExtension(suggestedName, STUDY_EXTENSION);
      download(name, text, 'application/json');
      return { status: 'written', path: name, name };
    },
    async saveStudyAs(text, suggestedName): Promise<WriteResult> {
      return this.saveStudy(text, suggestedName);
    },
    async newStudy() {},
    async exportFile(request: ExportRequest): Promise<WriteResult> {
      const name = withExtension(request.suggestedName, `.${EXPORT_EXTENSIONS[request.kind] ?? request.kind}`);
      download(name, request.data, EXPORT_TYPES[request.kind]);
      return { status: 'written', path: name, name };
    },
    async listRecent() {
      return [];
    },
    async writeRecovery(text) {
      const copy: RecoveryCopy = { text, originalPath: null, savedAt: new Date().toISOString() };
      try {
        localStorage.setItem(RECOVERY_KEY, JSON.stringify(copy));
      } catch {
        /* storage full or disabled: the page keeps working, only recovery is lost */
      }
    },
    async readRecovery() {
      try {
        const stored = localStorage.getItem(RECOVERY_KEY);
        const copy = stored ? (JSON.parse(stored) as RecoveryCopy) : null;
        return copy && typeof copy.text === 'string' ? copy : null;
      } catch {
        return null;
      }
    },
    async clearRecovery() {
      try {
        localStorage.removeItem(RECOVERY_KEY);
      } catch {
        /* see writeRecovery */
      }
    },
    async setDocumentState({ dirty, title }) {
      document.title = `${dirty ? '• ' : ''}${title} — Landreach`;
    },
    onMenuCommand(_listener: (command: MenuCommand, detail: MenuCommandDetail) => void) {
      return () => undefined;
    },
    async appVersion() {
      return __APP_VERSION__;
    },
  };
}

/** True when running inside the desktop app. */
export const isDesktop = typeof window !== 'undefined' && window.landreach !== undefined;

/** The bridge the app uses. */
export const bridge: LandreachBridge = isDesktop ? window.landreach! : createBrowserBridge();
