/**
 * Offline DEM fuzz run (not part of CI): `npx tsx test/fuzz/dem-fuzz.ts [perFile] [seed]` damages every
 * GDAL-written start file `perFile` times (default 1000: 17 000 streams), reads each with our reader and
 * with GDAL 3.6 (python3-gdal), and prints the verdicts (dem-oracle.ts `judge`), examples of anything
 * other than agreement or refusal, our slowest read and our peak memory.
 */
import { GdalOracle, gdalPythonAvailable } from '../reference/terrain/dem-oracle.ts';
import { fuzz } from '../reference/terrain/dem-fuzz.ts';
import { tempDir } from '../reference/terrain/gdal.ts';

const perFile = Number(process.argv[2] ?? 1000);
const seed = Number(process.argv[3] ?? 20240611);
if (!gdalPythonAvailable()) throw new Error('needs Debian python3-gdal');
const tmp = tempDir();
const oracle = new GdalOracle();
try {
  const tally = await fuzz(oracle, tmp.path, perFile, seed);
  console.log(JSON.stringify({ perFile, seed, ...tally, peakRss_MiB: Math.round(process.resourceUsage().maxRSS / 1024) }, null, 2));
} finally {
  oracle.close();
  tmp.cleanup();
}
