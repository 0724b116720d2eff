/**
 * `landreach hazard` writes like the other commands (issue 12): every output goes to a temporary file that
 * is flushed to disk (fsync) before it is renamed over its target, the folder is flushed after the renames,
 * and a manifest listing every output's SHA-256 is written last. The file-system calls are recorded by
 * wrapping node:fs (the real calls still run).
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { gridFromFunction, writeJsonGrid } from '../../../core/terrain/index.ts';
import { captureIo } from '../../support/cli-io.ts';

const calls = vi.hoisted(() => ({ log: [] as { op: 'fsync' | 'rename'; path: string; from?: string }[] }));

vi.mock('node:fs', async (importOriginal) => {
  const fs = await importOriginal<typeof import('node:fs')>();
  const pathOf = new Map<number, string>();
  const wrapped = {
    openSync: (p: import('node:fs').PathLike, ...rest: unknown[]) => {
      const fd = (fs.openSync as (...a: unknown[]) => number)(p, ...rest);
      pathOf.set(fd, String(p));
      return fd;
    },
    fsyncSync: (fd: number) => {
      calls.log.push({ op: 'fsync', path: pathOf.get(fd) ?? '?' });
      return fs.fsyncSync(fd);
    },
    renameSync: (from: import('node:fs').PathLike, to: import('node:fs').PathLike) => {
      calls.log.push({ op: 'rename', path: String(to), from: String(from) });
      return fs.renameSync(from, to);
    },
  };
  return { ...fs, ...wrapped, default: { ...fs, ...wrapped } };
});

const dir = mkdtempSync(join(tmpdir(), 'landreach-hazard-atomic-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
beforeEach(() => {
  calls.log.length = 0;
});

// A 12° plane in the west half, flat in the east half, at 1 m pixels (invented terrain).
const DEG = Math.PI / 180;
const demPath = join(dir, 'plane.json');
writeFileSync(demPath, writeJsonGrid(gridFromFunction({ width: 40, height: 20, pixelSizeX_m: 1, pixelSizeY_m: 1 }, (x) => (x < 20 ? Math.tan(12 * DEG) * (20 - x) : 0))));

const OUTPUTS = ['slope.tif', 'footprint-slope.tif', 'roughness.tif', 'hazard.tif', 'hazard-summary.json'];

describe('landreach hazard writes atomically', () => {
  it('flushes every output before renaming it into place, flushes the folder, and writes the manifest last', async () => {
    const out = join(dir, 'a');
    const h = captureIo();
    expect(await main(['hazard', demPath, '--out', out, '--lander-diameter-m', '4'], h.io), h.err.join('')).toBe(0);
    const renames = calls.log.filter((c) => c.op === 'rename');
    for (const name of [...OUTPUTS, 'hazard.manifest.json']) {
      const k = calls.log.findIndex((c) => c.op === 'rename' && c.path === join(out, name));
      expect(k, `${name} renamed into place`).toBeGreaterThanOrEqual(0);
      const from = calls.log[k].from!;
      expect(calls.log.slice(0, k).some((c) => c.op === 'fsync' && c.path === from), `${name}: its temporary flushed before the rename`).toBe(true);
    }
    expect(renames[renames.length - 1].path).toBe(join(out, 'hazard.manifest.json'));
    const lastRename = calls.log.lastIndexOf(renames[renames.length - 1]);
    expect(calls.log.slice(lastRename).some((c) => c.op === 'fsync' && c.path === out), 'the folder flushed after the last rename').toBe(true);
    // The manifest lists every output with its SHA-256 (Node's crypto as the reference).
    const manifest = JSON.parse(readFileSync(join(out, 'hazard.manifest.json'), 'utf8'));
    expect(manifest.files.map((f: { name: string }) => f.name).sort()).toEqual([...OUTPUTS].sort());
    for (const f of manifest.files) expect(f.sha256).toBe(createHash('sha256').update(readFileSync(join(out, f.name))).digest('hex'));
    expect(manifest.run.status).toBe('complete');
  });

  it('removes the temporaries a killed run left (including the old ".tmp-PID" names), never a live process\'s', async () => {
    const out = join(dir, 'b');
    mkdirSync(out);
    // The id of a process that has ended (a child that ran and exited).
    const dead = spawnSync(process.execPath, ['-e', '']).pid!;
    const orphans = [`hazard.tif.tmp-${dead}`, `slope.tif.${dead}.k2x9a7.tmp`];
    const live = `roughness.tif.${process.pid}.abc123.tmp`;
    for (const f of [...orphans, live]) writeFileSync(join(out, f), 'partial');
    const h = captureIo();
    expect(await main(['hazard', demPath, '--out', out, '--lander-diameter-m', '4'], h.io), h.err.join('')).toBe(0);
    for (const f of orphans) expect(existsSync(join(out, f)), f).toBe(false);
    expect(existsSync(join(out, live))).toBe(true);
    expect(h.err.join('')).toMatch(/removed 2 temporary file\(s\)/);
  });
});
