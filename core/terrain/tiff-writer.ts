/**
 * A small, strict writer of single-band, uncompressed, little-endian baseline TIFF (TIFF 6.0) with
 * GeoTIFF 1.1 georeferencing (OGC 19-008r4: ModelPixelScale + ModelTiepoint for north-up rasters,
 * ModelTransformation for rotated or sheared ones, GeoKeyDirectory with GeoDoubleParams and GeoAsciiParams)
 * and the GDAL_NODATA tag. Enough for slope, hazard and footprint rasters that GDAL reads back; written by
 * hand because it must carry Float32 samples, PixelIsArea and a nodata value exactly. Pure: returns bytes.
 *
 * The CRS is written as the source DEM's own GeoKeys copied key by key (e.g. a user-defined projection as
 * GDAL writes it for IAU_2015 codes and PROJ strings), or as an EPSG code when there are no keys: the raster
 * then carries the very CRS GDAL reads from the DEM (test/reference/export/ checks it with gdalsrsinfo).
 */
import { globals } from 'geotiff';
import type { ElevationGrid, GridGeoreference } from './grid.ts';

export interface RasterGeoreference {
  /**
   * GDAL-style geotransform [x0, a, b, y0, c, d] (outer corner of pixel 0,0): X = x0 + a·col + b·row,
   * Y = y0 + c·col + d·row. North-up ([x0, dx, 0, y0, 0, −dy]) is written as ModelPixelScale +
   * ModelTiepoint, anything else as ModelTransformation.
   */
  geoTransform: readonly [number, number, number, number, number, number];
  /** EPSG code of a projected CRS (metres). */
  projectedEpsg?: number;
  /** EPSG code of a geographic CRS (degrees). */
  geographicEpsg?: number;
  /**
   * The source's GeoKeys by name (as geotiff.js reads them), copied when there is no EPSG code above: the
   * raster type and vertical keys are left out (the raster is PixelIsArea and its values are not heights).
   */
  geoKeys?: Readonly<Record<string, unknown>>;
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
const GEO_DOUBLE_PARAMS = 34736;
const GEO_ASCII_PARAMS = 34737;

/**
 * GeoKeys whose values are DOUBLEs (GeoTIFF 1.1, OGC 19-008r4, Annex B): unit sizes, the figure, the prime
 * meridian, TOWGS84 and the projection parameters 3078–3096. Text keys are the citations; the rest are SHORT
 * codes.
 */
const DOUBLE_KEYS = new Set([2053, 2055, 2057, 2058, 2059, 2061, 2062, 3077, ...Array.from({ length: 19 }, (_, i) => 3078 + i)]);
const SHORT_KEYS = new Set([1024, 2048, 2050, 2051, 2052, 2054, 2056, 2060, 3072, 3074, 3075, 3076]);
const ASCII_KEYS = new Set([1026, 2049, 3073]);
/** Left out when copying: GTRasterTypeGeoKey (written as PixelIsArea) and the vertical keys (4096–4099). */
const DROPPED_KEYS = new Set([1025, 4096, 4097, 4098, 4099]);

interface GeoKeyBlock {
  directory: number[];
  doubles: number[];
  ascii: string;
}

/** GeoKeyDirectory, GeoDoubleParams and GeoAsciiParams for a georeference (keys sorted by id, as GeoTIFF asks). */
function geoKeyBlock(geo: RasterGeoreference): GeoKeyBlock {
  const entries: { id: number; value: unknown }[] = [];
  if (geo.projectedEpsg) entries.push({ id: 1024, value: 1 }, { id: 3072, value: geo.projectedEpsg });
  else if (geo.geographicEpsg) entries.push({ id: 1024, value: 2 }, { id: 2048, value: geo.geographicEpsg });
  else if (geo.geoKeys) {
    for (const [name, value] of Object.entries(geo.geoKeys)) {
      const id = (globals.geoKeys as Record<string, number>)[name];
      if (id === undefined) throw new Error(`writeGeoTiff: unknown GeoKey ${name}`);
      if (DROPPED_KEYS.has(id) || value === undefined || value === null) continue;
      entries.push({ id, value });
    }
  }
  entries.push({ id: 1025, value: 1 }); // GTRasterTypeGeoKey = RasterPixelIsArea
  entries.sort((x, y) => x.id - y.id);
  const directory: number[] = [];
  const doubles: number[] = [];
  let ascii = '';
  for (const { id, value } of entries) {
    if (ASCII_KEYS.has(id)) {
      if (typeof value !== 'string') throw new Error(`writeGeoTiff: GeoKey ${id} must be text, got ${String(value)}`);
      // In GeoAsciiParams each text ends with '|' (GeoTIFF 1.1), which geotiff.js leaves out: a '|' at the end of
      // the value belongs to the text (GDAL's citations separate fields with it), so the terminator is always added.
      const text = value + '|';
      directory.push(id, GEO_ASCII_PARAMS, text.length, ascii.length);
      ascii += text;
    } else if (DOUBLE_KEYS.has(id)) {
      const values = (Array.isArray(value) ? value : [value]).map(Number);
      if (!values.length || !values.every(Number.isFinite)) throw new Error(`writeGeoTiff: GeoKey ${id} must be numbers, got ${String(value)}`);
      directory.push(id, GEO_DOUBLE_PARAMS, values.length, doubles.length);
      doubles.push(...values);
    } else if (SHORT_KEYS.has(id) || id === 1025) {
      const v = Number(value);
      if (!Number.isInteger(v) || v < 0 || v > 65535) throw new Error(`writeGeoTiff: GeoKey ${id} must be a code 0–65535, got ${String(value)}`);
      directory.push(id, 0, 1, v);
    } else {
      throw new Error(`writeGeoTiff: GeoKey ${id} cannot be copied (its type is not known here)`);
    }
  }
  return { directory: [1, 1, 0, entries.length, ...directory], doubles, ascii };
}
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

/**
 * The CRS part of a raster georeference, from a grid's source georeference: the GeoKeys it was read from when
 * there are any (GDAL then reads the very CRS it reads from the source, citations included: with an EPSG code
 * alone GDAL 3.6 reads WGS 84 as the datum ensemble, with GDAL's citations as the plain datum), else its EPSG
 * codes.
 */
export function rasterCrs(g: GridGeoreference): Omit<RasterGeoreference, 'geoTransform'> {
  if (g.projectedCrs?.geoKeys) return { geoKeys: g.projectedCrs.geoKeys };
  return {
    ...(g.projectedEpsg ? { projectedEpsg: g.projectedEpsg } : {}),
    ...(g.geographicEpsg ? { geographicEpsg: g.geographicEpsg } : {}),
  };
}

/** GeoTIFF georeference for a grid: its source georeference when it has one, else its local east–north frame. */
export function gridRasterGeoreference(grid: ElevationGrid): RasterGeoreference {
  const g = grid.georeference;
  if (g && g.model !== 'none') return { geoTransform: g.geoTransform, ...rasterCrs(g) };
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
    const [x0, a, b, y0, c, d] = geo.geoTransform;
    if (![x0, a, b, y0, c, d].every(Number.isFinite) || !(a * d - b * c !== 0)) throw new Error(`writeGeoTiff: geotransform ${geo.geoTransform.join(', ')} is not invertible`);
    if (b === 0 && c === 0 && a > 0 && d < 0) {
      entries.push({ tag: 33550, type: DOUBLE, values: [a, -d, 0] });
      entries.push({ tag: 33922, type: DOUBLE, values: [0, 0, 0, x0, y0, 0] });
    } else {
      // ModelTransformationTag: the 4 × 4 matrix taking (col, row, 0, 1) to (X, Y, 0, 1), row-major.
      entries.push({ tag: 34264, type: DOUBLE, values: [a, b, 0, x0, c, d, 0, y0, 0, 0, 0, 0, 0, 0, 0, 1] });
    }
    const keys = geoKeyBlock(geo);
    entries.push({ tag: 34735, type: SHORT, values: keys.directory });
    if (keys.doubles.length) entries.push({ tag: GEO_DOUBLE_PARAMS, type: DOUBLE, values: keys.doubles });
    if (keys.ascii) entries.push({ tag: GEO_ASCII_PARAMS, type: ASCII, values: keys.ascii });
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
