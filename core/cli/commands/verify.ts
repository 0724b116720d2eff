/**
 * `landreach verify DIR`: is each output set in DIR complete and consistent? Checks every manifest
 * (`*.manifest.json`, written last by footprint, study and hazard: files.ts) against the files beside it,
 * and names result files that no manifest covers (a set whose writing was interrupted, or a mix of runs).
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { CliCommand, CliIo } from '../command.ts';
import { UsageError } from '../command.ts';
import { checkOutputSet, MANIFEST_FORMAT } from '../files.ts';
import { CAUTION } from '../../study/provenance.ts';

const USAGE = `Usage: landreach verify DIR

Checks the result files the footprint, study and hazard commands wrote into DIR against their manifests
(<name>.manifest.json, written last with each file's size and SHA-256). A set is complete when its
manifest exists and every file it lists is present with that size and hash. Result files that no
manifest lists come from a run interrupted while writing, or from an older Landreach.

Exit codes: 0 every set complete, 1 a set is incomplete or mixed (or DIR holds no manifest), 2 bad input.

${CAUTION}`;

/** Result files the commands write (a file of these names outside every manifest is reported). */
const RESULT_FILE = /^(footprint\.(json|csv|geojson|svg)|study-[a-z-]+(\.csv|\.json|\.svg|-reach\.csv)|slope\.tif|footprint-slope\.tif|roughness\.tif|hazard\.tif|hazard-summary\.json|safe-reachable\.tif)$/;

export const verifyCommand: CliCommand = {
  name: 'verify',
  summary: 'check that the result files in a folder form complete sets (their manifests and SHA-256)',
  usage: USAGE,
  async run(args: string[], io: CliIo): Promise<number> {
    if (args.length !== 1 || args[0].startsWith('--')) throw new UsageError('expected one folder (usage: landreach verify DIR)');
    const dir = args[0];
    if (!existsSync(dir) || !statSync(dir).isDirectory()) throw new UsageError(`'${dir}' is not a folder (give the --out folder of a run)`);
    const entries = readdirSync(dir).sort();
    const manifests = entries.filter((f) => f.endsWith('.manifest.json'));
    const listed = new Set<string>();
    let ok = manifests.length > 0;
    for (const m of manifests) {
      const check = checkOutputSet(join(dir, m));
      try {
        const body = JSON.parse(readFileSync(join(dir, m), 'utf8'));
        if (body.format === MANIFEST_FORMAT) for (const f of body.files) listed.add(f.name);
      } catch {
        // reported by checkOutputSet
      }
      if (check.complete) io.stdout(`${m}: complete (${check.status === 'stopped-early' ? 'a partial result: the run stopped early' : 'the run completed'})\n`);
      else {
        ok = false;
        io.stdout(`${m}: NOT complete\n${check.problems.map((p) => `  ${p}\n`).join('')}`);
      }
    }
    const unlisted = entries.filter((f) => RESULT_FILE.test(f) && !listed.has(f));
    if (unlisted.length) {
      ok = false;
      io.stdout(`not in any manifest (an interrupted or older run; do not trust them): ${unlisted.join(', ')}\n`);
    }
    if (manifests.length === 0) io.stdout(`no manifest in ${dir}: no complete output set to vouch for\n`);
    return ok ? 0 : 1;
  },
};
