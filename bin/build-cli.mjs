#!/usr/bin/env node
// Builds the command line and its worker_threads entry to JavaScript (esbuild), so `landreach` starts
// without transpiling TypeScript at run time. npm runs this as the root package's `prepare` script on
// `npm ci` and `npm install`; run it by hand after editing core/ (`npm run build:cli`). bin/landreach.mjs
// runs the build when it is present and newer than every source it was built from, and otherwise the
// TypeScript sources through tsx with a warning.
//
// Layout of the output folder (default dist-cli/), mirroring core/ so that the relative worker URL in
// core/cli/footprintRun.ts (`new URL('../footprint/nodeWorker.mjs', import.meta.url)`) names the compiled
// worker from the compiled command line exactly as it names the tsx bootstrap from the sources:
//   cli/entry.mjs               the command line (core/cli/entry.ts and everything it imports)
//   footprint/nodeWorker.mjs    the footprint pool's worker (core/footprint/nodeWorkerEntry.ts)
//   uncertainty/nodeWorker.mjs  the landing-success pool's worker (core/uncertainty/nodeWorkerEntry.ts,
//                               started from core/cli/landingSuccessPool.ts)
//   chunks/                     code loaded on use (each command, the terrain readers) or shared by both
//   build-info.json             the sources each bundle was built from and when (read by bin/landreach.mjs)
//
// Library packages are bundled in too (one file to load instead of hundreds of modules). The WebAssembly
// kernels are base64 inside generated TypeScript modules (npm run build:kernels), so they bundle as text.
//
//   node bin/build-cli.mjs [--outdir DIR]
import { mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { dirname, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('..', import.meta.url));

/** The bundles: source entry (from the project root) → output file (inside the output folder). */
export const CLI_BUNDLES = [
  { entry: 'core/cli/entry.ts', output: 'cli/entry.mjs' },
  { entry: 'core/footprint/nodeWorkerEntry.ts', output: 'footprint/nodeWorker.mjs' },
  { entry: 'core/uncertainty/nodeWorkerEntry.ts', output: 'uncertainty/nodeWorker.mjs' },
];

/**
 * zod's namespace re-exports every locale (`z.locales`, `z.core.locales`: 260 kB of the 580 kB the trajectory command loads);
 * the project uses none (zod's default English messages come from its own import of `locales/en.js`), so
 * in the bundle `z.locales` holds English only. test/unit/cli/compiled-cli.test.ts compares a refused
 * study's messages with the sources'.
 */
const zodEnglishOnly = {
  name: 'zod-english-only',
  setup(build) {
    build.onResolve({ filter: /^\.\.\/locales\/index\.js$/ }, (args) => {
      // Both re-export them: the classic namespace (z.locales) and zod's core (z.core.locales).
      if (!/[\\/]zod[\\/]v4[\\/](classic[\\/]external|core[\\/]index)\.js$/.test(args.importer)) return undefined;
      return { path: resolve(args.resolveDir, '../locales/en.js'), namespace: 'zod-english-only' };
    });
    build.onLoad({ filter: /.*/, namespace: 'zod-english-only' }, (args) => ({
      contents: "export { default as en } from './en.js';",
      resolveDir: dirname(args.path),
      loader: 'js',
    }));
  },
};

/** The worker file the compiled command line starts, relative to its own file (see the layout above). */
const WORKER_URL_IN_SOURCE = "new URL('../footprint/nodeWorker.mjs', import.meta.url)";
/** The same for the landing-success study's pool. */
const UNCERTAINTY_WORKER_URL_IN_SOURCE = "new URL('../uncertainty/nodeWorker.mjs', import.meta.url)";

/**
 * Builds every bundle into `outdir` (absolute, or relative to the project root); returns the build info.
 * Writes into a temporary folder beside it and renames it into place, so a reader never sees half a build.
 */
export async function buildCli(outdir = 'dist-cli') {
  const esbuild = await import('esbuild').catch(() => null);
  if (!esbuild) {
    throw new Error('esbuild is not installed (a devDependency): run `npm ci` (or `npm install`), then `npm run build:cli`.');
  }
  const target = resolve(ROOT, outdir);
  const staging = `${target}.${process.pid}.tmp`;
  await rm(staging, { recursive: true, force: true });
  // Taken before any source is read: a source saved during the build counts as newer than the build.
  const builtAt_ms = Date.now();
  const result = await esbuild.build({
    entryPoints: Object.fromEntries(CLI_BUNDLES.map((b) => [b.output.replace(/\.mjs$/, ''), resolve(ROOT, b.entry)])),
    outdir: staging,
    outExtension: { '.js': '.mjs' },
    // Each command (core/cli/commands/index.ts) and the terrain part of `trajectory` are dynamic imports:
    // with splitting they become chunks loaded on use, so a command loads only its own code.
    splitting: true,
    chunkNames: 'chunks/[name]-[hash]',
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    // Bundled CommonJS packages may call require() for Node built-ins; an ES module has none, so give it one.
    banner: { js: "import { createRequire as __landreachCreateRequire } from 'node:module'; const require = __landreachCreateRequire(import.meta.url);" },
    // Minified (a smaller file parses faster). Minification renames and folds only what JavaScript's own
    // semantics make equal, so the results are the same bits (test/unit/cli/compiled-cli.test.ts checks it).
    minify: true,
    sourcemap: 'linked',
    metafile: true,
    logLevel: 'warning',
    plugins: [zodEnglishOnly],
  });
  const inputs = Object.keys(result.metafile.inputs);
  const cliSource = await readFile(resolve(ROOT, 'core/cli/footprintRun.ts'), 'utf8');
  if (!cliSource.includes(WORKER_URL_IN_SOURCE)) {
    throw new Error(`core/cli/footprintRun.ts no longer starts its worker with ${WORKER_URL_IN_SOURCE}: update CLI_BUNDLES in bin/build-cli.mjs to match.`);
  }
  const poolSource = await readFile(resolve(ROOT, 'core/cli/landingSuccessPool.ts'), 'utf8');
  if (!poolSource.includes(UNCERTAINTY_WORKER_URL_IN_SOURCE)) {
    throw new Error(`core/cli/landingSuccessPool.ts no longer starts its worker with ${UNCERTAINTY_WORKER_URL_IN_SOURCE}: update CLI_BUNDLES in bin/build-cli.mjs to match.`);
  }
  // esbuild names inputs relative to its working directory; store the project's own relative to its root.
  // Library packages are left out: they change only through npm ci / npm install, which rebuild (prepare).
  // This script counts as a source too: a build made by an older version of it is stale.
  const own = relative(ROOT, fileURLToPath(import.meta.url)).split('\\').join('/');
  const files = [...inputs.filter((p) => !p.includes('node_modules/')).map((p) => relative(ROOT, resolve(process.cwd(), p)).split('\\').join('/')), own].sort();
  const info = { builtAt_ms, bundles: CLI_BUNDLES, inputs: files };
  await writeFile(resolve(staging, 'build-info.json'), JSON.stringify(info, null, 2) + '\n');
  await mkdir(resolve(target, '..'), { recursive: true });
  await rm(target, { recursive: true, force: true });
  await rename(staging, target);
  return info;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const args = process.argv.slice(2);
  const at = args.indexOf('--outdir');
  const outdir = at >= 0 ? args[at + 1] : 'dist-cli';
  if (at >= 0 && !outdir) {
    console.error('build-cli: --outdir needs a folder, e.g. --outdir dist-cli');
    process.exit(2);
  }
  try {
    const info = await buildCli(outdir);
    console.log(`build-cli: ${info.bundles.map((b) => b.output).join(', ')} in ${outdir}/ from ${info.inputs.length} sources`);
  } catch (err) {
    console.error(`build-cli: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  }
}
