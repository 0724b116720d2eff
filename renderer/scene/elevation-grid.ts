/**
 * A plain elevation grid as the scene receives it: the display grid the app builds from a DEM read by
 * core/terrain (renderer/terrain/terrain-product.ts, decimated, in the nominal-target frame).
 * Row 0 is the north edge, column 0 the west edge (the GeoTIFF convention). Heights in metres;
 * NaN marks missing data. Scene coordinates: x east, y north, z up, metres, origin at the nominal target.
 */
export interface ElevationGrid {
  width: number;
  height: number;
  /** Ground size of one pixel, metres (square pixels). */
  pixelSize_m: number;
  /** East coordinate of the centre of column 0. */
  west_m: number;
  /** North coordinate of the centre of row 0. */
  north_m: number;
  heights: Float32Array;
}

export function validateGrid(grid: ElevationGrid): void {
  const { width, height, pixelSize_m, heights } = grid;
  if (!Number.isInteger(width) || width < 2) throw new Error(`invalid grid width: ${width} (must be an integer ≥ 2)`);
  if (!Number.isInteger(height) || height < 2) throw new Error(`invalid grid height: ${height} (must be an integer ≥ 2)`);
  if (!(pixelSize_m > 0) || !Number.isFinite(pixelSize_m)) throw new Error(`invalid pixelSize_m: ${pixelSize_m} (must be a positive number of metres)`);
  if (heights.length !== width * height) throw new Error(`invalid heights: ${heights.length} values for a ${width} × ${height} grid (need ${width * height})`);
}

/** East coordinate of column `c` (fractional columns allowed). */
export const columnToEast = (grid: ElevationGrid, c: number) => grid.west_m + c * grid.pixelSize_m;
/** North coordinate of row `r`. */
export const rowToNorth = (grid: ElevationGrid, r: number) => grid.north_m - r * grid.pixelSize_m;

/** Smallest and largest finite height; [0, 0] for an all-NaN grid. */
export function heightRange(heights: ArrayLike<number>): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < heights.length; i++) {
    const h = heights[i];
    if (h < lo) lo = h;
    if (h > hi) hi = h;
  }
  return lo <= hi ? [lo, hi] : [0, 0];
}

/** Bilinear height at (east, north); NaN outside the grid or next to missing data. */
export function sampleHeight(grid: ElevationGrid, east: number, north: number): number {
  const c = (east - grid.west_m) / grid.pixelSize_m;
  const r = (grid.north_m - north) / grid.pixelSize_m;
  if (c < 0 || r < 0 || c > grid.width - 1 || r > grid.height - 1) return NaN;
  const c0 = Math.min(grid.width - 2, Math.floor(c));
  const r0 = Math.min(grid.height - 2, Math.floor(r));
  const fc = c - c0;
  const fr = r - r0;
  const h = grid.heights;
  const i = r0 * grid.width + c0;
  return (h[i] * (1 - fc) + h[i + 1] * fc) * (1 - fr) + (h[i + grid.width] * (1 - fc) + h[i + grid.width + 1] * fc) * fr;
}

/**
 * Height of the plane things are drawn on where the terrain is missing (past the DEM's edge, no-data): the
 * nominal target's ground, which is also the landing plane the footprint's targets are solved on. When the
 * target itself has no terrain under it, the middle of the terrain's height range.
 */
export function targetGroundHeight(grid: ElevationGrid): number {
  const h = sampleHeight(grid, 0, 0);
  if (!Number.isNaN(h)) return h;
  const [lo, hi] = heightRange(grid.heights);
  return (lo + hi) / 2;
}

/** Terrain height at (east, north), or the target's ground plane (targetGroundHeight) where there is no terrain. */
export function surfaceHeight(grid: ElevationGrid, east: number, north: number, plane_m?: number): number {
  const h = sampleHeight(grid, east, north);
  return Number.isNaN(h) ? plane_m ?? targetGroundHeight(grid) : h;
}
