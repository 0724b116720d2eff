/**
 * Decimated display mesh: a regular grid of vertices every `stride` cells whose heights are block means
 * (a box low-pass filter), so features wider than the stride — crater walls, ridges, the escarpment —
 * survive and only sub-stride detail (boulders) is dropped. Analysis always stays at full resolution;
 * the mesh is for drawing. Compute, never draw: positions and indices only (the renderer builds geometry).
 */
import type { ElevationGrid } from './grid.ts';
import { TerrainInputError, cellEast, cellNorth, sampleBilinear } from './grid.ts';

export interface DisplayMesh {
  /** Vertices per row and per column. */
  columns: number;
  rows: number;
  /** Source cells per mesh step. */
  stride: number;
  /** Offsets of the mesh frame: x = east − originEast_m, y = north − originNorth_m (Float32-friendly). */
  originEast_m: number;
  originNorth_m: number;
  /** x (east), y (north) relative to the origin above, z = up (m), 3 per vertex; no-data vertices carry NaN z and no triangle. */
  positions: Float32Array;
  /** Triangle vertex indices, 3 per triangle, counter-clockwise seen from above. */
  indices: Uint32Array;
  /** Largest |full-resolution height − mesh surface| at the valid source cell centres covered, m. */
  maxVerticalError_m: number;
}

/** Decimates so the mesh has at most `maxVertices` vertices (default 65 536). */
export function decimatedMesh(grid: ElevationGrid, maxVertices = 65536): DisplayMesh {
  if (!Number.isInteger(maxVertices) || maxVertices < 4) throw new TerrainInputError(`invalid maxVertices: ${maxVertices} (must be an integer ≥ 4)`);
  const { width: w, height: h, heights: z } = grid;
  let stride = 1;
  while ((Math.ceil(w / stride)) * (Math.ceil(h / stride)) > maxVertices) stride++;
  const columns = Math.ceil(w / stride);
  const rows = Math.ceil(h / stride);
  const positions = new Float32Array(columns * rows * 3);
  // Vertex (i, j) sits at the centre of its stride × stride block; height = mean of the block's valid cells.
  const meshGrid = { ...grid, width: columns, height: rows };
  const vz = new Float32Array(columns * rows);
  for (let j = 0; j < rows; j++) {
    const ra = j * stride, rb = Math.min(h, ra + stride);
    for (let i = 0; i < columns; i++) {
      const ca = i * stride, cb = Math.min(w, ca + stride);
      let s = 0, m = 0;
      for (let r = ra; r < rb; r++) for (let c = ca; c < cb; c++) { const v = z[r * w + c]; if (!Number.isNaN(v)) { s += v; m++; } }
      const v = m > 0 ? s / m : NaN;
      const k = j * columns + i;
      vz[k] = v;
      // Uniform pitch (stride cells); a clipped last block keeps the pitch, so the mesh may overhang
      // the grid by under half a stride.
      positions[3 * k] = (ca + stride / 2) * grid.pixelSizeX_m;
      positions[3 * k + 1] = -(ra + stride / 2) * grid.pixelSizeY_m;
      positions[3 * k + 2] = v;
    }
  }
  const tri: number[] = [];
  for (let j = 0; j + 1 < rows; j++) {
    for (let i = 0; i + 1 < columns; i++) {
      const a = j * columns + i, b = a + 1, c = a + columns, d = c + 1;
      // Rows run south, so (a, c, b) is counter-clockwise seen from above (+z).
      if (!Number.isNaN(vz[a] + vz[b] + vz[c])) tri.push(a, c, b);
      if (!Number.isNaN(vz[b] + vz[c] + vz[d])) tri.push(b, c, d);
    }
  }
  // Error of the mesh surface (bilinear between vertices) against the full-resolution heights.
  const pitchX = stride * grid.pixelSizeX_m;
  const pitchY = stride * grid.pixelSizeY_m;
  const surface = {
    ...meshGrid,
    heights: vz,
    noData: new Uint8Array(columns * rows),
    pixelSizeX_m: pitchX,
    pixelSizeY_m: pitchY,
    originEast_m: grid.originEast_m,
    originNorth_m: grid.originNorth_m,
  };
  let maxErr = 0;
  for (let r = 0; r < h; r++) {
    for (let c = 0; c < w; c++) {
      const v = z[r * w + c];
      if (Number.isNaN(v)) continue;
      const m = sampleBilinear(surface, cellEast(grid, c), cellNorth(grid, r));
      if (!Number.isNaN(m)) maxErr = Math.max(maxErr, Math.abs(m - v));
    }
  }
  return { columns, rows, stride, originEast_m: grid.originEast_m, originNorth_m: grid.originNorth_m, positions, indices: Uint32Array.from(tri), maxVerticalError_m: maxErr };
}
