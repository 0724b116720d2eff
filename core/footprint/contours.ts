/**
 * Propellant-cost contours and the reachable set's boundary, as GeoJSON geometry in local metres
 * (x east, y north, nominal target at the origin), computed with d3-contour's marching squares.
 */
import { contours } from 'd3-contour';
import type { MultiPolygon, Position } from 'geojson';
import { hasFlyableCost, type FootprintField } from './field.ts';

/** Region where the minimum propellant is at most `level_kg`, with its area. */
export interface PropellantRegion {
  level_kg: number;
  geometry: MultiPolygon;
  area_m2: number;
}

/**
 * Regions {propellant ≤ level} for each level. Unreachable, failed and pending targets count as above every
 * level, and so does everything beyond the grid: a region never reaches past the targets actually computed.
 * Between a reachable and an unreachable target the boundary sits at the reachable one (conservative);
 * between two reachable targets it is interpolated linearly in propellant.
 */
export function propellantRegions(field: FootprintField, levels_kg: readonly number[]): PropellantRegion[] {
  const { nx, ny } = field;
  for (const l of levels_kg) {
    if (!Number.isFinite(l)) throw new RangeError(`contour level ${l}: must be a finite propellant mass in kg`);
  }
  // Padded by one ring of "out of reach" so regions close at the outermost targets.
  const px = nx + 2;
  const py = ny + 2;
  const values = new Array<number>(px * py).fill(OUT_OF_REACH);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = j * nx + i;
      // Over-budget and relaxation-gap targets carry an upper bound on their cost (a flyable trajectory):
      // contours through them err on the safe side.
      if (hasFlyableCost(field, k)) values[(j + 1) * px + i + 1] = -field.propellant_kg[k];
    }
  }
  const generator = contours().size([px, py]).smooth(true);
  const dx = nx > 1 ? field.east[1] - field.east[0] : 1;
  const dy = ny > 1 ? field.north[1] - field.north[0] : 1;
  // d3-contour puts value (i, j) of the padded array at (i + 0.5, j + 0.5): target (0, 0) is at (1.5, 1.5).
  const toLocal = (p: Position): Position => [field.east[0] + (p[0] - 1.5) * dx, field.north[0] + (p[1] - 1.5) * dy];
  return levels_kg.map((level) => {
    const raw = generator.contour(values, -level);
    const geometry: MultiPolygon = {
      type: 'MultiPolygon',
      coordinates: raw.coordinates.map((poly) => poly.map((ring) => ring.map(toLocal))),
    };
    return { level_kg: level, geometry, area_m2: multiPolygonArea(geometry) };
  });
}

/** Stand-in value (negated propellant) for targets out of reach: below every contour level. */
const OUT_OF_REACH = -1e30;

/** Signed shoelace area of a closed ring. */
export function ringArea(ring: readonly Position[]): number {
  let a = 0;
  for (let k = 0, n = ring.length; k < n; k++) {
    const [x1, y1] = ring[k];
    const [x2, y2] = ring[(k + 1) % n];
    a += x1 * y2 - x2 * y1;
  }
  return a / 2;
}

/** Area of a MultiPolygon: each polygon's exterior minus its holes. */
export function multiPolygonArea(g: MultiPolygon): number {
  let total = 0;
  for (const poly of g.coordinates) {
    if (poly.length === 0) continue;
    let a = Math.abs(ringArea(poly[0]));
    for (let h = 1; h < poly.length; h++) a -= Math.abs(ringArea(poly[h]));
    total += a;
  }
  return total;
}

/** Even–odd point-in-polygon over every ring of the MultiPolygon. */
export function containsPoint(g: MultiPolygon, x: number, y: number): boolean {
  let inside = false;
  for (const poly of g.coordinates) {
    for (const ring of poly) {
      for (let k = 0, n = ring.length, m = n - 1; k < n; m = k++) {
        const [xi, yi] = ring[k];
        const [xj, yj] = ring[m];
        if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
      }
    }
  }
  return inside;
}

function segmentDistance(px: number, py: number, a: Position, b: Position): number {
  const vx = b[0] - a[0];
  const vy = b[1] - a[1];
  const len2 = vx * vx + vy * vy;
  const t = len2 > 0 ? Math.max(0, Math.min(1, ((px - a[0]) * vx + (py - a[1]) * vy) / len2)) : 0;
  return Math.hypot(a[0] + t * vx - px, a[1] + t * vy - py);
}

export interface DivertRadius {
  /** Radius of the largest circle around the point that lies inside the region, m (0 if outside). */
  radius_m: number;
  /**
   * True when that circle touches the region's boundary only where the region meets the edge of the
   * target grid: the true radius may be larger (widen the grid).
   */
  limitedByGrid: boolean;
}

/**
 * Guaranteed divert radius: the distance from the point to the nearest boundary of the region (when the
 * point is inside it). `gridBounds` = [west, south, east, north] of the region's possible extent.
 */
export function guaranteedDivertRadius(
  g: MultiPolygon,
  x: number,
  y: number,
  gridBounds: readonly [number, number, number, number],
): DivertRadius {
  if (!containsPoint(g, x, y)) return { radius_m: 0, limitedByGrid: false };
  let best = Infinity;
  let bestOnEdge = false;
  const [w, s, e, n] = gridBounds;
  const tol = 1e-6 * Math.max(e - w, n - s);
  const onEdge = (p: Position, q: Position) =>
    (Math.abs(p[0] - w) < tol && Math.abs(q[0] - w) < tol) ||
    (Math.abs(p[0] - e) < tol && Math.abs(q[0] - e) < tol) ||
    (Math.abs(p[1] - s) < tol && Math.abs(q[1] - s) < tol) ||
    (Math.abs(p[1] - n) < tol && Math.abs(q[1] - n) < tol);
  for (const poly of g.coordinates) {
    for (const ring of poly) {
      for (let k = 0; k < ring.length; k++) {
        const a = ring[k];
        const b = ring[(k + 1) % ring.length];
        const d = segmentDistance(x, y, a, b);
        if (d < best - tol || (Math.abs(d - best) <= tol && !onEdge(a, b))) {
          best = d;
          bestOnEdge = onEdge(a, b);
        }
      }
    }
  }
  return { radius_m: best, limitedByGrid: bestOnEdge };
}

/** [west, south, east, north]: the outermost targets of a field, where its regions stop. */
export function regionBounds(field: FootprintField): [number, number, number, number] {
  return [field.east[0], field.north[0], field.east[field.nx - 1], field.north[field.ny - 1]];
}

/**
 * Distance from (x0, y0) along the unit direction (dx, dy) to the farthest crossing of the region's
 * boundary (0 when the ray never crosses it).
 */
export function rayBoundaryDistance(g: MultiPolygon, x0: number, y0: number, dx: number, dy: number): number {
  let best = 0;
  for (const poly of g.coordinates) {
    for (const ring of poly) {
      for (let k = 0; k < ring.length; k++) {
        const [ax, ay] = ring[k];
        const [bx, by] = ring[(k + 1) % ring.length];
        const ex = bx - ax;
        const ey = by - ay;
        const den = dx * ey - dy * ex;
        if (den === 0) continue;
        // x0 + t d = a + s e  ⇒  t = ((a − x0) × e) / (d × e), s = ((a − x0) × d) / (d × e)
        const t = ((ax - x0) * ey - (ay - y0) * ex) / den;
        const s = ((ax - x0) * dy - (ay - y0) * dx) / den;
        if (t > 0 && s >= 0 && s <= 1 && t > best) best = t;
      }
    }
  }
  return best;
}

/** A "nice" step (1, 2 or 5 × 10ⁿ) near span / count. */
export function niceStep(span: number, count: number): number {
  const raw = span / Math.max(1, count);
  const p = 10 ** Math.floor(Math.log10(raw));
  const m = raw / p;
  return (m < 1.5 ? 1 : m < 3.5 ? 2 : m < 7.5 ? 5 : 10) * p;
}
