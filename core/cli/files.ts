/**
 * File reading and writing for the command line: clear errors, nothing ever half-written, and output sets
 * a reader can check (a manifest written last).
 */
import { createHash } from 'node:crypto';
import { closeSync, existsSync, fsyncSync, openSync, readdirSync, readFileSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { decodeStudyBytes, parseStudy, parseStudyJson, StudyError, type Study } from '../study/index.ts';
import { APP_VERSION, CAUTION } from '../study/provenance.ts';
import { UsageError } from './command.ts';

/**
 * Reads and validates a study file (UTF-8, a byte-order mark allowed; core/study checks the values and
 * the descent they describe); every problem becomes a UsageError naming the field and the fix.
 */
export function readStudy(path: string, vehicle: VehicleFlags = {}): Study {
  let bytes: Uint8Array;
  try {
    bytes = readFileSync(path);
  } catch (err) {
    throw new UsageError(`cannot read study file '${path}': ${(err as NodeJS.ErrnoException).code ?? (err as Error).message} (check the path)`);
  }
  try {
    const raw = parseStudyJson(decodeStudyBytes(bytes, path), path);
    return parseStudy(withVehicleFlags(raw, vehicle), path);
  } catch (err) {
    if (err instanceof StudyError) throw new UsageError(err.message);
    throw err;
  }
}

/** Vehicle fields given on the command line (study format version 2 fields), overriding the study's. */
export interface VehicleFlags {
  throttleBands?: [number, number][];
  throttleRate_perS?: number;
}

/** The usage text of the vehicle flags, shared by the commands that take them. */
export const VEHICLE_FLAGS_USAGE = `  --throttle-band LO,HI
                     a forbidden throttle band (fractions of full thrust, e.g. 0.4,0.6); repeat for
                     several; replaces the study's vehicle.throttleBands
  --throttle-rate R  largest throttle rate, fraction of full thrust per second (vehicle.throttleRate_perS)`;

/** Reads one vehicle flag at args[i] into `into`; returns how many arguments it used (0: not a vehicle flag). */
export function parseVehicleFlag(args: string[], i: number, into: VehicleFlags): number {
  const a = args[i];
  if (a !== '--throttle-band' && a !== '--throttle-rate') return 0;
  const text = args[i + 1];
  if (text === undefined || text.startsWith('--')) throw new UsageError(`${a} needs a value (e.g. ${a === '--throttle-band' ? '--throttle-band 0.4,0.6' : '--throttle-rate 0.5'})`);
  if (a === '--throttle-rate') {
    const v = Number(text);
    if (!(Number.isFinite(v) && v > 0) || text.trim() === '') throw new UsageError(`--throttle-rate ${text}: must be a positive fraction of full thrust per second, e.g. 0.5`);
    into.throttleRate_perS = v;
  } else {
    const parts = text.split(',').map((x) => Number(x.trim()));
    if (parts.length !== 2 || !parts.every(Number.isFinite)) throw new UsageError(`--throttle-band ${text}: must be LO,HI as fractions of full thrust, e.g. 0.4,0.6`);
    (into.throttleBands ??= []).push([parts[0], parts[1]]);
  }
  return 2;
}

/**
 * The study's JSON with the vehicle flags written in (a version-1 study becomes version 2, which only adds
 * these optional fields); the study file itself is never touched. Values are checked by the study schema,
 * so a bad band is reported with the field name like one in the file.
 */
function withVehicleFlags(raw: unknown, flags: VehicleFlags): unknown {
  if (flags.throttleBands === undefined && flags.throttleRate_perS === undefined) return raw;
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) return raw;
  const doc = raw as Record<string, unknown>;
  const vehicle = doc.vehicle !== null && typeof doc.vehicle === 'object' && !Array.isArray(doc.vehicle) ? { ...(doc.vehicle as Record<string, unknown>) } : doc.vehicle;
  if (vehicle !== null && typeof vehicle === 'object') {
    if (flags.throttleBands !== undefined) (vehicle as Record<string, unknown>).throttleBands = flags.throttleBands;
    if (flags.throttleRate_perS !== undefined) (vehicle as Record<string, unknown>).throttleRate_perS = flags.throttleRate_perS;
  }
  return { ...doc, version: doc.version === 1 ? 2 : doc.version, vehicle };
}

/**
 * A file to write: text (UTF-8) or bytes; bytes may come from a function, called when the file is written
 * (large rasters are then made one at a time, not all held at once).
 */
export type OutputFile = { path: string; text: string } | { path: string; bytes: Uint8Array | (() => Uint8Array) };

const contentOf = (f: OutputFile): Uint8Array =>
  'bytes' in f ? (typeof f.bytes === 'function' ? f.bytes() : f.bytes) : Buffer.from(f.text, 'utf8');

/**
 * Temporary files are named `<target>.<pid>.<random>.tmp` beside their target (the same folder, so the
 * rename is atomic): `removeOrphanTemporaries` recognises them by that pattern.
 */
const temporaryName = (path: string) => `${path}.${process.pid}.${Math.random().toString(36).slice(2, 10)}.tmp`;
/** Ours: `<name>.<pid>.<random>.tmp`, and the `<name>.tmp-<pid>` of earlier versions of `landreach hazard`. */
const TEMPORARY = /^(.+)\.(\d+)\.[a-z0-9]+\.tmp$|^(.+)\.tmp-(\d+)$/;

/** Flushes a folder's entries (the renames) to disk; not possible on every platform, harmless where not. */
function syncFolder(dir: string): void {
  let fd: number | null = null;
  try {
    fd = openSync(dir, 'r');
    fsyncSync(fd);
  } catch {
    // Windows cannot open a folder for fsync; its renames are journalled by NTFS.
  } finally {
    if (fd !== null) closeSync(fd);
  }
}

/** Writes the file's content to a new temporary beside it, flushed to disk; returns its name and SHA-256. */
function writeTemporary(f: OutputFile): { tmp: string; bytes: number; sha256: string } {
  const data = contentOf(f);
  const tmp = temporaryName(f.path);
  const fd = openSync(tmp, 'wx');
  try {
    let done = 0;
    while (done < data.length) done += writeSync(fd, data, done, data.length - done);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
  return { tmp, bytes: data.length, sha256: createHash('sha256').update(data).digest('hex') };
}

function removeQuietly(path: string): void {
  try {
    unlinkSync(path);
  } catch {
    // already renamed, removed, or never written
  }
}

/**
 * Writes all files, each to a temporary file that is flushed to disk (fsync) and then renamed over the
 * target, so a reader sees the old file or the complete new one, never a part. If any write fails,
 * every temporary file is removed and no target is touched.
 */
export function writeFilesAtomically(files: OutputFile[]): void {
  const temps: { tmp: string; path: string }[] = [];
  try {
    for (const f of files) temps.push({ tmp: writeTemporary(f).tmp, path: f.path });
    for (const t of temps) renameSync(t.tmp, t.path);
    for (const d of new Set(files.map((f) => dirname(f.path)))) syncFolder(d);
  } catch (err) {
    for (const t of temps) removeQuietly(t.tmp);
    throw new UsageError(`cannot write output: ${(err as Error).message} (check the folder exists and is writable)`);
  }
}

/** True if a process with this id exists (signal 0 tests for it without sending anything). */
function processAlive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Removes the temporary files that a run killed while writing (SIGKILL, power loss) left in `dir` beside
 * the outputs named in `names`: files matching our temporary pattern whose writing process is gone.
 * A temporary of a process still running (another landreach writing there) is left alone. Returns the
 * names removed.
 */
export function removeOrphanTemporaries(dir: string, names: readonly string[]): string[] {
  if (!existsSync(dir)) return [];
  const wanted = new Set(names);
  const removed: string[] = [];
  for (const entry of readdirSync(dir)) {
    const m = TEMPORARY.exec(entry);
    if (!m) continue;
    const target = m[1] ?? m[3];
    const pid = Number(m[2] ?? m[4]);
    if (!wanted.has(target) || processAlive(pid)) continue;
    try {
      unlinkSync(join(dir, entry));
      removed.push(entry);
    } catch {
      // gone meanwhile, or not ours to remove: the next run tries again
    }
  }
  return removed;
}

/** What the command line writes beside a run's result files (see writeOutputSet). */
export const MANIFEST_FORMAT = 'landreach-output-manifest';

export interface OutputManifest {
  format: typeof MANIFEST_FORMAT;
  version: 1;
  caution: string;
  /** How to use this file. */
  note: string;
  appVersion: string;
  /** Every result file of the set: name (in the manifest's folder), size and SHA-256 (FIPS 180-4). */
  files: { name: string; bytes: number; sha256: string }[];
  /**
   * The run record: what varies from run to run for the same inputs (date, elapsed time, worker count,
   * how the run ended) and so is kept out of the result files, which are then the same bytes for the same
   * inputs. Keys are command-specific; `status` is always present ('complete' or 'stopped-early').
   */
  run: { status: 'complete' | 'stopped-early'; [key: string]: unknown };
}

const MANIFEST_NOTE =
  'Written last, after every file below: the set is complete and consistent when this manifest exists and every file listed has this size and SHA-256 ' +
  '(e.g. `landreach verify DIR`, or sha256sum). The manifest is removed before any file of a new set replaces an old one, so a folder without it ' +
  'may hold a mix of two runs. The result files hold no date, duration or worker count (they are here), so the same inputs give the same bytes.';

/** Manifest file name for a set whose files share a stem: footprint → footprint.manifest.json. */
export const manifestName = (stem: string) => `${stem}.manifest.json`;

/**
 * Writes a run's result files into their folder so that a reader can always tell a complete set from a
 * partial or mixed one: (1) every file goes to a flushed temporary; (2) the set's previous manifest is
 * removed (and the removal flushed); (3) the temporaries are renamed over their targets and the folder
 * flushed; (4) the manifest — every file's size and SHA-256, and the run record — is written the same way,
 * last. Killed at any point, the folder holds the old complete set with its manifest, or files without a
 * manifest (incomplete: the next run's `removeOrphanTemporaries` clears its temporaries), or the new
 * complete set with its manifest. If a write fails, the temporaries are removed.
 */
export function writeOutputSet(files: OutputFile[], manifest: { name: string; run: OutputManifest['run'] }): string {
  if (files.length === 0) throw new Error('internal: an output set needs at least one file');
  const dir = dirname(files[0].path);
  if (files.some((f) => dirname(f.path) !== dir)) throw new Error('internal: the files of an output set share one folder');
  const manifestPath = join(dir, manifest.name);
  const temps: { tmp: string; path: string }[] = [];
  try {
    const listed: OutputManifest['files'] = [];
    for (const f of files) {
      const t = writeTemporary(f);
      temps.push({ tmp: t.tmp, path: f.path });
      listed.push({ name: basename(f.path), bytes: t.bytes, sha256: t.sha256 });
    }
    const body: OutputManifest = { format: MANIFEST_FORMAT, version: 1, caution: CAUTION, note: MANIFEST_NOTE, appVersion: APP_VERSION, files: listed, run: manifest.run };
    temps.push({ tmp: writeTemporary({ path: manifestPath, text: JSON.stringify(body, null, 1) + '\n' }).tmp, path: manifestPath });
    if (existsSync(manifestPath)) {
      unlinkSync(manifestPath);
      syncFolder(dir);
    }
    for (const t of temps.slice(0, -1)) renameSync(t.tmp, t.path);
    syncFolder(dir);
    const last = temps[temps.length - 1];
    renameSync(last.tmp, last.path);
    syncFolder(dir);
    return manifestPath;
  } catch (err) {
    for (const t of temps) removeQuietly(t.tmp);
    throw new UsageError(`cannot write output: ${(err as Error).message} (check the folder exists and is writable)`);
  }
}

export interface OutputSetCheck {
  manifest: string;
  /** complete: every listed file present with its size and SHA-256; otherwise what is wrong. */
  complete: boolean;
  status: OutputManifest['run']['status'] | null;
  problems: string[];
}

/** Checks a manifest against the files beside it (see writeOutputSet). */
export function checkOutputSet(manifestPath: string): OutputSetCheck {
  const dir = dirname(manifestPath);
  let m: OutputManifest;
  try {
    m = JSON.parse(readFileSync(manifestPath, 'utf8')) as OutputManifest;
  } catch (err) {
    return { manifest: manifestPath, complete: false, status: null, problems: [`cannot read the manifest: ${(err as Error).message}`] };
  }
  if (m.format !== MANIFEST_FORMAT || !Array.isArray(m.files)) {
    return { manifest: manifestPath, complete: false, status: null, problems: [`not a ${MANIFEST_FORMAT} file`] };
  }
  const problems: string[] = [];
  for (const f of m.files) {
    let data: Buffer;
    try {
      data = readFileSync(join(dir, f.name));
    } catch {
      problems.push(`${f.name}: missing`);
      continue;
    }
    if (data.length !== f.bytes || createHash('sha256').update(data).digest('hex') !== f.sha256) {
      problems.push(`${f.name}: not the file this manifest lists (another run's, or changed since)`);
    }
  }
  return { manifest: manifestPath, complete: problems.length === 0, status: m.run?.status ?? null, problems };
}
