/**
 * Exact Euclidean distance transform on a grid with rectangular pixels: P. F. Felzenszwalb and
 * D. P. Huttenlocher, "Distance Transforms of Sampled Functions", Theory of Computing 8:415–428, 2012
 * (lower envelope of parabolas, one pass per axis, O(N)). Distances are between cell centres, in metres.
 */

/** 1-D squared-distance transform of f (spacing `step`), written to out. Scratch arrays are reused. */
function transform1d(f: Float64Array, n: number, step: number, out: Float64Array, v: Int32Array, zb: Float64Array): void {
  const s2 = step * step;
  let k = 0;
  let first = -1;
  for (let q = 0; q < n; q++) if (f[q] < Infinity) { first = q; break; }
  if (first < 0) { for (let q = 0; q < n; q++) out[q] = Infinity; return; }
  v[0] = first;
  zb[0] = -Infinity;
  zb[1] = Infinity;
  for (let q = first + 1; q < n; q++) {
    if (f[q] === Infinity) continue;
    let s: number;
    while (true) {
      const p = v[k];
      // Intersection of the parabolas rooted at p and q, in index units with spacing `step`.
      s = (f[q] + s2 * q * q - (f[p] + s2 * p * p)) / (2 * s2 * (q - p));
      if (s <= zb[k] && k > 0) k--;
      else break;
    }
    if (s <= zb[k]) { v[k] = q; zb[k + 1] = Infinity; continue; }
    k++;
    v[k] = q;
    zb[k] = s;
    zb[k + 1] = Infinity;
  }
  k = 0;
  for (let q = 0; q < n; q++) {
    while (zb[k + 1] < q) k++;
    const d = (q - v[k]) * step;
    out[q] = d * d + f[v[k]];
  }
}

/**
 * Distance (m) from each cell centre to the centre of the nearest cell where `source` is non-zero;
 * 0 on source cells, Infinity everywhere when there is no source cell.
 */
export function distanceToNearest(source: Uint8Array, width: number, height: number, pixelSizeX_m: number, pixelSizeY_m: number): Float32Array {
  const n = Math.max(width, height);
  const f = new Float64Array(n);
  const out1 = new Float64Array(n);
  const v = new Int32Array(n);
  const zb = new Float64Array(n + 1);
  // Column pass writes squared distances into the result (Float32: 4 bytes a cell, relative error
  // ~1e-7); the row pass reads each row out, transforms it, and writes distances back in place.
  const result = new Float32Array(width * height);
  for (let c = 0; c < width; c++) {
    for (let r = 0; r < height; r++) f[r] = source[r * width + c] ? 0 : Infinity;
    transform1d(f, height, pixelSizeY_m, out1, v, zb);
    for (let r = 0; r < height; r++) result[r * width + c] = out1[r];
  }
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) f[c] = result[r * width + c];
    transform1d(f, width, pixelSizeX_m, out1, v, zb);
    for (let c = 0; c < width; c++) result[r * width + c] = Math.sqrt(out1[c]);
  }
  return result;
}
