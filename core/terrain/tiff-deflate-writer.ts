/**
 * A writer of single-band Float32 GeoTIFF in 256 × 256 tiles, Deflate-compressed (pako, a port of zlib)
 * with the floating-point predictor (TIFF Technical Note 3, predictor 3: each tile row's samples split into
 * byte planes, most significant first, then differenced byte by byte — as libtiff and GDAL write it), and
 * any GeoKeys: a short code, a double or an ASCII parameter, so user-defined projected CRSs (what GDAL writes
 * for a PROJ string or a planetary WKT) can be stored. Used for large rasters that must stay small on disk
 * (the invented demo DEM); tiff-writer.ts writes the small uncompressed rasters. Pure: returns bytes.
 */
import { deflate } from 'pako';

/** A GeoKey and its value: numbers of SHORT keys go in the directory, others in GeoDoubleParams. */
export type GeoKeyValue = { key: number; short: number } | { key: number; double: number } | { key: number; ascii: string };

export interface DeflateTiffRaster {
  width: number;
  height: number;
  data: Float32Array;
  /** GDAL-style geotransform [x0, dx, 0, y0, 0, −dy], north-up. */
  geoTransform: readonly [number, number, number, number, number, number];
  geoKeys: readonly GeoKeyValue[];
  /** Free text stored in ImageDescription (ASCII). */
  description?: string;
  /** zlib level 1–9 (default 9). */
  level?: number;
}

const TILE = 256;
const SHORT = 3, LONG = 4, ASCII = 2, DOUBLE = 12;

function ascii(s: string): Uint8Array {
  const out = new Uint8Array(s.length + 1);
  for (let i = 0; i < s.length; i++) out[i] = s.charCodeAt(i) < 128 ? s.charCodeAt(i) : 63;
  return out;
}

/** Predictor 3 on one tile: per row, byte planes (big-endian order) then horizontal byte differences. */
function predictTile(data: Float32Array, width: number, height: number, c0: number, r0: number): Uint8Array {
  const out = new Uint8Array(TILE * TILE * 4);
  const row = new DataView(new ArrayBuffer(4));
  for (let r = 0; r < TILE; r++) {
    const base = r * TILE * 4;
    for (let c = 0; c < TILE; c++) {
      // Padding outside the image is written as 0, as GDAL does.
      const v = r0 + r < height && c0 + c < width ? data[(r0 + r) * width + c0 + c] : 0;
      row.setFloat32(0, v, false);
      for (let b = 0; b < 4; b++) out[base + b * TILE + c] = row.getUint8(b);
    }
    for (let i = TILE * 4 - 1; i > 0; i--) out[base + i] = (out[base + i] - out[base + i - 1]) & 0xff;
  }
  return out;
}

export function writeDeflateGeoTiff(raster: DeflateTiffRaster): Uint8Array {
  const { width, height, data } = raster;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1 || data.length !== width * height) {
    throw new Error(`writeDeflateGeoTiff: ${width} × ${height} raster with ${data.length} values`);
  }
  const [x0, dx, rx, y0, ry, ndy] = raster.geoTransform;
  if (rx !== 0 || ry !== 0 || !(dx > 0) || !(ndy < 0)) throw new Error('writeDeflateGeoTiff: only north-up geotransforms are written');
  const across = Math.ceil(width / TILE), down = Math.ceil(height / TILE);
  const tiles: Uint8Array[] = [];
  for (let tr = 0; tr < down; tr++) for (let tc = 0; tc < across; tc++) {
    tiles.push(deflate(predictTile(data, width, height, tc * TILE, tr * TILE), { level: raster.level ?? 9 }));
  }

  // GeoKeys: SHORT values in the directory, doubles in GeoDoubleParams, text in GeoAsciiParams (a '|' ends each, as GDAL writes it).
  const keys = [...raster.geoKeys].sort((a, b) => a.key - b.key);
  const doubles: number[] = [];
  let asciiText = '';
  const dir: number[] = [1, 1, 0, keys.length];
  for (const k of keys) {
    if ('short' in k) dir.push(k.key, 0, 1, k.short);
    else if ('double' in k) { dir.push(k.key, 34736, 1, doubles.length); doubles.push(k.double); }
    else { const t = k.ascii + '|'; dir.push(k.key, 34737, t.length, asciiText.length); asciiText += t; }
  }

  type Entry = { tag: number; type: number; values: number[] | string };
  const entries: Entry[] = [
    { tag: 256, type: LONG, values: [width] },
    { tag: 257, type: LONG, values: [height] },
    { tag: 258, type: SHORT, values: [32] },
    { tag: 259, type: SHORT, values: [8] }, // Deflate (Adobe)
    { tag: 262, type: SHORT, values: [1] },
    ...(raster.description ? [{ tag: 270, type: ASCII, values: raster.description }] : []),
    { tag: 277, type: SHORT, values: [1] },
    { tag: 284, type: SHORT, values: [1] },
    { tag: 317, type: SHORT, values: [3] }, // floating-point predictor
    { tag: 322, type: SHORT, values: [TILE] },
    { tag: 323, type: SHORT, values: [TILE] },
    { tag: 324, type: LONG, values: new Array(tiles.length).fill(0) }, // patched below
    { tag: 325, type: LONG, values: tiles.map((t) => t.length) },
    { tag: 339, type: SHORT, values: [3] },
    { tag: 33550, type: DOUBLE, values: [dx, -ndy, 0] },
    { tag: 33922, type: DOUBLE, values: [0, 0, 0, x0, y0, 0] },
    { tag: 34735, type: SHORT, values: dir },
    ...(doubles.length ? [{ tag: 34736, type: DOUBLE, values: doubles }] : []),
    ...(asciiText ? [{ tag: 34737, type: ASCII, values: asciiText }] : []),
  ];
  const size = (t: number) => (t === DOUBLE ? 8 : t === LONG ? 4 : t === SHORT ? 2 : 1);
  const bytesOf = (e: Entry) => (typeof e.values === 'string' ? ascii(e.values).length : e.values.length * size(e.type));
  let at = 8 + 2 + entries.length * 12 + 4;
  const offsets = new Map<Entry, number>();
  for (const e of entries) {
    if (bytesOf(e) > 4) { at += at % 2; offsets.set(e, at); at += bytesOf(e); }
  }
  at += (4 - (at % 4)) % 4;
  const tileOffsets: number[] = [];
  for (const t of tiles) { tileOffsets.push(at); at += t.length; }
  entries.find((e) => e.tag === 324)!.values = tileOffsets;

  const out = new Uint8Array(at);
  const view = new DataView(out.buffer);
  out[0] = 0x49; out[1] = 0x49;
  view.setUint16(2, 42, true);
  view.setUint32(4, 8, true);
  view.setUint16(8, entries.length, true);
  const put = (e: Entry, p: number) => {
    if (typeof e.values === 'string') { out.set(ascii(e.values), p); return; }
    e.values.forEach((v, i) => {
      if (e.type === SHORT) view.setUint16(p + 2 * i, v, true);
      else if (e.type === LONG) view.setUint32(p + 4 * i, v, true);
      else view.setFloat64(p + 8 * i, v, true);
    });
  };
  entries.forEach((e, i) => {
    const p = 10 + 12 * i;
    view.setUint16(p, e.tag, true);
    view.setUint16(p + 2, e.type, true);
    view.setUint32(p + 4, typeof e.values === 'string' ? ascii(e.values).length : e.values.length, true);
    const off = offsets.get(e);
    if (off === undefined) put(e, p + 8);
    else { view.setUint32(p + 8, off, true); put(e, off); }
  });
  view.setUint32(10 + 12 * entries.length, 0, true);
  tiles.forEach((t, i) => out.set(t, tileOffsets[i]));
  return out;
}
