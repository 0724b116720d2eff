import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import * as fs from 'node:fs/promises';
import * as os from 'node:os';
import * as path from 'node:path';
import {
  atomicWriteFile,
  readStudyFile,
  realFileSystem,
  writeStudyFile,
  withExtension,
  FileServiceError,
  type FileSystem,
} from '../../../electron/file-service.ts';
import { STUDY_FORMAT, STUDY_VERSION } from '../../../electron/study-envelope.ts';

const study = (extra: Record<string, unknown> = {}) => JSON.stringify({ format: STUDY_FORMAT, version: STUDY_VERSION, name: 'invented demo', ...extra });

let dir: string;
beforeEach(async () => {
  dir = await fs.mkdtemp(path.join(os.tmpdir(), 'landreach-fs-'));
});
afterEach(async () => {
  await fs.rm(dir, { recursive: true, force: true });
});

/** Records the order of file-system calls and lets a test fail one of them. */
function tracingFs(failOn?: 'rename' | 'sync') {
  const calls: string[] = [];
  const traced: FileSystem = {
    ...realFileSystem,
    open: (async (file: string, flags?: string, mode?: number) => {
      const handle = await realFileSystem.open(file, flags, mode);
      calls.push(`open ${path.basename(file)} ${flags}`);
      const originalSync = handle.sync.bind(handle);
      handle.sync = async () => {
        calls.push(`sync ${path.basename(file)}`);
        if (failOn === 'sync' && flags === 'wx') throw new Error('simulated disk full');
        return originalSync();
      };
      return handle;
    }) as FileSystem['open'],
    rename: async (from, to) => {
      calls.push(`rename ${path.basename(String(from))} -> ${path.basename(String(to))}`);
      if (failOn === 'rename') throw new Error('simulated crash before rename');
      return realFileSystem.rename(from, to);
    },
  };
  return { fs: traced, calls };
}

describe('atomic writes', () => {
  it('writes to a temp file, fsyncs it, renames it over the target, then fsyncs the folder', async () => {
    const target = path.join(dir, 'a.landreach.json');
    const { fs: traced, calls } = tracingFs();
    await atomicWriteFile(target, 'hello', traced);
    expect(await fs.readFile(target, 'utf8')).toBe('hello');
    const tempOpen = calls.findIndex((c) => c.startsWith('open .a.landreach.json.') && c.endsWith(' wx'));
    const tempSync = calls.findIndex((c) => c.startsWith('sync .a.landreach.json.'));
    const rename = calls.findIndex((c) => c.startsWith('rename .a.landreach.json.') && c.endsWith('-> a.landreach.json'));
    const dirSync = calls.findIndex((c) => c === `sync ${path.basename(dir)}`);
    expect(tempOpen).toBeGreaterThanOrEqual(0);
    expect(tempSync).toBeGreaterThan(tempOpen);
    expect(rename).toBeGreaterThan(tempSync);
    expect(dirSync).toBeGreaterThan(rename);
    expect(await fs.readdir(dir)).toEqual(['a.landreach.json']);
  });

  it.each(['rename', 'sync'] as const)('leaves the old file intact and no temp file behind when %s fails', async (failOn) => {
    const target = path.join(dir, 'b.landreach.json');
    await fs.writeFile(target, 'old content');
    const { fs: traced } = tracingFs(failOn);
    await expect(atomicWriteFile(target, 'new content', traced)).rejects.toThrow(/simulated/);
    expect(await fs.readFile(target, 'utf8')).toBe('old content');
    expect(await fs.readdir(dir)).toEqual(['b.landreach.json']);
  });

  it('writes bytes unchanged', async () => {
    const target = path.join(dir, 'c.png');
    const bytes = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0, 255, 1]);
    await atomicWriteFile(target, bytes);
    expect(new Uint8Array(await fs.readFile(target))).toEqual(bytes);
  });
});

describe('study files', () => {
  it('round-trips a study', async () => {
    const target = path.join(dir, 'd.landreach.json');
    await writeStudyFile(target, study());
    expect(await readStudyFile(target)).toBe(study());
  });

  it('replaces an existing readable study', async () => {
    const target = path.join(dir, 'e.landreach.json');
    await fs.writeFile(target, study({ name: 'first' }));
    await writeStudyFile(target, study({ name: 'second' }));
    expect(JSON.parse(await fs.readFile(target, 'utf8')).name).toBe('second');
  });

  it('never overwrites a corrupt file, and says why and what to do', async () => {
    const target = path.join(dir, 'f.landreach.json');
    await fs.writeFile(target, '{"format": "landreach-study", "vers');
    const error = await writeStudyFile(target, study()).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(FileServiceError);
    expect((error as Error).message).toMatch(/f\.landreach\.json cannot be read: not valid JSON.*Save As/);
    expect(await fs.readFile(target, 'utf8')).toBe('{"format": "landreach-study", "vers');
  });

  it('never overwrites a study from a newer version', async () => {
    const target = path.join(dir, 'g.landreach.json');
    const newer = JSON.stringify({ format: STUDY_FORMAT, version: STUDY_VERSION + 1 });
    await fs.writeFile(target, newer);
    await expect(writeStudyFile(target, study())).rejects.toThrow(new RegExp(`newer Landreach \\(study version ${STUDY_VERSION + 1}`));
    expect(await fs.readFile(target, 'utf8')).toBe(newer);
  });

  it('never overwrites a file that is not a study', async () => {
    const target = path.join(dir, 'notes.json');
    await fs.writeFile(target, '{"todo": ["keep me"]}');
    await expect(writeStudyFile(target, study())).rejects.toThrow(/not a Landreach study/);
    expect(await fs.readFile(target, 'utf8')).toBe('{"todo": ["keep me"]}');
  });

  it('refuses to write text that is not a study envelope', async () => {
    const target = path.join(dir, 'h.landreach.json');
    await expect(writeStudyFile(target, '{"format":"other"}')).rejects.toThrow(/study to write is invalid/);
    await expect(fs.stat(target)).rejects.toThrow();
  });

  it('reports missing, corrupt and newer files when opening', async () => {
    await expect(readStudyFile(path.join(dir, 'missing.json'))).rejects.toThrow(/missing\.json no longer exists/);
    await fs.writeFile(path.join(dir, 'bad.json'), 'not json');
    await expect(readStudyFile(path.join(dir, 'bad.json'))).rejects.toThrow(/bad\.json cannot be read: not valid JSON/);
    await fs.writeFile(path.join(dir, 'v0.json'), JSON.stringify({ format: STUDY_FORMAT, version: 0 }));
    await expect(readStudyFile(path.join(dir, 'v0.json'))).rejects.toThrow(/"version" is 0, expected a positive integer/);
    await expect(readStudyFile(dir)).rejects.toThrow(/is not a file/);
  });
});

describe('replacing a file keeps what the user set up (issue 12)', () => {
  const posix = process.platform !== 'win32';

  it.runIf(posix)('keeps a 0600 study 0600 (and a 0640 export 0640)', async () => {
    const target = path.join(dir, 'private.landreach.json');
    await fs.writeFile(target, study({ name: 'first' }), { mode: 0o600 });
    await fs.chmod(target, 0o600);
    await writeStudyFile(target, study({ name: 'second' }));
    expect((await fs.stat(target)).mode & 0o777).toBe(0o600);
    expect(JSON.parse(await fs.readFile(target, 'utf8')).name).toBe('second');
    const exported = path.join(dir, 'map.csv');
    await fs.writeFile(exported, 'old');
    await fs.chmod(exported, 0o640);
    await atomicWriteFile(exported, 'new');
    expect((await fs.stat(exported)).mode & 0o777).toBe(0o640);
  });

  it('gives a new file the usual 0644 (before the umask)', async () => {
    const target = path.join(dir, 'new.landreach.json');
    await writeStudyFile(target, study());
    const umask = process.umask();
    if (posix) expect((await fs.stat(target)).mode & 0o777).toBe(0o644 & ~umask);
  });

  it('refuses to replace a read-only study, says so, and leaves it as it was', async () => {
    const target = path.join(dir, 'locked.landreach.json');
    await fs.writeFile(target, study({ name: 'locked' }));
    await fs.chmod(target, 0o444);
    const error = await writeStudyFile(target, study({ name: 'other' })).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(FileServiceError);
    expect((error as Error).message).toMatch(/Not saved: locked\.landreach\.json is read-only.*Save As/);
    expect(JSON.parse(await fs.readFile(target, 'utf8')).name).toBe('locked');
    expect((await fs.stat(target)).mode & 0o777).toBe(0o444);
    expect(await fs.readdir(dir)).toEqual(['locked.landreach.json']);
  });

  it.runIf(posix)('writes through a symlink to its target, leaving the link a link', async () => {
    const realDir = path.join(dir, 'shared');
    await fs.mkdir(realDir);
    const real = path.join(realDir, 'site.landreach.json');
    await fs.writeFile(real, study({ name: 'old' }));
    const link = path.join(dir, 'site-link.landreach.json');
    await fs.symlink(path.join('shared', 'site.landreach.json'), link);
    await writeStudyFile(link, study({ name: 'new' }));
    expect((await fs.lstat(link)).isSymbolicLink()).toBe(true);
    expect(JSON.parse(await fs.readFile(real, 'utf8')).name).toBe('new');
    expect((await fs.readdir(dir)).sort()).toEqual(['shared', 'site-link.landreach.json']);
    expect(await fs.readdir(realDir)).toEqual(['site.landreach.json']);
  });

  it.runIf(posix)('follows a chain of links, and a link to a file not yet written', async () => {
    const real = path.join(dir, 'figure.png');
    await fs.symlink('figure.png', path.join(dir, 'b.png'));
    await fs.symlink(path.join(dir, 'b.png'), path.join(dir, 'a.png'));
    await atomicWriteFile(path.join(dir, 'a.png'), new Uint8Array([1, 2, 3]));
    expect((await fs.lstat(path.join(dir, 'a.png'))).isSymbolicLink()).toBe(true);
    expect((await fs.lstat(path.join(dir, 'b.png'))).isSymbolicLink()).toBe(true);
    expect(new Uint8Array(await fs.readFile(real))).toEqual(new Uint8Array([1, 2, 3]));
  });
});

describe('study text as other tools write it', () => {
  it('opens a study that starts with a UTF-8 byte-order mark (and hands on the text without it)', async () => {
    const file = path.join(dir, 'bom.landreach.json');
    await fs.writeFile(file, Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(study())]));
    expect(await readStudyFile(file)).toBe(study());
  });

  it('refuses invalid UTF-8 naming the byte and the line, instead of replacing it', async () => {
    const file = path.join(dir, 'latin1.landreach.json');
    const text = study({ name: 'XX' });
    const at = text.indexOf('XX');
    await fs.writeFile(file, Buffer.concat([Buffer.from(text.slice(0, at)), Buffer.from([0xe9]), Buffer.from(text.slice(at))]));
    await expect(readStudyFile(file)).rejects.toThrow(new RegExp(`latin1\\.landreach\\.json is not UTF-8 text \\(byte ${at}, line 1\\).*UTF-8`));
  });
});

describe('file names', () => {
  it('adds an extension only when missing', () => {
    expect(withExtension('site', 'png')).toBe('site.png');
    expect(withExtension('site.PNG', 'png')).toBe('site.PNG');
    expect(withExtension('a', 'landreach.json')).toBe('a.landreach.json');
  });
});
