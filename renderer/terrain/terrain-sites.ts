/**
 * Where a computed footprint meets the terrain: the footprint's targets laid onto the DEM grid (core/terrain
 * resampleReachability: a DEM cell is reachable with the reserve kept when all four surrounding targets are),
 * intersected with the hazard map at full DEM resolution (safeReachableSet), the best landing sites ranked by
 * propellant and spread apart (rankSites) — the analysis `landreach hazard --study` writes — and the share of
 * safe ∩ reachable DEM cells under each display cell, for the scene. Pure: runs in the terrain worker, where
 * the DEM and its hazard map stay after they are read, and in unit tests.
 * Frames: the footprint is east/north of the nominal target; the DEM frame puts the target at `target`; the
 * app places the display grid by the same plain shift (terrain-product.ts placeDisplayGrid).
 */
import { TARGET } from '../../core/footprint/field.ts';
import { cellEast, cellNorth, rankSites, resampleReachability, safeReachableSet, type ElevationGrid, type GridSpec, type HazardMap } from '../../core/terrain/index.ts';

/** The parts of a footprint field the analysis needs (plain arrays: they cross to the worker). */
export interface SitesFootprint {
  nx: number;
  ny: number;
  /** Target east coordinates, ascending, m from the nominal target. */
  east: Float64Array;
  /** Target north coordinates, ascending (rows run south → north). */
  north: Float64Array;
  status: Uint8Array;
  propellant_kg: Float32Array;
}

export interface LandingSite {
  /** 1 = the cheapest. */
  rank: number;
  /** m east / north of the nominal target (the scene's frame). */
  east_m: number;
  north_m: number;
  /** Ground height, m on the DEM's datum. */
  height_m: number;
  propellant_kg: number;
  /** Distance to the nearest hazard cell, m. */
  hazardDistance_m: number;
}

export interface FootprintOnTerrain {
  sites: LandingSite[];
  safeReachableArea_m2: number;
  safeReachableCells: number;
  reachableCells: number;
  /** Per display cell (display.spec, row 0 north): share of its DEM cells that are safe and reachable, 0 … 1. */
  displayShare: Float32Array;
}

/** How many sites the app lists (and draws): the CLI's `--sites` default is 10; five fit beside the scene. */
export const APP_SITE_COUNT = 5;

/**
 * Sites the app lists are at least this far apart: two lander diameters (core/terrain rankSites' default) or a
 * twentieth of the DEM's shorter side, whichever is more, so five sites show five places on the map rather than
 * five neighbouring cells at the cheapest edge (e.g. 50 m apart on a 1 km DEM, 1 km on a 20 km one).
 */
export function siteSeparation_m(grid: ElevationGrid, landerDiameter_m: number): number {
  return Math.max(2 * landerDiameter_m, Math.min(grid.width * grid.pixelSizeX_m, grid.height * grid.pixelSizeY_m) / 20);
}

export function footprintOnTerrain(
  grid: ElevationGrid,
  map: HazardMap,
  displaySpec: GridSpec,
  footprint: SitesFootprint,
  budget_kg: number,
  target: { east_m: number; north_m: number },
  count = APP_SITE_COUNT,
): FootprintOnTerrain {
  const { nx, ny } = footprint;
  if (nx < 2 || ny < 2) throw new Error(`footprint grid ${nx} × ${ny}: need at least 2 × 2 targets`);
  const dx = (footprint.east[nx - 1] - footprint.east[0]) / (nx - 1);
  const dy = (footprint.north[ny - 1] - footprint.north[0]) / (ny - 1);
  // Terrain grids run north → south: row r of the raster is footprint row ny − 1 − r.
  const reachable = new Uint8Array(nx * ny);
  const propellant = new Float32Array(nx * ny).fill(NaN);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const src = j * nx + i;
      const dst = (ny - 1 - j) * nx + i;
      if (footprint.status[src] === TARGET.reachable && footprint.propellant_kg[src] <= budget_kg) {
        reachable[dst] = 1;
        propellant[dst] = footprint.propellant_kg[src];
      }
    }
  }
  const spec: GridSpec = {
    width: nx,
    height: ny,
    pixelSizeX_m: dx,
    pixelSizeY_m: dy,
    originEast_m: target.east_m + footprint.east[0] - dx / 2,
    originNorth_m: target.north_m + footprint.north[ny - 1] + dy / 2,
  };
  const onDem = resampleReachability({ width: nx, height: ny, reachable, propellant_kg: propellant }, spec, grid);
  const safe = safeReachableSet(map, onDem);
  const sites = rankSites(grid, map, onDem, { count, minSeparation_m: siteSeparation_m(grid, map.limits.landerDiameter_m) }).map((s, k) => ({
    rank: k + 1,
    east_m: s.east_m - target.east_m,
    north_m: s.north_m - target.north_m,
    height_m: s.height_m,
    propellant_kg: s.propellant_kg,
    hazardDistance_m: s.hazardDistance_m,
  }));
  return { sites, safeReachableArea_m2: safe.area_m2, safeReachableCells: safe.cells, reachableCells: safe.reachableCells, displayShare: shareOnDisplay(safe.mask, grid, displaySpec) };
}

/** Mean of a 0/1 DEM mask over each display cell (the DEM cells whose centres fall in it). */
export function shareOnDisplay(mask: Uint8Array, grid: ElevationGrid, display: GridSpec): Float32Array {
  const sum = new Float32Array(display.width * display.height);
  const count = new Float32Array(display.width * display.height);
  const e0 = display.originEast_m ?? 0;
  const n0 = display.originNorth_m ?? 0;
  for (let r = 0; r < grid.height; r++) {
    const dr = Math.floor((n0 - cellNorth(grid, r)) / display.pixelSizeY_m);
    if (dr < 0 || dr >= display.height) continue;
    for (let c = 0; c < grid.width; c++) {
      const dc = Math.floor((cellEast(grid, c) - e0) / display.pixelSizeX_m);
      if (dc < 0 || dc >= display.width) continue;
      const k = dr * display.width + dc;
      sum[k] += mask[r * grid.width + c];
      count[k]++;
    }
  }
  for (let k = 0; k < sum.length; k++) sum[k] = count[k] ? sum[k] / count[k] : 0;
  return sum;
}
