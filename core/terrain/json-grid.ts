/**
 * Landreach's own JSON elevation grid (for tests and small hand-made terrains):
 * {
 *   "format": "landreach-elevation-grid", "version": 1,
 *   "width": 3, "height": 2, "pixelSizeX_m": 2, "pixelSizeY_m": 2,
 *   "originEast_m": 0, "originNorth_m": 0,
 *   "heights_m": [0, 1, 2, 3, null, 5]      // row-major, row 0 north, null = no data
 * }
 */
import type { ElevationGrid } from './grid.ts';
import { TerrainInputError, checkDimensions, gridGeometry, makeGrid, requireSomeData } from './grid.ts';

export const JSON_GRID_FORMAT = 'landreach-elevation-grid';

function field(obj: Record<string, unknown>, name: string, required: boolean): number | undefined {
  const v = obj[name];
  if (v === undefined && !required) return undefined;
  if (typeof v !== 'number' || !Number.isFinite(v)) {
    throw new TerrainInputError(`JSON grid: invalid ${name}: ${JSON.stringify(v)} (must be a finite number)`);
  }
  return v;
}

/** Parses the JSON grid text. Errors are TerrainInputError naming the field. */
export function readJsonGrid(text: string): ElevationGrid {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (err) {
    throw new TerrainInputError(`JSON grid: not valid JSON (${err instanceof Error ? err.message : String(err)})`);
  }
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) throw new TerrainInputError('JSON grid: top level must be an object');
  const o = doc as Record<string, unknown>;
  if (o.format !== JSON_GRID_FORMAT) {
    throw new TerrainInputError(`JSON grid: invalid format: ${JSON.stringify(o.format)} (must be "${JSON_GRID_FORMAT}")`);
  }
  if (o.version !== 1) throw new TerrainInputError(`JSON grid: unsupported version: ${JSON.stringify(o.version)} (this program reads version 1)`);
  const width = field(o, 'width', true)!;
  const height = field(o, 'height', true)!;
  checkDimensions(width, height, 'JSON grid');
  const values = o.heights_m;
  if (!Array.isArray(values) || values.length !== width * height) {
    throw new TerrainInputError(`JSON grid: heights_m must be an array of width × height = ${width * height} numbers or nulls (got ${Array.isArray(values) ? values.length : typeof values})`);
  }
  const heights = new Float32Array(values.length);
  const mask = new Uint8Array(values.length);
  for (let k = 0; k < values.length; k++) {
    const v = values[k];
    if (v === null) mask[k] = 1;
    else if (typeof v === 'number' && Number.isFinite(v)) heights[k] = v;
    else throw new TerrainInputError(`JSON grid: heights_m[${k}] is ${JSON.stringify(v)} (must be a finite number or null)`);
  }
  const grid = makeGrid(
    {
      width,
      height,
      pixelSizeX_m: field(o, 'pixelSizeX_m', true)!,
      pixelSizeY_m: field(o, 'pixelSizeY_m', true)!,
      originEast_m: field(o, 'originEast_m', false) ?? 0,
      originNorth_m: field(o, 'originNorth_m', false) ?? 0,
    },
    heights,
    mask,
  );
  requireSomeData(grid, 'JSON grid');
  return grid;
}

/** Serialises a grid to the JSON grid format (heights rounded to float32 as stored). */
export function writeJsonGrid(grid: ElevationGrid): string {
  return JSON.stringify({
    format: JSON_GRID_FORMAT,
    version: 1,
    ...gridGeometry(grid),
    heights_m: Array.from(grid.heights, (v, k) => (grid.noData[k] ? null : v)),
  });
}
