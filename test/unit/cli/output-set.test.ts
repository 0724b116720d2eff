/**
 * Output sets that survive a crash (issue 12): a run killed while writing (SIGKILL, power loss) must leave
 * a folder in which a reader can tell a complete set from a partial or mixed one, and the next run must
 * clear the temporaries it left. The crash is simulated by making the n-th file-system call fail and every
 * later one too (the process is gone: not even its clean-up runs), for every n.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { checkOutputSet, removeOrphanTemporaries, writeOutputSet } from '../../../core/cli/files.ts';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';
import { DEMO_STUDY_PATH } from '../../support/scenarios.ts';

const crash = vi.hoisted(() => ({ at: -1, count: 0 }));

vi.mock('node:fs', async (importOriginal) => {
  const fs = await importOriginal<typeof import('node:fs')>();
  // Calls that change the disk: the n-th (counted from 0) fails, and so does every later one.
  const guard = <F extends (...a: never[]) => unknown>(f: F): F =>
    ((...a: never[]) => {
      if (crash.at >= 0 && crash.count++ >= crash.at) throw new Error('simulated crash');
      return f(...a);
    }) as F;
  const wrapped = {
    openSync: guard(fs.openSync),
    writeSync: guard(fs.writeSync),
    fsyncSync: guard(fs.fsyncSync),
    renameSync: guard(fs.renameSync),
    unlinkSync: guard(fs.unlinkSync),
  };
  return { ...fs, ...wrapped, default: { ...fs, ...wrapped } };
});

const dir = mkdtempSync(join(tmpdir(), 'landreach-set-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The id of a process that has ended (a child that ran and exited). */
const deadPid = () => spawnSync(process.execPath, ['-e', '']).pid!;

const NAMES = ['a.csv', 'b.json', 'c.svg'];
const set = (folder: string, tag: string) => NAMES.map((n) => ({ path: join(folder, n), text: `${n} from run ${tag}\n`.repeat(50) }));

describe('writeOutputSet killed at any point', () => {
  it('leaves the old complete set, or files without a manifest, or the new complete set; never a manifest over mixed files', () => {
    // How many disk-changing calls a write of the set takes.
    const probe = join(dir, 'probe');
    mkdirSync(probe);
    writeOutputSet(set(probe, 'old'), { name: 'x.manifest.json', run: { status: 'complete' } });
    crash.at = Number.MAX_SAFE_INTEGER;
    crash.count = 0;
    writeOutputSet(set(probe, 'new'), { name: 'x.manifest.json', run: { status: 'complete' } });
    const calls = crash.count;
    crash.at = -1;
    expect(calls).toBeGreaterThan(10);

    const seen = new Set<string>();
    const dead = deadPid();
    for (let n = 0; n <= calls; n++) {
      const folder = join(dir, `crash-${n}`);
      mkdirSync(folder);
      writeOutputSet(set(folder, 'old'), { name: 'x.manifest.json', run: { status: 'complete' } });
      crash.at = n;
      crash.count = 0;
      try {
        writeOutputSet(set(folder, 'new'), { name: 'x.manifest.json', run: { status: 'complete' } });
      } catch {
        // the simulated crash
      }
      crash.at = -1;
      const manifest = join(folder, 'x.manifest.json');
      const contents = NAMES.map((f) => readFileSync(join(folder, f), 'utf8').includes('run new'));
      if (existsSync(manifest)) {
        // A manifest present vouches for its files: they are all of one run, the run it lists.
        expect(checkOutputSet(manifest).problems, `crash at call ${n}`).toEqual([]);
        expect(new Set(contents).size, `crash at call ${n}: one run's files`).toBe(1);
        seen.add(contents[0] ? 'new complete' : 'old complete');
      } else seen.add(contents.some((c) => c) ? 'no manifest, files mixed' : 'no manifest, old files');
      // The temporaries the crash left are the next run's to clear (here as if their process had ended).
      for (const f of readdirSync(folder).filter((f) => f.endsWith('.tmp'))) renameSync(join(folder, f), join(folder, f.replace(`.${process.pid}.`, `.${dead}.`)));
      removeOrphanTemporaries(folder, [...NAMES, 'x.manifest.json']);
      expect(readdirSync(folder).filter((f) => f.endsWith('.tmp')), `crash at call ${n}`).toEqual([]);
    }
    // Every kind of crash point was met, the mixed one included (so the test exercises what it guards).
    expect([...seen].sort()).toEqual(['new complete', 'no manifest, files mixed', 'no manifest, old files', 'old complete']);
  });
});

describe('landreach verify and the next run after a crash', () => {
  it('tells a complete set from a mixed one, and the next run clears temporaries and writes a complete set', async () => {
    const out = join(dir, 'fp');
    const args = ['footprint', DEMO_STUDY_PATH, '--out', out, '--grid', '5x5', '--extent-m', '2000', '--workers', '1'];
    const run = async (argv: string[]) => {
      const h = captureIo();
      const code = await main(argv, h.io);
      return { code, out: h.out.join(''), err: h.err.join('') };
    };
    expect((await run(args)).code).toBe(0);
    expect(await run(['verify', out])).toMatchObject({ code: 0, out: expect.stringMatching(/footprint\.manifest\.json: complete \(the run completed\)/) });

    // A second run killed while renaming, as an older Landreach left it: one file already replaced, the old
    // manifest still there, and temporaries of the killed process.
    writeFileSync(join(out, 'footprint.csv'), '# another run\n');
    const dead = deadPid();
    const orphans = [`footprint.json.${dead}.x1y2z3.tmp`, `footprint.svg.${dead}.a9b8c7.tmp`];
    for (const f of orphans) writeFileSync(join(out, f), 'partial');
    const mixed = await run(['verify', out]);
    expect(mixed.code).toBe(1);
    expect(mixed.out).toMatch(/footprint\.manifest\.json: NOT complete\n {2}footprint\.csv: not the file this manifest lists/);

    // Killed after removing the manifest (what writeOutputSet does before replacing any file).
    rmSync(join(out, 'footprint.manifest.json'));
    const noManifest = await run(['verify', out]);
    expect(noManifest.code).toBe(1);
    expect(noManifest.out).toMatch(/not in any manifest .*footprint\.csv/);

    const again = await run(args);
    expect(again.code).toBe(0);
    expect(again.err).toMatch(/removed 2 temporary file\(s\) left in .* by an interrupted run/);
    for (const f of orphans) expect(existsSync(join(out, f))).toBe(false);
    expect((await run(['verify', out])).code).toBe(0);
  }, 120_000);

  it('exits 2 naming the problem when the folder does not exist', async () => {
    const h = captureIo();
    expect(await main(['verify', join(dir, 'nowhere')], h.io)).toBe(2);
    expect(h.err.join('')).toMatch(/is not a folder/);
  });
});
