/**
 * The region of a DEM an analysis needs, in the DEM's frame: a rectangle of the footprint's ground frame
 * (true east/north metres about the nominal target) mapped onto the DEM through the ground frame
 * (groundFrame.ts: the projection's Jacobian at the target), plus a margin in DEM metres; and how a GeoTIFF
 * read of such a region picks its level (full resolution or an overview), its pixel window and its block
 * averaging within the memory bound (geotiff-reader.ts does the reading).
 *
 * Memory bound of a read: at most MAX_GRID_CELLS = 4096 × 4096 = 16 777 216 cells are built, 5 bytes a cell
 * (Float32 height + Uint8 no-data mask: 80 MiB) at full resolution or from an overview, 17 while block
 * averaging (a Float64 sum and a Uint32 count more: 272 MiB), plus one block at a time (its stored and decoded
 * bytes; a GDAL tile of 256 × 256 Float32 is 256 KiB, at most MAX_BLOCK_BYTES). Only the file's header, its
 * directories and the blocks under the window are read.
 */
import type { GroundFrame } from './groundFrame.ts';
import type { ElevationGrid, GridFrame } from './grid.ts';
import { MAX_GRID_CELLS, TerrainInputError } from './grid.ts';

function fail(source: string, message: string): never {
  throw new TerrainInputError(`${source}: ${message}`);
}

export interface DemRectangle {
  readonly west_m: number;
  readonly east_m: number;
  readonly south_m: number;
  readonly north_m: number;
}

/**
 * The DEM-frame bounding box of the ground rectangle [west, east] × [south, north] (metres from the target)
 * and of any extra ground points (e.g. a trajectory's ground track), widened by `margin_m` DEM metres on
 * every side. The ground frame is linear, so the rectangle's four corners bound it.
 */
export function groundRegionOnDem(ground: GroundFrame, rect: DemRectangle, margin_m: number, points: readonly (readonly [number, number])[] = []): DemRectangle {
  const corners: (readonly [number, number])[] = [
    [rect.west_m, rect.south_m], [rect.east_m, rect.south_m], [rect.west_m, rect.north_m], [rect.east_m, rect.north_m], ...points,
  ];
  let w = Infinity, e = -Infinity, s = Infinity, n = -Infinity;
  for (const [x, y] of corners) {
    const [E, N] = ground.toDem(x, y);
    w = Math.min(w, E); e = Math.max(e, E); s = Math.min(s, N); n = Math.max(n, N);
  }
  return { west_m: w - margin_m, east_m: e + margin_m, south_m: s - margin_m, north_m: n + margin_m };
}

/**
 * Margin a hazard map needs past the cells it must judge, DEM metres: the lander's radius (the footprint
 * plane fit reaches that far), the safety margin (a hazard that close flags the cell) and two pixels (Horn's
 * 3 × 3 kernel and the fit's ring each reach one pixel further). With it, the hazard flags of the cells
 * inside the region are the ones the whole DEM would give.
 */
export function hazardMargin_m(frame: GridFrame, landerDiameter_m: number, safetyMargin_m: number): number {
  return landerDiameter_m / 2 + safetyMargin_m + 2 * Math.max(frame.pixelSizeX_m, frame.pixelSizeY_m);
}

/** One resolution level of a GeoTIFF: the full-resolution image (level 0) or a reduced-resolution IFD. */
export interface DemLevel {
  /** 0 full resolution; i ≥ 1 the i-th overview, finest first (GDAL's `-ovr ${i - 1}`). */
  readonly level: number;
  readonly width: number;
  readonly height: number;
  /** Pixel size in the DEM's frame, m. */
  readonly pixelSizeX_m: number;
  readonly pixelSizeY_m: number;
}

/**
 * What one read decoded and allocated, counted by the reader: the memory figures of a read. `workingBytes`
 * is what it held at its peak: the grid (Float32 heights + Uint8 no-data mask, 5 bytes a cell; while
 * averaging also a Float64 sum and a Uint32 count, 12 more) plus one block's stored and decoded bytes
 * (blocks are decoded one at a time and dropped), not counting the codec's own small buffers.
 */
export interface DemReadReport {
  readonly level: number;
  readonly overview: boolean;
  /** Pixels of the level averaged into one cell along each axis (1: none). */
  readonly decimation: number;
  readonly method: 'full resolution' | 'overview' | 'block average' | 'overview, block average';
  /** Pixel window [col0, row0, col1, row1) read, in the level's pixels. */
  readonly window: readonly [number, number, number, number];
  readonly levelSize: readonly [number, number];
  readonly cells: number;
  readonly gridBytes: number;
  readonly blocksDecoded: number;
  readonly blocksSparse: number;
  readonly bytesRead: number;
  readonly largestBlockBytes: number;
  readonly workingBytes: number;
}

export interface DemRead {
  readonly grid: ElevationGrid;
  readonly report: DemReadReport;
}

/** A region of the DEM to read, in the DEM's frame (metres; the frame of `GeoTiffDem.frame`). */
export interface DemRegionRequest {
  readonly west_m: number;
  readonly east_m: number;
  readonly south_m: number;
  readonly north_m: number;
  /**
   * 'native' (default): full resolution, refused over `maxCells`. 'fit': the finest resolution whose grid fits
   * `maxCells` (an overview, else block averages). A number: the coarsest pixel size acceptable, m — the
   * coarsest overview at least that fine, then block averages up to it.
   */
  readonly resolution?: 'native' | 'fit' | number;
  /** Most cells of the grid built; default and upper limit MAX_GRID_CELLS. */
  readonly maxCells?: number;
  /** What the region is, for messages (e.g. "the footprint ±4000 m with a 6 m margin"). */
  readonly what?: string;
  /** The fix to name when the region is too large at the resolution asked (e.g. "give a smaller --extent-m"). */
  readonly fix?: string;
}

/** Bytes per grid cell held by a read: Float32 height + Uint8 mask; averaging adds a Float64 sum and a Uint32 count. */
export const GRID_BYTES_PER_CELL = 5;
export const AVERAGING_BYTES_PER_CELL = 17;

/** Which level, pixel window and decimation a region read uses (pure; exported for tests). */
export function planRegionRead(levels: readonly DemLevel[], frame: GridFrame, req: DemRegionRequest, source = 'DEM'): { level: number; window: [number, number, number, number]; decimation: number; pixelSize_m: number } {
  const { west_m: W, east_m: E, south_m: S, north_m: N } = req;
  const what = req.what ?? 'the region';
  if (![W, E, S, N].every(Number.isFinite) || !(E > W) || !(N > S)) {
    fail(source, `invalid region for ${what}: east ${W}…${E} m, north ${S}…${N} m (must be finite with west < east, south < north)`);
  }
  const maxCells = Math.min(req.maxCells ?? MAX_GRID_CELLS, MAX_GRID_CELLS);
  if (!(Number.isInteger(maxCells) && maxCells >= 1)) fail(source, `invalid maxCells: ${req.maxCells} (must be a whole number from 1 to ${MAX_GRID_CELLS})`);
  const oE = frame.originEast_m, oN = frame.originNorth_m;
  const demW = oE, demE = demW + frame.width * frame.pixelSizeX_m;
  const demN = oN, demS = demN - frame.height * frame.pixelSizeY_m;
  if (E <= demW || W >= demE || N <= demS || S >= demN) {
    fail(source, `${what} (east ${W.toFixed(1)}…${E.toFixed(1)} m, north ${S.toFixed(1)}…${N.toFixed(1)} m) lies outside the DEM (east ${demW}…${demE} m, north ${demS}…${demN} m); place the target on the DEM`);
  }
  const windowAt = (l: DemLevel, k: number): [number, number, number, number] => {
    // The level's pixels the region touches, then widened to whole k × k cells of the level's own k-grid
    // (so a cell is the same pixels whatever the region), cut at the image's edge.
    const c0 = Math.max(0, Math.floor((W - oE) / l.pixelSizeX_m + 1e-9));
    const c1 = Math.min(l.width, Math.ceil((E - oE) / l.pixelSizeX_m - 1e-9));
    const r0 = Math.max(0, Math.floor((oN - N) / l.pixelSizeY_m + 1e-9));
    const r1 = Math.min(l.height, Math.ceil((oN - S) / l.pixelSizeY_m - 1e-9));
    return [Math.floor(c0 / k) * k, Math.floor(r0 / k) * k, Math.min(l.width, Math.ceil(c1 / k) * k), Math.min(l.height, Math.ceil(r1 / k) * k)];
  };
  const cellsAt = (l: DemLevel, k: number) => {
    const [c0, r0, c1, r1] = windowAt(l, k);
    return Math.ceil((c1 - c0) / k) * Math.ceil((r1 - r0) / k);
  };
  const pixelOf = (l: DemLevel, k: number) => k * Math.max(l.pixelSizeX_m, l.pixelSizeY_m);
  const tooLarge = (l: DemLevel, k: number, at: string): never => {
    const [c0, r0, c1, r1] = windowAt(l, k);
    const w = Math.ceil((c1 - c0) / k), h = Math.ceil((r1 - r0) / k);
    return fail(source, `${what} needs ${w} × ${h} = ${w * h} cells at ${at}, over the memory bound of ${maxCells} cells (${maxCells * (k > 1 ? AVERAGING_BYTES_PER_CELL : GRID_BYTES_PER_CELL)} bytes of grid; MAX_GRID_CELLS = 4096 × 4096); ${req.fix ?? 'read a smaller region'}`);
  };
  const res = req.resolution ?? 'native';
  let choice: { l: DemLevel; k: number };
  if (res === 'native') {
    choice = { l: levels[0], k: 1 };
  } else if (res === 'fit') {
    let best: { l: DemLevel; k: number } | null = null;
    for (const l of levels) {
      // The smallest k whose grid fits: cells fall roughly as 1/k², so start from that estimate.
      let k = Math.max(1, Math.floor(Math.sqrt(cellsAt(l, 1) / maxCells)));
      while (k > 1 && cellsAt(l, k - 1) <= maxCells) k--;
      while (cellsAt(l, k) > maxCells) k++;
      // Finer wins; at equal fineness the coarser level (fewer pixels decoded).
      if (!best || pixelOf(l, k) < pixelOf(best.l, best.k) * (1 - 1e-9) || (pixelOf(l, k) <= pixelOf(best.l, best.k) * (1 + 1e-9) && l.width < best.l.width)) best = { l, k };
    }
    choice = best!;
  } else {
    if (!(Number.isFinite(res) && res > 0)) fail(source, `invalid resolution for ${what}: ${res} (must be 'native', 'fit' or a pixel size in metres > 0)`);
    // The coarsest overview whose pixels are no coarser than asked; then whole-pixel block averages up to it.
    const meets = levels.filter((l) => Math.max(l.pixelSizeX_m, l.pixelSizeY_m) <= res * (1 + 1e-9));
    const l = meets.length ? meets.reduce((a, b) => (b.pixelSizeX_m > a.pixelSizeX_m ? b : a)) : levels[0];
    const k = Math.max(1, Math.floor(res / Math.max(l.pixelSizeX_m, l.pixelSizeY_m) + 1e-9));
    choice = { l, k };
  }
  const { l, k } = choice;
  if (cellsAt(l, k) > maxCells) tooLarge(l, k, k === 1 && l.level === 0 ? `full resolution (${l.pixelSizeX_m} × ${l.pixelSizeY_m} m)` : `${pixelOf(l, k)} m`);
  return { level: l.level, window: windowAt(l, k), decimation: k, pixelSize_m: pixelOf(l, k) };
}

