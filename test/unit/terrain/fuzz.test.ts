/**
 * Seeded fuzzing of the readers (fast-check): corrupted and truncated bytes must give either a valid
 * grid or a TerrainInputError with a message — never a crash with another error type, never a hang.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { ElevationGrid } from '../../../core/terrain/index.ts';
import { TerrainInputError, gridFromFunction, readGeoTiff, readJsonGrid, readPngHeightmap, writeGeoTiff, writeJsonGrid } from '../../../core/terrain/index.ts';
import { encodeGreyPng } from './png-encode.ts';

const corruption = fc.record({
  edits: fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 12 }),
  truncateTo: fc.option(fc.nat(), { nil: undefined }),
});

function corrupt(bytes: Uint8Array, c: { edits: [number, number][]; truncateTo?: number }): Uint8Array {
  const out = bytes.slice();
  // Bias edits towards the header and directory, where structure lives.
  for (const [pos, value] of c.edits) out[pos % Math.min(out.length, pos % 2 ? 400 : out.length)] = value;
  return c.truncateTo === undefined ? out : out.subarray(0, c.truncateTo % (out.length + 1));
}

function checkGrid(g: ElevationGrid) {
  expect(g.heights.length).toBe(g.width * g.height);
  expect(g.noData.length).toBe(g.width * g.height);
}

async function expectCleanOutcome(read: () => Promise<ElevationGrid>) {
  try {
    checkGrid(await read());
  } catch (err) {
    if (!(err instanceof TerrainInputError)) throw new Error(`reader threw a non-TerrainInputError: ${String(err)}`, { cause: err });
    expect(err.message.length).toBeGreaterThan(10);
  }
}

const demo = gridFromFunction({ width: 40, height: 30, pixelSizeX_m: 2, pixelSizeY_m: 2 }, (x, y) => Math.sin(x / 7) * 20 + y / 3);

describe('reader fuzzing (seeded)', () => {
  it('GeoTIFF: corrupted or truncated files fail cleanly', async () => {
    const tif = writeGeoTiff({ width: 40, height: 30, data: demo.heights, noData: -9999, georeference: { geoTransform: [0, 2, 0, 0, 0, -2], projectedEpsg: 32633 } });
    await fc.assert(fc.asyncProperty(corruption, async (c) => expectCleanOutcome(() => readGeoTiff(corrupt(tif, c)))), { numRuns: 400, seed: 42 });
  });

  it('PNG: corrupted or truncated files fail cleanly', async () => {
    const png = encodeGreyPng(40, 30, Array.from(demo.heights, (v) => Math.round((v + 50) * 100)), 16);
    await fc.assert(
      fc.asyncProperty(corruption, async (c) => expectCleanOutcome(() => readPngHeightmap(corrupt(png, c), { pixelSize_m: 2, heightScale_m: 0.01 }))),
      { numRuns: 300, seed: 7 },
    );
  });

  it('JSON grid: corrupted text fails cleanly', async () => {
    const json = new TextEncoder().encode(writeJsonGrid(demo));
    await fc.assert(
      fc.asyncProperty(corruption, async (c) => expectCleanOutcome(async () => readJsonGrid(new TextDecoder().decode(corrupt(json, c))))),
      { numRuns: 300, seed: 3 },
    );
  });
});
