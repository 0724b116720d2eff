/** File reading and writing for the command line: clear errors, nothing ever half-written. */
import { closeSync, fsyncSync, openSync, readFileSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { decodeStudyBytes, parseStudyText, StudyError, type Study } from '../study/index.ts';
import { UsageError } from './command.ts';

/**
 * Reads and validates a study file (UTF-8, a byte-order mark allowed; core/study checks the values and
 * the descent they describe); every problem becomes a UsageError naming the field and the fix.
 */
export function readStudy(path: string): Study {
  let bytes: Uint8Array;
  try {
    bytes = readFileSync(path);
  } catch (err) {
    throw new UsageError(`cannot read study file '${path}': ${(err as NodeJS.ErrnoException).code ?? (err as Error).message} (check the path)`);
  }
  try {
    return parseStudyText(decodeStudyBytes(bytes, path), path);
  } catch (err) {
    if (err instanceof StudyError) throw new UsageError(err.message);
    throw err;
  }
}

/**
 * Writes all files, each to a temporary file that is flushed to disk (fsync) and then renamed over the
 * target, so a reader sees the old file or the complete new one, never a part. If any write fails,
 * every temporary file is removed and no target is touched.
 */
export function writeFilesAtomically(files: { path: string; text: string }[]): void {
  const temps: { tmp: string; path: string }[] = [];
  try {
    for (const f of files) {
      const tmp = `${f.path}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
      const fd = openSync(tmp, 'wx');
      temps.push({ tmp, path: f.path });
      try {
        writeSync(fd, f.text);
        fsyncSync(fd);
      } finally {
        closeSync(fd);
      }
    }
    for (const t of temps) renameSync(t.tmp, t.path);
  } catch (err) {
    for (const t of temps) {
      try {
        unlinkSync(t.tmp);
      } catch {
        // already renamed or never written
      }
    }
    throw new UsageError(`cannot write output: ${(err as Error).message} (check the folder exists and is writable)`);
  }
}
