/**
 * A small, strict writer of single-band, uncompressed, little-endian baseline TIFF (TIFF 6.0) with
 * GeoTIFF 1.1 keys (ModelPixelScale, ModelTiepoint, GeoKeyDirectory) and the GDAL_NODATA tag. Enough for
 * slope and hazard rasters that GDAL reads back; written by hand because it must carry Float32 samples,
 * PixelIsArea and a nodata value exactly. Pure: returns bytes.
 */
import type { ElevationGrid } from './grid.ts';

export interface RasterGeoreference {
  /** GDAL-style geotransform [x0, dx, 0, y0, 0, −dy] (outer corner of pixel 0,0); north-up only. */
  geoTransform: readonly [number, number, number, number, number, number];
  /** EPSG code of a projected CRS (metres). */
  projectedEpsg?: number;
  /** EPSG code of a geographic CRS (degrees). */
  geographicEpsg?: number;
}

export interface TiffRaster {
  width: number;
  height: number;
  data: Float32Array | Uint8Array;
  georeference?: RasterGeoreference;
  /** Value written as GDAL_NODATA (e.g. NaN for float rasters, 255 for a Uint8 mask). */
  noData?: number;
  /** Free text stored in ImageDescription (ASCII). */
  description?: string;
}

const SHORT = 3;
const LONG = 4;
const DOUBLE = 12;
const ASCII = 2;

interface Entry {
  tag: number;
  type: number;
  values: number[] | string;
}

function asciiBytes(s: string): Uint8Array {
  const out = new Uint8Array(s.length + 1);
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    out[i] = c < 128 ? c : 63; // '?': TIFF ASCII is 7-bit
  }
  return out;
}

function noDataText(v: number): string {
  if (Number.isNaN(v)) return 'nan';
  return String(v);
}

/** GeoTIFF georeference for a grid: its source georeference when it has one, else its local east–north frame. */
export function gridRasterGeoreference(grid: ElevationGrid): RasterGeoreference {
  const g = grid.georeference;
  if (g && g.model !== 'none') {
    return {
      geoTransform: g.geoTransform,
      ...(g.projectedEpsg ? { projectedEpsg: g.projectedEpsg } : {}),
      ...(g.geographicEpsg ? { geographicEpsg: g.geographicEpsg } : {}),
    };
  }
  return { geoTransform: [grid.originEast_m, grid.pixelSizeX_m, 0, grid.originNorth_m, 0, -grid.pixelSizeY_m] };
}

/** Encodes a raster as GeoTIFF bytes. */
export function writeGeoTiff(raster: TiffRaster): Uint8Array {
  const { width, height, data } = raster;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1 || data.length !== width * height) {
    throw new Error(`writeGeoTiff: ${width} × ${height} raster with ${data.length} values`);
  }
  const isFloat = data instanceof Float32Array;
  const bytesPerSample = isFloat ? 4 : 1;
  const rowBytes = width * bytesPerSample;
  const rowsPerStrip = Math.max(1, Math.min(height, Math.floor(65536 / rowBytes)));
  const strips = Math.ceil(height / rowsPerStrip);
  const stripCounts: number[] = [];
  for (let s = 0; s < strips; s++) stripCounts.push(Math.min(rowsPerStrip, height - s * rowsPerStrip) * rowBytes);

  const entries: Entry[] = [
    { tag: 256, type: LONG, values: [width] },
    { tag: 257, type: LONG, values: [height] },
    { tag: 258, type: SHORT, values: [bytesPerSample * 8] },
    { tag: 259, type: SHORT, values: [1] },
    { tag: 262, type: SHORT, values: [1] },
    ...(raster.description ? [{ tag: 270, type: ASCII, values: raster.description }] : []),
    { tag: 273, type: LONG, values: new Array(strips).fill(0) }, // patched below
    { tag: 277, type: SHORT, values: [1] },
    { tag: 278, type: LONG, values: [rowsPerStrip] },
    { tag: 279, type: LONG, values: stripCounts },
    { tag: 284, type: SHORT, values: [1] },
    { tag: 339, type: SHORT, values: [isFloat ? 3 : 1] },
  ];
  const geo = raster.georeference;
  if (geo) {
    const [x0, dx, rx, y0, ry, ndy] = geo.geoTransform;
    if (rx !== 0 || ry !== 0 || !(dx > 0) || !(ndy < 0)) throw new Error('writeGeoTiff: only north-up geotransforms are written');
    entries.push({ tag: 33550, type: DOUBLE, values: [dx, -ndy, 0] });
    entries.push({ tag: 33922, type: DOUBLE, values: [0, 0, 0, x0, y0, 0] });
    // GeoKeyDirectory: header (version 1, revision 1.0, key count), then (key, location 0, count 1, value).
    const keys: number[][] = [];
    if (geo.projectedEpsg) keys.push([1024, 0, 1, 1]);
    else if (geo.geographicEpsg) keys.push([1024, 0, 1, 2]);
    keys.push([1025, 0, 1, 1]); // GTRasterTypeGeoKey = RasterPixelIsArea
    if (geo.geographicEpsg && !geo.projectedEpsg) keys.push([2048, 0, 1, geo.geographicEpsg]);
    if (geo.projectedEpsg) keys.push([3072, 0, 1, geo.projectedEpsg]);
    entries.push({ tag: 34735, type: SHORT, values: [1, 1, 0, keys.length, ...keys.flat()] });
  }
  if (raster.noData !== undefined) entries.push({ tag: 42113, type: ASCII, values: noDataText(raster.noData) });
  entries.sort((a, b) => a.tag - b.tag);

  const typeSize = (t: number) => (t === DOUBLE ? 8 : t === LONG ? 4 : t === SHORT ? 2 : 1);
  const payload = (e: Entry) => (typeof e.values === 'string' ? asciiBytes(e.values).length : e.values.length * typeSize(e.type));
  const ifdSize = 2 + entries.length * 12 + 4;
  let extra = 8 + ifdSize;
  const extraOffsets = new Map<Entry, number>();
  for (const e of entries) {
    const n = payload(e);
    if (n > 4) {
      extra += extra % 2; // word-align values, as TIFF 6.0 asks
      extraOffsets.set(e, extra);
      extra += n;
    }
  }
  extra += (4 - (extra % 4)) % 4;
  const dataStart = extra;
  const stripOffsets = stripCounts.map((_, s) => dataStart + s * rowsPerStrip * rowBytes);
  entries.find((e) => e.tag === 273)!.values = stripOffsets;
  const total = dataStart + data.length * bytesPerSample;
  const out = new Uint8Array(total);
  const view = new DataView(out.buffer);
  out[0] = 0x49; out[1] = 0x49;
  view.setUint16(2, 42, true);
  view.setUint32(4, 8, true);
  view.setUint16(8, entries.length, true);

  const writeValues = (e: Entry, at: number) => {
    if (typeof e.values === 'string') { out.set(asciiBytes(e.values), at); return; }
    e.values.forEach((v, i) => {
      if (e.type === SHORT) view.setUint16(at + 2 * i, v, true);
      else if (e.type === LONG) view.setUint32(at + 4 * i, v, true);
      else view.setFloat64(at + 8 * i, v, true);
    });
  };
  entries.forEach((e, i) => {
    const at = 10 + 12 * i;
    view.setUint16(at, e.tag, true);
    view.setUint16(at + 2, e.type, true);
    view.setUint32(at + 4, typeof e.values === 'string' ? asciiBytes(e.values).length : e.values.length, true);
    const off = extraOffsets.get(e);
    if (off === undefined) writeValues(e, at + 8);
    else { view.setUint32(at + 8, off, true); writeValues(e, off); }
  });
  view.setUint32(10 + 12 * entries.length, 0, true); // no next IFD
  if (isFloat) {
    for (let k = 0; k < data.length; k++) view.setFloat32(dataStart + 4 * k, data[k], true);
  } else {
    out.set(data, dataStart);
  }
  return out;
}
