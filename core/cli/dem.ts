/**
 * Reading an elevation model for the command line: GeoTIFF, 16-bit PNG heightmap or Landreach JSON grid,
 * chosen by the file's first bytes, with the reader options taken from command-line flags.
 */
import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { UsageError } from './command.ts';
import { readGeoTiff, readJsonGrid, readPngHeightmap, type ElevationGrid } from '../terrain/index.ts';

/** Parsed flags: name (without the dashes) → value, or true for a boolean flag. */
export type Flags = Record<string, string | true>;

export function num(flags: Flags, name: string): number | undefined {
  const v = flags[name];
  if (v === undefined) return undefined;
  const x = Number(v);
  if (typeof v !== 'string' || v.trim() === '' || !Number.isFinite(x)) throw new UsageError(`--${name}: '${String(v)}' is not a number`);
  return x;
}

/**
 * Reads a DEM. Flags used: window, body-radius-m, origin-lat-deg, origin-lon-deg, vertical-scale (GeoTIFF);
 * pixel-size-m, height-scale-m, height-offset-m (PNG). With `geoTiffOnlyFor` (an option name), anything but a
 * TIFF is refused, naming that option.
 */
export async function readDem(path: string, flags: Flags, geoTiffOnlyFor?: string): Promise<{ grid: ElevationGrid; format: string }> {
  let bytes: Uint8Array;
  try {
    bytes = new Uint8Array(await readFile(path));
  } catch (err) {
    throw new UsageError(`cannot read DEM '${path}': ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  }
  const name = basename(path);
  const isTiff = (bytes[0] === 0x49 && bytes[1] === 0x49) || (bytes[0] === 0x4d && bytes[1] === 0x4d);
  if (geoTiffOnlyFor && !isTiff) {
    throw new UsageError(`${geoTiffOnlyFor} ${path}: not a GeoTIFF; only a GeoTIFF carries the georeference (CRS) needed here`);
  }
  if (bytes[0] === 0x89 && bytes[1] === 0x50) {
    const pixelSize_m = num(flags, 'pixel-size-m');
    const heightScale_m = num(flags, 'height-scale-m');
    if (pixelSize_m === undefined || heightScale_m === undefined) {
      throw new UsageError(`'${name}' is a PNG heightmap: give --pixel-size-m and --height-scale-m (a PNG carries no georeference)`);
    }
    const grid = await readPngHeightmap(bytes, { pixelSize_m, heightScale_m, heightOffset_m: num(flags, 'height-offset-m') ?? 0, sourceName: name });
    return { grid, format: 'png-heightmap' };
  }
  const head = new TextDecoder().decode(bytes.subarray(0, 64)).replace(/^\uFEFF/, '').trimStart();
  if (head.startsWith('{')) {
    return { grid: readJsonGrid(new TextDecoder().decode(bytes)), format: 'landreach-json-grid' };
  }
  let window: [number, number, number, number] | undefined;
  if (typeof flags.window === 'string') {
    const parts = flags.window.split(',').map(Number);
    if (parts.length !== 4 || !parts.every(Number.isInteger)) throw new UsageError(`--window: '${flags.window}' must be four integers C0,R0,C1,R1`);
    window = parts as [number, number, number, number];
  }
  const grid = await readGeoTiff(bytes, {
    sourceName: name,
    window,
    bodyRadius_m: num(flags, 'body-radius-m'),
    originLatitude_deg: num(flags, 'origin-lat-deg'),
    originLongitude_deg: num(flags, 'origin-lon-deg'),
    verticalScale: num(flags, 'vertical-scale'),
  });
  return { grid, format: 'geotiff' };
}

/**
 * The nominal target on a DEM, in the DEM's frame: `--target-east-m` / `--target-north-m`, else the DEM's
 * centre; a point off the DEM is a usage error naming both options.
 */
export function nominalTargetOnDem(grid: ElevationGrid, flags: Flags): [number, number] {
  const west = grid.originEast_m;
  const east = west + grid.width * grid.pixelSizeX_m;
  const north = grid.originNorth_m;
  const south = north - grid.height * grid.pixelSizeY_m;
  const tE = num(flags, 'target-east-m') ?? (west + east) / 2;
  const tN = num(flags, 'target-north-m') ?? (south + north) / 2;
  if (tE < west || tE > east || tN < south || tN > north) {
    throw new UsageError(`--target-east-m ${tE}, --target-north-m ${tN}: the nominal target is outside the DEM (east ${west}…${east} m, north ${south}…${north} m); give a point on it`);
  }
  return [tE, tN];
}
