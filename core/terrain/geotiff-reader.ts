/**
 * GeoTIFF (OGC GeoTIFF 1.1) elevation reader on top of the `geotiff` package: bytes in, ElevationGrid
 * out; band 1 is the elevation (as GDAL reads it), pixel- or band-interleaved. Handles integer and float samples, the affine tags (ModelPixelScale +
 * ModelTiepoint, or a non-rotated ModelTransformation), GDAL_NODATA (including "nan"; float32 files are
 * compared after Math.fround), PixelIsPoint vs PixelIsArea, projected metres, and geographic degrees
 * converted to a flat local east–north frame around a chosen origin.
 */
import { GeoTIFF } from 'geotiff';
import type { GeoTIFFImage } from 'geotiff';
import type { ElevationGrid, GridFrame, GridGeoreference, GridSpec } from './grid.ts';
import { MAX_GRID_CELLS, TerrainInputError, checkDimensions, makeGrid, requireSomeData } from './grid.ts';
import { checkDirectoryAt, emptyBlockStats, noDataAsSample, readTiffHeader, readWindow, tiffLayout, type TiffHeader, type TiffLayout } from './tiff-blocks.ts';
import { geotiffSourceOf, isByteSource, memoryByteSource, type ByteSource } from './byte-source.ts';
import { AVERAGING_BYTES_PER_CELL, GRID_BYTES_PER_CELL, planRegionRead, type DemLevel, type DemRead, type DemRegionRequest } from './dem-region.ts';
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
  const u8 = bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes);
  // A geographic DEM read through a window keeps its frame's origin at the window's centre (unless given).
  const dem = await openGeoTiff(u8, options, options.window ?? 'image');
  return guarded(source, async () => {
    return (await dem.readPixels(options.window ?? [0, 0, dem.width, dem.height])).grid;
  });
}

async function guarded<T>(source: string, f: () => Promise<T>): Promise<T> {
  try {
    return await f();
  } catch (err) {
    if (err instanceof TerrainInputError) throw err;
    const why = err instanceof Error ? err.message : String(err);
    throw new TerrainInputError(`${source}: cannot be decoded as a GeoTIFF (${why}); the file may be truncated or corrupt`);
  }
}

/**
 * Opens a GeoTIFF for windowed reads: reads and checks the header, the first directory, the GeoKeys and the
 * CRS (nothing is decoded yet), and fixes the DEM's frame, which every read of it shares. Give a ByteSource
 * to read a file a range at a time (the CLI), or the bytes (the app). For geographic DEMs the frame's origin
 * is the whole image's centre unless `originLatitude_deg`/`originLongitude_deg` are given
 * (`originWindow` is readGeoTiff's window rule).
 */
export async function openGeoTiff(
  input: ByteSource | Uint8Array | ArrayBuffer,
  options: GeoTiffReadOptions = {},
  originWindow: readonly [number, number, number, number] | 'image' = 'image',
): Promise<GeoTiffDem> {
  const source = options.sourceName ?? 'GeoTIFF';
  const src = isByteSource(input) ? input : memoryByteSource(input instanceof Uint8Array ? input : new Uint8Array(input));
  if (src.byteLength < 8) fail(source, `only ${src.byteLength} bytes; not a TIFF file (truncated?)`);
  const head = await src.read(0, 4);
  const le = head[0] === 0x49 && head[1] === 0x49;
  const be = head[0] === 0x4d && head[1] === 0x4d;
  if (!le && !be) fail(source, 'not a TIFF file (no II/MM byte-order mark); give a GeoTIFF, a 16-bit PNG or a JSON grid');
  return guarded(source, () => openImage(src, source, options, originWindow));
}

/** An opened GeoTIFF: its frame, its levels, and windowed reads that decode only the blocks they need. */
export interface GeoTiffDem {
  readonly sourceName: string;
  /** Full-resolution size, pixels. */
  readonly width: number;
  readonly height: number;
  /** The whole image's placement (no heights): the frame every read shares. */
  readonly frame: GridFrame;
  /** Full resolution then the overviews (reduced-resolution IFDs, NewSubfileType bit 0), finest first. */
  levels(): Promise<readonly DemLevel[]>;
  /** Reads a pixel window of a level, averaging `decimation` × `decimation` pixels into a cell. */
  readPixels(window: readonly [number, number, number, number], level?: number, decimation?: number, maxCells?: number): Promise<DemRead>;
  /** Reads the region at the resolution asked (see DemRegionRequest), within the memory bound. */
  readRegion(request: DemRegionRequest): Promise<DemRead>;
}

interface LevelImage {
  level: DemLevel;
  image: GeoTIFFImage;
  layout: TiffLayout;
  affine: Affine;
}

async function openImage(src: ByteSource, source: string, options: GeoTiffReadOptions, originWindow: readonly [number, number, number, number] | 'image'): Promise<GeoTiffDem> {
  const header = await readTiffHeader(src, source);
  await checkDirectoryAt(src, header, header.firstDirectory, source);
  const tiff = await GeoTIFF.fromSource(geotiffSourceOf(src) as never);
  const image = await tiff.getImage(0);
  const layout = tiffLayout(image, source);
  const { width: fullW, height: fullH } = layout;
  checkNoAlpha(image, layout.samplesPerPixel, source);
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

  // The frame, fixed once: a projected CRS is taken from the GeoKeys through the projection libraries and
  // refused here, naming it, when it cannot be handled (projection.ts) — nothing is decoded on a DEM whose
  // metres we cannot place on its body. Geographic DEMs: the local frame's origin, once for every read.
  const epsg = Number(geoKeys.ProjectedCSTypeGeoKey);
  const crs = modelType === 1 ? projectedCrsFromGeoKeys(geoKeys, source) : undefined;
  let unit_m = 1;
  let geoOptions = options;
  if (modelType === 2) {
    const [oc0, or0, oc1, or1] = originWindow === 'image' ? [0, 0, fullW, fullH] : originWindow;
    const o = geographicSpec(source, geoKeys, affine, { w: oc1 - oc0, h: or1 - or0, wx0: affine.x0 + oc0 * affine.dx, wy0: affine.y0 - or0 * affine.dy }, options);
    const lf = o.georeference.localFrame!;
    geoOptions = { ...options, originLatitude_deg: lf.originLatitude_deg, originLongitude_deg: lf.originLongitude_deg };
  } else {
    // Projected CRS in feet or kilometres: the local frame is in metres, the georeference keeps file units.
    // Without ProjLinearUnitsGeoKey the unit is the CRS's own (an EPSG code in US feet is in feet, as GDAL
    // reads it); with it, the two must agree.
    const crsUnit = crs ? makeProjection(crs).unit_m : 1;
    const unitKey = geoKeys.ProjLinearUnitsGeoKey;
    unit_m = modelType === 1 && unitKey !== undefined ? unitToMetres(source, 'ProjLinearUnitsGeoKey', unitKey) : crsUnit;
    if (Math.abs(crsUnit - unit_m) > 1e-9 * unit_m) {
      fail(source, `ProjLinearUnitsGeoKey ${String(unitKey)} (${unit_m} m) disagrees with the unit of the CRS ${crs?.name} (${crsUnit} m); re-save the file with GDAL`);
    }
  }
  /** The grid spec of a window [c0, r0) of w × h cells, each `k` pixels of a level with affine `a`. */
  const specOf = (a: Affine, c0: number, r0: number, w: number, h: number, k: number): GridSpec => {
    const wx0 = a.x0 + c0 * a.dx;
    const wy0 = a.y0 - r0 * a.dy;
    const cell: Affine = { x0: a.x0, y0: a.y0, dx: a.dx * k, dy: a.dy * k };
    if (modelType === 2) return geographicSpec(source, geoKeys, cell, { w, h, wx0, wy0 }, geoOptions);
    const georeference: GridGeoreference = {
      model: modelType === 1 ? 'projected' : 'none',
      // Geotransform of the window read (corner of its pixel 0,0), in the source CRS.
      geoTransform: [wx0, cell.dx, 0, wy0, 0, -cell.dy],
      ...(Number.isInteger(epsg) && epsg > 0 && epsg < 32767 ? { projectedEpsg: epsg } : {}),
      ...(crs ? { projectedCrs: crs } : {}),
    };
    return { width: w, height: h, pixelSizeX_m: cell.dx * unit_m, pixelSizeY_m: cell.dy * unit_m, originEast_m: wx0 * unit_m, originNorth_m: wy0 * unit_m, georeference };
  };
  const whole = specOf(affine, 0, 0, fullW, fullH, 1);
  const frame: GridFrame = {
    width: fullW, height: fullH, pixelSizeX_m: whole.pixelSizeX_m, pixelSizeY_m: whole.pixelSizeY_m,
    originEast_m: whole.originEast_m ?? 0, originNorth_m: whole.originNorth_m ?? 0, ...(whole.georeference ? { georeference: whole.georeference } : {}),
  };
  const base: LevelImage = {
    level: { level: 0, width: fullW, height: fullH, pixelSizeX_m: frame.pixelSizeX_m, pixelSizeY_m: frame.pixelSizeY_m },
    image, layout, affine,
  };
  let levelList: Promise<LevelImage[]> | null = null;
  const levels = () => (levelList ??= overviewLevels(src, header, tiff, base, source, frame));

  const readPixels = async (window: readonly [number, number, number, number], levelIndex = 0, k = 1, maxCells = MAX_GRID_CELLS): Promise<DemRead> => {
    const L = levelIndex === 0 ? base : (await levels())[levelIndex];
    if (!L) fail(source, `has no overview level ${levelIndex}`);
    const [c0, r0, c1, r1] = window;
    const { width: lw, height: lh } = L.level;
    if (![c0, r0, c1, r1].every(Number.isInteger) || c0 < 0 || r0 < 0 || c1 > lw || r1 > lh || c1 <= c0 || r1 <= r0) {
      fail(source, `invalid window [${c0}, ${r0}, ${c1}, ${r1}] for a ${lw} × ${lh} image (need 0 ≤ col0 < col1 ≤ width, 0 ≤ row0 < row1 ≤ height)`);
    }
    if (!(Number.isInteger(k) && k >= 1)) fail(source, `invalid decimation: ${k} (must be a whole number ≥ 1)`);
    const w = Math.ceil((c1 - c0) / k);
    const h = Math.ceil((r1 - r0) / k);
    const limit = Math.min(maxCells, MAX_GRID_CELLS);
    if (w * h > limit) {
      fail(source, `is ${w} × ${h} = ${w * h} cells, over the limit of ${limit} (${limit === MAX_GRID_CELLS ? '4096 × 4096, ' : ''}${limit * (k > 1 ? AVERAGING_BYTES_PER_CELL : GRID_BYTES_PER_CELL)} bytes of grid); pass a window of at most that many cells, or read the region a footprint needs at the resolution it needs (CLI: hazard --study with --extent-m, footprint and trajectory --terrain)`);
    }
    checkDimensions(w, h, `${source} window`);
    const n = w * h;
    const heights = new Float32Array(n);
    const mask = new Uint8Array(n);
    const sum = k > 1 ? new Float64Array(n) : null;
    const count = k > 1 ? new Uint32Array(n) : null;
    const bad: { at: [number, number, number] | null } = { at: null };
    const stats = emptyBlockStats();
    await readWindow(L.image, src, L.layout, window, 0, noDataAsSample(noData, L.layout), (col, row, v) => {
      if (isNoData(v)) {
        if (!sum) { mask[row * w + col] = 1; heights[row * w + col] = NaN; }
        return;
      }
      const z = v * verticalScale;
      // A sample float32 heights cannot hold (±Infinity, or past ±3.4e38 m) is no height: refuse, never
      // turn it silently into no-data (GDAL reads it as a value).
      if (!Number.isFinite(Math.fround(z))) { bad.at ??= [col, row, v]; return; }
      if (sum && count) {
        // Block average (GDAL's -r average): the mean of the valid pixels under the cell, no-data left out.
        const i = Math.floor(row / k) * w + Math.floor(col / k);
        sum[i] += z;
        count[i]++;
      } else heights[row * w + col] = z;
    }, source, stats);
    if (bad.at) {
      const [col, row, v] = bad.at;
      fail(source, `sample ${v} at column ${c0 + col}, row ${r0 + row} is not a height (beyond ±3.4e38 m); the file is corrupt, or its voids need a no-data value (gdal_edit.py -a_nodata)`);
    }
    if (sum && count) {
      for (let i = 0; i < n; i++) {
        if (count[i] === 0) { mask[i] = 1; heights[i] = NaN; } else heights[i] = sum[i] / count[i];
      }
    }
    const grid = makeGrid(specOf(L.affine, c0, r0, w, h, k), heights, mask);
    requireSomeData(grid, source);
    const gridBytes = n * (sum ? AVERAGING_BYTES_PER_CELL : GRID_BYTES_PER_CELL);
    const overview = L.level.level > 0;
    return {
      grid,
      report: {
        level: L.level.level,
        overview,
        decimation: k,
        method: overview ? (k > 1 ? 'overview, block average' : 'overview') : k > 1 ? 'block average' : 'full resolution',
        window: [c0, r0, c1, r1],
        levelSize: [L.level.width, L.level.height],
        cells: n,
        gridBytes,
        blocksDecoded: stats.blocksDecoded,
        blocksSparse: stats.blocksSparse,
        bytesRead: stats.bytesRead,
        largestBlockBytes: stats.largestBlockBytes,
        workingBytes: gridBytes + 2 * stats.largestBlockBytes + (L.layout.predictor !== 1 ? stats.largestBlockBytes : 0),
      },
    };
  };

  const readRegion = async (req: DemRegionRequest): Promise<DemRead> => {
    const plan = planRegionRead(await (req.resolution === undefined || req.resolution === 'native' ? [base.level] : (await levels()).map((l) => l.level)), frame, req, source);
    return readPixels(plan.window, plan.level, plan.decimation, req.maxCells);
  };

  return { sourceName: source, width: fullW, height: fullH, frame, levels: async () => (await levels()).map((l) => l.level), readPixels, readRegion };
}

/**
 * The overviews GDAL would use: the IFDs after the first whose NewSubfileType has the reduced-resolution bit
 * (1) and not the mask bit (4), with band 1 of the same sample type; their pixel size is the full image's
 * times the size ratio, as GDAL places overviews. Each directory is checked before it is parsed.
 */
async function overviewLevels(src: ByteSource, header: TiffHeader, tiff: GeoTIFF, base: LevelImage, source: string, frame: GridFrame): Promise<LevelImage[]> {
  const out: LevelImage[] = [base];
  let at = await checkDirectoryAt(src, header, header.firstDirectory, source);
  const seen = new Set<number>([header.firstDirectory]);
  for (let index = 1; at !== 0 && index <= MAX_DIRECTORIES; index++) {
    if (seen.has(at)) fail(source, `image directory ${index} points back to an earlier one (offset ${at}); the file is corrupt — re-save it with GDAL`);
    seen.add(at);
    const next = await checkDirectoryAt(src, header, at, source, `image directory ${index}`);
    const image = await tiff.getImage(index);
    const fd = image.getFileDirectory();
    const kind = fd.hasTag('NewSubfileType' as never) ? Number(fd.getValue('NewSubfileType' as never)) : 0;
    if ((kind & 1) === 1 && (kind & 4) === 0) {
      const layout = tiffLayout(image, `${source} (overview IFD ${index})`);
      if (layout.sampleFormat === base.layout.sampleFormat && layout.bitsPerSample === base.layout.bitsPerSample && layout.samplesPerPixel === base.layout.samplesPerPixel) {
        const fx = base.level.width / layout.width;
        const fy = base.level.height / layout.height;
        const affine: Affine = { x0: base.affine.x0, y0: base.affine.y0, dx: base.affine.dx * fx, dy: base.affine.dy * fy };
        out.push({ image, layout, affine, level: { level: 0, width: layout.width, height: layout.height, pixelSizeX_m: frame.pixelSizeX_m * fx, pixelSizeY_m: frame.pixelSizeY_m * fy } });
      }
    }
    at = next;
  }
  const overviews = out.slice(1).sort((a, b) => b.level.width - a.level.width);
  return [base, ...overviews.map((o, i) => ({ ...o, level: { ...o.level, level: i + 1 } }))];
}

/** Most image directories looked at for overviews (GDAL writes one per overview level and mask). */
const MAX_DIRECTORIES = 64;

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
