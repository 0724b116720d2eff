/**
 * Slope at the DEM's own resolution by Horn's (1981) 3 × 3 method: B. K. P. Horn, "Hill shading and the
 * reflectance map", Proc. IEEE 69(1):14–47, 1981. With the window
 *     a b c
 *     d e f
 *     g h i
 * ∂z/∂x = ((c + 2f + i) − (a + 2d + g)) / (8 Δx),  ∂z/∂y = ((g + 2h + i) − (a + 2b + c)) / (8 Δy)
 * (y pointing south here, which only flips a sign under the square), slope = atan √(zx² + zy²).
 *
 * Edges and no-data (documented choice; both modes match `gdaldem slope` of GDAL 3.6, the outside
 * reference in test/reference/terrain):
 * - 'no-data' (default; gdaldem's default): a cell whose 3 × 3 window leaves the grid or touches a
 *   no-data cell gets no slope (NaN).
 * - 'extrapolate' (gdaldem -compute_edges): on the first and last row the missing row is extrapolated
 *   linearly (2·edge − inner) and, in those rows only, the off-grid column is replaced by the edge
 *   column itself; on the first and last column of the other rows the missing column is extrapolated
 *   linearly. Any neighbour still missing (no-data, or extrapolated from no-data) takes the centre
 *   cell's height. A plane therefore keeps its exact slope on the edges, except at the four corners,
 *   where the gradient along the row is halved.
 * A no-data centre is always no-data. Hazard analysis uses the 'no-data' mode.
 */
import type { ElevationGrid } from './grid.ts';

export type SlopeEdgeMode = 'no-data' | 'extrapolate';

/** Horn slope in radians, Float32, NaN where undefined. */
export function hornSlope(grid: ElevationGrid, edges: SlopeEdgeMode = 'no-data'): Float32Array {
  const { width: w, height: h, heights: z } = grid;
  const out = new Float32Array(w * h);
  const kx = 1 / (8 * grid.pixelSizeX_m);
  const ky = 1 / (8 * grid.pixelSizeY_m);
  const fill = edges === 'extrapolate' && w >= 2 && h >= 2;
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
/**
 * The 3 × 3 window around (r, c) for the 'extrapolate' mode (see the file comment), with missing
 * neighbours set to the centre height. Needs w ≥ 2 and h ≥ 2.
 */
function fillWindow(z: Float32Array, w: number, h: number, r: number, c: number, centre: number): Float64Array {
  const at = (rr: number, cc: number) => z[rr * w + cc];
  const lin = (edge: number, inner: number) => 2 * edge - inner; // NaN in, NaN out
  if (r === 0 || r === h - 1) {
    const inner = r === 0 ? 1 : h - 2;
    const cl = c === 0 ? c : c - 1;
    const cr = c === w - 1 ? c : c + 1;
    const cols = [cl, c, cr];
    for (let i = 0; i < 3; i++) {
      const edge = at(r, cols[i]);
      const near = at(inner, cols[i]);
      const far = lin(edge, near);
      // Window rows north → south: top row extrapolates above row 0; bottom row below row h − 1.
      scratch[i] = r === 0 ? far : near;
      scratch[3 + i] = edge;
      scratch[6 + i] = r === 0 ? near : far;
    }
  } else {
    for (let dr = -1; dr <= 1; dr++) {
      const rr = r + dr;
      const base = 3 * (dr + 1);
      if (c === 0) {
        scratch[base] = lin(at(rr, 0), at(rr, 1));
        scratch[base + 1] = at(rr, 0);
        scratch[base + 2] = at(rr, 1);
      } else if (c === w - 1) {
        scratch[base] = at(rr, w - 2);
        scratch[base + 1] = at(rr, w - 1);
        scratch[base + 2] = lin(at(rr, w - 1), at(rr, w - 2));
      } else {
        scratch[base] = at(rr, c - 1);
        scratch[base + 1] = at(rr, c);
        scratch[base + 2] = at(rr, c + 1);
      }
    }
  }
  for (let i = 0; i < 9; i++) if (Number.isNaN(scratch[i])) scratch[i] = centre;
  return scratch;
}

/** Radians → degrees, keeping NaN. */
export function toDegrees(radians: Float32Array): Float32Array {
  const out = new Float32Array(radians.length);
  const f = 180 / Math.PI;
  for (let k = 0; k < radians.length; k++) out[k] = radians[k] * f;
  return out;
}
