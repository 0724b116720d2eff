/**
 * Thin helpers around the GDAL 3.6 command-line tools from Debian's gdal-bin (gdal_translate,
 * gdal_create, gdaldem, gdalinfo, gdaltransform), used as an outside reference for terrain tests.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gdalTool, referenceToolsReady } from '../../support/reference-tools.ts';

/**
 * True when GDAL's tools are here (LANDREACH_GDAL_BIN, else PATH); false with a visible warning on a
 * developer machine, an error under CI=true (test/support/reference-tools.ts).
 */
export function gdalAvailable(): boolean {
  return referenceToolsReady('gdal');
}

/** Runs a GDAL tool; throws with its stderr when it fails. Quiet, no aux.xml side files. */
export function gdal(tool: string, args: string[], input?: string): string {
  const r = spawnSync(gdalTool(tool), args, { encoding: 'utf8', input, env: { ...process.env, GDAL_PAM_ENABLED: 'NO' } });
  if (r.status !== 0) throw new Error(`${tool} ${args.join(' ')} failed (${r.status}): ${r.stderr}`);
  return r.stdout;
}

export function tempDir(): { dir: string; path: (name: string) => string; cleanup: () => void } {
  const dir = mkdtempSync(join(tmpdir(), 'landreach-gdal-'));
  return { dir, path: (n) => join(dir, n), cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}

/**
 * Writes an ESRI ASCII grid (GDAL's AAIGrid driver reads it) — a plain text input format, so the
 * GeoTIFFs under test are written by GDAL, not by us. Values are printed with 9 significant digits
 * (float32 round-trips); NaN becomes the NODATA_value.
 */
export function writeAsciiGrid(path: string, width: number, height: number, values: ArrayLike<number>, noData = -99999): void {
  const lines = [`ncols ${width}`, `nrows ${height}`, 'xllcorner 0', 'yllcorner 0', 'cellsize 1', `NODATA_value ${noData}`];
  for (let r = 0; r < height; r++) {
    const row: string[] = [];
    for (let c = 0; c < width; c++) {
      const v = values[r * width + c];
      row.push(Number.isNaN(v) ? String(noData) : Math.fround(v).toPrecision(9));
    }
    lines.push(row.join(' '));
  }
  writeFileSync(path, lines.join('\n') + '\n');
}

/** gdal_translate -of XYZ: (x, y, z) of every pixel centre, rows north to south, as GDAL computes them. */
export function readXyz(tifPath: string, xyzPath: string): { x: number; y: number; z: number }[] {
  gdal('gdal_translate', ['-q', '-of', 'XYZ', tifPath, xyzPath]);
  return readFileSync(xyzPath, 'utf8')
    .trim()
    .split('\n')
    .map((line) => {
      const [x, y, z] = line.trim().split(/\s+/).map(Number);
      return { x, y, z };
    });
}

export function gdalinfoJson(path: string): Record<string, unknown> & { bands: Record<string, unknown>[] } {
  return JSON.parse(gdal('gdalinfo', ['-json', path]));
}
