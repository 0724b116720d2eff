/**
 * `npm run bench [-- --only NAME] [-- --json FILE]`: runs the benchmarks and prints their figures.
 * Benchmarks never fail a build; they report. Targets are stated beside each suite.
 */
import { writeFileSync } from 'node:fs';
import os from 'node:os';
import { benchConic } from './conic.bench.ts';
import { benchDescent } from './descent.bench.ts';
import { benchFootprint } from './footprint.bench.ts';
import { benchLandingSuccess } from './landingSuccess.bench.ts';
import { benchPeers } from './peers.bench.ts';
import { benchTerrain } from './terrain.bench.ts';
import { formatFigure, type BenchResult } from './util.ts';

const SUITES: Record<string, { target: string; run: () => Promise<BenchResult[]> }> = {
  conic: {
    target: 'target: ≥ 30× faster than CVXOPT and < 2 ms per solve at ~700 variables',
    run: benchConic,
  },
  descent: {
    target: 'target: one free-final-time target solve < 20 ms at N = 50',
    run: async () => [{ name: 'descent (demo study)', figures: await benchDescent() }],
  },
  footprint: {
    target: 'target: 41 × 41 demo footprint < 10 s with 2 workers',
    run: () => benchFootprint([41]),
  },
  'landing-success': {
    target: 'target: 1,000 closed-loop samples on the demo well under a minute with 2 workers',
    run: () => benchLandingSuccess(1000, 2),
  },
  peers: {
    target: 'target: kept-workspace warm solve ≥ 8× Clarabel per solve at N = 30 and N = 50; cold solve no slower than Clarabel cold',
    run: () => benchPeers([30, 50]),
  },
  terrain: {
    target: 'target: hazard map of a 2048 × 2048 DEM < 2 s and < 200 MB',
    run: async () => [{ name: 'terrain hazard 2048²', figures: await benchTerrain() }],
  },
};

async function main() {
  const args = process.argv.slice(2);
  const jsonAt = args.indexOf('--json');
  const jsonFile = jsonAt >= 0 ? args[jsonAt + 1] : undefined;
  if (jsonAt >= 0 && !jsonFile) throw new Error('--json needs a file name, e.g. --json bench.json');
  const onlyAt = args.indexOf('--only');
  const only = onlyAt >= 0 ? args[onlyAt + 1] : undefined;
  if (only && !(only in SUITES)) throw new Error(`--only ${only}: unknown suite (known: ${Object.keys(SUITES).join(', ')})`);
  const machine = `${os.cpus().length} × ${os.cpus()[0]?.model ?? 'cpu'}, Node ${process.version}`;
  console.log(`Landreach benchmarks — ${machine} — ${new Date().toISOString()}`);
  const all: Record<string, BenchResult[]> = {};
  for (const [name, suite] of Object.entries(SUITES)) {
    if (only && name !== only) continue;
    console.log(`\n## ${name} (${suite.target})`);
    const results = await suite.run();
    all[name] = results;
    for (const r of results) {
      console.log(`  ${r.name}: ` + Object.entries(r.figures).map(([k, v]) => `${k}=${formatFigure(v)}`).join('  '));
    }
  }
  if (jsonFile) {
    writeFileSync(jsonFile, JSON.stringify({ machine, date: new Date().toISOString(), suites: all }, null, 2));
    console.log(`\nwrote ${jsonFile}`);
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
