/**
 * Seeded fuzzing of the GeoTIFF reader with GDAL 3.6 as the oracle (dem-fuzz.ts): 17 GDAL-written start
 * files (ZSTD, LERC_ZSTD and multi-band among them) × 150 named mutations each, fixed seed, work bounded
 * by that count. On every damaged file our reader must agree with GDAL (heights, no-data mask, geotransform) or refuse with a TerrainInputError —
 * never crash, never read a file GDAL refuses, never decode silently wrong. The larger offline run is
 * test/fuzz/dem-fuzz.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { GdalOracle, gdalPythonAvailable } from './dem-oracle.ts';
import { fuzz } from './dem-fuzz.ts';
import { tempDir } from './gdal.ts';

const available = gdalPythonAvailable();
const tmp = tempDir();
let oracle: GdalOracle;
beforeAll(() => { if (available) oracle = new GdalOracle(); });
afterAll(() => { oracle?.close(); tmp.cleanup(); });

describe.skipIf(!available)('GeoTIFF reader fuzzing against GDAL (seeded)', () => {
  it('2 550 damaged GDAL-written files: agree with GDAL or refuse cleanly', async () => {
    const tally = await fuzz(oracle, tmp.path, 150, 4242);
    expect(tally.streams).toBe(2550);
    expect(tally.examples).toEqual([]); // every crash, silent difference or over-lenient read, with its detail
    expect(tally.counts.crash + tally.counts.wrong + tally.counts['we-read-gdal-refused']).toBe(0);
    // Not vacuous: many damaged files still read (and agree), many are refused by both.
    expect(tally.counts.agree).toBeGreaterThan(400);
    expect(tally.counts['both-refused']).toBeGreaterThan(400);
  });
});
