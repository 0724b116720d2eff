/**
 * Slope and roughness at the lander's footprint scale: a least-squares plane z = a + b·x + c·y fitted
 * to every DEM cell whose centre lies within the lander's radius of the candidate cell's centre, then
 * - footprint slope = atan √(b² + c²) (the tilt the lander would sit at), and
 * - roughness = max |z − plane| (default; the bump or hole a leg or the base could meet) or the RMS
 *   residual.
 * The disc of cell offsets is symmetric under x → −x and y → −y, so Σx = Σy = Σxy = 0 and the normal
 * equations are diagonal: a = mean z, b = Σxz / Σx², c = Σyz / Σy². That holds only when the whole disc
 * is valid, which is what we require: a cell whose disc leaves the grid or touches no-data is
 * *unknown* (NaN), and hazard analysis counts unknown as unsafe.
 * Cost: the window sums come from per-row prefix sums kept for the disc's rows only (O(rows) a cell,
 * O(width · rows) memory); the residual pass is O(cells in the disc) a cell.
 */
import type { ElevationGrid } from './grid.ts';
import { TerrainInputError } from './grid.ts';

export type RoughnessMeasure = 'max' | 'rms';

export interface FootprintFit {
  /** Plane-fit slope over the footprint, radians; NaN where unknown. */
  slope_rad: Float32Array;
  /** Residual height above/below the fitted plane (max |·| or RMS), metres; NaN where unknown. */
  roughness_m: Float32Array;
  /** Number of DEM cells in the footprint disc. */
  cellsInFootprint: number;
  /** Half-size of the disc in cells (columns, rows): cells nearer the edge than this are unknown. */
  reachCols: number;
  reachRows: number;
}

/**
 * Most DEM cells the footprint disc's bounding box may span: 65 536 (a disc about 256 pixels across).
 * The fit costs O(disc) a cell, so a lander hundreds of pixels wide means a DEM far finer than the hazard
 * needs — or a wrong pixel size (a 1e-4 m pixel under a 4 m lander is 40 001 pixels across, 1.6e9 cells).
 * Above the limit the fit is refused before anything is allocated.
 */
export const MAX_FOOTPRINT_CELLS = 65536;

/** Cell offsets (columns, rows) of the footprint disc: cells whose centre is within the lander's radius. */
export function footprintDisc(grid: ElevationGrid, diameter_m: number) {
  const radius = diameter_m / 2;
  const rc = Math.floor(radius / grid.pixelSizeX_m);
  const rr = Math.floor(radius / grid.pixelSizeY_m);
  const box = (2 * rc + 1) * (2 * rr + 1);
  if (!(box <= MAX_FOOTPRINT_CELLS)) {
    throw new TerrainInputError(
      `landerDiameter_m ${diameter_m} spans ${2 * rc + 1} × ${2 * rr + 1} DEM pixels of ${grid.pixelSizeX_m} × ${grid.pixelSizeY_m} m, ` +
        `over the limit of ${MAX_FOOTPRINT_CELLS} cells for the footprint fit; check the DEM's pixel size (ModelPixelScale, or pixelSizeX_m / pixelSizeY_m of a JSON grid), ` +
        `or resample it coarser, e.g. gdalwarp -tr ${(diameter_m / 64).toPrecision(2)} ${(diameter_m / 64).toPrecision(2)}`,
    );
  }
  const cols: number[] = [];
  const rows: number[] = [];
  for (let dr = -rr; dr <= rr; dr++) {
    for (let dc = -rc; dc <= rc; dc++) {
      const x = dc * grid.pixelSizeX_m;
      const y = dr * grid.pixelSizeY_m;
      if (x * x + y * y <= radius * radius * (1 + 1e-12)) { cols.push(dc); rows.push(dr); }
    }
  }
  return { cols, rows, reachCols: rc, reachRows: rr };
}

/** True when the footprint disc holds enough cells for a plane fit (its radius reaches the 4-neighbours). */
export function footprintResolvable(grid: ElevationGrid, diameter_m: number): boolean {
  return diameter_m / 2 >= Math.max(grid.pixelSizeX_m, grid.pixelSizeY_m) * (1 - 1e-12);
}

export function fitFootprint(grid: ElevationGrid, diameter_m: number, measure: RoughnessMeasure = 'max'): FootprintFit {
  if (!Number.isFinite(diameter_m) || diameter_m <= 0) {
    throw new TerrainInputError(`invalid landerDiameter_m: ${diameter_m} (must be a finite number > 0)`);
  }
  if (!footprintResolvable(grid, diameter_m)) {
    throw new TerrainInputError(
      `landerDiameter_m ${diameter_m} is under two DEM pixels (${grid.pixelSizeX_m} × ${grid.pixelSizeY_m} m); a footprint plane fit needs a finer DEM`,
    );
  }
  const { width: w, height: h, heights: z } = grid;
  const disc = footprintDisc(grid, diameter_m);
  const n = disc.cols.length;
  const { reachCols: rc, reachRows: rr } = disc;
  const dx = grid.pixelSizeX_m, dy = grid.pixelSizeY_m;
  // The disc as one column span per row offset: columns −half[i] … +half[i] on row offset i − rr.
  const half = new Int32Array(2 * rr + 1).fill(-1);
  for (let j = 0; j < n; j++) half[disc.rows[j] + rr] = Math.max(half[disc.rows[j] + rr], disc.cols[j]);
  let sxx = 0, syy = 0;
  for (let j = 0; j < n; j++) {
    sxx += (disc.cols[j] * dx) ** 2;
    syy += (disc.rows[j] * dy) ** 2;
  }
  const slope = new Float32Array(w * h).fill(NaN);
  const rough = new Float32Array(w * h).fill(NaN);
  const rms = measure === 'rms';
  // Per-row prefix sums (of z − zRef, of column·(z − zRef), of no-data count) in a ring of 2·rr + 1 rows,
  // so each window sum is O(rows) and memory stays O(width · rows).
  let zRef = 0;
  for (let k = 0; k < z.length; k++) if (!Number.isNaN(z[k])) { zRef = z[k]; break; }
  const ring = 2 * rr + 1;
  const P0 = new Float64Array(ring * (w + 1));
  const P1 = new Float64Array(ring * (w + 1));
  const PN = new Int32Array(ring * (w + 1));
  const fillRow = (row: number) => {
    const base = (row % ring) * (w + 1);
    let a0 = 0, a1 = 0, an = 0;
    P0[base] = 0; P1[base] = 0; PN[base] = 0;
    for (let c = 0; c < w; c++) {
      const v = z[row * w + c];
      if (Number.isNaN(v)) an++;
      else { const d = v - zRef; a0 += d; a1 += c * d; }
      P0[base + c + 1] = a0; P1[base + c + 1] = a1; PN[base + c + 1] = an;
    }
  };
  for (let row = 0; row < Math.min(h, ring - 1); row++) fillRow(row);
  const rowBase = new Int32Array(ring);
  for (let r = rr; r < h - rr; r++) {
    fillRow(r + rr);
    for (let i = 0; i < ring; i++) rowBase[i] = ((r + i - rr) % ring) * (w + 1);
    for (let c = rc; c < w - rc; c++) {
      let s = 0, sxc = 0, sy = 0, bad = 0;
      for (let i = 0; i < ring; i++) {
        const hw = half[i];
        if (hw < 0) continue;
        const base = rowBase[i];
        const lo = base + c - hw, hi = base + c + hw + 1;
        bad += PN[hi] - PN[lo];
        const s0 = P0[hi] - P0[lo];
        s += s0;
        sxc += P1[hi] - P1[lo] - c * s0; // Σ (column − c)·(z − zRef)
        sy += -(i - rr) * s0; // row offsets grow south; y is north-positive
      }
      if (bad > 0) continue; // a no-data cell in the disc: unknown
      const b = (sxc * dx) / sxx;
      const cc = (sy * dy) / syy;
      const k = r * w + c;
      slope[k] = Math.atan(Math.sqrt(b * b + cc * cc));
      const a = s / n + zRef; // plane height at the centre
      const acc = rms ? residualSumSquares(z, w, r, c, rr, half, a, b * dx, cc * dy) : residualMaxAbs(z, w, r, c, rr, half, a, b * dx, cc * dy);
      rough[k] = rms ? Math.sqrt(acc / n) : acc;
    }
  }
  return { slope_rad: slope, roughness_m: rough, cellsInFootprint: n, reachCols: rc, reachRows: rr };
}

/**
 * Largest |z − plane| over the disc rows, plane = a + bx·(column offset) − cy·(row offset) (bx, cy: the
 * plane's change per column east and per row north). This and residualSumSquares are the hot loops:
 * two small monomorphic functions rather than one with a branch inside the loop.
 */
function residualMaxAbs(z: Float32Array, w: number, r: number, c: number, rr: number, half: Int32Array, a: number, bx: number, cy: number): number {
  let hi = 0, lo = 0;
  for (let i = 0; i < half.length; i++) {
    const hw = half[i];
    if (hw < 0) continue;
    const first = (r + i - rr) * w + c - hw;
    const last = first + 2 * hw;
    let plane = a - cy * (i - rr) - bx * hw;
    for (let q = first; q <= last; q++) {
      const e = z[q] - plane;
      if (e > hi) hi = e;
      else if (e < lo) lo = e;
      plane += bx;
    }
  }
  return hi > -lo ? hi : -lo;
}

/** Σ (z − plane)² over the disc rows (same plane as residualMaxAbs). */
function residualSumSquares(z: Float32Array, w: number, r: number, c: number, rr: number, half: Int32Array, a: number, bx: number, cy: number): number {
  let acc = 0;
  for (let i = 0; i < half.length; i++) {
    const hw = half[i];
    if (hw < 0) continue;
    const first = (r + i - rr) * w + c - hw;
    const last = first + 2 * hw;
    let plane = a - cy * (i - rr) - bx * hw;
    for (let q = first; q <= last; q++) {
      const e = z[q] - plane;
      acc += e * e;
      plane += bx;
    }
  }
  return acc;
}
