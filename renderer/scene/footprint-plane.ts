/**
 * The part of a footprint's drape that has no terrain under it. Inside the DEM the propellant is draped on
 * the terrain itself (vertex colours); a footprint grid often reaches past the DEM's edge (or over no-data),
 * and there its cells are drawn on the plane of the nominal target's ground (elevation-grid.ts
 * targetGroundHeight): the landing plane the footprint's targets were solved on. Pure: data in, geometry out.
 */
import { BufferAttribute, BufferGeometry } from 'three';
import { colorizeLinear, VIRIDIS, type Colormap } from '../../core/study/colormap.ts';
import { sampleHeight, targetGroundHeight, type ElevationGrid } from './elevation-grid.ts';
import type { ScalarGrid } from './resample.ts';

export interface FootprintPlaneOptions {
  exaggeration: number;
  /** Value range of the colour map: the same as the drape on the terrain, so the two read as one field. */
  range: [number, number];
  colormap?: Colormap;
}

/**
 * One vertex per footprint sample (on the plane, coloured by its value), two triangles per footprint cell
 * whose four corners have a value and whose centre has no terrain under it.
 */
export function buildFootprintPlaneGeometry(field: ScalarGrid, terrain: ElevationGrid, options: FootprintPlaneOptions): BufferGeometry {
  const { width, height, pixelSize_m, west_m, north_m, values } = field;
  if (values.length !== width * height) throw new Error(`invalid footprint grid: ${values.length} values for ${width} × ${height}`);
  const [lo, hi] = options.range;
  const z = targetGroundHeight(terrain) * options.exaggeration;
  const positions = new Float32Array(width * height * 3);
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) positions.set([west_m + c * pixelSize_m, north_m - r * pixelSize_m, z], 3 * (r * width + c));
  }
  const index: number[] = [];
  for (let r = 0; r < height - 1; r++) {
    for (let c = 0; c < width - 1; c++) {
      const nw = r * width + c;
      const ne = nw + 1;
      const sw = nw + width;
      const se = sw + 1;
      if (Number.isNaN(values[nw] + values[ne] + values[sw] + values[se])) continue;
      const centreEast = west_m + (c + 0.5) * pixelSize_m;
      const centreNorth = north_m - (r + 0.5) * pixelSize_m;
      if (!Number.isNaN(sampleHeight(terrain, centreEast, centreNorth))) continue;
      // Counter-clockwise seen from above, as the terrain mesh (terrain-mesh.ts).
      index.push(sw, se, ne, sw, ne, nw);
    }
  }
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(positions, 3));
  geometry.setAttribute('color', new BufferAttribute(colorizeLinear(values, lo, hi > lo ? hi : lo + 1, options.colormap ?? VIRIDIS), 3));
  geometry.setIndex(new BufferAttribute(new Uint32Array(index), 1));
  geometry.computeBoundingSphere();
  return geometry;
}
