/**
 * The compiled command line (bin/build-cli.mjs → dist-cli/) against the TypeScript sources it is built from
 * (run through tsx): the same result bytes for a demo trajectory (JSON, CSV and the printed summary), the same
 * trajectory over the demo DEM (the terrain readers and projections, loaded on use, and the WebAssembly
 * kernels, all from the bundle) and the same footprint files with two worker threads (the compiled worker).
 * Then how bin/landreach.mjs chooses: the build when it is present and current, else the sources with a
 * warning naming `npm run build:cli`. Nothing here is timed.
 *
 * The build goes to a scratch project folder (bin/landreach.mjs and bin/build-cli.mjs copied, core/,
 * assets/ and node_modules/ linked), so the
 * repository's own dist-cli/ is neither needed nor touched.
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildCli } from '../../../bin/build-cli.mjs';
import { COMMANDS } from '../../../core/cli/commands/index.ts';
import { DEMO_STUDY_PATH } from '../../support/scenarios.ts';

const ROOT = fileURLToPath(new URL('../../../', import.meta.url));
const DEMO_DEM = join(ROOT, 'assets/demo/terrain/demo-site.tif');
const scratch = mkdtempSync(join(tmpdir(), 'landreach-compiled-'));
const project = join(scratch, 'project');
const BIN = join(project, 'bin/landreach.mjs');
afterAll(() => rmSync(scratch, { recursive: true, force: true }));

beforeAll(async () => {
  mkdirSync(join(project, 'bin'), { recursive: true });
  copyFileSync(join(ROOT, 'bin/landreach.mjs'), BIN);
  copyFileSync(join(ROOT, 'bin/build-cli.mjs'), join(project, 'bin/build-cli.mjs'));
  symlinkSync(join(ROOT, 'core'), join(project, 'core'));
  symlinkSync(join(ROOT, 'node_modules'), join(project, 'node_modules'));
  symlinkSync(join(ROOT, 'assets'), join(project, 'assets'));
  await buildCli(join(project, 'dist-cli'));
}, 120_000);

interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
}

function landreach(args: string[], mode: 'compiled' | 'sources' | 'auto'): Run {
  const env = { ...process.env };
  delete env.LANDREACH_CLI;
  if (mode !== 'auto') env.LANDREACH_CLI = mode;
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd: scratch, env, encoding: 'utf8', timeout: 240_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The JSON report without its creation date (the one field that differs between two runs). */
function reportWithoutDate(path: string): string {
  const report = JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
  expect(report).toHaveProperty('createdAt');
  delete report.createdAt;
  return JSON.stringify(report);
}

describe('the compiled command line gives the same bits as the TypeScript sources', () => {
  it('demo trajectory: JSON (every float as written), CSV and summary', () => {
    const files: Record<string, { json: string; csv: string; stdout: string }> = {};
    for (const mode of ['compiled', 'sources'] as const) {
      const json = join(scratch, `traj-${mode}.json`);
      const csv = join(scratch, `traj-${mode}.csv`);
      const r = landreach(['trajectory', DEMO_STUDY_PATH, '--target', '300,-150', '--json', json, '--csv', csv], mode);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toBe('');
      files[mode] = { json: reportWithoutDate(json), csv: readFileSync(csv, 'utf8'), stdout: r.stdout };
    }
    expect(files.compiled.stdout).toMatch(/status\s+solved/);
    expect(files.compiled.json).toBe(files.sources.json);
    expect(files.compiled.csv).toBe(files.sources.csv);
    expect(files.compiled.stdout).toBe(files.sources.stdout);
  }, 240_000);

  it('trajectory over the demo GeoTIFF: terrain readers and projection from their own chunk', () => {
    const out: Record<string, string> = {};
    for (const mode of ['compiled', 'sources'] as const) {
      const json = join(scratch, `terrain-${mode}.json`);
      const r = landreach(['trajectory', DEMO_STUDY_PATH, '--terrain', DEMO_DEM, '--json', json], mode);
      expect(r.code, r.stderr).toBe(0);
      out[mode] = reportWithoutDate(json);
    }
    expect(out.compiled).toContain('minClearance_m');
    expect(out.compiled).toBe(out.sources);
  }, 240_000);

  it('a refused study: the same exit code and messages (the schema library runs from the bundle)', () => {
    const study = JSON.parse(readFileSync(DEMO_STUDY_PATH, 'utf8')) as { vehicle: Record<string, unknown> };
    study.vehicle.dryMass_kg = 'heavy';
    study.vehicle.unknownField = 1;
    const bad = join(scratch, 'bad.study.json');
    writeFileSync(bad, JSON.stringify(study));
    const compiled = landreach(['trajectory', bad], 'compiled');
    const sources = landreach(['trajectory', bad], 'sources');
    expect(compiled.code).toBe(2);
    expect(compiled.stderr).toMatch(/dryMass_kg/);
    expect(compiled.stderr).toBe(sources.stderr);
    expect(compiled.code).toBe(sources.code);
  }, 240_000);

  it('footprint with two worker threads: the same result files', () => {
    const names = ['footprint.csv', 'footprint.geojson', 'footprint.json', 'footprint.svg'];
    const bytes: Record<string, Buffer[]> = {};
    for (const mode of ['compiled', 'sources'] as const) {
      const dir = join(scratch, `fp-${mode}`);
      const r = landreach(['footprint', DEMO_STUDY_PATH, '--out', dir, '--grid', '3x3', '--extent-m', '1500', '--workers', '2'], mode);
      expect(r.code, r.stderr).toBe(0);
      bytes[mode] = names.map((n) => readFileSync(join(dir, n)));
    }
    names.forEach((n, i) => expect(bytes.compiled[i].equals(bytes.sources[i]), n).toBe(true));
  }, 240_000);
});

describe('bin/landreach.mjs runs the build only when it is current', () => {
  const info = () => join(project, 'dist-cli/build-info.json');

  it('current build: no warning', () => {
    const r = landreach(['--version'], 'auto');
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^landreach \d+\.\d+\.\d+\n$/);
    expect(r.stderr).toBe('');
  });

  it('a source newer than the build: the sources through tsx, with a warning naming the source and the fix', () => {
    const saved = readFileSync(info(), 'utf8');
    try {
      writeFileSync(info(), JSON.stringify({ ...JSON.parse(saved), builtAt_ms: 0 }));
      const r = landreach(['--version'], 'auto');
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toMatch(/^landreach /);
      expect(r.stderr).toMatch(/warning: the compiled command line \(dist-cli\/\) is older than (bin|core)\/\S+; running the TypeScript sources through tsx.*npm run build:cli/);
    } finally {
      writeFileSync(info(), saved);
    }
  });

  it('no build: the sources with a warning; LANDREACH_CLI=compiled is an error naming npm run build:cli', () => {
    rmSync(join(project, 'dist-cli'), { recursive: true, force: true });
    const r = landreach(['--version'], 'auto');
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^landreach /);
    expect(r.stderr).toMatch(/compiled command line \(dist-cli\/\) is not built; running the TypeScript sources.*npm run build:cli/);
    const forced = landreach(['--version'], 'compiled');
    expect(forced.code).toBe(1);
    expect(forced.stderr).toMatch(/compiled command line is missing .*npm run build:cli/);
    const bad = landreach(['--version'], 'fast' as never);
    expect(bad.code).toBe(2);
  });
});

describe('the command table (commands load on use)', () => {
  it('each entry loads the command of its own name', async () => {
    for (const entry of COMMANDS) expect((await entry.load()).name).toBe(entry.name);
  });
});
