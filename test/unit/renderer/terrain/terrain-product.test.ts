import { describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import { gridFromFunction, hazardMap, makeGrid, writeGeoTiff, writeJsonGrid, HAZARD_SLOPE } from '../../../../core/terrain/index.ts';
import { describeGeoreference, displayTerrain, placeDisplayGrid, readTerrain, sniffTerrainFormat, terrainExtent, terrainProduct } from '../../../../renderer/terrain/terrain-product.ts';
import { sampleHeight } from '../../../../renderer/scene/elevation-grid.ts';

const NO_PNG = { pixelSize_m: null, heightScale_m: null };
// A tilted plane z = 0.1 e − 0.05 n + 7 (analytic: the mean of a plane over a symmetric block is its value
// at the block's centre, so block-mean decimation must reproduce the plane exactly at display cell centres).
const plane = (e: number, n: number) => 0.1 * e - 0.05 * n + 7;

describe('display terrain', () => {
  it('decimates by block means that reproduce a plane at the display cell centres (analytic)', () => {
    const grid = gridFromFunction({ width: 600, height: 400, pixelSizeX_m: 2, pixelSizeY_m: 2, originEast_m: 1000, originNorth_m: 5000 }, plane);
    const d = displayTerrain(grid, 257 * 257);
    // 600 × 400 = 240 000 cells > 66 049: stride 2 gives 300 × 200 = 60 000 vertices.
    expect(d.stride).toBe(2);
    expect([d.grid.width, d.grid.height, d.grid.pixelSize_m]).toEqual([300, 200, 4]);
    for (const [i, j] of [[0, 0], [299, 0], [0, 199], [150, 77], [299, 199]]) {
      const e = d.grid.west_m + i * d.grid.pixelSize_m;
      const n = d.grid.north_m - j * d.grid.pixelSize_m;
      expect(d.grid.heights[j * d.grid.width + i]).toBeCloseTo(plane(e, n), 2);
    }
    expect(d.maxVerticalError_m).toBeLessThan(1e-3);
  });

  it('keeps every cell of a small DEM and resamples unequal pixel sides to square ones', () => {
    const small = gridFromFunction({ width: 50, height: 40, pixelSizeX_m: 5, pixelSizeY_m: 5 }, plane);
    expect(displayTerrain(small).stride).toBe(1);
    const oblong = gridFromFunction({ width: 100, height: 50, pixelSizeX_m: 2, pixelSizeY_m: 4 }, plane);
    const d = displayTerrain(oblong);
    expect(d.grid.pixelSize_m).toBe(2);
    expect(d.grid.height).toBe(100);
    const mid = d.grid.heights[50 * d.grid.width + 50];
    expect(mid).toBeCloseTo(plane(d.grid.west_m + 50 * 2, d.grid.north_m - 50 * 2), 3);
  });

  it('places the nominal target at the chosen DEM point: the scene origin samples the DEM there', () => {
    const grid = gridFromFunction({ width: 200, height: 200, pixelSizeX_m: 2, pixelSizeY_m: 2, originEast_m: 0, originNorth_m: 0 }, plane);
    const display = displayTerrain(grid).grid;
    const placed = placeDisplayGrid(display, { east_m: 120, north_m: -250 });
    expect(sampleHeight(placed, 0, 0)).toBeCloseTo(plane(120, -250), 3);
    expect(sampleHeight(placed, 30, 40)).toBeCloseTo(plane(150, -210), 3);
  });
});

describe('hazard on the display grid', () => {
  it('flags every display cell over a hazardous DEM cell (conservative) and leaves a flat area safe', () => {
    // West half flat, east half a 30° ramp (tan 30° = 0.577): over the default 10° limit.
    const grid = gridFromFunction({ width: 400, height: 400, pixelSizeX_m: 1, pixelSizeY_m: 1 }, (e) => (e > 200 ? (e - 200) * Math.tan(Math.PI / 6) : 0));
    const product = terrainProduct(grid, 'ramp.tif', 'geotiff', {});
    const map = hazardMap(grid, {});
    const { stride, grid: d } = product.display;
    expect(stride).toBe(2);
    for (let r = 0; r < grid.height; r++) {
      for (let c = 0; c < grid.width; c++) {
        if (map.flags[r * grid.width + c] & HAZARD_SLOPE) expect(product.displayHazard[Math.floor(r / stride) * d.width + Math.floor(c / stride)] & HAZARD_SLOPE).toBeTruthy();
      }
    }
    // Well inside the flat half (away from the edge cells the footprint cannot cover): safe.
    expect(product.displayHazard[100 * d.width + 50]).toBe(0);
    expect(product.displayHazard[100 * d.width + 150] & HAZARD_SLOPE).toBeTruthy();
    expect(product.hazard.safeFraction).toBeCloseTo(map.safeFraction, 12);
    expect(product.hazard.limits.maxSlope_deg).toBe(10);
  });
});

describe('reading a DEM', () => {
  it('reads the bundled demo DEM (2000 × 2000 at 10 m, equirectangular on a Mars-sized sphere) as demo-site.json describes it', async () => {
    const bytes = new Uint8Array(fs.readFileSync(new URL('../../../../assets/demo/terrain/demo-site.tif', import.meta.url)));
    const info = JSON.parse(fs.readFileSync(new URL('../../../../assets/demo/terrain/demo-site.json', import.meta.url), 'utf8'));
    const site = info.rasters.find((r: { file: string }) => r.file === 'demo-site.tif');
    const { grid, format } = await readTerrain(bytes, 'demo-site.tif', NO_PNG);
    expect(format).toBe('geotiff');
    expect([grid.width, grid.height, grid.pixelSizeX_m]).toEqual([site.width, site.height, site.pixelSize_m]);
    expect(describeGeoreference(grid.georeference ?? null)).toMatch(/^projected, user-defined CRS "Equirectangular, Mars sphere, Orvessa Plain \(invented\)" \(.*equirectangular/i);
    // The DEM's centre is the site centre (the demo study's nominal target) in the CRS's metres.
    expect(terrainExtent({ ...grid })).toMatchObject({ centreEast_m: info.crs.centreEasting_m, centreNorth_m: info.crs.centreNorthing_m });
  });

  it('tells formats apart by their first bytes and reads a JSON grid', async () => {
    const grid = makeGrid({ width: 3, height: 2, pixelSizeX_m: 1, pixelSizeY_m: 1 }, Float32Array.from([1, 2, 3, 4, 5, 6]));
    const json = new TextEncoder().encode(writeJsonGrid(grid));
    expect(sniffTerrainFormat(json)).toBe('landreach-json-grid');
    expect(sniffTerrainFormat(writeGeoTiff({ width: 3, height: 2, data: grid.heights }))).toBe('geotiff');
    expect((await readTerrain(json, 'g.json', NO_PNG)).grid.heights[5]).toBe(6);
  });

  it('names the file and the problem for unknown, corrupt and under-specified files', async () => {
    await expect(readTerrain(new TextEncoder().encode('hello'), 'notes.tif', NO_PNG)).rejects.toThrow(/^notes\.tif: not a GeoTIFF, 16-bit PNG heightmap or Landreach JSON grid/);
    const tiff = writeGeoTiff({ width: 4, height: 4, data: new Float32Array(16) });
    await expect(readTerrain(tiff.subarray(0, 20), 'cut.tif', NO_PNG)).rejects.toThrow(/^cut\.tif: /);
    // PNG signature (ISO/IEC 15948 §5.2) and nothing else.
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    await expect(readTerrain(png, 'h.png', NO_PNG)).rejects.toThrow(/h\.png: .*enter “PNG pixel size” and “PNG height step”/);
    await expect(readTerrain(new TextEncoder().encode('{"format": "x"}'), 'g.json', NO_PNG)).rejects.toThrow(/^g\.json: /);
    const empty = writeGeoTiff({ width: 2, height: 2, data: new Float32Array(4).fill(NaN), noData: NaN, georeference: { geoTransform: [0, 1, 0, 0, 0, -1] } });
    await expect(readTerrain(empty, 'void.tif', NO_PNG)).rejects.toThrow(/void\.tif: every cell is no-data/);
  });

  it('summarises a projected and a geographic georeference', () => {
    expect(describeGeoreference({ model: 'projected', projectedEpsg: 32633, geoTransform: [0, 1, 0, 0, 0, -1] })).toBe('projected, EPSG:32633');
    // A user-defined planetary CRS: its name (the file's citation) and its projection method.
    const polar = { proj4: '+proj=stere +lat_0=-90 +lon_0=0 +k_0=1 +x_0=0 +y_0=0 +a=1737400 +b=1737400', name: 'user-defined CRS "Moon (2015) - Sphere / Ocentric / South Polar"' };
    expect(describeGeoreference({ model: 'projected', projectedCrs: polar, geoTransform: [0, 1, 0, 0, 0, -1] })).toBe('projected, user-defined CRS "Moon (2015) - Sphere / Ocentric / South Polar" (polar stereographic)');
    expect(describeGeoreference({ model: 'geographic', geographicEpsg: 4326, geoTransform: [0, 1, 0, 0, 0, -1], localFrame: { originLatitude_deg: 45, originLongitude_deg: 7.5, bodyRadius_m: 6378137, maxEastScaleError: 0 } })).toMatch(/^geographic \(EPSG:4326\), flat local frame about 45\.0000°, 7\.5000° on a 6378\.1 km radius$/);
  });
});

describe('reading a PNG heightmap', () => {
  it('uses the Terrain group’s pixel size and height step (16-bit samples, PNG spec encoder)', async () => {
    const { encodeGreyPng } = await import('../../terrain/png-encode.ts');
    // Samples 0, 1000, 2000, 3000 at 0.05 m per step: heights 0, 50, 100, 150 m.
    const png = encodeGreyPng(2, 2, [0, 1000, 2000, 3000], 16);
    const { grid, format } = await readTerrain(png, 'h.png', { pixelSize_m: 3, heightScale_m: 0.05 });
    expect(format).toBe('png-heightmap');
    expect([grid.width, grid.pixelSizeX_m, grid.pixelSizeY_m]).toEqual([2, 3, 3]);
    expect(Array.from(grid.heights)).toEqual([0, 50, 100, 150]);
  });
});
