/**
 * Trade studies built on footprints.
 * - Reserve study: one footprint computed against the dry mass serves every reserve, since "reachable with
 *   reserve R" is the region {propellant ≤ usable − R}.
 * - Ignition-altitude study: a footprint per ignition altitude (the ignition state from a user rule), the
 *   guaranteed divert radius at the required reserve, and the lowest altitude meeting a required radius.
 */
import type { Vec3 } from '../descent/constants.ts';
import { guaranteedDivertRadius, propellantRegions, regionBounds } from './contours.ts';
import type { FootprintField } from './field.ts';

export interface ReserveStudyRow {
  reserve_kg: number;
  budget_kg: number;
  /** Area of {propellant ≤ budget}, m². */
  area_m2: number;
  /** Guaranteed divert radius around the nominal target, m. */
  divertRadius_m: number;
  /** The radius is limited by the grid's extent, not by reach (widen the grid). */
  limitedByGrid: boolean;
}

export function reserveStudy(field: FootprintField, usable_kg: number, reserves_kg: readonly number[]): ReserveStudyRow[] {
  for (const r of reserves_kg) {
    if (!(r >= 0) || r >= usable_kg) throw new RangeError(`reserve ${r} kg: must be from 0 up to below the usable propellant, ${usable_kg} kg`);
  }
  const bounds = regionBounds(field);
  return [...reserves_kg].sort((a, b) => a - b).map((reserve_kg) => {
    const budget_kg = usable_kg - reserve_kg;
    const [region] = propellantRegions(field, [budget_kg]);
    const radius = guaranteedDivertRadius(region.geometry, 0, 0, bounds);
    return { reserve_kg, budget_kg, area_m2: region.area_m2, divertRadius_m: radius.radius_m, limitedByGrid: radius.limitedByGrid };
  });
}

/** How the ignition velocity (and the horizontal offset) follow the ignition altitude. */
export type IgnitionRule =
  /** The same position offset east/north and velocity at every altitude. */
  | { kind: 'fixed-velocity' }
  /**
   * On the approach line through the nominal ignition point: the position slides along the velocity's
   * direction (constant flight-path angle), the velocity is kept.
   */
  | { kind: 'fixed-flight-path-angle' }
  /** Velocity by altitude, linearly interpolated (altitudes ascending), position offset kept. */
  | { kind: 'table'; altitudes_m: number[]; velocities_mps: Vec3[] };

/** The ignition position and velocity at altitude h from the nominal ones and a rule. */
export function ignitionAtAltitude(position: Vec3, velocity: Vec3, altitude_m: number, rule: IgnitionRule): { position: Vec3; velocity: Vec3 } {
  if (!(altitude_m > 0)) throw new RangeError(`ignition altitude ${altitude_m} m: must be above the target`);
  switch (rule.kind) {
    case 'fixed-velocity':
      return { position: [position[0], position[1], altitude_m], velocity: [...velocity] as Vec3 };
    case 'fixed-flight-path-angle': {
      if (!(velocity[2] < 0)) throw new RangeError('fixed-flight-path-angle: the ignition velocity must be descending (negative vertical speed)');
      // Move along v from the nominal point until the altitude is h: p + s·v with p_z + s v_z = h.
      const s = (altitude_m - position[2]) / velocity[2];
      return { position: [position[0] + s * velocity[0], position[1] + s * velocity[1], altitude_m], velocity: [...velocity] as Vec3 };
    }
    case 'table': {
      const { altitudes_m: hs, velocities_mps: vs } = rule;
      if (hs.length < 1 || hs.length !== vs.length) throw new RangeError('table: give as many velocities as altitudes (at least one)');
      for (let i = 1; i < hs.length; i++) if (!(hs[i] > hs[i - 1])) throw new RangeError('table: altitudes must increase');
      if (altitude_m <= hs[0]) return { position: [position[0], position[1], altitude_m], velocity: [...vs[0]] as Vec3 };
      if (altitude_m >= hs[hs.length - 1]) return { position: [position[0], position[1], altitude_m], velocity: [...vs[vs.length - 1]] as Vec3 };
      let i = 1;
      while (hs[i] < altitude_m) i++;
      const f = (altitude_m - hs[i - 1]) / (hs[i] - hs[i - 1]);
      const lerp = (c: number) => vs[i - 1][c] + f * (vs[i][c] - vs[i - 1][c]);
      const v: Vec3 = [lerp(0), lerp(1), lerp(2)];
      return { position: [position[0], position[1], altitude_m], velocity: v };
    }
  }
}

export interface AltitudeStudyRow {
  altitude_m: number;
  divertRadius_m: number;
  limitedByGrid: boolean;
  /** Propellant to the nominal target (nearest grid target to the origin), kg; NaN if unreachable. */
  nominalPropellant_kg: number;
  area_m2: number;
  /**
   * Reach-boundary rows only: directions whose reach comes from a relaxation that was not lossless (an
   * optimistic reach, flagged rather than silently used). Absent for footprint-field rows.
   */
  lossyDirections?: number;
}

/**
 * The lowest altitude whose guaranteed divert radius meets `requiredRadius_m`, by linear interpolation
 * between the first sampled altitude that meets it and the one below (null if none meets it; the lowest
 * sampled altitude if all do — then the answer is "at most" that).
 */
export function minimumAltitude(rows: readonly AltitudeStudyRow[], requiredRadius_m: number): { altitude_m: number; bracketed: boolean } | null {
  const sorted = [...rows].sort((a, b) => a.altitude_m - b.altitude_m);
  const k = sorted.findIndex((r) => r.divertRadius_m >= requiredRadius_m);
  if (k < 0) return null;
  if (k === 0) return { altitude_m: sorted[0].altitude_m, bracketed: false };
  const a = sorted[k - 1];
  const b = sorted[k];
  const f = (requiredRadius_m - a.divertRadius_m) / (b.divertRadius_m - a.divertRadius_m);
  return { altitude_m: a.altitude_m + f * (b.altitude_m - a.altitude_m), bracketed: true };
}
