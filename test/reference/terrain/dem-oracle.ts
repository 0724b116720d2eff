/**
 * GDAL 3.6 (Debian python3-gdal, gdal_oracle.py) as the reference reader for GeoTIFF elevation models:
 * one long-lived Python process writes corpus files with GDAL's GTiff driver and reads files back, and
 * `judge` compares our reader's outcome with GDAL's. Shared by the corpus test, the seeded fuzz test and
 * the offline fuzz run (test/fuzz/dem-fuzz.ts).
 */
import { REFERENCE_PYTHON, referenceToolsReady } from '../../support/reference-tools.ts';
import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { TerrainInputError, readGeoTiff, type ElevationGrid } from '../../../core/terrain/index.ts';

export interface GdalWrite {
  path: string;
  type: string;
  width: number;
  height: number;
  values: number[];
  nodata?: number | null;
  nan?: number[];
  options?: string[];
  bands?: number;
  srs?: string;
  geotransform?: number[];
  sparse_blocks?: boolean;
}

export interface GdalRead {
  ok: boolean;
  /** GDAL opened the file but it has more cells than the oracle reads back (gdal_oracle.py MAX_CELLS). */
  skipped?: boolean;
  error?: string;
  width: number;
  height: number;
  bands: number;
  type: string;
  nodata: number | 'nan' | string | null;
  signedbyte: boolean;
  geotransform: number[] | null;
  values: string;
}

/** The oracle process; requests are answered in order. */
export class GdalOracle {
  private proc: ChildProcessWithoutNullStreams;
  private buffer = '';
  private waiting: ((line: string) => void)[] = [];

  constructor() {
    const script = fileURLToPath(new URL('./gdal_oracle.py', import.meta.url));
    this.proc = spawn(REFERENCE_PYTHON, [script], { env: { ...process.env, GDAL_PAM_ENABLED: 'NO' } });
    this.proc.stdout.setEncoding('utf8');
    this.proc.stdout.on('data', (chunk: string) => {
      this.buffer += chunk;
      let nl: number;
      while ((nl = this.buffer.indexOf('\n')) >= 0) {
        const line = this.buffer.slice(0, nl);
        this.buffer = this.buffer.slice(nl + 1);
        this.waiting.shift()?.(line);
      }
    });
  }

  private request<T>(req: object): Promise<T> {
    return new Promise((resolve, reject) => {
      this.waiting.push((line) => {
        const ans = JSON.parse(line);
        if (!ans.ok) reject(new Error(`GDAL oracle: ${ans.error}`));
        else resolve(ans as T);
      });
      this.proc.stdin.write(JSON.stringify(req) + '\n');
    });
  }

  write(req: GdalWrite): Promise<unknown> {
    // JSON has no NaN: a NaN no-data value travels as "nan" (values NaN travel as null, read back as NaN).
    return this.request({ op: 'write', ...req, nodata: req.nodata !== undefined && req.nodata !== null && Number.isNaN(req.nodata) ? 'nan' : req.nodata });
  }

  async read(paths: string[]): Promise<GdalRead[]> {
    return (await this.request<{ results: GdalRead[] }>({ op: 'read', paths })).results;
  }

  close(): void {
    this.proc.stdin.end();
  }
}

/** Is the python3-gdal reference there? Under CI=true its absence is a failure, not a skip (test/support/reference-tools.ts). */
export function gdalPythonAvailable(): boolean {
  return referenceToolsReady('gdal-python');
}

/** GDAL's band-1 values as numbers (signed bytes reinterpreted: GDAL 3.6 exposes them as Byte + PIXELTYPE=SIGNEDBYTE). */
export function gdalValues(r: GdalRead): Float64Array {
  const b = Buffer.from(r.values, 'base64');
  const v = new Float64Array(b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength));
  if (r.signedbyte) for (let k = 0; k < v.length; k++) if (v[k] > 127) v[k] -= 256;
  return v;
}

function gdalNoData(r: GdalRead): number | null {
  if (r.nodata === null) return null;
  if (r.nodata === 'nan') return NaN;
  if (typeof r.nodata === 'string') return r.nodata.startsWith('-') ? -Infinity : Infinity;
  return r.nodata;
}

/** GDAL's no-data mask: the value equals the band's no-data value, or is NaN (no height either way). */
export function gdalMask(r: GdalRead, values: Float64Array): Uint8Array {
  const nd = gdalNoData(r);
  return Uint8Array.from(values, (v) => (Number.isNaN(v) || (nd !== null && v === nd) ? 1 : 0));
}

export type Verdict =
  | 'agree' // both read: same size, same no-data mask, same heights, same geotransform
  | 'both-refused'
  | 'we-refused' // GDAL reads it, we refuse with a TerrainInputError (allowed: a clear refusal)
  | 'we-read-gdal-refused' // reported and looked at: GDAL is stricter there
  | 'wrong' // both read but differ: a silent wrong decode
  | 'crash' // our reader threw something other than a TerrainInputError
  | 'unchecked'; // we read it; GDAL opens it but it is too large for the oracle to read back

export interface Judgement {
  verdict: Verdict;
  detail: string;
}

export type OurOutcome = { grid: ElevationGrid } | { error: unknown };

export async function readOurs(bytes: Uint8Array): Promise<OurOutcome> {
  try {
    return { grid: await readGeoTiff(bytes, { verticalScale: 1, sourceName: 'fuzz.tif' }) };
  } catch (error) {
    return { error };
  }
}

/** Compares our outcome with GDAL's for one file. Heights: ours are float32, so GDAL's value is rounded the same way. */
export function judge(ours: OurOutcome, gdal: GdalRead): Judgement {
  if ('error' in ours) {
    const e = ours.error;
    if (!(e instanceof TerrainInputError) || e.message.length < 20) return { verdict: 'crash', detail: String(e instanceof Error ? e.stack : e).slice(0, 400) };
    return { verdict: gdal.ok ? 'we-refused' : 'both-refused', detail: e.message.slice(0, 200) };
  }
  if (gdal.skipped) return { verdict: 'unchecked', detail: gdal.error ?? '' };
  if (!gdal.ok) return { verdict: 'we-read-gdal-refused', detail: gdal.error ?? '' };
  const g = ours.grid;
  if (g.width !== gdal.width || g.height !== gdal.height) return { verdict: 'wrong', detail: `size ${g.width} × ${g.height}, GDAL ${gdal.width} × ${gdal.height}` };
  const values = gdalValues(gdal);
  const mask = gdalMask(gdal, values);
  let bad = 0;
  let first = '';
  for (let k = 0; k < values.length; k++) {
    const same = mask[k] ? g.noData[k] === 1 : g.noData[k] === 0 && g.heights[k] === Math.fround(values[k]);
    if (!same) {
      if (!bad) first = `cell ${k}: ours ${g.noData[k] ? 'no-data' : g.heights[k]}, GDAL ${mask[k] ? 'no-data' : values[k]} (${values[k]})`;
      bad++;
    }
  }
  if (bad) return { verdict: 'wrong', detail: `${bad} of ${values.length} cells differ; first ${first}` };
  const gt = gdal.geotransform;
  const ourGt = g.georeference?.geoTransform;
  if (gt && ourGt && !gt.every((x, i) => Math.abs(x - ourGt[i]) <= 1e-9 * Math.max(1, Math.abs(x)))) {
    return { verdict: 'wrong', detail: `geotransform ${ourGt.join(', ')}, GDAL ${gt.join(', ')}` };
  }
  return { verdict: 'agree', detail: '' };
}
