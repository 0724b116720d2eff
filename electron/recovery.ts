/**
 * Autosave for crash recovery. The renderer sends the unsaved study every few seconds while it is
 * dirty; it is written atomically to one file in the user's settings folder. A clean save or an
 * explicit discard removes it. At start-up a leftover copy means the last session ended without
 * saving, and the renderer offers to restore it.
 */
import * as path from 'node:path';
import type { RecoveryCopy } from './bridge-api.ts';
import { atomicWriteFile, realFileSystem, type FileSystem } from './file-service.ts';

const RECOVERY_FORMAT = 'landreach-recovery';

export function encodeRecovery(copy: RecoveryCopy): string {
  return JSON.stringify({ format: RECOVERY_FORMAT, ...copy });
}

/** Decode a recovery file; null when it is missing its fields (a damaged copy is ignored, not fatal). */
export function decodeRecovery(text: string): RecoveryCopy | null {
  try {
    const doc = JSON.parse(text) as Record<string, unknown>;
    if (doc?.format !== RECOVERY_FORMAT) return null;
    if (typeof doc.text !== 'string' || typeof doc.savedAt !== 'string') return null;
    const originalPath = typeof doc.originalPath === 'string' ? doc.originalPath : null;
    return { text: doc.text, savedAt: doc.savedAt, originalPath };
  } catch {
    return null;
  }
}

export class RecoveryStore {
  constructor(
    private readonly file: string,
    private readonly fs: FileSystem = realFileSystem,
    private readonly now: () => Date = () => new Date(),
  ) {}

  async write(text: string, originalPath: string | null): Promise<void> {
    await this.fs.mkdir(path.dirname(this.file), { recursive: true });
    await atomicWriteFile(this.file, encodeRecovery({ text, originalPath, savedAt: this.now().toISOString() }), this.fs);
  }

  async read(): Promise<RecoveryCopy | null> {
    try {
      return decodeRecovery(await this.fs.readFile(this.file, 'utf8'));
    } catch {
      return null;
    }
  }

  async clear(): Promise<void> {
    await this.fs.unlink(this.file).catch((error: NodeJS.ErrnoException) => {
      if (error.code !== 'ENOENT') throw error;
    });
  }
}
