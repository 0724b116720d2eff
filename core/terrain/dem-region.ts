/**
 * The region of a DEM an analysis needs, in the DEM's frame: a rectangle of the footprint's ground frame
 * (true east/north metres about the nominal target) mapped onto the DEM through the ground frame
 * (groundFrame.ts: the projection's Jacobian at the target), plus a margin in DEM metres.
 */
import type { GroundFrame } from './groundFrame.ts';
import type { GridFrame } from './grid.ts';

export interface DemRectangle {
  readonly west_m: number;
  readonly east_m: number;
  readonly south_m: number;
  readonly north_m: number;
}

/**
 * The DEM-frame bounding box of the ground rectangle [west, east] × [south, north] (metres from the target)
 * and of any extra ground points (e.g. a trajectory's ground track), widened by `margin_m` DEM metres on
 * every side. The ground frame is linear, so the rectangle's four corners bound it.
 */
export function groundRegionOnDem(ground: GroundFrame, rect: DemRectangle, margin_m: number, points: readonly (readonly [number, number])[] = []): DemRectangle {
  const corners: (readonly [number, number])[] = [
    [rect.west_m, rect.south_m], [rect.east_m, rect.south_m], [rect.west_m, rect.north_m], [rect.east_m, rect.north_m], ...points,
  ];
  let w = Infinity, e = -Infinity, s = Infinity, n = -Infinity;
  for (const [x, y] of corners) {
    const [E, N] = ground.toDem(x, y);
    w = Math.min(w, E); e = Math.max(e, E); s = Math.min(s, N); n = Math.max(n, N);
  }
  return { west_m: w - margin_m, east_m: e + margin_m, south_m: s - margin_m, north_m: n + margin_m };
}

/**
 * Margin a hazard map needs past the cells it must judge, DEM metres: the lander's radius (the footprint
 * plane fit reaches that far), the safety margin (a hazard that close flags the cell) and two pixels (Horn's
 * 3 × 3 kernel and the fit's ring each reach one pixel further). With it, the hazard flags of the cells
 * inside the region are the ones the whole DEM would give.
 */
export function hazardMargin_m(frame: GridFrame, landerDiameter_m: number, safetyMargin_m: number): number {
  return landerDiameter_m / 2 + safetyMargin_m + 2 * Math.max(frame.pixelSizeX_m, frame.pixelSizeY_m);
}
