/**
 * Footprint results as struct-of-arrays: one typed array per quantity, row-major (index = row · nx + col),
 * so rows can be streamed between threads as transferables and a cancelled run keeps every finished row.
 */
import type { TargetGrid } from './grid.ts';

/** Per-target outcome codes stored in `status`. */
export const TARGET = {
  /** Not computed (yet, or the run was cancelled first). */
  pending: 0,
  /** Reachable: an optimal trajectory exists within the vehicle's propellant. */
  reachable: 1,
  /**
   * Certified unreachable: at every time of flight searched the exact landing is infeasible — a
   * minimum-propellant infeasibility certificate, or a minimum-landing-error optimum with a positive miss
   * (that problem relaxes the landing point, so a positive minimum proves the landing impossible).
   */
  unreachable: 2,
  /** The solver failed for this target (neither solved nor certified). */
  failed: 3,
  /**
   * Reachable, but certainly not within the run's propellant budget (only in a reachable-set run, which
   * stops a target's search as soon as the convex lower bound on its cost exceeds the budget):
   * `propellant_kg` then holds the cost of the best trajectory found, an upper bound on the minimum, so
   * the budget contour drawn through such targets errs on the small (safe) side.
   */
  overBudget: 4,
  /**
   * The convex relaxation is not lossless at this target and the best flyable trajectory found costs more
   * than the search's tolerance above the certified lower bound (or none was found): `propellant_kg` holds
   * the flyable trajectory's cost (an upper bound; NaN when none), so contours through such targets err on
   * the small (safe) side. Never merged with `reachable`: footprints, exports and the app show it apart.
   */
  relaxationGap: 5,
  /**
   * Forbidden throttle bands only (core/descent/band.ts): the relaxation that ignores the band does not
   * exclude the target (its certified lower bound is within the budget, or no budget was set), but no
   * band-respecting trajectory was found within it. Neither reachable nor unreachable is proven:
   * `propellant_kg` holds the band-respecting cost when one was found above the budget, NaN otherwise. Never
   * merged with `reachable`; contours do not count it as reached.
   */
  undecided: 6,
} as const;
export type TargetCode = (typeof TARGET)[keyof typeof TARGET];

/**
 * Whether the target's `propellant_kg` is the cost of a flyable trajectory found (exact for reachable
 * targets, an upper bound for over-budget and relaxation-gap ones).
 */
export function hasFlyableCost(field: { status: Uint8Array; propellant_kg: Float32Array | Float64Array }, k: number): boolean {
  const st = field.status[k];
  return (st === TARGET.reachable || st === TARGET.overBudget || st === TARGET.relaxationGap) && Number.isFinite(field.propellant_kg[k]);
}

/** The outcome of one target, as the footprint engine needs it from the descent search. */
export interface TargetOutcome {
  code: TargetCode;
  /** Minimum propellant, kg (NaN when unreachable or failed; an upper bound when over budget). */
  propellant_kg: number;
  /** Optimal time of flight, s; for unreachable targets that of the closest-approach trajectory; NaN when failed. */
  timeOfFlight_s: number;
  /** Largest thrust tilt from vertical along the optimal trajectory, degrees. */
  peakTilt_deg: number;
  /** Horizontal miss of the closest reachable landing point, m (0 when reachable). */
  miss_m: number;
  /** Cone-program solves spent on this target. */
  solves: number;
  /** Dense re-simulation between nodes (core/descent/verify.ts): BETWEEN_NODES.* (optional: not checked). */
  betweenNodes?: number;
}

/** Codes stored in `betweenNodes`: whether the target's trajectory meets every constraint between its nodes too. */
export const BETWEEN_NODES = {
  /** Not checked (no flyable trajectory, or not computed). */
  unchecked: 0,
  /** Every constraint met between the nodes within VERIFY_TOLERANCES. */
  met: 1,
  /** At least one constraint missed between the nodes beyond its tolerance. */
  missed: 2,
} as const;

export interface FootprintField {
  readonly nx: number;
  readonly ny: number;
  readonly east: Float64Array;
  readonly north: Float64Array;
  readonly status: Uint8Array;
  readonly propellant_kg: Float32Array;
  readonly timeOfFlight_s: Float32Array;
  readonly peakTilt_deg: Float32Array;
  readonly miss_m: Float32Array;
  readonly solves: Uint16Array;
  /** BETWEEN_NODES.* per target. */
  readonly betweenNodes: Uint8Array;
}

export function emptyField(grid: TargetGrid): FootprintField {
  const n = grid.nx * grid.ny;
  return {
    nx: grid.nx,
    ny: grid.ny,
    east: grid.east.slice(),
    north: grid.north.slice(),
    status: new Uint8Array(n),
    propellant_kg: new Float32Array(n).fill(NaN),
    timeOfFlight_s: new Float32Array(n).fill(NaN),
    peakTilt_deg: new Float32Array(n).fill(NaN),
    miss_m: new Float32Array(n).fill(NaN),
    solves: new Uint16Array(n),
    betweenNodes: new Uint8Array(n),
  };
}

/** One finished row, as sent between threads (its buffers are transferable). */
export interface FieldRow {
  row: number;
  status: Uint8Array;
  propellant_kg: Float32Array;
  timeOfFlight_s: Float32Array;
  peakTilt_deg: Float32Array;
  miss_m: Float32Array;
  solves: Uint16Array;
  betweenNodes: Uint8Array;
}

export function emptyRow(row: number, nx: number): FieldRow {
  return {
    row,
    status: new Uint8Array(nx),
    propellant_kg: new Float32Array(nx).fill(NaN),
    timeOfFlight_s: new Float32Array(nx).fill(NaN),
    peakTilt_deg: new Float32Array(nx).fill(NaN),
    miss_m: new Float32Array(nx).fill(NaN),
    solves: new Uint16Array(nx),
    betweenNodes: new Uint8Array(nx),
  };
}

export function setOutcome(row: FieldRow, col: number, o: TargetOutcome): void {
  row.status[col] = o.code;
  row.propellant_kg[col] = o.propellant_kg;
  row.timeOfFlight_s[col] = o.timeOfFlight_s;
  row.peakTilt_deg[col] = o.peakTilt_deg;
  row.miss_m[col] = o.miss_m;
  row.solves[col] = Math.min(65535, o.solves);
  row.betweenNodes[col] = o.betweenNodes ?? BETWEEN_NODES.unchecked;
}

export function writeRow(field: FootprintField, r: FieldRow): void {
  const o = r.row * field.nx;
  field.status.set(r.status, o);
  field.propellant_kg.set(r.propellant_kg, o);
  field.timeOfFlight_s.set(r.timeOfFlight_s, o);
  field.peakTilt_deg.set(r.peakTilt_deg, o);
  field.miss_m.set(r.miss_m, o);
  field.solves.set(r.solves, o);
  field.betweenNodes.set(r.betweenNodes, o);
}

export function rowBuffers(r: FieldRow): ArrayBuffer[] {
  return [r.status, r.propellant_kg, r.timeOfFlight_s, r.peakTilt_deg, r.miss_m, r.solves, r.betweenNodes].map((a) => a.buffer as ArrayBuffer);
}

export function countByStatus(field: FootprintField): Record<keyof typeof TARGET, number> {
  const out = { pending: 0, reachable: 0, unreachable: 0, failed: 0, overBudget: 0, relaxationGap: 0, undecided: 0 };
  const names = Object.keys(TARGET) as (keyof typeof TARGET)[];
  for (const code of field.status) out[names[code]]++;
  return out;
}

/**
 * The optimal time of flight at the computed target nearest to (east, north) — of its closest approach
 * if unreachable — when that target lies within one grid spacing; else undefined. A start for a
 * neighbouring target's own search (a picked point, say).
 */
export function timeOfFlightNear(field: FootprintField, east_m: number, north_m: number): number | undefined {
  const { nx, ny } = field;
  const nearest = (a: Float64Array, v: number) => {
    let best = 0;
    for (let i = 1; i < a.length; i++) if (Math.abs(a[i] - v) < Math.abs(a[best] - v)) best = i;
    return best;
  };
  const i = nearest(field.east, east_m);
  const j = nearest(field.north, north_m);
  const dx = nx > 1 ? Math.abs(field.east[1] - field.east[0]) : Infinity;
  const dy = ny > 1 ? Math.abs(field.north[1] - field.north[0]) : Infinity;
  if (Math.abs(field.east[i] - east_m) > dx || Math.abs(field.north[j] - north_m) > dy) return undefined;
  const tf = field.timeOfFlight_s[j * nx + i];
  return Number.isFinite(tf) && tf > 0 ? tf : undefined;
}
