/**
 * The app's display grid of the demo DEM against GDAL: `gdal_translate -r average -outsize 256 256` (Debian
 * gdal-bin 3.6) at 250 × 250 averages each 8 × 8 block of the 2000 × 2000 demo DEM, which is what
 * core/terrain's display mesh does at stride 8 (the smallest stride giving at most 257 × 257 vertices). Same heights (Float32 round-off) and the same cell-centre coordinates.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { gdal, gdalAvailable, readXyz, tempDir } from '../terrain/gdal.ts';
import { displayTerrain, readTerrain } from '../../../renderer/terrain/terrain-product.ts';

const DEM = fileURLToPath(new URL('../../../assets/demo/terrain/demo-site.tif', import.meta.url));

describe.runIf(gdalAvailable())('display terrain vs GDAL average resampling', () => {
  it('matches gdal_translate -r average at an eighth of the resolution on the demo DEM', async () => {
    const { grid } = await readTerrain(new Uint8Array(readFileSync(DEM)), 'demo-site.tif', { pixelSize_m: null, heightScale_m: null });
    const display = displayTerrain(grid).grid;
    expect([display.width, display.height, display.pixelSize_m]).toEqual([250, 250, 80]);
    const tmp = tempDir();
    try {
      gdal('gdal_translate', ['-q', '-r', 'average', '-outsize', '250', '250', DEM, tmp.path('half.tif')]);
      const xyz = readXyz(tmp.path('half.tif'), tmp.path('half.xyz'));
      expect(xyz).toHaveLength(250 * 250);
      let worst = 0;
      for (let k = 0; k < xyz.length; k++) {
        const c = k % 250;
        const r = Math.floor(k / 250);
        // GDAL's XYZ gives cell centres in the DEM frame; ours: column 0's centre plus c pixels.
        expect(display.west_m + c * display.pixelSize_m).toBeCloseTo(xyz[k].x, 9);
        expect(display.north_m - r * display.pixelSize_m).toBeCloseTo(xyz[k].y, 9);
        worst = Math.max(worst, Math.abs(display.heights[k] - xyz[k].z));
      }
      // Heights near −2600 m in Float32: one unit in the last place is 2.4e-4 m; both round a mean once.
      expect(worst).toBeLessThan(1e-3);
    } finally {
      tmp.cleanup();
    }
  });
});
