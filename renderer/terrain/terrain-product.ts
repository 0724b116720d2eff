/**
 * From an elevation model's bytes to what the app shows: core/terrain reads the file (GeoTIFF, 16-bit PNG
 * heightmap or Landreach JSON grid, told apart by their first bytes), computes the hazard map at full
 * resolution with the user's limits, and the scene gets a decimated display grid (core/terrain's block-mean
 * display mesh) with the hazard flags laid onto it conservatively (a display cell is unsafe when any DEM cell
 * under it is). Pure: runs in the terrain worker and in unit tests. Analysis stays at DEM resolution.
 */
import {
  MAX_GRID_CELLS, PROJECTIONS_CHECKED, TerrainInputError, decimatedMesh, gridGeometry, hazardMap, openGeoTiff, readJsonGrid, readPngHeightmap, requireSomeData,
  resampleHazardFlags, resampleHeights, validCount, type ElevationGrid, type GridGeoreference, type GridSpec, type HazardLimits,
} from '../../core/terrain/index.ts';
import type { ElevationGrid as DisplayGrid } from '../scene/elevation-grid.ts';

export type TerrainFormat = 'geotiff' | 'png-heightmap' | 'landreach-json-grid';

/** What a 16-bit PNG heightmap needs and does not carry. */
export interface PngHeightmapInputs {
  pixelSize_m: number | null;
  heightScale_m: number | null;
}

/**
 * Display grid size: at most 257 × 257 vertices (66 049), about 2.5× the vertices of the earlier synthetic
 * stand-in, which software WebGL (the browser tests) draws without lag. Features wider than the stride survive
 * the block means; hazards are not decimated away (conservative OR).
 */
export const MAX_DISPLAY_VERTICES = 257 * 257;

/** The file's format from its first bytes (TIFF "II"/"MM", PNG signature, JSON "{"), or null. */
export function sniffTerrainFormat(bytes: Uint8Array): TerrainFormat | null {
  if ((bytes[0] === 0x49 && bytes[1] === 0x49) || (bytes[0] === 0x4d && bytes[1] === 0x4d)) return 'geotiff';
  if (bytes[0] === 0x89 && bytes[1] === 0x50 && bytes[2] === 0x4e && bytes[3] === 0x47) return 'png-heightmap';
  const head = new TextDecoder().decode(bytes.subarray(0, 64)).replace(/^\uFEFF/, '').trimStart();
  return head.startsWith('{') ? 'landreach-json-grid' : null;
}

/**
 * A GeoTIFF of at most MAX_GRID_CELLS is read whole. A larger one (e.g. a 20k × 20k DTM) is read at full
 * resolution — the hazard map needs it — over the largest window of at most 4096 × 4096 cells about the DEM's
 * centre (the default nominal target), decoding only the blocks under it; its name says which window. The
 * footprint and the scene then work on that window (a target outside it is refused as off the DEM).
 */
async function readLargeGeoTiff(bytes: Uint8Array, name: string): Promise<{ grid: ElevationGrid; shownName: string }> {
  const dem = await openGeoTiff(bytes, { sourceName: name });
  if (dem.width * dem.height <= MAX_GRID_CELLS) return { grid: (await dem.readPixels([0, 0, dem.width, dem.height])).grid, shownName: name };
  const side = Math.sqrt(MAX_GRID_CELLS);
  const w = Math.min(dem.width, side), h = Math.min(dem.height, Math.floor(MAX_GRID_CELLS / w));
  const c0 = Math.floor((dem.width - w) / 2), r0 = Math.floor((dem.height - h) / 2);
  const { grid } = await dem.readPixels([c0, r0, c0 + w, r0 + h]);
  return { grid, shownName: `${name} (full-resolution window ${w} × ${h} about the centre of its ${dem.width} × ${dem.height})` };
}

/** Reads an elevation model; errors are TerrainInputErrors naming the file and the problem. */
export async function readTerrain(bytes: Uint8Array, name: string, png: PngHeightmapInputs): Promise<{ grid: ElevationGrid; format: TerrainFormat; shownName: string }> {
  const format = sniffTerrainFormat(bytes);
  let grid: ElevationGrid;
  let shownName = name;
  if (format === 'geotiff') ({ grid, shownName } = await readLargeGeoTiff(bytes, name));
  else if (format === 'png-heightmap') {
    if (png.pixelSize_m === null || png.heightScale_m === null) {
      throw new TerrainInputError(`${name}: a PNG heightmap carries no pixel size or height scale; enter “PNG pixel size” and “PNG height step” in the Terrain group, then load it again`);
    }
    grid = await readPngHeightmap(bytes, { pixelSize_m: png.pixelSize_m, heightScale_m: png.heightScale_m, sourceName: name });
  } else if (format === 'landreach-json-grid') {
    try {
      grid = readJsonGrid(new TextDecoder().decode(bytes));
    } catch (error) {
      throw new TerrainInputError(`${name}: ${(error as Error).message}`);
    }
  } else {
    throw new TerrainInputError(`${name}: not a GeoTIFF, 16-bit PNG heightmap or Landreach JSON grid (unrecognised first bytes); choose one of those`);
  }
  requireSomeData(grid, name);
  return { grid, format, shownName };
}

/** Facts about the DEM the Terrain group shows. Plain data (crosses the worker boundary). */
export interface TerrainFacts {
  name: string;
  format: TerrainFormat;
  width: number;
  height: number;
  pixelSizeX_m: number;
  pixelSizeY_m: number;
  originEast_m: number;
  originNorth_m: number;
  validCells: number;
  georeference: GridGeoreference | null;
}

/** The DEM's extent in its own frame (outer edges) and its centre, the default nominal-target position. */
export function terrainExtent(facts: Pick<TerrainFacts, 'width' | 'height' | 'pixelSizeX_m' | 'pixelSizeY_m' | 'originEast_m' | 'originNorth_m'>) {
  const west_m = facts.originEast_m;
  const east_m = facts.originEast_m + facts.width * facts.pixelSizeX_m;
  const north_m = facts.originNorth_m;
  const south_m = facts.originNorth_m - facts.height * facts.pixelSizeY_m;
  return { west_m, east_m, south_m, north_m, centreEast_m: (west_m + east_m) / 2, centreNorth_m: (south_m + north_m) / 2 };
}

/** One-line CRS / georeference summary. */
export function describeGeoreference(geo: GridGeoreference | null): string {
  if (!geo || geo.model === 'none') return 'no CRS: local east/north metres';
  if (geo.model === 'projected') {
    const method = /\+proj=(\S+)/.exec(geo.projectedCrs?.proj4 ?? '')?.[1];
    const name = geo.projectedEpsg ? `EPSG:${geo.projectedEpsg}` : geo.projectedCrs?.name ?? 'CRS without an EPSG code';
    return `projected, ${name}${method && PROJECTIONS_CHECKED[method] ? ` (${PROJECTIONS_CHECKED[method]})` : ''}`;
  }
  const frame = geo.localFrame;
  const crs = geo.geographicEpsg ? `EPSG:${geo.geographicEpsg}` : 'body’s own sphere';
  return frame
    ? `geographic (${crs}), flat local frame about ${frame.originLatitude_deg.toFixed(4)}°, ${frame.originLongitude_deg.toFixed(4)}° on a ${(frame.bodyRadius_m / 1000).toFixed(1)} km radius`
    : `geographic (${crs})`;
}

/** The display grid in the DEM's own frame (cell-centre coordinates), before placing the nominal target. */
export interface DisplayTerrain {
  grid: DisplayGrid;
  /** The display cells as a core GridSpec (outer corner), for laying DEM-resolution rasters onto them. */
  spec: GridSpec;
  stride: number;
  maxVerticalError_m: number;
}

/** Decimated display grid (square pixels: a DEM with unequal pixel sides is first resampled to the smaller). */
export function displayTerrain(grid: ElevationGrid, maxVertices = MAX_DISPLAY_VERTICES): DisplayTerrain {
  let source = grid;
  if (Math.abs(grid.pixelSizeX_m - grid.pixelSizeY_m) > 1e-9 * Math.max(grid.pixelSizeX_m, grid.pixelSizeY_m)) {
    const pixel = Math.min(grid.pixelSizeX_m, grid.pixelSizeY_m);
    source = resampleHeights(grid, {
      width: Math.max(2, Math.floor((grid.width * grid.pixelSizeX_m) / pixel)),
      height: Math.max(2, Math.floor((grid.height * grid.pixelSizeY_m) / pixel)),
      pixelSizeX_m: pixel,
      pixelSizeY_m: pixel,
      originEast_m: grid.originEast_m,
      originNorth_m: grid.originNorth_m,
    });
  }
  const mesh = decimatedMesh(source, maxVertices);
  const heights = new Float32Array(mesh.columns * mesh.rows);
  for (let k = 0; k < heights.length; k++) heights[k] = mesh.positions[3 * k + 2];
  const pitch = mesh.stride * source.pixelSizeX_m;
  return {
    grid: {
      width: mesh.columns,
      height: mesh.rows,
      pixelSize_m: pitch,
      // Vertex (i, j) is the centre of its stride × stride block (core/terrain/mesh.ts).
      west_m: source.originEast_m + pitch / 2,
      north_m: source.originNorth_m - pitch / 2,
      heights,
    },
    spec: { width: mesh.columns, height: mesh.rows, pixelSizeX_m: pitch, pixelSizeY_m: pitch, originEast_m: source.originEast_m, originNorth_m: source.originNorth_m },
    stride: mesh.stride,
    maxVerticalError_m: mesh.maxVerticalError_m,
  };
}

/** Hazard figures for the Terrain group. */
export interface HazardFacts {
  safeFraction: number;
  safeArea_m2: number;
  roughnessAssessed: boolean;
  limits: Required<HazardLimits>;
}

/** Everything the app needs from one DEM with one set of limits. Typed arrays: transferable. */
export interface TerrainProduct {
  facts: TerrainFacts;
  display: DisplayTerrain;
  /** Hazard flags (core/terrain HAZARD_* bits) on the display cells; non-zero = unsafe. */
  displayHazard: Uint8Array;
  hazard: HazardFacts;
}

/** The hazard map at DEM resolution, its flags laid conservatively onto the display cells. */
export function terrainProduct(grid: ElevationGrid, name: string, format: TerrainFormat, limits: HazardLimits, maxVertices = MAX_DISPLAY_VERTICES, map = hazardMap(grid, limits)): TerrainProduct {
  const display = displayTerrain(grid, maxVertices);
  return {
    facts: { name, format, ...gridGeometry(grid), validCells: validCount(grid), georeference: grid.georeference ?? null },
    display,
    displayHazard: resampleHazardFlags(map.flags, grid, display.spec),
    hazard: { safeFraction: map.safeFraction, safeArea_m2: map.safeCells * map.cellArea_m2, roughnessAssessed: map.roughnessAssessed, limits: map.limits },
  };
}

/** The buffers of a product, to transfer rather than copy out of the worker. */
export function productTransfer(product: TerrainProduct): ArrayBuffer[] {
  return [product.display.grid.heights.buffer as ArrayBuffer, product.displayHazard.buffer as ArrayBuffer];
}

/**
 * The display grid in the scene's frame: east/north of the nominal target, which sits at (east_m, north_m)
 * of the DEM frame. The footprint, its drape, contours and picks are all in that frame.
 */
export function placeDisplayGrid(display: DisplayGrid, target: { east_m: number; north_m: number }): DisplayGrid {
  return { ...display, west_m: display.west_m - target.east_m, north_m: display.north_m - target.north_m };
}
