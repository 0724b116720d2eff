/**
 * Safe reachable set and candidate landing sites. The footprint engine is not part of core/terrain:
 * these functions take a plain reachability grid (reachable flags + propellant per cell) laid on the
 * same grid as the hazard map (lay the footprint's target grid onto the terrain grid first with
 * `resampleReachability` in resample.ts, so hazards keep the DEM's resolution).
 */
import type { ElevationGrid } from './grid.ts';
import { TerrainInputError, cellEast, cellNorth, sampleBilinear } from './grid.ts';
import type { HazardMap } from './hazard.ts';

/** What the footprint engine hands over, cell for cell on the terrain grid. */
export interface ReachabilityGrid {
  width: number;
  height: number;
  /** 1 where the target is reachable from the ignition state, 0 otherwise. */
  reachable: Uint8Array;
  /** Propellant used to reach the cell, kg (ignored where not reachable). */
  propellant_kg: Float32Array;
}

export interface SafeReachableSet {
  /** 1 where reachable and safe (hazard flags 0, so outside the safety margin too). */
  mask: Uint8Array;
  cells: number;
  area_m2: number;
  /** Reachable cells, for the ratio. */
  reachableCells: number;
}

function checkSameGrid(hazard: HazardMap, reach: ReachabilityGrid): void {
  if (reach.width !== hazard.width || reach.height !== hazard.height) {
    throw new TerrainInputError(
      `reachability grid is ${reach.width} × ${reach.height} but the hazard map is ${hazard.width} × ${hazard.height}; lay the footprint onto the terrain grid first (resampleReachability)`,
    );
  }
  const n = hazard.width * hazard.height;
  if (reach.reachable.length !== n || reach.propellant_kg.length !== n) {
    throw new TerrainInputError(`reachability arrays have ${reach.reachable.length} / ${reach.propellant_kg.length} values, expected ${n}`);
  }
}

/** Reachable ∧ safe, with its area. */
export function safeReachableSet(hazard: HazardMap, reach: ReachabilityGrid): SafeReachableSet {
  checkSameGrid(hazard, reach);
  const n = hazard.width * hazard.height;
  const mask = new Uint8Array(n);
  let cells = 0, reachableCells = 0;
  for (let k = 0; k < n; k++) {
    if (!reach.reachable[k]) continue;
    reachableCells++;
    if (hazard.flags[k] === 0) { mask[k] = 1; cells++; }
  }
  return { mask, cells, area_m2: cells * hazard.cellArea_m2, reachableCells };
}

export interface SiteRankOptions {
  /** How many sites to return (default 10, at most 1000). */
  count?: number;
  /** A site needs at least this distance (m) from its centre to the nearest hazard cell centre. Default: the hazard map's safety margin. */
  margin_m?: number;
  /** Sites returned are at least this far apart (m), so the list is not ten neighbouring cells. Default: 2 × lander diameter. */
  minSeparation_m?: number;
}

export interface CandidateSite {
  col: number;
  row: number;
  east_m: number;
  north_m: number;
  height_m: number;
  propellant_kg: number;
  /** Distance to the nearest hazard cell centre, m (Infinity when the map has no hazard). */
  hazardDistance_m: number;
  footprintSlope_deg: number;
  roughness_m: number;
}

/**
 * Candidate sites: safe, reachable cells with at least `margin_m` to the nearest hazard, in increasing
 * propellant (ties: larger hazard distance first), greedily thinned to `minSeparation_m`.
 */
export function rankSites(grid: ElevationGrid, hazard: HazardMap, reach: ReachabilityGrid, options: SiteRankOptions = {}): CandidateSite[] {
  checkSameGrid(hazard, reach);
  if (grid.width !== hazard.width || grid.height !== hazard.height) throw new TerrainInputError('rankSites: the elevation grid and hazard map differ in size');
  const count = options.count ?? 10;
  const margin = options.margin_m ?? hazard.limits.safetyMargin_m;
  const sep = options.minSeparation_m ?? 2 * hazard.limits.landerDiameter_m;
  if (!Number.isInteger(count) || count < 1 || count > 1000) throw new TerrainInputError(`invalid count: ${count} (must be an integer from 1 to 1000)`);
  if (!Number.isFinite(margin) || margin < 0) throw new TerrainInputError(`invalid margin_m: ${margin} (must be a number ≥ 0)`);
  if (!Number.isFinite(sep) || sep < 0) throw new TerrainInputError(`invalid minSeparation_m: ${sep} (must be a number ≥ 0)`);
  const eligible = (k: number) =>
    reach.reachable[k] && hazard.flags[k] === 0 && hazard.hazardDistance_m[k] >= margin && Number.isFinite(reach.propellant_kg[k]);
  let size = 0;
  for (let k = 0; k < reach.reachable.length; k++) if (eligible(k)) size++;
  const heap = new Int32Array(size);
  for (let k = 0, j = 0; k < reach.reachable.length; k++) if (eligible(k)) heap[j++] = k;
  // Increasing propellant, then larger hazard distance, then index. A binary heap (built in O(n), popped
  // lazily) instead of a full sort: only the first few hundred candidates are ever looked at.
  const prop = reach.propellant_kg, dist = hazard.hazardDistance_m;
  const before = (p: number, q: number) => prop[p] < prop[q] || (prop[p] === prop[q] && (dist[p] > dist[q] || (dist[p] === dist[q] && p < q)));
  const siftDown = (i: number) => {
    while (true) {
      const l = 2 * i + 1, r = l + 1;
      let m = i;
      if (l < size && before(heap[l], heap[m])) m = l;
      if (r < size && before(heap[r], heap[m])) m = r;
      if (m === i) return;
      const t = heap[i]; heap[i] = heap[m]; heap[m] = t;
      i = m;
    }
  };
  for (let i = (size >> 1) - 1; i >= 0; i--) siftDown(i);
  const sites: CandidateSite[] = [];
  const deg = 180 / Math.PI;
  while (size > 0 && sites.length < count) {
    const k = heap[0];
    heap[0] = heap[--size];
    siftDown(0);
    const col = k % grid.width;
    const row = (k - col) / grid.width;
    const east = cellEast(grid, col);
    const north = cellNorth(grid, row);
    if (sites.some((s) => (s.east_m - east) ** 2 + (s.north_m - north) ** 2 < sep * sep)) continue;
    sites.push({
      col,
      row,
      east_m: east,
      north_m: north,
      height_m: grid.heights[k],
      propellant_kg: prop[k],
      hazardDistance_m: dist[k],
      footprintSlope_deg: hazard.footprintSlope_rad[k] * deg,
      roughness_m: hazard.roughness_m[k],
    });
  }
  return sites;
}

/** A trajectory node in the terrain's local frame; up_m on the same vertical datum as the heights. */
export interface TrajectoryNode {
  east_m: number;
  north_m: number;
  up_m: number;
}

export interface ClearanceReport {
  /** Smallest (trajectory height − terrain height) over nodes and segment samples above the grid, m; NaN when none is. */
  minClearance_m: number;
  /** Indices of nodes lower than terrain + required clearance. */
  violations: number[];
  /** Indices i of segments (node i → i + 1) that dip below terrain + clearance between their nodes. */
  segmentViolations: number[];
  /** Indices of nodes outside the grid or over no-data (clearance unknown). */
  unknown: number[];
  ok: boolean;
}

/**
 * Terrain clearance along a trajectory: flags every node below the (bilinear) terrain surface plus
 * `clearance_m`, and every straight segment between nodes that does so anywhere, sampled at the DEM's
 * pixel size (a ridge narrower than the node spacing is not missed). The final touchdown node(s) can
 * be excluded with `skipLast` (default 1), since they sit on the surface by construction; segments
 * into skipped nodes are not checked.
 */
export function checkTerrainClearance(grid: ElevationGrid, nodes: readonly TrajectoryNode[], clearance_m: number, skipLast = 1): ClearanceReport {
  if (!Number.isFinite(clearance_m) || clearance_m < 0) throw new TerrainInputError(`invalid clearance_m: ${clearance_m} (must be a number ≥ 0)`);
  const violations: number[] = [];
  const segmentViolations: number[] = [];
  const unknown: number[] = [];
  let minClearance = Infinity;
  const last = nodes.length - Math.max(0, skipLast);
  const step = Math.min(grid.pixelSizeX_m, grid.pixelSizeY_m);
  for (let i = 0; i < last; i++) {
    const p = nodes[i];
    const ground = sampleBilinear(grid, p.east_m, p.north_m);
    if (Number.isNaN(ground)) unknown.push(i);
    else {
      const gap = p.up_m - ground;
      if (gap < minClearance) minClearance = gap;
      if (gap < clearance_m) violations.push(i);
    }
    if (i + 1 >= last) continue;
    const q = nodes[i + 1];
    const samples = Math.min(100000, Math.ceil(Math.hypot(q.east_m - p.east_m, q.north_m - p.north_m) / step));
    let dips = false;
    for (let s = 1; s < samples; s++) {
      const t = s / samples;
      const g = sampleBilinear(grid, p.east_m + t * (q.east_m - p.east_m), p.north_m + t * (q.north_m - p.north_m));
      if (Number.isNaN(g)) continue;
      const gap = p.up_m + t * (q.up_m - p.up_m) - g;
      if (gap < minClearance) minClearance = gap;
      if (gap < clearance_m) dips = true;
    }
    if (dips) segmentViolations.push(i);
  }
  return {
    minClearance_m: minClearance === Infinity ? NaN : minClearance,
    violations,
    segmentViolations,
    unknown,
    ok: violations.length === 0 && segmentViolations.length === 0 && unknown.length === 0,
  };
}
