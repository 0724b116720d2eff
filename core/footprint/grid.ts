/**
 * Grids of candidate landing targets around the nominal target, and the order in which they are solved
 * so that every target after the first starts from a solved neighbour (continuation).
 */

/** A rectangular grid of targets in the local east–north frame (metres, nominal target at the origin). */
export interface TargetGridSpec {
  /** Half-width of the grid east–west, m (targets span −halfWidthEast_m … +halfWidthEast_m). */
  halfWidthEast_m: number;
  /** Half-height of the grid north–south, m. */
  halfWidthNorth_m: number;
  /** Targets along east (≥ 2). */
  nx: number;
  /** Targets along north (≥ 2). */
  ny: number;
}

export interface TargetGrid {
  readonly nx: number;
  readonly ny: number;
  /** East coordinate of each column, m (ascending). */
  readonly east: Float64Array;
  /** North coordinate of each row, m (ascending). */
  readonly north: Float64Array;
  readonly spacingEast_m: number;
  readonly spacingNorth_m: number;
}

/** Largest grid side accepted (a 1001 × 1001 grid is a million cone-program searches). */
export const MAX_GRID_SIDE = 1001;

export function makeTargetGrid(spec: TargetGridSpec): TargetGrid {
  const { halfWidthEast_m: he, halfWidthNorth_m: hn, nx, ny } = spec;
  for (const [name, v] of [['halfWidthEast_m', he], ['halfWidthNorth_m', hn]] as const) {
    if (!Number.isFinite(v) || v <= 0) throw new RangeError(`grid.${name}: ${v} (must be a positive distance in metres)`);
  }
  for (const [name, v] of [['nx', nx], ['ny', ny]] as const) {
    if (!Number.isInteger(v) || v < 2 || v > MAX_GRID_SIDE) {
      throw new RangeError(`grid.${name}: ${v} (must be a whole number from 2 to ${MAX_GRID_SIDE})`);
    }
  }
  const east = Float64Array.from({ length: nx }, (_, i) => -he + (2 * he * i) / (nx - 1));
  const north = Float64Array.from({ length: ny }, (_, j) => -hn + (2 * hn * j) / (ny - 1));
  return { nx, ny, east, north, spacingEast_m: (2 * he) / (nx - 1), spacingNorth_m: (2 * hn) / (ny - 1) };
}

/** Parses "41x41" (or "41") into [nx, ny]; errors name the option and the fix. */
export function parseGridSize(text: string, option = '--grid'): [number, number] {
  const m = /^\s*(\d+)\s*(?:[x×]\s*(\d+))?\s*$/i.exec(text);
  if (!m) throw new RangeError(`${option} ${text}: expected NXxNY, e.g. 41x41`);
  const nx = Number(m[1]);
  const ny = Number(m[2] ?? m[1]);
  for (const v of [nx, ny]) {
    if (v < 2 || v > MAX_GRID_SIDE) throw new RangeError(`${option} ${text}: each side must be from 2 to ${MAX_GRID_SIDE}`);
  }
  return [nx, ny];
}

/**
 * Row order for continuation: the row nearest the nominal target first, then alternately outwards, so each
 * row after the first has a solved neighbour row toward the centre. `parentRow[k]` is that neighbour (−1 for
 * the first).
 */
export function rowOrder(grid: TargetGrid): { rows: Int32Array; parentRow: Int32Array } {
  const ny = grid.ny;
  let centre = 0;
  for (let j = 1; j < ny; j++) if (Math.abs(grid.north[j]) < Math.abs(grid.north[centre])) centre = j;
  const rows: number[] = [centre];
  const parentRow = new Int32Array(ny).fill(-1);
  for (let d = 1; rows.length < ny; d++) {
    if (centre + d < ny) {
      rows.push(centre + d);
      parentRow[centre + d] = centre + d - 1;
    }
    if (centre - d >= 0) {
      rows.push(centre - d);
      parentRow[centre - d] = centre - d + 1;
    }
  }
  return { rows: Int32Array.from(rows), parentRow };
}

/**
 * Column order within a row: from the column nearest east = 0 outwards to the east edge, then from there
 * to the west edge; `previous[i]` is the column solved just before in the same row that neighbours i
 * (−1 for the first), so each target's time-of-flight guess comes from an adjacent solved target.
 */
export function columnOrder(grid: TargetGrid): { columns: Int32Array; previous: Int32Array } {
  const nx = grid.nx;
  let centre = 0;
  for (let i = 1; i < nx; i++) if (Math.abs(grid.east[i]) < Math.abs(grid.east[centre])) centre = i;
  const columns: number[] = [];
  const previous = new Int32Array(nx).fill(-1);
  for (let i = centre; i < nx; i++) {
    columns.push(i);
    previous[i] = i === centre ? -1 : i - 1;
  }
  for (let i = centre - 1; i >= 0; i--) {
    columns.push(i);
    previous[i] = i + 1;
  }
  return { columns: Int32Array.from(columns), previous };
}
