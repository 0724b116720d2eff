/**
 * Terrain mesh: one vertex per grid sample, two triangles per cell (cells touching missing data are
 * left out), heights scaled by the vertical exaggeration, a scalar field draped as vertex colours.
 */
import { BufferAttribute, BufferGeometry } from 'three';
import { colorizeLinear, VIRIDIS, type Colormap } from '../../core/study/colormap.ts';
import { heightRange, validateGrid, type ElevationGrid } from './elevation-grid.ts';

export interface TerrainMeshOptions {
  /** Multiplies heights for display; 1 = true scale. Default 1. */
  exaggeration?: number;
  /** Field draped as colour, one value per sample (NaN = no data). Default: the heights themselves. */
  drape?: Float32Array;
  /** Value range mapped onto the colour map. Default: the drape's own finite range. */
  drapeRange?: [number, number];
  colormap?: Colormap;
}

export function validateExaggeration(exaggeration: number): number {
  if (!(exaggeration > 0) || !Number.isFinite(exaggeration)) throw new Error(`invalid exaggeration: ${exaggeration} (must be a positive number; 1 = true scale)`);
  return exaggeration;
}

/** Triangle indices of the valid cells, counter-clockwise seen from above (+z). */
export function terrainIndices(grid: ElevationGrid): Uint32Array {
  const { width, height, heights } = grid;
  const out = new Uint32Array((width - 1) * (height - 1) * 6);
  let n = 0;
  for (let r = 0; r < height - 1; r++) {
    for (let c = 0; c < width - 1; c++) {
      const nw = r * width + c;
      const ne = nw + 1;
      const sw = nw + width;
      const se = sw + 1;
      if (Number.isNaN(heights[nw] + heights[ne] + heights[sw] + heights[se])) continue;
      // Rows run south as r grows, so (sw, se, ne) turns counter-clockwise in (east, north).
      out[n++] = sw; out[n++] = se; out[n++] = ne;
      out[n++] = sw; out[n++] = ne; out[n++] = nw;
    }
  }
  return out.slice(0, n);
}

export function buildTerrainGeometry(grid: ElevationGrid, options: TerrainMeshOptions = {}): BufferGeometry {
  validateGrid(grid);
  const exaggeration = validateExaggeration(options.exaggeration ?? 1);
  const { width, height, heights, pixelSize_m, west_m, north_m } = grid;
  const positions = new Float32Array(width * height * 3);
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const i = r * width + c;
      const h = heights[i];
      positions[3 * i] = west_m + c * pixelSize_m;
      positions[3 * i + 1] = north_m - r * pixelSize_m;
      // Missing samples sit at 0; no triangle uses them.
      positions[3 * i + 2] = Number.isNaN(h) ? 0 : h * exaggeration;
    }
  }
  const drape = options.drape ?? heights;
  if (drape.length !== heights.length) throw new Error(`invalid drape: ${drape.length} values for ${heights.length} samples`);
  const [lo, top] = options.drapeRange ?? heightRange(drape);
  const hi = top > lo ? top : lo + 1; // a flat field still gets a valid (single) colour
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(positions, 3));
  geometry.setAttribute('color', new BufferAttribute(colorizeLinear(drape, lo, hi, options.colormap ?? VIRIDIS), 3));
  geometry.setIndex(new BufferAttribute(terrainIndices(grid), 1));
  geometry.computeVertexNormals();
  geometry.computeBoundingBox();
  geometry.computeBoundingSphere();
  geometry.userData = { exaggeration };
  return geometry;
}

/** Change the exaggeration in place (no new buffers): z ← h × exaggeration, normals recomputed. */
export function setTerrainExaggeration(geometry: BufferGeometry, grid: ElevationGrid, exaggeration: number): void {
  validateExaggeration(exaggeration);
  const position = geometry.getAttribute('position') as BufferAttribute;
  const array = position.array as Float32Array;
  for (let i = 0; i < grid.heights.length; i++) {
    const h = grid.heights[i];
    array[3 * i + 2] = Number.isNaN(h) ? 0 : h * exaggeration;
  }
  position.needsUpdate = true;
  geometry.computeVertexNormals();
  geometry.computeBoundingBox();
  geometry.computeBoundingSphere();
  geometry.userData = { ...geometry.userData, exaggeration };
}
