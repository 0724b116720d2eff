/**
 * Hazard overlay: the terrain cells that touch a hazardous sample, lifted slightly above the terrain,
 * with world-space texture coordinates so a stripe texture reads the same at every zoom. Stripes,
 * not a colour, mark the hazard, so the overlay does not depend on colour vision and does not hide
 * the draped colour map underneath.
 */
import { BufferAttribute, BufferGeometry, DataTexture, RepeatWrapping, RGBAFormat, LinearFilter } from 'three';
import { validateGrid, type ElevationGrid } from './elevation-grid.ts';

export interface HazardOverlayOptions {
  exaggeration?: number;
  /** Metres above the terrain (before exaggeration) so the overlay never z-fights it. Default 1. */
  lift_m?: number;
  /** Ground distance of one stripe period, metres. Default 120. */
  stripe_m?: number;
  /** Cells drawn: those touching a marked sample (`any`, default: conservative for hazards) or with all four marked (`all`). */
  cells?: 'any' | 'all';
}

export function buildHazardGeometry(grid: ElevationGrid, mask: Uint8Array, options: HazardOverlayOptions = {}): BufferGeometry {
  validateGrid(grid);
  if (mask.length !== grid.heights.length) throw new Error(`invalid hazard mask: ${mask.length} values for ${grid.heights.length} samples`);
  const ex = options.exaggeration ?? 1;
  const lift = options.lift_m ?? 1;
  const stripe = options.stripe_m ?? 120;
  if (!(stripe > 0)) throw new Error(`invalid stripe_m: ${stripe} (must be positive)`);
  const { width, height, heights, pixelSize_m, west_m, north_m } = grid;
  const positions = new Float32Array(width * height * 3);
  const uvs = new Float32Array(width * height * 2);
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const i = r * width + c;
      const e = west_m + c * pixelSize_m;
      const n = north_m - r * pixelSize_m;
      const h = Number.isNaN(heights[i]) ? 0 : heights[i];
      positions.set([e, n, (h + lift) * ex], 3 * i);
      uvs.set([e / stripe, n / stripe], 2 * i);
    }
  }
  const index: number[] = [];
  for (let r = 0; r < height - 1; r++) {
    for (let c = 0; c < width - 1; c++) {
      const nw = r * width + c;
      const ne = nw + 1;
      const sw = nw + width;
      const se = sw + 1;
      if (Number.isNaN(heights[nw] + heights[ne] + heights[sw] + heights[se])) continue;
      if (options.cells === 'all' ? !(mask[nw] && mask[ne] && mask[sw] && mask[se]) : !(mask[nw] || mask[ne] || mask[sw] || mask[se])) continue;
      index.push(sw, se, ne, sw, ne, nw);
    }
  }
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(positions, 3));
  geometry.setAttribute('uv', new BufferAttribute(uvs, 2));
  geometry.setIndex(new BufferAttribute(new Uint32Array(index), 1));
  return geometry;
}

/** A 16 × 16 texture of diagonal light stripes on transparency, repeating. */
export function hazardStripeTexture(): DataTexture {
  const size = 16;
  const data = new Uint8Array(size * size * 4);
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const on = (x + y) % size < 4;
      data.set(on ? [250, 250, 250, 150] : [0, 0, 0, 0], 4 * (y * size + x));
    }
  }
  const texture = new DataTexture(data, size, size, RGBAFormat);
  texture.wrapS = RepeatWrapping;
  texture.wrapT = RepeatWrapping;
  texture.magFilter = LinearFilter;
  texture.needsUpdate = true;
  return texture;
}
