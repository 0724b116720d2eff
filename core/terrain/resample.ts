/**
 * Resampling terrain products onto another regular grid in the same local frame (e.g. the footprint's
 * target grid). Heights: bilinear between source cell centres (NaN when a corner is no-data or the
 * target centre is outside the source centres). Hazard flags: conservative — a target cell takes the
 * OR of every source cell whose area overlaps it, so a coarse cell is safe only if all of it is.
 * Footprint results: `resampleReachability` lays a coarse target grid onto the terrain grid.
 */
import type { ElevationGrid, GridSpec } from './grid.ts';
import { TerrainInputError, checkDimensions, makeGrid, sampleBilinear } from './grid.ts';
import { HAZARD_UNKNOWN } from './hazard.ts';
import type { ReachabilityGrid } from './sites.ts';

function checkSpec(spec: GridSpec): void {
  checkDimensions(spec.width, spec.height, 'target grid');
  for (const name of ['pixelSizeX_m', 'pixelSizeY_m'] as const) {
    if (!Number.isFinite(spec[name]) || spec[name] <= 0) throw new TerrainInputError(`invalid target ${name}: ${spec[name]} (must be > 0)`);
  }
}

export function resampleHeights(grid: ElevationGrid, target: GridSpec): ElevationGrid {
  checkSpec(target);
  const e0 = target.originEast_m ?? 0;
  const n0 = target.originNorth_m ?? 0;
  const out = new Float32Array(target.width * target.height);
  for (let r = 0; r < target.height; r++) {
    const north = n0 - (r + 0.5) * target.pixelSizeY_m;
    for (let c = 0; c < target.width; c++) {
      out[r * target.width + c] = sampleBilinear(grid, e0 + (c + 0.5) * target.pixelSizeX_m, north);
    }
  }
  return makeGrid({ ...target, originEast_m: e0, originNorth_m: n0, georeference: undefined }, out);
}

/**
 * Conservative hazard-flag resampling: OR of overlapping source cells; target cells not fully covered
 * by the source grid get HAZARD_UNKNOWN as well.
 */
export function resampleHazardFlags(flags: Uint8Array, source: ElevationGrid, target: GridSpec): Uint8Array {
  checkSpec(target);
  const e0 = target.originEast_m ?? 0;
  const n0 = target.originNorth_m ?? 0;
  const out = new Uint8Array(target.width * target.height);
  const eps = 1e-9;
  for (let r = 0; r < target.height; r++) {
    const top = (source.originNorth_m - (n0 - r * target.pixelSizeY_m)) / source.pixelSizeY_m;
    const bottom = (source.originNorth_m - (n0 - (r + 1) * target.pixelSizeY_m)) / source.pixelSizeY_m;
    const r0 = Math.floor(top + eps), r1 = Math.ceil(bottom - eps) - 1;
    for (let c = 0; c < target.width; c++) {
      const left = (e0 + c * target.pixelSizeX_m - source.originEast_m) / source.pixelSizeX_m;
      const right = (e0 + (c + 1) * target.pixelSizeX_m - source.originEast_m) / source.pixelSizeX_m;
      const c0 = Math.floor(left + eps), c1 = Math.ceil(right - eps) - 1;
      let f = 0;
      if (r0 < 0 || c0 < 0 || r1 >= source.height || c1 >= source.width) f |= HAZARD_UNKNOWN;
      for (let rr = Math.max(0, r0); rr <= Math.min(source.height - 1, r1); rr++) {
        for (let cc = Math.max(0, c0); cc <= Math.min(source.width - 1, c1); cc++) f |= flags[rr * source.width + cc];
      }
      out[r * target.width + c] = f;
    }
  }
  return out;
}

/**
 * Footprint results (a coarse target grid) laid onto the terrain grid, so hazards stay at full DEM
 * resolution: propellant bilinear between target centres; a terrain cell is reachable only when all
 * four surrounding targets are (conservative at the footprint's edge). Terrain cells outside the target
 * centres are unreachable. `demToGrid` maps the terrain's coordinates into the target grid's frame when the
 * two differ (a footprint in ground metres on a UTM DEM, see groundFrame.ts); by default they are the same.
 */
export function resampleReachability(
  reach: ReachabilityGrid,
  reachGrid: GridSpec,
  terrain: ElevationGrid,
  demToGrid?: (demEast_m: number, demNorth_m: number) => [number, number],
): ReachabilityGrid {
  checkSpec(reachGrid);
  if (reach.reachable.length !== reachGrid.width * reachGrid.height || reach.propellant_kg.length !== reach.reachable.length) {
    throw new TerrainInputError(`reachability arrays have ${reach.reachable.length} / ${reach.propellant_kg.length} values, but the target grid is ${reachGrid.width} × ${reachGrid.height}`);
  }
  const e0 = reachGrid.originEast_m ?? 0;
  const n0 = reachGrid.originNorth_m ?? 0;
  const { width: W, height: H } = reachGrid;
  const n = terrain.width * terrain.height;
  const out: ReachabilityGrid = { width: terrain.width, height: terrain.height, reachable: new Uint8Array(n), propellant_kg: new Float32Array(n).fill(NaN) };
  for (let r = 0; r < terrain.height; r++) {
    const demNorth = terrain.originNorth_m - (r + 0.5) * terrain.pixelSizeY_m;
    for (let c = 0; c < terrain.width; c++) {
      const demEast = terrain.originEast_m + (c + 0.5) * terrain.pixelSizeX_m;
      const [x, y] = demToGrid ? demToGrid(demEast, demNorth) : [demEast, demNorth];
      const fy = (n0 - y) / reachGrid.pixelSizeY_m - 0.5;
      if (!(fy >= 0 && fy <= H - 1)) continue;
      const r0 = Math.min(Math.floor(fy), Math.max(H - 2, 0)), r1 = Math.min(r0 + 1, H - 1), ty = fy - r0;
      const fx = (x - e0) / reachGrid.pixelSizeX_m - 0.5;
      if (!(fx >= 0 && fx <= W - 1)) continue;
      const c0 = Math.min(Math.floor(fx), Math.max(W - 2, 0)), c1 = Math.min(c0 + 1, W - 1), tx = fx - c0;
      const k00 = r0 * W + c0, k01 = r0 * W + c1, k10 = r1 * W + c0, k11 = r1 * W + c1;
      if (!(reach.reachable[k00] && reach.reachable[k01] && reach.reachable[k10] && reach.reachable[k11])) continue;
      const p = reach.propellant_kg;
      const k = r * terrain.width + c;
      out.reachable[k] = 1;
      out.propellant_kg[k] = (1 - ty) * ((1 - tx) * p[k00] + tx * p[k01]) + ty * ((1 - tx) * p[k10] + tx * p[k11]);
    }
  }
  return out;
}
