/**
 * Reading and writing files for the main process. Every write is atomic: the bytes go to a temporary
 * file in the same folder, are flushed to disk (fsync), then renamed over the target, and the folder is
 * flushed so the rename itself survives a power cut. A reader therefore sees the old file or the new
 * one, never half of one. A study file that is corrupt or was written by a newer version is never
 * overwritten.
 *
 * The file-system functions are a parameter so tests can inject failures; production uses node:fs.
 */
import * as nodeFs from 'node:fs/promises';
import * as path from 'node:path';
import { randomBytes } from 'node:crypto';
import { checkEnvelope, describeEnvelopeProblem } from './study-envelope.ts';
import { MAX_PAYLOAD_BYTES, MAX_TERRAIN_BYTES, TERRAIN_EXTENSIONS } from './bridge-api.ts';
import { decodeUtf8Text } from './text-decode.ts';

/** The subset of node:fs/promises this module uses. */
export interface FileSystem {
  open: typeof nodeFs.open;
  rename: typeof nodeFs.rename;
  unlink: typeof nodeFs.unlink;
  readFile: typeof nodeFs.readFile;
  stat: typeof nodeFs.stat;
  lstat: typeof nodeFs.lstat;
  readlink: typeof nodeFs.readlink;
  mkdir: typeof nodeFs.mkdir;
}

export const realFileSystem: FileSystem = {
  open: nodeFs.open,
  rename: nodeFs.rename,
  unlink: nodeFs.unlink,
  readFile: nodeFs.readFile,
  stat: nodeFs.stat,
  lstat: nodeFs.lstat,
  readlink: nodeFs.readlink,
  mkdir: nodeFs.mkdir,
};

export class FileServiceError extends Error {
  override readonly name = 'FileServiceError';
}

function isMissing(error: unknown): boolean {
  return (error as NodeJS.ErrnoException)?.code === 'ENOENT';
}

/** Links followed at most, as POSIX's SYMLOOP_MAX is commonly 40 (Linux's limit). */
const MAX_LINKS = 40;

/**
 * The file a write to `target` must replace: `target` itself, or, when it is a symbolic link, the file
 * the chain of links ends at (which may not exist yet). Replacing the link itself would turn it into a
 * regular file and leave the file it pointed to stale.
 */
async function resolveLinks(target: string, fs: FileSystem): Promise<string> {
  let file = path.resolve(target);
  for (let i = 0; i < MAX_LINKS; i++) {
    let info;
    try {
      info = await fs.lstat(file);
    } catch (error) {
      if (isMissing(error)) return file;
      throw error;
    }
    if (!info.isSymbolicLink()) return file;
    file = path.resolve(path.dirname(file), await fs.readlink(file));
  }
  throw new FileServiceError(`Not saved: ${path.basename(target)} is a chain of more than ${MAX_LINKS} links (a loop?). Choose the file itself.`);
}

/** Whether the current user may write the existing file `info` describes (its owner's write bit when it is ours). */
function writable(info: { mode: number; uid: number }): boolean {
  const uid = typeof process.getuid === 'function' ? process.getuid() : undefined;
  // As its owner (and as root, which file permissions would not stop), honour the owner's write bit:
  // a file made read-only was made so on purpose. Windows reports read-only files as mode 0o444.
  if (uid === undefined || uid === info.uid || uid === 0) return (info.mode & 0o200) !== 0;
  return (info.mode & 0o002) !== 0 || (info.mode & 0o020) !== 0;
}

/**
 * Write `data` to `target` atomically (temp file in the same folder + fsync + rename + folder fsync).
 * A symbolic link is written through to the file it points to; a replaced file keeps its permission
 * bits; a read-only file is not replaced (FileServiceError saying so).
 */
export async function atomicWriteFile(target: string, data: string | Uint8Array, fs: FileSystem = realFileSystem): Promise<void> {
  const file = await resolveLinks(target, fs);
  let mode = 0o644;
  try {
    const info = await fs.stat(file);
    if (!writable(info)) {
      throw new FileServiceError(`Not saved: ${path.basename(target)} is read-only. Make it writable first, or use Save As to choose another name.`);
    }
    mode = info.mode & 0o7777;
  } catch (error) {
    if (!isMissing(error)) throw error;
  }
  const dir = path.dirname(file);
  const temp = path.join(dir, `.${path.basename(file)}.${process.pid}.${randomBytes(6).toString('hex')}.tmp`);
  let handle: nodeFs.FileHandle | undefined;
  try {
    // 'wx': fail rather than reuse a temp name that somehow exists.
    handle = await fs.open(temp, 'wx', 0o644);
    // The replaced file's permission bits, exactly (the umask applies only to a new file's 0644).
    if (mode !== 0o644) await handle.chmod(mode);
    await handle.writeFile(data);
    await handle.sync();
    await handle.close();
    handle = undefined;
    await fs.rename(temp, file);
  } catch (error) {
    if (handle) await handle.close().catch(() => undefined);
    await fs.unlink(temp).catch(() => undefined);
    throw error;
  }
  await syncDirectory(dir, fs);
}

async function syncDirectory(dir: string, fs: FileSystem): Promise<void> {
  // Flushing a folder is how POSIX makes a rename durable; Windows cannot open folders this way,
  // and there the rename is already journaled, so a failure here is not an error.
  let handle: nodeFs.FileHandle | undefined;
  try {
    handle = await fs.open(dir, 'r');
    await handle.sync();
  } catch {
    /* best effort, see above */
  } finally {
    await handle?.close().catch(() => undefined);
  }
}

/** Read a text file, refusing anything larger than the IPC payload limit or not UTF-8 (decodeUtf8Text). */
export async function readTextFile(file: string, fs: FileSystem = realFileSystem): Promise<string> {
  const info = await fs.stat(file);
  if (!info.isFile()) throw new FileServiceError(`${path.basename(file)} is not a file. Choose a study file.`);
  if (info.size > MAX_PAYLOAD_BYTES) {
    throw new FileServiceError(
      `${path.basename(file)} is ${(info.size / 1048576).toFixed(1)} MiB, larger than the ${MAX_PAYLOAD_BYTES / 1048576} MiB a study may be. Choose the study file, not a data file.`,
    );
  }
  const decoded = decodeUtf8Text(new Uint8Array(await fs.readFile(file)));
  if (!decoded.ok) {
    throw new FileServiceError(
      `${path.basename(file)} is not UTF-8 text (byte ${decoded.byte}, line ${decoded.line}). Save it as UTF-8 (any text editor can) and check the names near that line.`,
    );
  }
  return decoded.text;
}

/** Read a study file and check its envelope; throws FileServiceError with a user-facing message. */
export async function readStudyFile(file: string, fs: FileSystem = realFileSystem): Promise<string> {
  let text: string;
  try {
    text = await readTextFile(file, fs);
  } catch (error) {
    if (error instanceof FileServiceError) throw error;
    if (isMissing(error)) throw new FileServiceError(`${path.basename(file)} no longer exists. It may have been moved or deleted.`);
    throw new FileServiceError(`${path.basename(file)} cannot be read: ${(error as Error).message}.`);
  }
  const check = checkEnvelope(text);
  if (check.kind !== 'study') throw new FileServiceError(describeEnvelopeProblem(path.basename(file), check));
  return text;
}

/**
 * Refuse to overwrite a file that is not a study this build understands. A missing file is fine;
 * an existing readable study of a supported version is fine; anything else would destroy data the
 * user may still need.
 */
export async function assertStudyOverwritable(file: string, fs: FileSystem = realFileSystem): Promise<void> {
  let existing: string;
  try {
    existing = await readTextFile(file, fs);
  } catch (error) {
    if (isMissing(error)) return;
    if (error instanceof FileServiceError) throw new FileServiceError(`Not saved: ${error.message}`);
    throw new FileServiceError(`Not saved: ${path.basename(file)} exists but cannot be read (${(error as Error).message}).`);
  }
  const check = checkEnvelope(existing);
  if (check.kind === 'study') return;
  throw new FileServiceError(`Not saved, to protect the existing file: ${describeEnvelopeProblem(path.basename(file), check)} Use Save As to choose another name.`);
}

/** Save a study: the text must itself be a valid envelope, and the target must be safe to replace. */
export async function writeStudyFile(file: string, text: string, fs: FileSystem = realFileSystem): Promise<void> {
  const own = checkEnvelope(text);
  if (own.kind !== 'study') {
    // The renderer builds the text; a bad envelope here is a program error, caught before any write.
    throw new FileServiceError(`Not saved: the study to write is invalid (${own.kind}). Please report this.`);
  }
  await assertStudyOverwritable(file, fs);
  await atomicWriteFile(file, text, fs);
}

/**
 * Read an elevation model's bytes: a regular file with one of TERRAIN_EXTENSIONS, at most MAX_TERRAIN_BYTES.
 * The content is not judged here (core/terrain's readers in the renderer do that and name the problem).
 */
export async function readTerrainFile(file: string, fs: FileSystem = realFileSystem, maxBytes = MAX_TERRAIN_BYTES): Promise<Uint8Array> {
  const name = path.basename(file);
  const ext = path.extname(file).slice(1).toLowerCase();
  if (!(TERRAIN_EXTENSIONS as readonly string[]).includes(ext)) {
    throw new FileServiceError(`${name} is not an elevation model: choose a GeoTIFF (.tif, .tiff), a 16-bit PNG heightmap (.png) or a Landreach JSON grid (.json).`);
  }
  let info;
  try {
    info = await fs.stat(file);
  } catch (error) {
    if (isMissing(error)) throw new FileServiceError(`${name} no longer exists. It may have been moved or deleted.`);
    throw new FileServiceError(`${name} cannot be read: ${(error as Error).message}.`);
  }
  if (!info.isFile()) throw new FileServiceError(`${name} is not a file. Choose an elevation model file.`);
  if (info.size > maxBytes) {
    throw new FileServiceError(
      `${name} is ${(info.size / 1048576).toFixed(1)} MiB, larger than the ${maxBytes / 1048576} MiB an elevation model may be here (the app holds the file in memory). Cut a window around the site first (e.g. gdal_translate -projwin), or use the command line (landreach hazard --study … --extent-m), which reads a large DEM a window at a time.`,
    );
  }
  try {
    return new Uint8Array(await fs.readFile(file));
  } catch (error) {
    throw new FileServiceError(`${name} cannot be read: ${(error as Error).message}.`);
  }
}

/** Ensure a folder exists (for recovery copies and settings). */
export async function ensureDirectory(dir: string, fs: FileSystem = realFileSystem): Promise<void> {
  await fs.mkdir(dir, { recursive: true });
}

/** Give `name` the extension `ext` (without dot) unless it already ends with it. */
export function withExtension(name: string, ext: string): string {
  return name.toLowerCase().endsWith(`.${ext}`) ? name : `${name}.${ext}`;
}
