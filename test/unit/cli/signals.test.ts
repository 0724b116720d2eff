/**
 * Stopping `landreach footprint` and `landreach study` with signals (issue 12): Ctrl-C twice in quick
 * succession, or SIGTERM, must still write every finished row, mark the files as stopped early and exit
 * with 128 + the signal's number (the shell's convention: 130 for SIGINT, 143 for SIGTERM).
 *
 * The command runs as a real process (bin/landreach.mjs). Each test waits for the progress line of the
 * first finished row on stderr — never for a length of time — then signals. The grids are large (101 × 101
 * targets, minutes of work) so that the run is still going when the signal lands.
 */
import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { checkOutputSet } from '../../../core/cli/files.ts';
import { DEMO_STUDY_PATH } from '../../support/scenarios.ts';

const BIN = fileURLToPath(new URL('../../../bin/landreach.mjs', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'landreach-sig-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface Running {
  child: ChildProcessWithoutNullStreams;
  stderr: () => string;
  stdout: () => string;
  /** Resolves with the stderr match once the pattern appears (rejects if the process ends first). */
  waitFor: (pattern: RegExp) => Promise<RegExpExecArray>;
  exit: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

function runCli(args: string[]): Running {
  const child = spawn(process.execPath, [BIN, ...args], { stdio: 'pipe' });
  let err = '';
  let out = '';
  const waiters: { pattern: RegExp; resolve: (m: RegExpExecArray) => void }[] = [];
  child.stderr.on('data', (d: Buffer) => {
    err += d.toString('utf8');
    for (const w of [...waiters]) {
      const m = w.pattern.exec(err);
      if (m) {
        waiters.splice(waiters.indexOf(w), 1);
        w.resolve(m);
      }
    }
  });
  child.stdout.on('data', (d: Buffer) => (out += d.toString('utf8')));
  const exit = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.on('close', (code, signal) => resolve({ code, signal })));
  return {
    child,
    stderr: () => err,
    stdout: () => out,
    exit,
    waitFor: (pattern) =>
      new Promise((resolve, reject) => {
        const m = pattern.exec(err);
        if (m) return resolve(m);
        waiters.push({ pattern, resolve });
        void exit.then(({ code }) => reject(new Error(`the command ended (code ${code}) before ${pattern} appeared:\n${err}`)));
      }),
  };
}

/** The progress line of a finished row: "[##…] 3 %  303/10201 targets". */
const FIRST_ROW = /\]\s+\d+ %\s+(\d+)\/(\d+) targets/;

describe('landreach footprint stopped by a signal', () => {
  it.each([
    { name: 'Ctrl-C twice in quick succession', signals: ['SIGINT', 'SIGINT'] as const, code: 130, by: 'SIGINT' },
    { name: 'SIGTERM', signals: ['SIGTERM'] as const, code: 143, by: 'SIGTERM' },
  ])('$name: writes every finished row, marks the files as stopped early, exits $code', async ({ signals, code, by }) => {
    const out = join(dir, `fp-${by}-${signals.length}`);
    const run = runCli(['footprint', DEMO_STUDY_PATH, '--out', out, '--grid', '101x101', '--extent-m', '2500', '--workers', '2']);
    const first = await run.waitFor(FIRST_ROW);
    const doneWhenSignalled = Number(first[1]);
    for (const s of signals) run.child.kill(s);
    const exit = await run.exit;
    expect(exit, run.stderr()).toEqual({ code, signal: null });
    expect(run.stderr()).toMatch(new RegExp(`${by}: stopping; writing the results that finished`));

    // A complete set (the manifest's hashes match) whose run record says how it ended.
    const check = checkOutputSet(join(out, 'footprint.manifest.json'));
    expect(check.problems).toEqual([]);
    expect(check.status).toBe('stopped-early');
    const manifest = JSON.parse(readFileSync(join(out, 'footprint.manifest.json'), 'utf8'));
    expect(manifest.run).toMatchObject({ status: 'stopped-early', stoppedBy: by, targets: 101 * 101 });

    const report = JSON.parse(readFileSync(join(out, 'footprint.json'), 'utf8'));
    expect(report.stoppedEarly).toBe(true);
    expect(report.summary.cancelled).toBe(true);
    // Every row finished before the signal is in the files, and only whole rows are.
    const computed = report.summary.targets - report.summary.pending;
    expect(computed).toBeGreaterThanOrEqual(doneWhenSignalled);
    expect(computed % 101).toBe(0);
    expect(report.summary.pending).toBeGreaterThan(0);
    for (let j = 0; j < 101; j++) {
      const row = report.grid.status.slice(j * 101, (j + 1) * 101);
      expect(new Set(row.map((s: string) => s === 'pending')).size, `row ${j} is whole`).toBe(1);
    }
    const csv = readFileSync(join(out, 'footprint.csv'), 'utf8').split('\n');
    expect(csv[1]).toBe(`# STOPPED EARLY: partial result; ${report.summary.pending} of ${101 * 101} targets not computed (status pending)`);
    expect(JSON.parse(readFileSync(join(out, 'footprint.geojson'), 'utf8')).stopped_early).toMatch(/^STOPPED EARLY/);
    expect(readFileSync(join(out, 'footprint.svg'), 'utf8')).toContain('STOPPED EARLY');
    expect(run.stdout()).toMatch(new RegExp(`status: +stopped early by ${by}`));
  }, 300_000);
});

describe('landreach study stopped by a signal', () => {
  it('SIGTERM during the reserve study: writes the partial study marked as stopped early, exits 143', async () => {
    const out = join(dir, 'study');
    const run = runCli(['study', 'reserve', DEMO_STUDY_PATH, '--out', out, '--grid', '101x101', '--extent-m', '2500', '--workers', '2']);
    await run.waitFor(FIRST_ROW);
    run.child.kill('SIGTERM');
    const exit = await run.exit;
    expect(exit, run.stderr()).toEqual({ code: 143, signal: null });
    const check = checkOutputSet(join(out, 'study-reserve.manifest.json'));
    expect(check.problems).toEqual([]);
    expect(check.status).toBe('stopped-early');
    expect(JSON.parse(readFileSync(join(out, 'study-reserve.json'), 'utf8')).cancelled).toBe(true);
    expect(readFileSync(join(out, 'study-reserve.csv'), 'utf8').split('\n')[1]).toMatch(/^# STOPPED EARLY/);
  }, 300_000);
});
