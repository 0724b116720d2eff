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

describe('file names', () => {
  it('adds an extension only when missing', () => {
    expect(withExtension('site', 'png')).toBe('site.png');
    expect(withExtension('site.PNG', 'png')).toBe('site.PNG');
    expect(withExtension('a', 'landreach.json')).toBe('a.landreach.json');
  });
});
