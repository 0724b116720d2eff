/**
 * Seeded fuzzing (fast-check) of the GeoTIFF reader on files GDAL 3.6 writes with compression and
 * tiling (deflate + float predictor, LZW, PackBits, LERC): corrupted or truncated bytes must give a grid or
 * a TerrainInputError — never another error type, never a hang.
 */
import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { TerrainInputError, readGeoTiff } from '../../../core/terrain/index.ts';
import { gdal, gdalAvailable, tempDir, writeAsciiGrid } from './gdal.ts';

const tmp = tempDir();
afterAll(() => tmp.cleanup());

describe.runIf(gdalAvailable())('GeoTIFF reader fuzzing on GDAL-written compressed files', () => {
  const variants: [string, string[]][] = [
    ['deflate', ['-ot', 'Float32', '-co', 'COMPRESS=DEFLATE', '-co', 'PREDICTOR=3', '-co', 'TILED=YES', '-co', 'BLOCKXSIZE=16', '-co', 'BLOCKYSIZE=16']],
    ['lzw', ['-ot', 'Int16', '-co', 'COMPRESS=LZW', '-co', 'PREDICTOR=2']],
    ['packbits', ['-ot', 'Int16', '-co', 'COMPRESS=PACKBITS']],
    ['lerc', ['-ot', 'Float32', '-co', 'COMPRESS=LERC', '-co', 'MAX_Z_ERROR=0.01']],
  ];
  for (const [name, options] of variants) {
    it(`${name}: corrupted or truncated files fail cleanly`, async () => {
      const asc = tmp.path(`${name}.asc`);
      const tif = tmp.path(`${name}.tif`);
      writeAsciiGrid(asc, 48, 40, Float64Array.from({ length: 48 * 40 }, (_, k) => 300 + 20 * Math.sin(k / 17) + (k % 48)));
      gdal('gdal_translate', ['-q', '-a_srs', 'EPSG:32633', '-a_ullr', '0', '80', '96', '0', ...options, asc, tif]);
      const good = new Uint8Array(readFileSync(tif));
      expect((await readGeoTiff(good)).width).toBe(48);
      await fc.assert(
        fc.asyncProperty(
          fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 16 }),
          fc.option(fc.nat(), { nil: undefined }),
          async (edits, cut) => {
            const bad = good.slice();
            for (const [pos, v] of edits) bad[pos % bad.length] = v;
            const input = cut === undefined ? bad : bad.subarray(0, cut % (bad.length + 1));
            try {
              const g = await readGeoTiff(input);
              expect(g.heights.length).toBe(g.width * g.height);
            } catch (err) {
              if (!(err instanceof TerrainInputError)) throw new Error(`non-TerrainInputError: ${String(err)}`, { cause: err });
            }
          },
        ),
        { numRuns: 250, seed: 1234 },
      );
    });
  }
});
