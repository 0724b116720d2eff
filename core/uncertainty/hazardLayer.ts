/**
 * The hazard map as the uncertainty studies see it: which landing points are safe. A landing point is given
 * in the dynamics' frame (metres east, north of the nominal target) and laid on the DEM through the ground
 * frame's linear map at the target (core/terrain/groundFrame.ts: DEM offset = J · ground offset); the cell it
 * falls in is a safe touchdown when it has no slope, roughness or unknown flag; a target is chosen only where
 * the cell is also outside the map's safety margin (`clear`). Points off the DEM are unsafe: nothing is known
 * there. Plain data, so it crosses to workers.
 */
import type { ElevationGrid } from '../terrain/grid.ts';
import { HAZARD_MARGIN, type HazardMap } from '../terrain/hazard.ts';

export interface HazardLayer {
  width: number;
  height: number;
  pixelSizeX_m: number;
  pixelSizeY_m: number;
  originEast_m: number;
  originNorth_m: number;
  /** 1 where a touchdown is safe (no slope, roughness or unknown flag), 0 elsewhere (row 0 north, as the DEM). */
  safe: Uint8Array;
  /** 1 where a target may be chosen: safe and also outside the safety margin of every hazard. */
  clear: Uint8Array;
  /** The nominal target in the DEM's frame, m. */
  target_m: [number, number];
  /** J = ∂(E, N)/∂(east, north) at the target, row-major [∂E/∂e, ∂E/∂n, ∂N/∂e, ∂N/∂n]. */
  jacobian: [number, number, number, number];
}

export function hazardLayer(grid: ElevationGrid, map: HazardMap, target_m: readonly [number, number], jacobian: readonly [number, number, number, number] = [1, 0, 0, 1]): HazardLayer {
  if (map.width !== grid.width || map.height !== grid.height) throw new RangeError(`hazard map ${map.width} × ${map.height} does not match the DEM ${grid.width} × ${grid.height}`);
  const safe = new Uint8Array(map.flags.length);
  const clear = new Uint8Array(map.flags.length);
  for (let k = 0; k < safe.length; k++) {
    // The margin flag marks safe ground near a hazard: a safe touchdown, but not a target to aim at.
    safe[k] = (map.flags[k] & ~HAZARD_MARGIN) === 0 ? 1 : 0;
    clear[k] = map.flags[k] === 0 ? 1 : 0;
  }
  return {
    width: grid.width,
    height: grid.height,
    pixelSizeX_m: grid.pixelSizeX_m,
    pixelSizeY_m: grid.pixelSizeY_m,
    originEast_m: grid.originEast_m,
    originNorth_m: grid.originNorth_m,
    safe,
    clear,
    target_m: [target_m[0], target_m[1]],
    jacobian: [...jacobian] as [number, number, number, number],
  };
}

/** The DEM cell index under a ground point (east, north of the nominal target, m), or −1 off the DEM. */
export function cellAt(layer: HazardLayer, east_m: number, north_m: number): number {
  const [a, b, c, d] = layer.jacobian;
  const E = layer.target_m[0] + a * east_m + b * north_m;
  const N = layer.target_m[1] + c * east_m + d * north_m;
  const col = Math.floor((E - layer.originEast_m) / layer.pixelSizeX_m);
  const row = Math.floor((layer.originNorth_m - N) / layer.pixelSizeY_m);
  if (!(col >= 0 && col < layer.width && row >= 0 && row < layer.height)) return -1;
  return row * layer.width + col;
}

/** True when a touchdown at this ground point is on safe, known ground. */
export function isSafeAt(layer: HazardLayer, east_m: number, north_m: number): boolean {
  const k = cellAt(layer, east_m, north_m);
  return k >= 0 && layer.safe[k] === 1;
}

/** True when a target here is outside the safety margin of every hazard (and on safe, known ground). */
export function isClearAt(layer: HazardLayer, east_m: number, north_m: number): boolean {
  const k = cellAt(layer, east_m, north_m);
  return k >= 0 && layer.clear[k] === 1;
}

/** Ground coordinates (east, north of the nominal target) of a DEM cell's centre: the inverse of J. */
export function cellCentreGround(layer: HazardLayer, k: number): [number, number] {
  const col = k % layer.width;
  const row = (k - col) / layer.width;
  const dE = layer.originEast_m + (col + 0.5) * layer.pixelSizeX_m - layer.target_m[0];
  const dN = layer.originNorth_m - (row + 0.5) * layer.pixelSizeY_m - layer.target_m[1];
  const [a, b, c, d] = layer.jacobian;
  const det = a * d - b * c;
  return [(d * dE - b * dN) / det, (-c * dE + a * dN) / det];
}

/**
 * P(touchdown on unsafe ground) under a bivariate Gaussian landing distribution N(mean, cov) in ground
 * metres: 1 − ∫_safe p. The integral over each safe cell is the density at the cell centre times the cell's
 * ground area (midpoint rule; its error per cell is of relative order (h/σ_min)²/24 for a cell of side h,
 * e.g. 1.7e-5 for 2 m cells under a 20 m σ). Mass outside the DEM counts as unsafe.
 */
export function gaussianUnsafeProbability(layer: HazardLayer, mean: readonly [number, number], cov: readonly [number, number, number]): number {
  const [see, sen, snn] = cov;
  const det = see * snn - sen * sen;
  if (!(see > 0 && snn > 0 && det > 0)) throw new RangeError(`landing covariance [${cov.join(', ')}] m²: must be positive definite for the Gaussian model (give samples with some spread)`);
  const [a, b, c, d] = layer.jacobian;
  const cellArea = (layer.pixelSizeX_m * layer.pixelSizeY_m) / Math.abs(a * d - b * c);
  const norm = cellArea / (2 * Math.PI * Math.sqrt(det));
  const i00 = snn / det;
  const i01 = -sen / det;
  const i11 = see / det;
  let safeMass = 0;
  for (let k = 0; k < layer.safe.length; k++) {
    if (!layer.safe[k]) continue;
    const [e, n] = cellCentreGround(layer, k);
    const x = e - mean[0];
    const y = n - mean[1];
    safeMass += Math.exp(-0.5 * (i00 * x * x + 2 * i01 * x * y + i11 * y * y));
  }
  return Math.max(0, 1 - safeMass * norm);
}
