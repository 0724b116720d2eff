/**
 * Slope at the DEM's own resolution by Horn's (1981) 3 × 3 method: B. K. P. Horn, "Hill shading and the
 * reflectance map", Proc. IEEE 69(1):14–47, 1981. With the window
 *     a b c
 *     d e f
 *     g h i
 * ∂z/∂x = ((c + 2f + i) − (a + 2d + g)) / (8 Δx),  ∂z/∂y = ((g + 2h + i) − (a + 2b + c)) / (8 Δy)
 * (y pointing south here, which only flips a sign under the square), slope = atan √(zx² + zy²).
 *
 * Edges and no-data (documented choice, matching `gdaldem slope` so GDAL can be the reference):
 * - 'no-data' (default, gdaldem's default): a cell whose 3 × 3 window leaves the grid or touches a
 *   no-data cell gets no slope (NaN).
 * - 'centre-fill' (gdaldem -compute_edges): each missing neighbour takes the centre cell's height.
 *   This biases slope low at the edge (a tilted plane's edge cells read 3/4 of the true gradient
 *   across the edge), which is why hazard analysis does not use edge cells.
 * A no-data centre is always no-data.
 */
import type { ElevationGrid } from './grid.ts';

export type SlopeEdgeMode = 'no-data' | 'centre-fill';

/** Horn slope in radians, Float32, NaN where undefined. */
export function hornSlope(grid: ElevationGrid, edges: SlopeEdgeMode = 'no-data'): Float32Array {
  const { width: w, height: h, heights: z } = grid;
  const out = new Float32Array(w * h);
  const kx = 1 / (8 * grid.pixelSizeX_m);
  const ky = 1 / (8 * grid.pixelSizeY_m);
  const fill = edges === 'centre-fill';
  for (let r = 0; r < h; r++) {
    const interiorRow = r > 0 && r < h - 1;
    for (let c = 0; c < w; c++) {
      const k = r * w + c;
      const e = z[k];
      if (Number.isNaN(e)) { out[k] = NaN; continue; }
      if (interiorRow && c > 0 && c < w - 1) {
        const a = z[k - w - 1], b = z[k - w], cc = z[k - w + 1];
        const d = z[k - 1], f = z[k + 1];
        const g = z[k + w - 1], hh = z[k + w], i = z[k + w + 1];
        let zx = (cc + 2 * f + i - (a + 2 * d + g)) * kx;
        let zy = (g + 2 * hh + i - (a + 2 * b + cc)) * ky;
        if (Number.isNaN(zx + zy)) {
          if (!fill) { out[k] = NaN; continue; }
          const win = fillWindow(z, w, h, r, c, e);
          zx = (win[2] + 2 * win[5] + win[8] - (win[0] + 2 * win[3] + win[6])) * kx;
          zy = (win[6] + 2 * win[7] + win[8] - (win[0] + 2 * win[1] + win[2])) * ky;
        }
        out[k] = Math.atan(Math.sqrt(zx * zx + zy * zy));
      } else if (fill) {
        const win = fillWindow(z, w, h, r, c, e);
        const zx = (win[2] + 2 * win[5] + win[8] - (win[0] + 2 * win[3] + win[6])) * kx;
        const zy = (win[6] + 2 * win[7] + win[8] - (win[0] + 2 * win[1] + win[2])) * ky;
        out[k] = Math.atan(Math.sqrt(zx * zx + zy * zy));
      } else {
        out[k] = NaN;
      }
    }
  }
  return out;
}

const scratch = new Float64Array(9);
/** The 3 × 3 window around (r, c) with missing (off-grid or no-data) neighbours set to the centre height. */
function fillWindow(z: Float32Array, w: number, h: number, r: number, c: number, centre: number): Float64Array {
  let n = 0;
  for (let dr = -1; dr <= 1; dr++) {
    for (let dc = -1; dc <= 1; dc++) {
      const rr = r + dr, cc = c + dc;
      const v = rr >= 0 && rr < h && cc >= 0 && cc < w ? z[rr * w + cc] : NaN;
      scratch[n++] = Number.isNaN(v) ? centre : v;
    }
  }
  return scratch;
}

/** Radians → degrees, keeping NaN. */
export function toDegrees(radians: Float32Array): Float32Array {
  const out = new Float32Array(radians.length);
  const f = 180 / Math.PI;
  for (let k = 0; k < radians.length; k++) out[k] = radians[k] * f;
  return out;
}
