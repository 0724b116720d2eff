#!/usr/bin/env node
// Makes sure the outside references the tests compare against are here before `npm test` runs them
// (package.json "pretest"), so that `npm ci && npm test` passes on a fresh Debian 12 machine:
//   - CVXOPT, NumPy, Matplotlib and Pillow importable by the reference Python (default /usr/bin/python3);
//   - GDAL's command-line tools (gdal-bin);
//   - Chromium for the browser tests (default /usr/bin/chromium).
// What is missing is installed from Debian when this runs as root on a machine with apt-get (the command
// is printed first). Otherwise it stops at once with one message naming the exact command to run.
//
// Where the tests look (test/support/reference-tools.ts reads the same settings from here):
//   LANDREACH_PYTHON    the Python with the reference libraries (default /usr/bin/python3)
//   LANDREACH_GDAL_BIN  the directory holding gdalinfo & co. (default: looked up on PATH)
//   LANDREACH_CHROMIUM  the Chromium executable (default /usr/bin/chromium)
import { spawnSync } from 'node:child_process';
import { accessSync, constants, statSync } from 'node:fs';
import { delimiter, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The GDAL programs the reference tests run. */
export const GDAL_PROGRAMS = ['gdalinfo', 'gdal_translate', 'gdal_create', 'gdaldem', 'gdaltransform', 'gdalwarp'];

/** The Python modules the reference tests import, with the Debian package that provides each. */
const PYTHON_MODULES = [
  { id: 'cvxopt', label: 'CVXOPT', module: 'cvxopt', debian: 'python3-cvxopt' },
  { id: 'numpy', label: 'NumPy', module: 'numpy', debian: 'python3-numpy' },
  { id: 'scipy', label: 'SciPy', module: 'scipy.stats', debian: 'python3-scipy' },
  { id: 'matplotlib', label: 'Matplotlib', module: 'matplotlib', debian: 'python3-matplotlib' },
  { id: 'pillow', label: 'Pillow', module: 'PIL', debian: 'python3-pil' },
  { id: 'gdal-python', label: "GDAL's Python bindings", module: 'osgeo.gdal', debian: 'python3-gdal' },
];

/** Every reference tool: id, name shown to people, and the Debian 12 package that provides it. */
export const REFERENCE_TOOLS = [
  ...PYTHON_MODULES.map(({ id, label, debian }) => ({ id, label, debian })),
  { id: 'gdal', label: 'GDAL', debian: 'gdal-bin' },
  { id: 'chromium', label: 'Chromium', debian: 'chromium' },
];

/** Where the tests look for the tools (environment overrides, else the Debian locations). */
export function referencePaths(env = process.env) {
  return {
    python: env.LANDREACH_PYTHON || '/usr/bin/python3',
    gdalBin: env.LANDREACH_GDAL_BIN || null,
    chromium: env.LANDREACH_CHROMIUM || '/usr/bin/chromium',
  };
}

function isExecutableFile(path) {
  try {
    if (!statSync(path).isFile()) return false;
    accessSync(path, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

/** The first executable `name` on PATH, or null. */
export function findOnPath(name, env = process.env) {
  for (const dir of (env.PATH ?? '').split(delimiter)) {
    if (dir && isExecutableFile(join(dir, name))) return join(dir, name);
  }
  return null;
}

/** What to spawn for a GDAL program: in LANDREACH_GDAL_BIN when set, else the name (found on PATH). */
export function gdalProgram(name, env = process.env) {
  const { gdalBin } = referencePaths(env);
  return gdalBin ? join(gdalBin, name) : name;
}

function firstLine(text) {
  return String(text ?? '').trim().split('\n').filter((l) => l.trim() !== '').pop()?.trim() ?? '';
}

function checkPython(python, env) {
  // Import each module (not only find it): a module that is present but broken fails here, not mid-test.
  const script = [
    'import importlib, json',
    'out = {}',
    `for m in ${JSON.stringify(PYTHON_MODULES.map((m) => m.module))}:`,
    '    try:',
    '        importlib.import_module(m); out[m] = None',
    '    except Exception as e:',
    "        out[m] = type(e).__name__ + ': ' + str(e)",
    'print(json.dumps(out))',
  ].join('\n');
  const r = spawnSync(python, ['-c', script], { encoding: 'utf8', env: { ...env, MPLBACKEND: 'Agg' }, timeout: 60_000 });
  let imports = null;
  if (r.status === 0) {
    try {
      imports = JSON.parse(r.stdout);
    } catch {
      imports = null;
    }
  }
  return PYTHON_MODULES.map(({ id, module }) => {
    if (r.error) return { id, reason: `cannot run ${python} (${r.error.code ?? r.error.message})` };
    if (!imports) return { id, reason: `${python} failed (exit ${r.status}): ${firstLine(r.stderr)}` };
    return imports[module] === null ? { id, reason: null } : { id, reason: `${python} cannot import ${module} (${imports[module]})` };
  });
}

function checkGdal(env) {
  const { gdalBin } = referencePaths(env);
  const absent = GDAL_PROGRAMS.filter((p) => (gdalBin ? !isExecutableFile(join(gdalBin, p)) : findOnPath(p, env) === null));
  if (absent.length > 0) return { id: 'gdal', reason: `${absent.join(', ')} not found ${gdalBin ? `in ${gdalBin}` : 'on PATH'}` };
  const r = spawnSync(gdalProgram('gdalinfo', env), ['--version'], { encoding: 'utf8', env, timeout: 60_000 });
  if (r.status !== 0) return { id: 'gdal', reason: `gdalinfo --version failed (${r.error?.code ?? `exit ${r.status}`}): ${firstLine(r.stderr)}` };
  return { id: 'gdal', reason: null };
}

function checkChromium(env) {
  const { chromium } = referencePaths(env);
  if (!isExecutableFile(chromium)) return { id: 'chromium', reason: `no executable at ${chromium}` };
  const r = spawnSync(chromium, ['--version'], { encoding: 'utf8', env, timeout: 60_000 });
  if (r.status !== 0) return { id: 'chromium', reason: `${chromium} --version failed (${r.error?.code ?? `exit ${r.status}`})` };
  return { id: 'chromium', reason: null };
}

/**
 * Checks every reference tool (or those named). Returns one entry per tool: `reason` is null when it
 * is usable, else says what is wrong; `debian` is the package that provides it.
 */
export function checkReferenceTools(ids = REFERENCE_TOOLS.map((t) => t.id), env = process.env) {
  const wanted = new Set(ids);
  const unknown = [...wanted].filter((id) => !REFERENCE_TOOLS.some((t) => t.id === id));
  if (unknown.length > 0) throw new Error(`unknown reference tool: ${unknown.join(', ')} (one of ${REFERENCE_TOOLS.map((t) => t.id).join(', ')})`);
  const found = [];
  if (PYTHON_MODULES.some((m) => wanted.has(m.id))) found.push(...checkPython(referencePaths(env).python, env));
  if (wanted.has('gdal')) found.push(checkGdal(env));
  if (wanted.has('chromium')) found.push(checkChromium(env));
  return REFERENCE_TOOLS.filter((t) => wanted.has(t.id)).map((t) => ({ ...t, reason: found.find((f) => f.id === t.id).reason }));
}

/** The Debian command that installs the given packages (as root; `sudo` otherwise). */
export function installCommand(packages, root) {
  const sudo = root ? '' : 'sudo ';
  return `${sudo}apt-get update && ${sudo}apt-get install -y --no-install-recommends ${packages.join(' ')}`;
}

/**
 * What to do about the missing tools: install (root and apt-get here), or stop with a message. Pure, so
 * the unit test can try every machine kind.
 */
export function plan(missing, { root, aptGet }) {
  const packages = [...new Set(missing.map((t) => t.debian))];
  if (packages.length === 0) return { action: 'none' };
  if (root && aptGet) return { action: 'install', packages, command: installCommand(packages, true) };
  const why = aptGet ? 'Install them with:' : 'This machine has no apt-get, so they cannot be installed from here; on Debian 12:';
  return { action: 'stop', packages, message: missingMessage(missing, why, installCommand(packages, root)) };
}

/** The one message shown when tools are missing and this script cannot install them. */
export function missingMessage(missing, why, command) {
  return [
    'npm test compares Landreach against outside reference tools, and some are missing:',
    ...missing.map((t) => `  - ${t.label} (Debian package ${t.debian}): ${t.reason}`),
    why,
    `  ${command}`,
    'then run npm test again. (LANDREACH_PYTHON, LANDREACH_GDAL_BIN and LANDREACH_CHROMIUM point the tests at other copies.)',
  ].join('\n');
}

function run(argv, env) {
  console.log(`$ ${argv.join(' ')}`);
  const r = spawnSync(argv[0], argv.slice(1), { stdio: 'inherit', env });
  if (r.status !== 0) throw new Error(`${argv.join(' ')} failed (${r.error?.code ?? `exit ${r.status}`})`);
}

/** Checks, installs what is missing where it can, checks again. Returns the exit code. */
export function main(env = process.env) {
  const before = checkReferenceTools(undefined, env);
  const missing = before.filter((t) => t.reason !== null);
  if (missing.length === 0) {
    console.log(`Reference tools present: ${before.map((t) => t.label).join(', ')}.`);
    return 0;
  }
  const aptGet = findOnPath('apt-get', env);
  const root = typeof process.getuid === 'function' && process.getuid() === 0;
  const decision = plan(missing, { root, aptGet: aptGet !== null });
  if (decision.action === 'stop') {
    console.error(decision.message);
    return 1;
  }
  console.log(`Missing reference tools: ${missing.map((t) => t.label).join(', ')}. Installing them from Debian:`);
  console.log(`  ${decision.command}`);
  const aptEnv = { ...env, DEBIAN_FRONTEND: 'noninteractive' };
  try {
    run([aptGet, 'update'], aptEnv);
    run([aptGet, 'install', '-y', '--no-install-recommends', ...decision.packages], aptEnv);
  } catch (error) {
    console.error(missingMessage(missing, `The install failed: ${error.message}. Run it yourself and read apt-get's message:`, decision.command));
    return 1;
  }
  const still = checkReferenceTools(undefined, env).filter((t) => t.reason !== null);
  if (still.length > 0) {
    const command = installCommand([...new Set(still.map((t) => t.debian))], root);
    console.error(missingMessage(still, 'They are still missing after the install above (an override pointing elsewhere?). The install was:', command));
    return 1;
  }
  console.log(`Reference tools present: ${before.map((t) => t.label).join(', ')}.`);
  return 0;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) process.exitCode = main();
