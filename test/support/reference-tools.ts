/**
 * One rule for every test that needs something from outside the project (CVXOPT, NumPy, Matplotlib,
 * Pillow, GDAL, Chromium) or the compiled WebAssembly modules:
 *   - present: the test runs;
 *   - missing on a developer's machine: the test is skipped with a visible warning naming the fix;
 *   - missing under CI=true: an error, so the run fails (a CI run never passes by skipping a reference).
 * `npm test` installs the Debian tools first (bin/ensure-test-tools.mjs); the locations come from there
 * (LANDREACH_PYTHON, LANDREACH_GDAL_BIN, LANDREACH_CHROMIUM), so tests and installer look in one place.
 *
 * Use: `describe.runIf(referenceToolsReady('gdal'))(…)`, or `if (!referenceToolsReady('pillow')) return;`.
 */
import {
  checkReferenceTools, gdalProgram, installCommand, referencePaths, type ReferenceToolId,
} from '../../bin/ensure-test-tools.mjs';
import { ITERATION_BASE64 } from '../../core/conic/wasm/iteration.generated.ts';
import { KERNELS_BASE64 } from '../../core/linalg/wasm/kernels.generated.ts';

export type ToolId = ReferenceToolId | 'wasm';

export interface Missing {
  label: string;
  reason: string;
  fix: string;
}

/** The Python the reference scripts run with (LANDREACH_PYTHON, default Debian's /usr/bin/python3). */
export const REFERENCE_PYTHON = referencePaths().python;
/** The Chromium the browser tests drive (LANDREACH_CHROMIUM, default /usr/bin/chromium). */
export const REFERENCE_CHROMIUM = referencePaths().chromium;
/** The path to spawn for a GDAL program (in LANDREACH_GDAL_BIN when set, else found on PATH). */
export const gdalTool = (name: string): string => gdalProgram(name);

/** True when the environment says this is a CI run (CI set to anything but '', '0' or 'false'). */
export function isCi(env: NodeJS.ProcessEnv = process.env): boolean {
  const v = (env.CI ?? '').trim().toLowerCase();
  return v !== '' && v !== '0' && v !== 'false';
}

/**
 * Compiles each embedded WebAssembly module (base64, as the generated files hold them) the way
 * core/linalg/wasm/ldlWasm.ts does; returns why the first that fails does, or null when all compile.
 */
export function wasmModulesProblem(modules: Record<string, string>): string | null {
  for (const [name, base64] of Object.entries(modules)) {
    try {
      const text = atob(base64);
      const bytes = new Uint8Array(text.length);
      for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
      new WebAssembly.Module(bytes);
    } catch (error) {
      return `the ${name} module does not compile: ${(error as Error).message}`;
    }
  }
  return null;
}

const WASM_FIX = 'rebuild the modules with `npm run build:kernels` (Node 20 and Chromium support WebAssembly with SIMD)';

const cache = new Map<ToolId, Missing | null>();

/** What is wrong with a tool here, or null when it is usable (checked once per test file). */
export function toolProblem(id: ToolId): Missing | null {
  if (!cache.has(id)) {
    if (id === 'wasm') {
      const reason = wasmModulesProblem({ kernels: KERNELS_BASE64, iteration: ITERATION_BASE64 });
      cache.set(id, reason === null ? null : { label: 'WebAssembly kernels', reason, fix: WASM_FIX });
    } else {
      const [check] = checkReferenceTools([id]);
      cache.set(id, check.reason === null ? null : {
        label: `${check.label} (Debian ${check.debian})`,
        reason: check.reason,
        fix: `run npm test (it installs the reference tools as root), or: ${installCommand([check.debian], process.getuid?.() === 0)}`,
      });
    }
  }
  return cache.get(id)!;
}

/**
 * The rule above, given what is missing: true when nothing is, throws under CI, else warns and returns
 * false. Separate from the checks so the unit test can try both sides without removing a tool.
 */
export function decide(missing: Missing[], ci: boolean, warn: (text: string) => void = console.warn): boolean {
  if (missing.length === 0) return true;
  const lines = missing.map((m) => `${m.label}: ${m.reason}. Fix: ${m.fix}.`);
  if (ci) throw new Error(`Needed by these tests and missing under CI=true (a CI run never skips them):\n${lines.join('\n')}`);
  warn(`SKIPPED reference checks (a failure under CI=true):\n${lines.join('\n')}`);
  return false;
}

const warned = new Set<string>();

/** True when every named tool is usable; false with a warning on a developer machine; throws under CI=true. */
export function referenceToolsReady(...ids: ToolId[]): boolean {
  return decide(ids.map(toolProblem).filter((m): m is Missing => m !== null), isCi(), (text) => {
    if (!warned.has(text)) console.warn(text);
    warned.add(text);
  });
}
