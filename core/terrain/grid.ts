/**
 * The elevation grid every terrain function takes and returns: plain data, no classes, so it crosses
 * workers as transferables and runs the same in the renderer, in workers and in the CLI.
 *
 * Frame: a local east–north–up frame in metres. Row 0 is the northern edge, rows run south, columns
 * run east (the usual north-up raster order). Pixel (col, row) is an *area*; its centre is at
 *   east  = originEast_m  + (col + 0.5) · pixelSizeX_m
 *   north = originNorth_m − (row + 0.5) · pixelSizeY_m
 * where (originEast_m, originNorth_m) is the outer north-west corner of pixel (0, 0) — the same
 * convention as a GDAL geotransform.
 */

/** Where the grid came from in its source file's coordinate reference system (kept for writing back). */
export interface GridGeoreference {
  /** GDAL-style geotransform of the source CRS: [x0, dx, 0, y0, 0, −dy] (corner of pixel 0,0). */
  readonly geoTransform: readonly [number, number, number, number, number, number];
  /** EPSG code of a projected CRS, when the file named one. */
  readonly projectedEpsg?: number;
  /**
   * Projected sources: the CRS as a PROJ string and a name (projection.ts), taken from the file's GeoKeys
   * (EPSG code or user-defined keys). Without it a projected georeference falls back on `projectedEpsg`.
   */
  readonly projectedCrs?: { readonly proj4: string; readonly name: string; readonly planetocentric?: boolean; readonly geoKeys?: Readonly<Record<string, unknown>> };
  /** EPSG code of a geographic CRS, when the file named one. */
  readonly geographicEpsg?: number;
  /** 'projected' (metres), 'geographic' (degrees, converted to a local frame), or 'none' (no CRS). */
  readonly model: 'projected' | 'geographic' | 'none';
  /** For geographic sources: the local-frame origin (degrees) and the body radius used (m). */
  readonly localFrame?: {
    readonly originLatitude_deg: number;
    readonly originLongitude_deg: number;
    readonly bodyRadius_m: number;
    /** Worst relative east-scale error of the flat local frame over the grid (|cos φ / cos φ0 − 1|). */
    readonly maxEastScaleError: number;
  };
}

export interface ElevationGrid {
  readonly width: number;
  readonly height: number;
  /** Heights in metres, row-major (row 0 north). NaN where `noData` is 1. */
  readonly heights: Float32Array;
  /** 1 where the cell has no data, 0 where it is valid. */
  readonly noData: Uint8Array;
  /** Pixel size east–west (m, > 0). */
  readonly pixelSizeX_m: number;
  /** Pixel size north–south (m, > 0). */
  readonly pixelSizeY_m: number;
  /** East coordinate of the grid's north-west outer corner (m). */
  readonly originEast_m: number;
  /** North coordinate of the grid's north-west outer corner (m). */
  readonly originNorth_m: number;
  readonly georeference?: GridGeoreference;
}

/** A grid's size and placement without its heights (an opened DEM's frame before anything is read). */
export type GridFrame = Omit<ElevationGrid, 'heights' | 'noData'>;

/**
 * The memory bound: the largest grid any reader builds, 4096 × 4096 = 16 777 216 cells — 80 MiB of Float32
 * heights and Uint8 masks (5 bytes a cell), 272 MiB while block averaging (17 bytes a cell), plus one TIFF
 * block at a time (dem-region.ts). A hazard map on such a grid holds about 40 bytes a cell more (slope,
 * footprint slope, roughness, flags, distance transform: ≈ 0.7 GiB at the bound). Larger files are read as a
 * window of them (`openGeoTiff(…).readRegion`: the region an analysis needs, at full resolution, from an
 * overview or block-averaged; or the `window` option of readGeoTiff).
 */
export const MAX_GRID_CELLS = 4096 * 4096;

/** An error in terrain input that the user can fix; the message names the field, the value and the fix. */
export class TerrainInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'TerrainInputError';
  }
}

/** Rejects dimensions that are not positive integers or exceed MAX_GRID_CELLS. */
export function checkDimensions(width: number, height: number, what = 'grid'): void {
  for (const [name, v] of [['width', width], ['height', height]] as const) {
    if (!Number.isInteger(v) || v < 1) {
      throw new TerrainInputError(`invalid ${what} ${name}: ${v} (must be a positive integer)`);
    }
  }
  if (width * height > MAX_GRID_CELLS) {
    throw new TerrainInputError(
      `${what} too large: ${width} × ${height} = ${width * height} cells (limit ${MAX_GRID_CELLS}, i.e. 4096 × 4096); read a window of the file instead`,
    );
  }
}

function checkPositive(name: string, v: number): void {
  if (!Number.isFinite(v) || v <= 0) throw new TerrainInputError(`invalid ${name}: ${v} (must be a finite number > 0)`);
}

function checkFinite(name: string, v: number): void {
  if (!Number.isFinite(v)) throw new TerrainInputError(`invalid ${name}: ${v} (must be a finite number)`);
}

export interface GridSpec {
  width: number;
  height: number;
  pixelSizeX_m: number;
  pixelSizeY_m: number;
  originEast_m?: number;
  originNorth_m?: number;
  georeference?: GridGeoreference;
}

/**
 * Builds a grid from heights; cells that are NaN (or flagged in `noData`) become no-data. The heights
 * array is taken over, not copied.
 */
export function makeGrid(spec: GridSpec, heights: Float32Array, noData?: Uint8Array): ElevationGrid {
  checkDimensions(spec.width, spec.height);
  checkPositive('pixelSizeX_m', spec.pixelSizeX_m);
  checkPositive('pixelSizeY_m', spec.pixelSizeY_m);
  const originEast_m = spec.originEast_m ?? 0;
  const originNorth_m = spec.originNorth_m ?? 0;
  checkFinite('originEast_m', originEast_m);
  checkFinite('originNorth_m', originNorth_m);
  const n = spec.width * spec.height;
  if (heights.length !== n) {
    throw new TerrainInputError(`heights has ${heights.length} values but the grid is ${spec.width} × ${spec.height} = ${n}`);
  }
  const mask = noData ?? new Uint8Array(n);
  if (mask.length !== n) throw new TerrainInputError(`noData mask has ${mask.length} values, expected ${n}`);
  for (let k = 0; k < n; k++) {
    if (mask[k] || !Number.isFinite(heights[k])) {
      mask[k] = 1;
      heights[k] = NaN;
    }
  }
  return {
    width: spec.width,
    height: spec.height,
    heights,
    noData: mask,
    pixelSizeX_m: spec.pixelSizeX_m,
    pixelSizeY_m: spec.pixelSizeY_m,
    originEast_m,
    originNorth_m,
    ...(spec.georeference ? { georeference: spec.georeference } : {}),
  };
}

/** Builds a grid by sampling f(east, north) at every pixel centre. */
export function gridFromFunction(spec: GridSpec, f: (east_m: number, north_m: number) => number): ElevationGrid {
  checkDimensions(spec.width, spec.height);
  const heights = new Float32Array(spec.width * spec.height);
  const e0 = spec.originEast_m ?? 0;
  const n0 = spec.originNorth_m ?? 0;
  for (let r = 0; r < spec.height; r++) {
    const north = n0 - (r + 0.5) * spec.pixelSizeY_m;
    for (let c = 0; c < spec.width; c++) heights[r * spec.width + c] = f(e0 + (c + 0.5) * spec.pixelSizeX_m, north);
  }
  return makeGrid(spec, heights);
}

/** Size and placement of a grid (the fields a file or report carries besides the heights). */
export function gridGeometry(grid: ElevationGrid) {
  const { width, height, pixelSizeX_m, pixelSizeY_m, originEast_m, originNorth_m } = grid;
  return { width, height, pixelSizeX_m, pixelSizeY_m, originEast_m, originNorth_m };
}

/** East coordinate of the centre of column `col`. */
export function cellEast(grid: ElevationGrid, col: number): number {
  return grid.originEast_m + (col + 0.5) * grid.pixelSizeX_m;
}

/** North coordinate of the centre of row `row`. */
export function cellNorth(grid: ElevationGrid, row: number): number {
  return grid.originNorth_m - (row + 0.5) * grid.pixelSizeY_m;
}

/** Number of valid cells. */
export function validCount(grid: ElevationGrid): number {
  let n = 0;
  for (let k = 0; k < grid.noData.length; k++) if (!grid.noData[k]) n++;
  return n;
}

/** Throws when every cell is no-data (nothing to analyse). */
export function requireSomeData(grid: ElevationGrid, source: string): void {
  if (validCount(grid) === 0) {
    throw new TerrainInputError(`${source}: every cell is no-data (nodata value or NaN); check the nodata value or the window`);
  }
}

/**
 * Bilinear height at (east, north); NaN outside the grid's pixel centres or when a corner is no-data.
 * Pure, used by clearance checks and resampling.
 */
export function sampleBilinear(grid: ElevationGrid, east_m: number, north_m: number): number {
  const fx = (east_m - grid.originEast_m) / grid.pixelSizeX_m - 0.5;
  const fy = (grid.originNorth_m - north_m) / grid.pixelSizeY_m - 0.5;
  if (!(fx >= 0 && fy >= 0 && fx <= grid.width - 1 && fy <= grid.height - 1)) return NaN;
  const c0 = Math.min(Math.floor(fx), Math.max(grid.width - 2, 0));
  const r0 = Math.min(Math.floor(fy), Math.max(grid.height - 2, 0));
  const c1 = Math.min(c0 + 1, grid.width - 1);
  const r1 = Math.min(r0 + 1, grid.height - 1);
  const tx = fx - c0;
  const ty = fy - r0;
  const w = grid.width;
  const h = grid.heights;
  const z00 = h[r0 * w + c0];
  const z01 = h[r0 * w + c1];
  const z10 = h[r1 * w + c0];
  const z11 = h[r1 * w + c1];
  return (1 - ty) * ((1 - tx) * z00 + tx * z01) + ty * ((1 - tx) * z10 + tx * z11);
}
