/**
 * The rule of test/support/reference-tools.ts: a missing reference tool or an uncompilable WebAssembly
 * module fails a CI run (CI=true) and is a visible skip elsewhere. Missing tools are simulated with the
 * overrides (LANDREACH_PYTHON, LANDREACH_GDAL_BIN, LANDREACH_CHROMIUM → paths that do not exist) in a
 * separate vitest run of real reference test files; nothing on the machine is removed.
 */
import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ITERATION_BASE64 } from '../../../core/conic/wasm/iteration.generated.ts';
import { KERNELS_BASE64 } from '../../../core/linalg/wasm/kernels.generated.ts';
import { decide, isCi, wasmModulesProblem, type Missing } from '../../support/reference-tools.ts';

const ROOT = new URL('../../..', import.meta.url).pathname;
const VITEST = path.join(ROOT, 'node_modules/vitest/vitest.mjs');
const GONE = '/nonexistent/landreach-test';

const bytesOf = (base64: string) => Uint8Array.from(atob(base64), (c) => c.charCodeAt(0));
const base64Of = (bytes: Uint8Array) => btoa(String.fromCharCode(...bytes));

describe('the CI rule for reference tools', () => {
  const gdal: Missing = { label: 'GDAL (Debian gdal-bin)', reason: 'gdalinfo not found on PATH', fix: 'apt-get install gdal-bin' };

  it('runs when nothing is missing, throws under CI, warns and skips elsewhere', () => {
    const warnings: string[] = [];
    expect(decide([], true)).toBe(true);
    expect(() => decide([gdal], true)).toThrow(/missing under CI=true \(a CI run never skips them\):\nGDAL \(Debian gdal-bin\): gdalinfo not found on PATH\. Fix: apt-get install gdal-bin/);
    expect(decide([gdal], false, (t) => warnings.push(t))).toBe(false);
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toMatch(/^SKIPPED reference checks \(a failure under CI=true\):\nGDAL/);
  });

  it('reads CI the way CI services set it', () => {
    expect([isCi({ CI: 'true' }), isCi({ CI: '1' }), isCi({ CI: 'TRUE' })]).toEqual([true, true, true]);
    expect([isCi({}), isCi({ CI: '' }), isCi({ CI: 'false' }), isCi({ CI: '0' })]).toEqual([false, false, false, false]);
  });
});

describe('the WebAssembly availability check', () => {
  it('compiles the committed modules', () => {
    expect(wasmModulesProblem({ kernels: KERNELS_BASE64, iteration: ITERATION_BASE64 })).toBeNull();
  });

  it('reports a corrupt module, naming it, so that a CI run fails instead of skipping the kernel tests', () => {
    // WebAssembly core specification (binary format, modules): a module starts with the magic \0asm and
    // version 1, and every section has the length it declares; a wrong magic byte or a cut-off last
    // section each make the module invalid.
    const good = bytesOf(KERNELS_BASE64);
    const badMagic = good.slice();
    badMagic[1] = 0x62;
    const truncated = good.slice(0, good.length - 7);
    for (const bytes of [badMagic, truncated]) {
      const problem = wasmModulesProblem({ kernels: KERNELS_BASE64, iteration: base64Of(bytes) });
      expect(problem).toMatch(/^the iteration module does not compile: /);
      expect(() => decide([{ label: 'WebAssembly kernels', reason: problem!, fix: 'npm run build:kernels' }], true)).toThrow(/WebAssembly kernels: the iteration module does not compile/);
    }
  });
});

/** A separate vitest run of reference test files under the given environment. */
function vitestRun(files: string[], env: Record<string, string>) {
  const out = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'landreach-ci-rule-')), 'report.json');
  const base = { ...process.env };
  delete base.CI;
  delete base.VITEST;
  delete base.VITEST_POOL_ID;
  delete base.VITEST_WORKER_ID;
  const r = spawnSync(process.execPath, [VITEST, 'run', '--project', 'reference', '--reporter=default', '--reporter=json', `--outputFile.json=${out}`, ...files], {
    cwd: ROOT, env: { ...base, ...env }, encoding: 'utf8', timeout: 120_000,
  });
  const report = JSON.parse(fs.readFileSync(out, 'utf8')) as {
    numPassedTests: number; numFailedTests: number; numPendingTests: number;
    testResults: { name: string; status: string; message: string }[];
  };
  fs.rmSync(path.dirname(out), { recursive: true, force: true });
  return { status: r.status, stderr: r.stderr, report };
}

describe('reference test files with their tools missing', () => {
  const files = ['test/reference/colormap.test.ts', 'test/reference/descent/cvxopt.test.ts', 'test/reference/terrain/gdal-slope.test.ts'];
  const missing = { LANDREACH_PYTHON: `${GONE}/python3`, LANDREACH_GDAL_BIN: GONE };

  it('fail the run under CI=true, each file naming the missing tool', () => {
    const { status, report } = vitestRun(files, { ...missing, CI: 'true' });
    expect(status).not.toBe(0);
    expect(report.numPassedTests).toBe(0);
    const byFile = Object.fromEntries(report.testResults.map((t) => [path.relative(ROOT, t.name), t]));
    expect(Object.keys(byFile).sort()).toEqual([...files].sort());
    for (const f of files) expect(byFile[f].status, f).toBe('failed');
    expect(byFile['test/reference/colormap.test.ts'].message).toMatch(/Matplotlib \(Debian python3-matplotlib\): cannot run \/nonexistent/);
    expect(byFile['test/reference/descent/cvxopt.test.ts'].message).toMatch(/CVXOPT \(Debian python3-cvxopt\)/);
    expect(byFile['test/reference/terrain/gdal-slope.test.ts'].message).toMatch(/GDAL \(Debian gdal-bin\): gdalinfo, .* not found in \/nonexistent/);
  }, 120_000);

  it('are skipped with a visible warning on a developer machine (no CI)', () => {
    const { status, stderr, report } = vitestRun(files, missing);
    expect(status).toBe(0);
    expect(report.numFailedTests).toBe(0);
    expect(report.numPassedTests).toBe(0);
    expect(report.numPendingTests).toBeGreaterThan(0);
    for (const label of ['Matplotlib', 'CVXOPT', 'GDAL']) expect(stderr).toMatch(new RegExp(`SKIPPED reference checks[^]*${label}`));
  }, 120_000);
});
