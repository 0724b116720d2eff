#!/usr/bin/env node
// Command-line entry. Runs the compiled command line (dist-cli/, built by `npm run build:cli`, which npm runs
// as the `prepare` script on `npm ci` and `npm install`) when it is present and newer than every source it was
// built from; otherwise the TypeScript sources through tsx (a slower start), with a warning saying why.
// LANDREACH_CLI=sources always runs the sources; LANDREACH_CLI=compiled always runs the build (an error if
// there is none).
import { readFileSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const ROOT = new URL('../', import.meta.url);
const DIST = new URL('dist-cli/', ROOT);
const REBUILD = 'run `npm run build:cli`';

/** Why the compiled command line cannot be used (null when it can). */
function compiledStale() {
  let info;
  try {
    info = JSON.parse(readFileSync(new URL('build-info.json', DIST), 'utf8'));
  } catch {
    return 'is not built';
  }
  // The project's own sources it was built from (library packages change only through npm ci / install,
  // which rebuild). One stat per file, about a hundred: a millisecond or two.
  for (const input of info.inputs) {
    let mtime;
    try {
      mtime = statSync(new URL(input, ROOT)).mtimeMs;
    } catch {
      return `was built from ${input}, which is gone`;
    }
    if (mtime > info.builtAt_ms) return `is older than ${input}`;
  }
  return null;
}

const choice = process.env.LANDREACH_CLI ?? '';
if (!['', 'compiled', 'sources'].includes(choice)) {
  process.stderr.write(`landreach: LANDREACH_CLI='${choice}' is not understood: use 'compiled', 'sources' or leave it unset.\n`);
  process.exit(2);
}
const why = choice === 'sources' ? 'is not wanted (LANDREACH_CLI=sources)' : choice === 'compiled' ? null : compiledStale();
if (why === null) {
  const entry = new URL('cli/entry.mjs', DIST);
  try {
    statSync(entry);
  } catch {
    process.stderr.write(`landreach: the compiled command line is missing (${fileURLToPath(entry)}): ${REBUILD}.\n`);
    process.exit(1);
  }
  await import(entry.href);
} else {
  let register;
  try {
    ({ register } = await import('tsx/esm/api'));
  } catch {
    process.stderr.write(`landreach: the compiled command line (dist-cli/) ${why}, and tsx (a devDependency) is not installed to run the TypeScript sources instead: ${REBUILD} (after \`npm ci\`).\n`);
    process.exit(1);
  }
  if (choice !== 'sources') {
    process.stderr.write(`landreach: warning: the compiled command line (dist-cli/) ${why}; running the TypeScript sources through tsx, which starts slower. To build it, ${REBUILD}.\n`);
  }
  register();
  await import('../core/cli/entry.ts');
}
