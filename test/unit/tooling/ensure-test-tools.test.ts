/**
 * bin/ensure-test-tools.mjs (npm test's "pretest"): on a fresh Debian machine it installs the missing
 * reference tools as root, and elsewhere stops with one message naming the exact command. The tools are
 * installed on this machine, so "missing" is simulated with the script's own overrides (LANDREACH_PYTHON,
 * LANDREACH_GDAL_BIN, LANDREACH_CHROMIUM pointing into a temporary directory) and a fake apt-get that
 * records its arguments; nothing on the machine is installed or removed.
 */
import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { GDAL_PROGRAMS, installCommand, plan, REFERENCE_TOOLS, type ToolCheck } from '../../../bin/ensure-test-tools.mjs';

const SCRIPT = new URL('../../../bin/ensure-test-tools.mjs', import.meta.url).pathname;
const ROOT = process.getuid?.() === 0;
const EVERY_PACKAGE = 'python3-cvxopt python3-numpy python3-scipy python3-matplotlib python3-pil python3-gdal gdal-bin chromium';

let dir: string;
beforeEach(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'landreach-ensure-'));
});
afterEach(() => fs.rmSync(dir, { recursive: true, force: true }));

function executable(file: string, body: string) {
  fs.mkdirSync(path.dirname(file), { recursive: true });
  fs.writeFileSync(file, `#!/bin/sh\n${body}\n`, { mode: 0o755 });
}

/**
 * A machine in `dir`: a stand-in Python that imports everything (prints what the script's import check
 * prints on success), GDAL programs and a Chromium that answer --version, and on PATH only a fake apt-get
 * that logs its arguments and, on `install`, puts the stand-ins listed in FAKE_APT_PROVIDES in place.
 */
function machine(options: { present: ('python' | 'gdal' | 'chromium')[]; apt: 'fixes' | 'does-nothing' | 'fails' | 'absent' }) {
  const stock = path.join(dir, 'stock');
  const imports = JSON.stringify({ cvxopt: null, numpy: null, 'scipy.stats': null, matplotlib: null, PIL: null, 'osgeo.gdal': null });
  executable(path.join(stock, 'python', 'python3'), `echo '${imports}'`);
  for (const p of GDAL_PROGRAMS) executable(path.join(stock, 'gdal', p), 'echo "GDAL 0.0.0 (stand-in)"');
  executable(path.join(stock, 'chromium', 'chromium'), 'echo "Chromium stand-in"');
  const live = path.join(dir, 'live');
  fs.mkdirSync(live);
  for (const part of options.present) fs.cpSync(path.join(stock, part), path.join(live, part), { recursive: true });
  const bin = path.join(dir, 'bin');
  fs.mkdirSync(bin);
  const log = path.join(dir, 'apt.log');
  fs.writeFileSync(log, '');
  if (options.apt !== 'absent') {
    const install = options.apt === 'fixes' ? `/bin/cp -r ${stock}/python ${stock}/gdal ${stock}/chromium ${live}/` : ':';
    executable(path.join(bin, 'apt-get'), [
      `echo "$DEBIAN_FRONTEND $*" >> ${log}`,
      options.apt === 'fails' ? 'exit 100' : `if [ "$1" = install ]; then ${install}; fi`,
    ].join('\n'));
  }
  const env = {
    PATH: bin,
    HOME: dir,
    LANDREACH_PYTHON: path.join(live, 'python', 'python3'),
    LANDREACH_GDAL_BIN: path.join(live, 'gdal'),
    LANDREACH_CHROMIUM: path.join(live, 'chromium', 'chromium'),
  };
  const run = () => {
    const r = spawnSync(process.execPath, [SCRIPT], { env, encoding: 'utf8' });
    return { status: r.status, out: r.stdout, err: r.stderr, apt: fs.readFileSync(log, 'utf8').trim().split('\n').filter(Boolean) };
  };
  return { run };
}

describe('npm test installs or names the reference tools (bin/ensure-test-tools.mjs)', () => {
  it('does nothing when every tool is there', () => {
    const r = machine({ present: ['python', 'gdal', 'chromium'], apt: 'fixes' }).run();
    expect(r.status).toBe(0);
    expect(r.apt).toEqual([]);
    expect(r.out).toMatch(/Reference tools present: CVXOPT, NumPy, SciPy, Matplotlib, Pillow, GDAL's Python bindings, GDAL, Chromium\./);
  });

  it('as root with apt-get: prints and runs apt-get update and one install of the missing packages, then checks again', () => {
    const r = machine({ present: [], apt: 'fixes' }).run();
    if (ROOT) {
      expect(r.status, r.err).toBe(0);
      expect(r.out).toContain(`apt-get update && apt-get install -y --no-install-recommends ${EVERY_PACKAGE}`);
      // Non-interactive, so a CI run never waits on a prompt.
      expect(r.apt).toEqual(['noninteractive update', `noninteractive install -y --no-install-recommends ${EVERY_PACKAGE}`]);
    } else {
      // Not root: the same command with sudo, and nothing run.
      expect(r.status).toBe(1);
      expect(r.err).toContain(`sudo apt-get update && sudo apt-get install -y --no-install-recommends ${EVERY_PACKAGE}`);
      expect(r.apt).toEqual([]);
    }
  });

  it('installs only what is missing', () => {
    const r = machine({ present: ['python', 'chromium'], apt: 'fixes' }).run();
    if (!ROOT) return expect(r.err).toContain('sudo apt-get install -y --no-install-recommends gdal-bin\n');
    expect(r.status, r.err).toBe(0);
    expect(r.apt).toEqual(['noninteractive update', 'noninteractive install -y --no-install-recommends gdal-bin']);
  });

  it('fails when the tools are still missing after the install, naming each and why', () => {
    const r = machine({ present: ['gdal', 'chromium'], apt: 'does-nothing' }).run();
    expect(r.status).toBe(1);
    expect(r.err).toMatch(/CVXOPT \(Debian package python3-cvxopt\): cannot run .*live\/python\/python3 \(ENOENT\)/);
    expect(r.err).toMatch(/Pillow \(Debian package python3-pil\)/);
    expect(r.err).not.toMatch(/ {2}- (GDAL \(|Chromium)/);
    if (ROOT) expect(r.err).toMatch(/still missing after the install above/);
  });

  it('fails with the command when apt-get itself fails', () => {
    const r = machine({ present: ['python', 'gdal'], apt: 'fails' }).run();
    expect(r.status).toBe(1);
    expect(r.err).toContain('apt-get install -y --no-install-recommends chromium');
    if (ROOT) expect(r.err).toMatch(/The install failed: .*apt-get update failed \(exit 100\)/);
  });

  it('without apt-get: one message that names every missing tool and the exact command, and installs nothing', () => {
    const r = machine({ present: ['chromium'], apt: 'absent' }).run();
    expect(r.status).toBe(1);
    expect(r.out).toBe('');
    const lines = r.err.trim().split('\n');
    expect(lines[0]).toBe('npm test compares Landreach against outside reference tools, and some are missing:');
    expect(lines.filter((l) => l.startsWith('  - ')).map((l) => l.slice(4).split(' (')[0])).toEqual(['CVXOPT', 'NumPy', 'SciPy', 'Matplotlib', 'Pillow', "GDAL's Python bindings", 'GDAL']);
    expect(r.err).toContain('This machine has no apt-get, so they cannot be installed from here; on Debian 12:');
    expect(r.err).toContain(`apt-get update && ${ROOT ? '' : 'sudo '}apt-get install -y --no-install-recommends python3-cvxopt python3-numpy python3-scipy python3-matplotlib python3-pil python3-gdal gdal-bin\n`);
  });
});

describe('the install plan', () => {
  const missing = (ids: string[]): ToolCheck[] =>
    REFERENCE_TOOLS.filter((t) => ids.includes(t.id)).map((t) => ({ ...t, reason: 'absent' }));

  it('installs as root with apt-get, once per package', () => {
    expect(plan(missing(['cvxopt', 'gdal']), { root: true, aptGet: true })).toEqual({
      action: 'install',
      packages: ['python3-cvxopt', 'gdal-bin'],
      command: 'apt-get update && apt-get install -y --no-install-recommends python3-cvxopt gdal-bin',
    });
    expect(plan([], { root: false, aptGet: false })).toEqual({ action: 'none' });
  });

  it('stops with the sudo command when not root, and says why when there is no apt-get', () => {
    const notRoot = plan(missing(['chromium']), { root: false, aptGet: true });
    expect(notRoot.action).toBe('stop');
    expect(notRoot.action === 'stop' && notRoot.message).toContain('Install them with:\n  sudo apt-get update && sudo apt-get install -y --no-install-recommends chromium\n');
    const noApt = plan(missing(['pillow']), { root: true, aptGet: false });
    expect(noApt.action === 'stop' && noApt.message).toMatch(/no apt-get[^]*\n {2}apt-get update && apt-get install -y --no-install-recommends python3-pil\n/);
    expect(installCommand(['a', 'b'], false)).toBe('sudo apt-get update && sudo apt-get install -y --no-install-recommends a b');
  });
});
