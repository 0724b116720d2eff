/**
 * GeoTIFF (OGC GeoTIFF 1.1) elevation reader on top of the `geotiff` package: bytes in, ElevationGrid
 * out; band 1 is the elevation (as GDAL reads it), pixel- or band-interleaved. Handles integer and float samples, the affine tags (ModelPixelScale +
 * ModelTiepoint, or a non-rotated ModelTransformation), GDAL_NODATA (including "nan"; float32 files are
 * compared after Math.fround), PixelIsPoint vs PixelIsArea, projected metres, and geographic degrees
 * converted to a flat local east–north frame around a chosen origin.
 */
import { fromArrayBuffer } from 'geotiff';
import type { GeoTIFFImage } from 'geotiff';
import type { ElevationGrid, GridGeoreference, GridSpec } from './grid.ts';
import { MAX_GRID_CELLS, TerrainInputError, checkDimensions, makeGrid, requireSomeData } from './grid.ts';
import { checkDirectory, noDataAsSample, readWindow, tiffLayout } from './tiff-blocks.ts';
import { CHECKED_PROJECTIONS_TEXT, makeProjection, projectedCrsFromGeoKeys } from './projection.ts';
import { WGS84_SEMI_MAJOR_AXIS_M, geographicToLocal, localFrameScale, type GeographicFrame } from './georeference.ts';

/** Options for readGeoTiff; every field is optional. */
export interface GeoTiffReadOptions {
  /** Pixel window [col0, row0, col1, row1) to read; default the whole image. Use it for files over MAX_GRID_CELLS. */
  window?: readonly [number, number, number, number];
  /** Metres per vertical unit of the samples. Default: from VerticalUnitsGeoKey when present, else 1
   *  (heights taken as metres — a file that stores feet without saying so needs this option). */
  verticalScale?: number;
  /** Geographic DEMs: body radius in metres. Default: the file's GeogSemiMajorAxisGeoKey, else WGS 84's
   *  6 378 137 m for EPSG:4326, else an error asking for it. */
  bodyRadius_m?: number;
  /** Geographic DEMs: local-frame origin (degrees); default the centre of the grid read. */
  originLatitude_deg?: number;
  originLongitude_deg?: number;
  /** Name used in error messages (e.g. the file name). */
  sourceName?: string;
}

const TAG_PIXEL_SCALE = 'ModelPixelScale';
const TAG_TIEPOINT = 'ModelTiepoint';
const TAG_TRANSFORMATION = 'ModelTransformation';
const DEG = Math.PI / 180;

/** EPSG unit-of-measure codes for lengths → metres (EPSG 9001 metre, 9002 foot, 9003 US survey foot, 9036 kilometre). */
const LINEAR_UNIT_M: Record<number, number> = { 9001: 1, 9002: 0.3048, 9003: 1200 / 3937, 9036: 1000 };

function unitToMetres(source: string, key: string, code: unknown): number {
  if (code === undefined || code === null) return 1;
  const f = LINEAR_UNIT_M[Number(code)];
  if (f === undefined) fail(source, `${key} ${String(code)} is not a length unit this reader knows (metre, foot, US survey foot, kilometre); reproject to metres first (gdalwarp)`);
  return f;
}

function fail(source: string, message: string): never {
  throw new TerrainInputError(`${source}: ${message}`);
}

/**
 * GDAL_NODATA is ASCII, read the way GDAL reads it (CPLAtofM, i.e. C strtod): up to the first NUL, leading
 * white space skipped, "nan" / "inf" spellings, the longest number at the start, and 0 when there is none.
 * An empty tag means no no-data value.
 */
export function parseNoData(text: unknown): number | null {
  if (typeof text !== 'string') return null;
  const nul = text.indexOf('\0');
  const raw = nul < 0 ? text : text.slice(0, nul);
  if (raw === '') return null;
  const t = raw.replace(/^[ \t\n\v\f\r]+/, '');
  const special = /^([+-]?)(nan|inf(inity)?|1\.#(qnan|snan|ind|inf))/i.exec(t);
  if (special) {
    const word = special[2].toLowerCase();
    if (word.includes('nan') || word.includes('ind')) return NaN;
    return special[1] === '-' ? -Infinity : Infinity;
  }
  const m = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?/.exec(t);
  return m ? Number(m[0]) : 0;
}

const FLOAT32_MAX = 3.4028234663852886e38;

/** GDAL's no-data for float32 bands: values just past ±FLT_MAX snap to it, then rounded to float32. */
function gdalNoData(noData: number | null, sampleFormat: number, bits: number): number | null {
  if (noData === null || !(sampleFormat === 3 && bits === 32) || !Number.isFinite(noData)) return noData;
  const snapped = Math.abs(noData) > FLOAT32_MAX && Math.abs(noData) < FLOAT32_MAX * (1 + 1e-10) ? Math.sign(noData) * FLOAT32_MAX : noData;
  return Math.fround(snapped);
}

async function tag(image: GeoTIFFImage, name: string): Promise<unknown> {
  const fd = image.getFileDirectory();
  if (!fd.hasTag(name as never)) return undefined;
  return fd.loadValue(name as never);
}

function numbers(v: unknown): number[] | undefined {
  if (v === undefined || v === null) return undefined;
  if (typeof v === 'number') return [v];
  if (Array.isArray(v) || ArrayBuffer.isView(v)) return Array.from(v as ArrayLike<number>, Number);
  return undefined;
}

/**
 * The GeoKeyDirectory's own consistency (OGC GeoTIFF 1.1, 7.1.3), as libgeotiff checks it when GDAL opens
 * a file: a key stored in the directory has one value; a key pointing into GeoDoubleParams or
 * GeoAsciiParams stays inside them. GDAL refuses a file that breaks this; so do we.
 */
function checkGeoKeyDirectory(image: GeoTIFFImage, source: string): void {
  const fd = image.getFileDirectory();
  if (!fd.hasTag('GeoKeyDirectory' as never)) return;
  const dir = numbers(fd.getValue('GeoKeyDirectory' as never)) ?? [];
  const lengthOf = (tag: string) => {
    if (!fd.hasTag(tag as never)) return 0;
    const v = fd.getValue(tag as never) as unknown;
    // libgeotiff takes GeoAsciiParams as a C string: it ends at the first NUL.
    return typeof v === 'string' ? (v.includes('\0') ? v.indexOf('\0') : v.length) : numbers(v)?.length ?? 0;
  };
  const keys = dir[3] ?? 0;
  const asciiKeys = Array.from({ length: keys }, (_, i) => dir[5 + 4 * i]).some((loc) => loc === 34737);
  if (asciiKeys && typeof fd.getValue('GeoAsciiParams' as never) !== 'string') fail(source, 'has GeoKeys stored in GeoAsciiParams, but that tag is missing or not text; re-save the file with GDAL');
  if (dir.length < 4 || dir.length < 4 + 4 * keys) fail(source, `GeoKeyDirectory holds ${dir.length} values but declares ${keys} keys; re-save the file with GDAL`);
  for (let i = 0; i < keys; i++) {
    const [id, location, count, offset] = dir.slice(4 + 4 * i, 8 + 4 * i);
    const bad = location === 0 ? count !== 1
      : location === 34736 ? offset + count > lengthOf('GeoDoubleParams')
        : location === 34737 ? offset + count > lengthOf('GeoAsciiParams')
          : false;
    if (bad) fail(source, `GeoKey ${id} (stored in tag ${location}, count ${count}, offset ${offset}) is inconsistent with its parameter tag; re-save the file with GDAL`);
  }
}

interface Affine {
  x0: number; // source-CRS x of the outer corner of pixel (0,0)
  dx: number;
  y0: number;
  dy: number; // positive: rows go south
}

async function readAffine(image: GeoTIFFImage, source: string, pixelIsPoint: boolean): Promise<Affine | null> {
  const scale = numbers(await tag(image, TAG_PIXEL_SCALE));
  const tie = numbers(await tag(image, TAG_TIEPOINT));
  const mt = numbers(await tag(image, TAG_TRANSFORMATION));
  let a: Affine | null = null;
  if (mt && mt.length >= 16) {
    if (mt[1] !== 0 || mt[4] !== 0) {
      fail(source, `rotated or sheared ModelTransformation (terms ${mt[1]}, ${mt[4]}) is not supported; warp the DEM north-up first (e.g. gdalwarp)`);
    }
    a = { x0: mt[3], dx: mt[0], y0: mt[7], dy: -mt[5] };
  } else if (scale && tie && scale.length >= 2 && tie.length >= 6) {
    if (tie.length > 6) fail(source, `${tie.length / 6} tiepoints (a warped, non-affine grid) are not supported; warp the DEM to a regular grid first`);
    const [i, j, , x, y] = tie;
    a = { x0: x - i * scale[0], dx: scale[0], y0: y + j * scale[1], dy: scale[1] };
  } else if (scale || tie) {
    fail(source, 'has ModelPixelScale or ModelTiepoint but not both; the grid cannot be placed');
  }
  if (!a) return null;
  if (![a.x0, a.dx, a.y0, a.dy].every(Number.isFinite) || a.dx <= 0 || a.dy <= 0) {
    fail(source, `invalid geotransform (pixel size ${a.dx} × ${a.dy}); pixel sizes must be finite and > 0 for a north-up raster`);
  }
  // PixelIsPoint: the tiepoint names the centre of pixel (0,0); shift to its outer corner (GDAL does the same).
  if (pixelIsPoint) a = { ...a, x0: a.x0 - a.dx / 2, y0: a.y0 + a.dy / 2 };
  return a;
}

/** No-data cells: the sample equals the no-data value, or is NaN (never a height, whatever the tag says). */
function isNoDataFactory(noData: number | null): (v: number) => boolean {
  if (noData === null || Number.isNaN(noData)) return (v) => Number.isNaN(v);
  return (v) => v === noData || Number.isNaN(v);
}

/**
 * Band 1 is the elevation of a file with several bands, as GDAL reads it (gdaldem and GDAL's other DEM tools
 * use band 1 by default); GDAL_NODATA applies to every band. An alpha band (ExtraSamples 1 or 2, TIFF 6.0
 * Section 18) is refused: GDAL would use it as band 1's mask, which this reader does not read.
 */
function checkNoAlpha(image: GeoTIFFImage, samples: number, source: string): void {
  const fd = image.getFileDirectory();
  if (!fd.hasTag('ExtraSamples' as never)) return;
  const extra = numbers(fd.getValue('ExtraSamples' as never)) ?? [];
  // libtiff's rules (tif_dir.c, setExtraSamples), which make GDAL refuse the file: no more extra samples
  // than samples, and each one 0 (unspecified), 1 (associated alpha) or 2 (unassociated alpha).
  if (extra.length > samples) fail(source, `ExtraSamples lists ${extra.length} extra samples but SamplesPerPixel is ${samples} (GDAL refuses it too); re-save the file from its source`);
  const bad = extra.find((v) => !(v === 0 || v === 1 || v === 2 || v === 999));
  if (bad !== undefined) fail(source, `invalid ExtraSamples value ${bad} (TIFF 6.0 defines 0, 1, 2; GDAL refuses others too); re-save the file from its source`);
  const i = extra.findIndex((v) => v === 1 || v === 2 || v === 999); // libtiff reads 999 as unassociated alpha
  if (i >= 0) {
    const band = samples - extra.length + i + 1;
    fail(source, `band ${band} is an alpha band (ExtraSamples ${extra[i]}), which GDAL uses as band 1's mask and this reader does not read; keep the elevation band and give its voids a no-data value: gdal_translate -b 1 -a_nodata VALUE`);
  }
}

/** Reads band 1 (the elevation) of a GeoTIFF into an ElevationGrid. Errors are TerrainInputError. */
export async function readGeoTiff(bytes: Uint8Array | ArrayBuffer, options: GeoTiffReadOptions = {}): Promise<ElevationGrid> {
  const source = options.sourceName ?? 'GeoTIFF';
  // geotiff wants a whole ArrayBuffer: use the view's own buffer when it spans all of it, else copy
  // (a small Node Buffer may be a view into a larger shared pool).
  const whole = bytes instanceof Uint8Array && bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength && bytes.buffer instanceof ArrayBuffer;
  const buf = bytes instanceof Uint8Array ? (whole ? (bytes.buffer as ArrayBuffer) : new Uint8Array(bytes).buffer) : bytes;
  if (buf.byteLength < 8) fail(source, `only ${buf.byteLength} bytes; not a TIFF file (truncated?)`);
  const head = new Uint8Array(buf, 0, 4);
  const le = head[0] === 0x49 && head[1] === 0x49;
  const be = head[0] === 0x4d && head[1] === 0x4d;
  if (!le && !be) fail(source, 'not a TIFF file (no II/MM byte-order mark); give a GeoTIFF, a 16-bit PNG or a JSON grid');
  try {
    return await readImage(bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes), buf, source, options);
  } catch (err) {
    if (err instanceof TerrainInputError) throw err;
    const why = err instanceof Error ? err.message : String(err);
    throw new TerrainInputError(`${source}: cannot be decoded as a GeoTIFF (${why}); the file may be truncated or corrupt`);
  }
}

async function readImage(bytes: Uint8Array, buf: ArrayBuffer, source: string, options: GeoTiffReadOptions): Promise<ElevationGrid> {
  checkDirectory(bytes, source);
  const tiff = await fromArrayBuffer(buf);
  const image = await tiff.getImage(0);
  const layout = tiffLayout(image, source);
  const { width: fullW, height: fullH } = layout;
  checkNoAlpha(image, layout.samplesPerPixel, source);
  const [c0, r0, c1, r1] = options.window ?? [0, 0, fullW, fullH];
  if (![c0, r0, c1, r1].every(Number.isInteger) || c0 < 0 || r0 < 0 || c1 > fullW || r1 > fullH || c1 <= c0 || r1 <= r0) {
    fail(source, `invalid window [${c0}, ${r0}, ${c1}, ${r1}] for a ${fullW} × ${fullH} image (need 0 ≤ col0 < col1 ≤ width, 0 ≤ row0 < row1 ≤ height)`);
  }
  const w = c1 - c0;
  const h = r1 - r0;
  if (w * h > MAX_GRID_CELLS) {
    fail(source, `is ${w} × ${h} = ${w * h} cells, over the limit of ${MAX_GRID_CELLS} (4096 × 4096); pass a window of at most that many cells`);
  }
  checkDimensions(w, h, `${source} window`);
  checkGeoKeyDirectory(image, source);
  const geoKeys = image.getGeoKeys() ?? {};
  const pixelIsPoint = geoKeys.GTRasterTypeGeoKey === 2;
  const affine = await readAffine(image, source, pixelIsPoint);
  if (!affine) {
    fail(source, 'has no georeferencing (ModelPixelScale/ModelTiepoint or ModelTransformation), so the pixel size is unknown; add it (gdal_translate -a_ullr … -a_srs …) or use a PNG heightmap with an explicit pixel size');
  }
  const modelType = Number(geoKeys.GTModelTypeGeoKey ?? 0);
  if (modelType !== 0 && modelType !== 1 && modelType !== 2) {
    // 3 is geocentric; 32767 is a user-defined model, which GDAL writes for a projection GeoTIFF keys cannot
    // express (with the CRS only as text in a citation): either way no projection we can use.
    const citation = [geoKeys.GTCitationGeoKey, geoKeys.PCSCitationGeoKey].find((c) => typeof c === 'string' && c !== '') as string | undefined;
    fail(source, `GTModelTypeGeoKey ${modelType} (${modelType === 3 ? 'geocentric' : 'user-defined model'}${citation ? `, CRS "${citation.length > 160 ? `${citation.slice(0, 160)}…` : citation}"` : ''}) is not a projected or geographic CRS this reader can use; reproject the DEM to one of ${CHECKED_PROJECTIONS_TEXT} or to longitude/latitude (gdalwarp -t_srs …)`);
  }
  const { sampleFormat, bitsPerSample: bits } = layout;
  const noData = gdalNoData(parseNoData(await tag(image, 'GDAL_NODATA')), sampleFormat, bits);
  const isNoData = isNoDataFactory(noData);
  const verticalScale = options.verticalScale ?? unitToMetres(source, 'VerticalUnitsGeoKey', geoKeys.VerticalUnitsGeoKey);
  if (!Number.isFinite(verticalScale) || verticalScale === 0) {
    fail(source, `invalid verticalScale: ${verticalScale} (must be a finite non-zero number of metres per unit)`);
  }

  const heights = new Float32Array(w * h);
  const mask = new Uint8Array(w * h);
  let outOfRange = -1;
  let outValue = 0;
  await readWindow(image, bytes, layout, [c0, r0, c1, r1], 0, noDataAsSample(noData, layout), (k, v) => {
    if (isNoData(v)) {
      mask[k] = 1;
      heights[k] = NaN;
    } else {
      heights[k] = v * verticalScale;
      // A sample float32 heights cannot hold (±Infinity, or past ±3.4e38 m) is no height: refuse, never
      // turn it silently into no-data (GDAL reads it as a value).
      if (!Number.isFinite(heights[k]) && outOfRange < 0) { outOfRange = k; outValue = v; }
    }
  }, source);
  if (outOfRange >= 0) {
    fail(source, `sample ${outValue} at column ${c0 + (outOfRange % w)}, row ${r0 + Math.floor(outOfRange / w)} is not a height (beyond ±3.4e38 m); the file is corrupt, or its voids need a no-data value (gdal_edit.py -a_nodata)`);
  }

  let spec: GridSpec;
  const wx0 = affine.x0 + c0 * affine.dx;
  const wy0 = affine.y0 - r0 * affine.dy;
  // Geotransform of the window read (corner of its pixel 0,0), in the source CRS.
  const geoTransform = [wx0, affine.dx, 0, wy0, 0, -affine.dy] as const;
  if (modelType === 2) {
    spec = geographicSpec(source, geoKeys, affine, { w, h, wx0, wy0 }, options);
  } else {
    const epsg = Number(geoKeys.ProjectedCSTypeGeoKey);
    // A projected CRS is taken from the GeoKeys (EPSG code or user-defined keys) through the projection
    // libraries, and refused here, naming it, when it cannot be handled (projection.ts): nothing is
    // computed on a DEM whose metres we cannot place on its body.
    const crs = modelType === 1 ? projectedCrsFromGeoKeys(geoKeys, source) : undefined;
    const georeference: GridGeoreference = {
      model: modelType === 1 ? 'projected' : 'none',
      geoTransform,
      ...(Number.isInteger(epsg) && epsg > 0 && epsg < 32767 ? { projectedEpsg: epsg } : {}),
      ...(crs ? { projectedCrs: crs } : {}),
    };
    // Projected CRS in feet or kilometres: the local frame is in metres, the georeference keeps file units.
    // Without ProjLinearUnitsGeoKey the unit is the CRS's own (an EPSG code in US feet is in feet, as GDAL
    // reads it); with it, the two must agree.
    const crsUnit = crs ? makeProjection(crs).unit_m : 1;
    const unitKey = geoKeys.ProjLinearUnitsGeoKey;
    const f = modelType === 1 && unitKey !== undefined ? unitToMetres(source, 'ProjLinearUnitsGeoKey', unitKey) : crsUnit;
    if (Math.abs(crsUnit - f) > 1e-9 * f) {
      fail(source, `ProjLinearUnitsGeoKey ${String(unitKey)} (${f} m) disagrees with the unit of the CRS ${crs?.name} (${crsUnit} m); re-save the file with GDAL`);
    }
    spec = { width: w, height: h, pixelSizeX_m: affine.dx * f, pixelSizeY_m: affine.dy * f, originEast_m: wx0 * f, originNorth_m: wy0 * f, georeference };
  }
  const grid = makeGrid(spec, heights, mask);
  requireSomeData(grid, source);
  return grid;
}

function geographicSpec(
  source: string,
  geoKeys: Record<string, unknown>,
  affine: Affine,
  win: { w: number; h: number; wx0: number; wy0: number },
  options: GeoTiffReadOptions,
) {
  const epsg = Number(geoKeys.GeographicTypeGeoKey);
  const semiMajor = Number(geoKeys.GeogSemiMajorAxisGeoKey);
  if (options.bodyRadius_m !== undefined && !(Number.isFinite(options.bodyRadius_m) && options.bodyRadius_m > 0)) {
    fail(source, `invalid bodyRadius_m: ${options.bodyRadius_m} (must be a finite number of metres > 0)`);
  }
  const radius = options.bodyRadius_m ?? (Number.isFinite(semiMajor) && semiMajor > 0 ? semiMajor : epsg === 4326 ? WGS84_SEMI_MAJOR_AXIS_M : NaN);
  if (!Number.isFinite(radius) || radius <= 0) {
    fail(source, `is in geographic degrees (GeographicTypeGeoKey ${Number.isFinite(epsg) ? epsg : 'unset'}) with no body radius; pass bodyRadius_m (CLI: --body-radius-m)`);
  }
  const latN = win.wy0;
  const latS = win.wy0 - win.h * affine.dy;
  const lonW = win.wx0;
  const lonE = win.wx0 + win.w * affine.dx;
  if (latN > 90 || latS < -90) fail(source, `latitudes ${latS}…${latN}° are outside ±90°; is the file really geographic?`);
  const lat0 = options.originLatitude_deg ?? (latN + latS) / 2;
  const lon0 = options.originLongitude_deg ?? (lonW + lonE) / 2;
  if (!Number.isFinite(lat0) || Math.abs(lat0) >= 89) {
    fail(source, `invalid originLatitude_deg: ${lat0} (must be within ±89°; a flat local frame breaks down at the poles — reproject to a polar stereographic DEM)`);
  }
  if (!Number.isFinite(lon0)) fail(source, `invalid originLongitude_deg: ${lon0}`);
  const cos0 = Math.cos(lat0 * DEG);
  // Flat (equirectangular) local frame (georeference.ts): east = R cos φ0 (λ − λ0), north = R (φ − φ0). The
  // grid stays regular, so meridian convergence is ignored; report the worst east-scale error over the grid.
  const frame: GeographicFrame = { originLatitude_deg: lat0, originLongitude_deg: lon0, bodyRadius_m: radius };
  const scale = localFrameScale(frame);
  const [originEast_m, originNorth_m] = geographicToLocal(frame, lonW, latN);
  const maxEastScaleError = Math.max(
    Math.abs(Math.cos(latN * DEG) / cos0 - 1),
    Math.abs(Math.cos(latS * DEG) / cos0 - 1),
  );
  const georeference: GridGeoreference = {
    model: 'geographic',
    geoTransform: [win.wx0, affine.dx, 0, win.wy0, 0, -affine.dy],
    ...(Number.isInteger(epsg) && epsg > 0 && epsg < 32767 ? { geographicEpsg: epsg } : {}),
    localFrame: { originLatitude_deg: lat0, originLongitude_deg: lon0, bodyRadius_m: radius, maxEastScaleError },
  };
  return {
    width: win.w,
    height: win.h,
    pixelSizeX_m: scale.east_m_per_deg * affine.dx,
    pixelSizeY_m: scale.north_m_per_deg * affine.dy,
    originEast_m,
    originNorth_m,
    georeference,
  };
}
