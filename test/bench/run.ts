/**
 * Minimal `npm run bench` entry for this branch (the lead's fuller runner replaces it): runs the
 * terrain benchmark and prints its figures.
 */
import os from 'node:os';
import { benchTerrain } from './terrain.bench.ts';

console.log(`Landreach benchmarks — ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'cpu'}, Node ${process.version} — ${new Date().toISOString()}`);
console.log('\n## terrain (target: hazard map of a 2048 × 2048 DEM under 2 s and under 200 MB)');
await benchTerrain();
