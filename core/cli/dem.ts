/**
 * Reading an elevation model for the command line: GeoTIFF, 16-bit PNG heightmap or Landreach JSON grid,
 * chosen by the file's first bytes, with the reader options taken from command-line flags.
 */
import { open, readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { UsageError } from './command.ts';
import {
  GRID_BYTES_PER_CELL, MAX_GRID_CELLS, openGeoTiff, readJsonGrid, readPngHeightmap,
  type ByteSource, type DemReadReport, type ElevationGrid, type GeoTiffDem, type GridFrame,
} from '../terrain/index.ts';

/** Parsed flags: name (without the dashes) → value, or true for a boolean flag. */
export type Flags = Record<string, string | true>;

/**
 * Positional arguments and `--name value` / `--name=value` options of a command that keeps its options as
 * Flags (hazard, the landing-success study). A value may start with one '-' (negative coordinates such as
 * `--target-north-m -507`), not with '--'. `what` names the command in the messages, e.g. 'landreach hazard'.
 */
export function parseFlagArgs(args: string[], valueFlags: ReadonlySet<string>, booleanFlags: ReadonlySet<string>, what: string): { positional: string[]; flags: Flags } {
  const positional: string[] = [];
  const flags: Flags = {};
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (!a.startsWith('--')) { positional.push(a); continue; }
    const eq = a.indexOf('=');
    const name = a.slice(2, eq < 0 ? undefined : eq);
    if (booleanFlags.has(name)) { flags[name] = true; continue; }
    if (!valueFlags.has(name)) throw new UsageError(`unknown option --${name} (see ${what} --help)`);
    const value = eq >= 0 ? a.slice(eq + 1) : args[++i];
    if (value === undefined || value.startsWith('--')) throw new UsageError(`--${name} needs a value (see ${what} --help)`);
    flags[name] = value;
  }
  return { positional, flags };
}

export function num(flags: Flags, name: string): number | undefined {
  const v = flags[name];
  if (v === undefined) return undefined;
  const x = Number(v);
  if (typeof v !== 'string' || v.trim() === '' || !Number.isFinite(x)) throw new UsageError(`--${name}: '${String(v)}' is not a number`);
  return x;
}

/** A file read a byte range at a time (positional reads on one handle): a GeoTIFF is never held whole. */
async function fileByteSource(path: string): Promise<{ source: ByteSource; close: () => Promise<void> }> {
  const handle = await open(path, 'r');
  const { size } = await handle.stat();
  return {
    source: {
      byteLength: size,
      read: async (offset, length) => {
        const n = Math.max(0, Math.min(length, size - offset));
        const buf = new Uint8Array(n);
        let done = 0;
        while (done < n) {
          const { bytesRead } = await handle.read(buf, done, n - done, offset + done);
          if (bytesRead === 0) break;
          done += bytesRead;
        }
        return done === n ? buf : buf.subarray(0, done);
      },
    },
    close: () => handle.close(),
  };
}

/**
 * An elevation model opened for reading. A GeoTIFF is opened, not read: its header, directory and CRS are
 * checked and `frame` is its placement; `dem` reads windows of it, decoding only the blocks they need, from
 * the file a range at a time. PNG heightmaps and JSON grids (at most MAX_GRID_CELLS) and a GeoTIFF read
 * with --window are read whole into `grid`.
 */
export interface OpenedDem {
  readonly format: string;
  readonly name: string;
  readonly frame: GridFrame;
  readonly dem: GeoTiffDem | null;
  readonly grid: ElevationGrid | null;
  close(): Promise<void>;
}

/**
 * Opens a DEM. Flags used: window, body-radius-m, origin-lat-deg, origin-lon-deg, vertical-scale (GeoTIFF);
 * pixel-size-m, height-scale-m, height-offset-m (PNG). With `geoTiffOnlyFor` (an option name), anything but a
 * TIFF is refused, naming that option. Close it when done.
 */
export async function openDem(path: string, flags: Flags, geoTiffOnlyFor?: string): Promise<OpenedDem> {
  let file: Awaited<ReturnType<typeof fileByteSource>>;
  try {
    file = await fileByteSource(path);
  } catch (err) {
    throw new UsageError(`cannot read DEM '${path}': ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  }
  const name = basename(path);
  try {
    const head = await file.source.read(0, 64);
    const isTiff = (head[0] === 0x49 && head[1] === 0x49) || (head[0] === 0x4d && head[1] === 0x4d);
    if (geoTiffOnlyFor && !isTiff) {
      throw new UsageError(`${geoTiffOnlyFor} ${path}: not a GeoTIFF; only a GeoTIFF carries the georeference (CRS) needed here`);
    }
    const whole = async (grid: ElevationGrid, format: string): Promise<OpenedDem> => {
      await file.close();
      return { format, name, frame: grid, dem: null, grid, close: async () => undefined };
    };
    if (head[0] === 0x89 && head[1] === 0x50) {
      const pixelSize_m = num(flags, 'pixel-size-m');
      const heightScale_m = num(flags, 'height-scale-m');
      if (pixelSize_m === undefined || heightScale_m === undefined) {
        throw new UsageError(`'${name}' is a PNG heightmap: give --pixel-size-m and --height-scale-m (a PNG carries no georeference)`);
      }
      const bytes = new Uint8Array(await readFile(path));
      return whole(await readPngHeightmap(bytes, { pixelSize_m, heightScale_m, heightOffset_m: num(flags, 'height-offset-m') ?? 0, sourceName: name }), 'png-heightmap');
    }
    const text = new TextDecoder().decode(head).replace(/^\uFEFF/, '').trimStart();
    if (text.startsWith('{')) return whole(readJsonGrid(new TextDecoder().decode(await readFile(path))), 'landreach-json-grid');
    let window: [number, number, number, number] | undefined;
    if (typeof flags.window === 'string') {
      const parts = flags.window.split(',').map(Number);
      if (parts.length !== 4 || !parts.every(Number.isInteger)) throw new UsageError(`--window: '${flags.window}' must be four integers C0,R0,C1,R1`);
      window = parts as [number, number, number, number];
    }
    const options = {
      sourceName: name,
      bodyRadius_m: num(flags, 'body-radius-m'),
      originLatitude_deg: num(flags, 'origin-lat-deg'),
      originLongitude_deg: num(flags, 'origin-lon-deg'),
      verticalScale: num(flags, 'vertical-scale'),
    };
    // --window keeps its rule: a geographic frame's origin at the window's centre (unless given).
    const dem = await openGeoTiff(file.source, options, window ?? 'image');
    if (window) return whole((await dem.readPixels(window)).grid, 'geotiff');
    return { format: 'geotiff', name, frame: dem.frame, dem, grid: null, close: file.close };
  } catch (err) {
    await file.close().catch(() => undefined);
    throw err;
  }
}

/** The whole DEM: what `openDem` read, or the whole GeoTIFF at full resolution (refused over MAX_GRID_CELLS). */
export async function wholeDem(opened: OpenedDem, fix: string): Promise<ElevationGrid> {
  if (opened.grid) return opened.grid;
  const { width, height } = opened.frame;
  if (width * height > MAX_GRID_CELLS) {
    throw new UsageError(`'${opened.name}' is ${width} × ${height} = ${width * height} cells, over the memory bound of ${MAX_GRID_CELLS} cells (4096 × 4096, ${MAX_GRID_CELLS * GRID_BYTES_PER_CELL} bytes of grid) read at full resolution; ${fix}`);
  }
  return (await opened.dem!.readPixels([0, 0, width, height])).grid;
}

/** Reads a whole DEM (see openDem; a GeoTIFF over MAX_GRID_CELLS needs --window). */
export async function readDem(path: string, flags: Flags, geoTiffOnlyFor?: string): Promise<{ grid: ElevationGrid; format: string }> {
  const opened = await openDem(path, flags, geoTiffOnlyFor);
  try {
    return { grid: await wholeDem(opened, 'pass --window C0,R0,C1,R1 to read a part of it'), format: opened.format };
  } finally {
    await opened.close();
  }
}

/** One line on what a windowed read took: level, resolution, cells, bytes held and blocks decoded. */
export function demReadLine(name: string, r: DemReadReport, grid: ElevationGrid): string {
  const [c0, r0, c1, r1] = r.window;
  const how = r.method === 'full resolution' ? 'full resolution' : `${r.method}${r.overview ? ` (overview ${r.level}, ${r.levelSize[0]} × ${r.levelSize[1]})` : ''}${r.decimation > 1 ? `, ${r.decimation} × ${r.decimation} pixels averaged per cell` : ''}`;
  return `read ${name} window [${c0}, ${r0}, ${c1}, ${r1}] at ${how}: ${grid.width} × ${grid.height} cells of ${grid.pixelSizeX_m.toPrecision(6)} × ${grid.pixelSizeY_m.toPrecision(6)} m, ${r.workingBytes} bytes held, ${r.blocksDecoded} blocks decoded (${r.blocksSparse} never written), ${r.bytesRead} bytes read from the file\n`;
}

/**
 * The nominal target on a DEM, in the DEM's frame: `--target-east-m` / `--target-north-m`, else the DEM's
 * centre; a point off the DEM is a usage error naming both options.
 */
export function nominalTargetOnDem(grid: GridFrame, flags: Flags): [number, number] {
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
