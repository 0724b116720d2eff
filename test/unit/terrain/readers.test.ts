import { describe, expect, it } from 'vitest';
import {
  MAX_GRID_CELLS, TerrainInputError, gridFromFunction, readGeoTiff, readJsonGrid, readPngHeightmap, writeGeoTiff, writeJsonGrid,
} from '../../../core/terrain/index.ts';
import { encodeGreyPng } from './png-encode.ts';

describe('JSON grid', () => {
  it('round-trips heights, no-data and geometry', () => {
    const text = JSON.stringify({
      format: 'landreach-elevation-grid', version: 1, width: 3, height: 2, pixelSizeX_m: 2, pixelSizeY_m: 3,
      originEast_m: 10, originNorth_m: 20, heights_m: [0, 1, 2, 3, null, 5],
    });
    const g = readJsonGrid(text);
    expect(Array.from(g.noData)).toEqual([0, 0, 0, 0, 1, 0]);
    expect(g.heights[5]).toBe(5);
    expect(readJsonGrid(writeJsonGrid(g))).toEqual(g);
  });

  it('names the field and the value on bad input', () => {
    const base = { format: 'landreach-elevation-grid', version: 1, width: 2, height: 1, pixelSizeX_m: 1, pixelSizeY_m: 1, heights_m: [1, 2] };
    expect(() => readJsonGrid('{')).toThrow(/not valid JSON/);
    expect(() => readJsonGrid(JSON.stringify({ ...base, pixelSizeX_m: -1 }))).toThrow('invalid pixelSizeX_m: -1 (must be a finite number > 0)');
    expect(() => readJsonGrid(JSON.stringify({ ...base, heights_m: [1, 'x'] }))).toThrow(/heights_m\[1\] is "x"/);
    expect(() => readJsonGrid(JSON.stringify({ ...base, heights_m: [null, null] }))).toThrow(/every cell is no-data/);
    expect(() => readJsonGrid(JSON.stringify({ ...base, width: 1e5, height: 1e5 }))).toThrow(/too large/);
  });
});

describe('PNG heightmap', () => {
  it('decodes 16-bit samples through every filter type, applying scale, offset and tRNS no-data', async () => {
    const w = 7, h = 11;
    const samples = Array.from({ length: w * h }, (_, k) => (k * 2654435761) % 65536);
    samples[3] = 12345;
    const png = encodeGreyPng(w, h, samples, 16, 12345);
    const g = await readPngHeightmap(png, { pixelSize_m: 2, heightScale_m: 0.01, heightOffset_m: -100 });
    expect(g.width).toBe(w);
    expect(g.noData[3]).toBe(1);
    for (let k = 0; k < w * h; k++) if (k !== 3 && samples[k] !== 12345) expect(g.heights[k]).toBeCloseTo(-100 + 0.01 * samples[k], 3);
  });

  it('decodes 8-bit greyscale', async () => {
    const g = await readPngHeightmap(encodeGreyPng(4, 3, [0, 1, 2, 3, 4, 5, 6, 7, 250, 251, 252, 255], 8), { pixelSize_m: 1, heightScale_m: 1 });
    expect(Array.from(g.heights)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 250, 251, 252, 255]);
  });

  it('requires a pixel size and height scale, and rejects colour, truncation and bad CRC clearly', async () => {
    const png = encodeGreyPng(4, 4, new Array(16).fill(1000), 16);
    await expect(readPngHeightmap(png, { heightScale_m: 1 } as never)).rejects.toThrow(/pixelSize_m is required/);
    await expect(readPngHeightmap(png, { pixelSize_m: 0, heightScale_m: 1 })).rejects.toThrow('invalid pixelSize_m: 0');
    await expect(readPngHeightmap(png.subarray(0, png.length - 20), { pixelSize_m: 1, heightScale_m: 1 })).rejects.toThrow(TerrainInputError);
    const colour = png.slice();
    colour[8 + 8 + 9] = 2; // IHDR colour type → RGB (CRC now wrong too)
    await expect(readPngHeightmap(colour, { pixelSize_m: 1, heightScale_m: 1 })).rejects.toThrow(/CRC/);
    await expect(readPngHeightmap(new Uint8Array([1, 2, 3]), { pixelSize_m: 1, heightScale_m: 1 })).rejects.toThrow(/not a PNG/);
  });
});

describe('GeoTIFF reader on files from our writer', () => {
  it('reads Float32 heights, NaN no-data and the geotransform back', async () => {
    const g = gridFromFunction({ width: 9, height: 5, pixelSizeX_m: 2, pixelSizeY_m: 3, originEast_m: 500, originNorth_m: 900 }, (x, y) => x - y);
    const data = g.heights.slice();
    data[7] = NaN;
    const tif = writeGeoTiff({ width: 9, height: 5, data, noData: NaN, georeference: { geoTransform: [500, 2, 0, 900, 0, -3], projectedEpsg: 32610 } });
    const back = await readGeoTiff(tif);
    expect(back.pixelSizeX_m).toBe(2);
    expect(back.pixelSizeY_m).toBe(3);
    expect(back.originEast_m).toBe(500);
    expect(back.originNorth_m).toBe(900);
    expect(back.noData[7]).toBe(1);
    expect(back.heights[8]).toBe(g.heights[8]);
    expect(back.georeference?.projectedEpsg).toBe(32610);
    const win = await readGeoTiff(tif, { window: [2, 1, 5, 4] });
    expect(win.width).toBe(3);
    expect(win.originEast_m).toBe(504);
    expect(win.originNorth_m).toBe(897);
    expect(win.heights[0]).toBe(g.heights[1 * 9 + 2]);
  });

  it('rejects not-a-TIFF, truncation, a missing georeference and a bad window, clearly', async () => {
    await expect(readGeoTiff(new TextEncoder().encode('hello world'))).rejects.toThrow(/not a TIFF/);
    const tif = writeGeoTiff({ width: 64, height: 64, data: new Float32Array(4096), georeference: { geoTransform: [0, 1, 0, 0, 0, -1] } });
    await expect(readGeoTiff(tif.subarray(0, 2000))).rejects.toThrow(TerrainInputError);
    await expect(readGeoTiff(writeGeoTiff({ width: 2, height: 2, data: new Float32Array(4) }))).rejects.toThrow(/no georeferencing/);
    await expect(readGeoTiff(tif, { window: [0, 0, 65, 10] })).rejects.toThrow(/invalid window \[0, 0, 65, 10\]/);
    expect(MAX_GRID_CELLS).toBe(4096 * 4096);
  });
});
