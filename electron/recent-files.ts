/**
 * The recent-files list: pure list operations plus load/save to a small JSON file in the user's
 * settings folder (written atomically like everything else).
 */
import * as path from 'node:path';
import { atomicWriteFile, realFileSystem, type FileSystem } from './file-service.ts';

/** How many recent studies the File menu keeps. */
export const RECENT_LIMIT = 10;

/** Put `file` first, drop its older entry, keep at most `limit` entries. */
export function addRecent(list: readonly string[], file: string, limit = RECENT_LIMIT): string[] {
  const absolute = path.resolve(file);
  return [absolute, ...list.filter((entry) => entry !== absolute)].slice(0, limit);
}

export function removeRecent(list: readonly string[], file: string): string[] {
  const absolute = path.resolve(file);
  return list.filter((entry) => entry !== absolute);
}

/** Parse the stored list; anything unexpected yields an empty list rather than a crash at start-up. */
export function parseRecent(text: string, limit = RECENT_LIMIT): string[] {
  try {
    const doc = JSON.parse(text) as unknown;
    const files = (doc as { files?: unknown })?.files;
    if (!Array.isArray(files)) return [];
    const clean = files.filter((f): f is string => typeof f === 'string' && path.isAbsolute(f));
    return [...new Set(clean)].slice(0, limit);
  } catch {
    return [];
  }
}

export class RecentFiles {
  private list: string[] = [];

  constructor(
    private readonly storeFile: string,
    private readonly fs: FileSystem = realFileSystem,
  ) {}

  async load(): Promise<string[]> {
    try {
      this.list = parseRecent(await this.fs.readFile(this.storeFile, 'utf8'));
    } catch {
      this.list = [];
    }
    return this.entries();
  }

  entries(): string[] {
    return [...this.list];
  }

  has(file: string): boolean {
    return this.list.includes(path.resolve(file));
  }

  async add(file: string): Promise<string[]> {
    this.list = addRecent(this.list, file);
    await this.persist();
    return this.entries();
  }

  async remove(file: string): Promise<string[]> {
    this.list = removeRecent(this.list, file);
    await this.persist();
    return this.entries();
  }

  async clear(): Promise<void> {
    this.list = [];
    await this.persist();
  }

  private async persist(): Promise<void> {
    await this.fs.mkdir(path.dirname(this.storeFile), { recursive: true });
    await atomicWriteFile(this.storeFile, JSON.stringify({ files: this.list }, null, 2), this.fs);
  }
}
