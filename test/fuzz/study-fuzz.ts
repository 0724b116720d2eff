/**
 * Offline study fuzzing: `npx tsx test/fuzz/study-fuzz.ts [--count 10000] [--seed 12] [--from 0]`.
 * Runs mutations `from … from + count − 1` of the demo study (test/support/study-mutations.ts) through
 * `landreach trajectory` and prints how each ended: a result (by status), an input error (by field), or an
 * internal error (each one listed with its mutation index, so it can be replayed alone). Exits 1 if any
 * internal error occurred. The CI test (test/unit/study/study-fuzz.test.ts) runs a smaller count.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { DEMO_STUDY_PATH } from '../support/scenarios.ts';
import { studyMutation } from '../support/study-mutations.ts';
import { runStudyFile, solveDespiteBurnTimeRule } from '../support/study-fuzz.ts';

function option(name: string, fallback: number): number {
  const at = process.argv.indexOf(`--${name}`);
  if (at < 0) return fallback;
  const v = Number(process.argv[at + 1]);
  if (!Number.isInteger(v) || v < 0) throw new Error(`--${name} ${process.argv[at + 1]}: must be a whole number ≥ 0`);
  return v;
}

const count = option('count', 10000);
const seed = option('seed', 12);
const from = option('from', 0);
const base = JSON.parse(readFileSync(DEMO_STUDY_PATH, 'utf8'));
const dir = mkdtempSync(join(tmpdir(), 'landreach-fuzz-'));
const results = new Map<string, number>();
const fields = new Map<string, number>();
const internal: string[] = [];
const burnTime = new Map<string, number>();
const started = Date.now();
try {
  for (let i = from; i < from + count; i++) {
    const m = studyMutation(base, seed, i);
    const o = await runStudyFile(join(dir, 'study.json'), m.bytes);
    if (o.kind === 'result') results.set(o.status, (results.get(o.status) ?? 0) + 1);
    else if (o.kind === 'input-error') {
      fields.set(o.field, (fields.get(o.field) ?? 0) + 1);
      const status = solveDespiteBurnTimeRule(m.bytes);
      if (status) burnTime.set(status, (burnTime.get(status) ?? 0) + 1);
      if (status === 'solved') internal.push(`#${i} [${m.label}] refused by the burn-time rule, but the solver landed it`);
    }
    else {
      internal.push(`#${i} [${m.label}] exit ${o.exit}: ${o.message.replace(/\s+/g, ' ').slice(0, 240)}`);
      console.log(internal[internal.length - 1]);
    }
    if ((i - from + 1) % 500 === 0) console.error(`${i - from + 1} of ${count}, ${internal.length} internal error(s)`);
  }
} finally {
  rmSync(dir, { recursive: true, force: true });
}
const sum = (m: Map<string, number>) => [...m.values()].reduce((a, b) => a + b, 0);
const list = (m: Map<string, number>) => [...m].sort((a, b) => b[1] - a[1]).map(([k, v]) => `${k} ${v}`).join(', ');
console.log(`study fuzz: seed ${seed}, mutations ${from}…${from + count - 1} (${count}), ${((Date.now() - started) / 1000).toFixed(0)} s`);
console.log(`  results (exit 0):      ${sum(results)}  (${list(results)})`);
console.log(`  input errors (exit 2): ${sum(fields)}  (${fields.size} fields named; most: ${list(fields).split(', ').slice(0, 8).join(', ')})`);
console.log(`  burn-time refusals solved anyway: ${sum(burnTime)} (${list(burnTime) || 'none'}); a 'solved' would be a wrong refusal`);
console.log(`  internal errors:       ${internal.length}`);
process.exitCode = internal.length ? 1 : 0;
