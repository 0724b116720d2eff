/**
 * `landreach footprint` gives byte-identical result files for 1, 2 and 8 worker threads (issue 11 §2), on
 * the invented demo study and our low-propellant variant of it. What legitimately differs between runs
 * (date, elapsed time, worker count) lives only in the run record, footprint.manifest.json, which is
 * written last and lists every result file with its SHA-256 (FIPS 180-4, Node's crypto as the reference).
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';
import { DEMO_STUDY_PATH, lowPropellantDemo } from '../../support/scenarios.ts';

const dir = mkdtempSync(join(tmpdir(), 'landreach-repro-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const RESULT_FILES = ['footprint.csv', 'footprint.geojson', 'footprint.json', 'footprint.svg'];

const lowPath = join(dir, 'low.study.json');
writeFileSync(lowPath, JSON.stringify(lowPropellantDemo().study));

describe.each([
  { label: 'demo study, ±2.5 km', study: DEMO_STUDY_PATH, extent: '2500' },
  { label: 'low-propellant variant, ±3.5 km', study: lowPath, extent: '3500' },
])('landreach footprint is reproducible: $label', ({ study, extent }) => {
  it('writes the same bytes with 1, 2 and 8 workers; only the manifest differs', async () => {
    const runs: Record<string, Buffer>[] = [];
    const manifests: { run: { workers: number; status: string }; files: { name: string; bytes: number; sha256: string }[] }[] = [];
    for (const workers of [1, 2, 8]) {
      const out = join(dir, `${extent}-w${workers}`);
      const h = captureIo();
      const code = await main(['footprint', study, '--out', out, '--grid', '9x9', '--extent-m', extent, '--workers', String(workers)], h.io);
      expect(code, h.err.join('')).toBe(0);
      expect(readdirSync(out).sort()).toEqual([...RESULT_FILES.slice(0, 3), 'footprint.manifest.json', 'footprint.svg']);
      runs.push(Object.fromEntries(RESULT_FILES.map((f) => [f, readFileSync(join(out, f))])));
      manifests.push(JSON.parse(readFileSync(join(out, 'footprint.manifest.json'), 'utf8')));
    }
    for (const f of RESULT_FILES) {
      expect(runs[1][f].equals(runs[0][f]), `${f}: 2 workers vs 1`).toBe(true);
      expect(runs[2][f].equals(runs[0][f]), `${f}: 8 workers vs 1`).toBe(true);
    }
    // The run record says how each run went; its file list matches the bytes on disk.
    expect(manifests.map((m) => m.run.workers)).toEqual([1, 2, 8]);
    expect(manifests.every((m) => m.run.status === 'complete')).toBe(true);
    for (const [k, m] of manifests.entries()) {
      expect(m.files.map((f) => f.name).sort()).toEqual(RESULT_FILES);
      for (const f of m.files) {
        expect(f.sha256).toBe(createHash('sha256').update(runs[k][f.name]).digest('hex'));
        expect(f.bytes).toBe(runs[k][f.name].length);
      }
    }
    // The result report holds no date or duration (they are in the manifest).
    const report = JSON.parse(runs[0]['footprint.json'].toString('utf8'));
    expect(report).not.toHaveProperty('createdAt');
    expect(report.summary).not.toHaveProperty('elapsed_s');
  }, 240_000);
});
