/**
 * Greyscale PNG heightmap reader (PNG: ISO/IEC 15948, W3C PNG 2nd ed.). 16-bit (and 8-bit) greyscale,
 * non-interlaced; a tRNS grey value marks no-data. The user gives the pixel size and height scale,
 * since a PNG carries neither. Inflate uses the standard DecompressionStream ('deflate' = zlib),
 * available in browsers, workers and Node ≥ 18; output is capped at the expected size.
 */
import type { ElevationGrid } from './grid.ts';
import { MAX_GRID_CELLS, TerrainInputError, makeGrid, requireSomeData } from './grid.ts';

/** How raw PNG samples map to heights: height_m = heightOffset_m + heightScale_m · sample. */
export interface PngHeightmapOptions {
  /** Ground size of one pixel in metres (required; square unless pixelSizeY_m is given). */
  pixelSize_m: number;
  pixelSizeY_m?: number;
  /** Metres per sample step (required). */
  heightScale_m: number;
  /** Height of sample 0 in metres (default 0). */
  heightOffset_m?: number;
  originEast_m?: number;
  originNorth_m?: number;
  sourceName?: string;
}

const SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

let crcTable: Uint32Array | null = null;
/** CRC-32 (ISO 3309 / ITU-T V.42), as PNG chunks use. */
export function crc32(bytes: Uint8Array, start = 0, end = bytes.length): number {
  if (!crcTable) {
    crcTable = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      crcTable[n] = c >>> 0;
    }
  }
  let c = 0xffffffff;
  for (let i = start; i < end; i++) c = crcTable[(c ^ bytes[i]) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function fail(source: string, message: string): never {
  throw new TerrainInputError(`${source}: ${message}`);
}

async function inflateCapped(data: Uint8Array, cap: number, source: string): Promise<Uint8Array> {
  const stream = new Blob([data as BlobPart]).stream().pipeThrough(new DecompressionStream('deflate'));
  const reader = stream.getReader();
  const out = new Uint8Array(cap);
  let n = 0;
  try {
    while (true) {
      const { done, value } = await reader.read();
      if (done) break;
      if (n + value.length > cap) {
        await reader.cancel();
        fail(source, `image data inflates to more than the ${cap} bytes the header allows; the file is corrupt`);
      }
      out.set(value, n);
      n += value.length;
    }
  } catch (err) {
    if (err instanceof TerrainInputError) throw err;
    fail(source, `image data cannot be inflated (${err instanceof Error ? err.message : String(err)}); the file is truncated or corrupt`);
  }
  if (n !== cap) fail(source, `image data inflates to ${n} bytes, expected ${cap}; the file is truncated or corrupt`);
  return out;
}

function paeth(a: number, b: number, c: number): number {
  const p = a + b - c;
  const pa = Math.abs(p - a);
  const pb = Math.abs(p - b);
  const pc = Math.abs(p - c);
  return pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
}

/** Reverses PNG's per-scanline filters in place; returns the raw sample bytes without filter bytes. */
function unfilter(raw: Uint8Array, height: number, rowBytes: number, bpp: number, source: string): Uint8Array {
  const out = new Uint8Array(height * rowBytes);
  for (let r = 0; r < height; r++) {
    const type = raw[r * (rowBytes + 1)];
    const src = r * (rowBytes + 1) + 1;
    const dst = r * rowBytes;
    const prev = dst - rowBytes;
    for (let i = 0; i < rowBytes; i++) {
      const x = raw[src + i];
      const a = i >= bpp ? out[dst + i - bpp] : 0;
      const b = r > 0 ? out[prev + i] : 0;
      const c = r > 0 && i >= bpp ? out[prev + i - bpp] : 0;
      let v: number;
      switch (type) {
        case 0: v = x; break;
        case 1: v = x + a; break;
        case 2: v = x + b; break;
        case 3: v = x + ((a + b) >> 1); break;
        case 4: v = x + paeth(a, b, c); break;
        default: fail(source, `scanline ${r} has unknown filter type ${type}; the file is corrupt`);
      }
      out[dst + i] = v & 0xff;
    }
  }
  return out;
}

function checkOption(name: string, v: number | undefined, rule: 'positive' | 'non-zero' | 'finite'): void {
  if (v === undefined) return;
  const ok = Number.isFinite(v) && (rule === 'positive' ? v > 0 : rule === 'non-zero' ? v !== 0 : true);
  if (!ok) throw new TerrainInputError(`invalid ${name}: ${v} (must be a finite number${rule === 'positive' ? ' > 0' : rule === 'non-zero' ? ', not 0' : ''})`);
}

/** Reads a greyscale PNG heightmap into an ElevationGrid. Errors are TerrainInputError. */
export async function readPngHeightmap(bytes: Uint8Array, options: PngHeightmapOptions): Promise<ElevationGrid> {
  const source = options.sourceName ?? 'PNG heightmap';
  if (options.pixelSize_m === undefined) throw new TerrainInputError('pixelSize_m is required for a PNG heightmap (a PNG has no georeference); e.g. --pixel-size-m 2');
  if (options.heightScale_m === undefined) throw new TerrainInputError('heightScale_m is required for a PNG heightmap (metres per sample step); e.g. --height-scale-m 0.01');
  checkOption('pixelSize_m', options.pixelSize_m, 'positive');
  checkOption('pixelSizeY_m', options.pixelSizeY_m, 'positive');
  checkOption('heightScale_m', options.heightScale_m, 'non-zero');
  checkOption('heightOffset_m', options.heightOffset_m, 'finite');
  checkOption('originEast_m', options.originEast_m, 'finite');
  checkOption('originNorth_m', options.originNorth_m, 'finite');
  if (bytes.length < 8 || SIGNATURE.some((b, i) => bytes[i] !== b)) fail(source, 'not a PNG file (bad signature)');
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let pos = 8;
  let width = 0, height = 0, depth = 0, colour = -1, interlace = 0;
  let transparent: number | null = null;
  const idat: Uint8Array[] = [];
  let idatLength = 0;
  let sawEnd = false;
  while (pos < bytes.length) {
    if (pos + 12 > bytes.length) fail(source, `chunk at byte ${pos} is cut short; the file is truncated`);
    const length = view.getUint32(pos);
    const type = String.fromCharCode(bytes[pos + 4], bytes[pos + 5], bytes[pos + 6], bytes[pos + 7]);
    const dataStart = pos + 8;
    if (length > bytes.length - dataStart - 4) fail(source, `chunk '${type}' claims ${length} bytes past the end of the file; the file is truncated`);
    const stored = view.getUint32(dataStart + length);
    if (crc32(bytes, pos + 4, dataStart + length) !== stored) fail(source, `chunk '${type}' at byte ${pos} fails its CRC check; the file is corrupt`);
    const data = bytes.subarray(dataStart, dataStart + length);
    if (type === 'IHDR') {
      if (length !== 13) fail(source, `IHDR has length ${length}, expected 13`);
      width = view.getUint32(dataStart);
      height = view.getUint32(dataStart + 4);
      depth = data[8];
      colour = data[9];
      interlace = data[12];
    } else if (type === 'tRNS' && length >= 2) {
      transparent = (data[0] << 8) | data[1];
    } else if (type === 'IDAT') {
      idat.push(data);
      idatLength += length;
    } else if (type === 'IEND') {
      sawEnd = true;
      break;
    }
    pos = dataStart + length + 4;
  }
  if (width === 0) fail(source, 'has no IHDR chunk (or zero size); the file is corrupt');
  if (colour !== 0) fail(source, `colour type ${colour} is not greyscale (0); save the heightmap as a single-channel greyscale PNG`);
  if (depth !== 16 && depth !== 8) fail(source, `bit depth ${depth} is not supported; use a 16-bit (or 8-bit) greyscale PNG`);
  if (interlace !== 0) fail(source, 'is interlaced (Adam7); save it without interlacing');
  if (width * height > MAX_GRID_CELLS) fail(source, `is ${width} × ${height} = ${width * height} cells, over the limit of ${MAX_GRID_CELLS} (4096 × 4096); crop it first`);
  if (!sawEnd) fail(source, 'has no IEND chunk; the file is truncated');
  if (idatLength === 0) fail(source, 'has no image data (IDAT)');
  const joined = new Uint8Array(idatLength);
  let o = 0;
  for (const d of idat) { joined.set(d, o); o += d.length; }
  const bpp = depth / 8;
  const rowBytes = width * bpp;
  const raw = await inflateCapped(joined, height * (rowBytes + 1), source);
  const pixels = unfilter(raw, height, rowBytes, bpp, source);
  const heights = new Float32Array(width * height);
  const mask = new Uint8Array(width * height);
  const scale = options.heightScale_m;
  const offset = options.heightOffset_m ?? 0;
  for (let k = 0; k < heights.length; k++) {
    const sample = depth === 16 ? (pixels[2 * k] << 8) | pixels[2 * k + 1] : pixels[k];
    if (transparent !== null && sample === transparent) mask[k] = 1;
    else heights[k] = offset + scale * sample;
  }
  const grid = makeGrid(
    {
      width,
      height,
      pixelSizeX_m: options.pixelSize_m,
      pixelSizeY_m: options.pixelSizeY_m ?? options.pixelSize_m,
      originEast_m: options.originEast_m ?? 0,
      originNorth_m: options.originNorth_m ?? 0,
    },
    heights,
    mask,
  );
  requireSomeData(grid, source);
  return grid;
}
