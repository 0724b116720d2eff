/**
 * The study file, format version 2 (version 1 files are migrated on reading, load.ts): the one definition (zod) from which validation, defaults, types
 * and the committed JSON Schema (study.schema.json) all come.
 *
 * Units are in the field names (SI; angles in degrees at this boundary). Frame: x east, y north,
 * z up, origin at the nominal target on the surface.
 */
import { z } from 'zod';

export const STUDY_FORMAT = 'landreach-study';
export const STUDY_VERSION = 2;
/** Fields that version 2 added (all optional): a version-1 file carrying one is refused, naming the fix. */
export const VERSION_2_VEHICLE_FIELDS = ['throttleBands', 'throttleRate_perS'] as const;

const num = (unit: string) => z.number({ error: `must be a finite number (${unit})` }).describe(unit);
const finite = (unit: string) => num(unit);
const positive = (unit: string) => num(unit).gt(0, { error: `must be positive (${unit})` });
const nonNegative = (unit: string) => num(unit).min(0, { error: `must be zero or positive (${unit})` });
const vec3 = (unit: string) => z.tuple([num(unit), num(unit), num(unit)], { error: `must be three numbers [x, y, z] (${unit})` }).describe(`[x east, y north, z up], ${unit}`);
const fraction = (what: string) => num(what).min(0, { error: `must be between 0 and 1 (${what})` }).max(1, { error: `must be between 0 and 1 (${what})` });

export const PlanetSchema = z
  .strictObject({
    /** Preset body or "custom". */
    body: z.enum(['mars', 'moon', 'custom'], { error: 'must be "mars", "moon" or "custom"' }),
    /** Surface gravity, m/s²; required for "custom", overrides the preset otherwise. */
    gravity_mps2: positive('m/s²').optional(),
    /** Sidereal rotation period, hours; null for a non-rotating model. Default: the preset's. */
    siderealPeriod_h: positive('hours').nullable().optional(),
  })
  .superRefine((p, ctx) => {
    if (p.body === 'custom' && p.gravity_mps2 === undefined) {
      ctx.addIssue({ code: 'custom', path: ['gravity_mps2'], message: 'is required when body is "custom" (surface gravity in m/s²)', input: p.gravity_mps2 });
    }
    if (p.body === 'custom' && p.siderealPeriod_h === undefined) {
      ctx.addIssue({ code: 'custom', path: ['siderealPeriod_h'], message: 'is required when body is "custom" (hours, or null for no rotation)', input: p.siderealPeriod_h });
    }
  });

export const SiteSchema = z.strictObject({
  name: z.string().min(1, { error: 'must be a non-empty name' }),
  /** Latitude of the site, degrees north; sets the direction of the planet's rotation vector. */
  latitude_deg: num('degrees north').min(-90, { error: 'must be between −90 and 90 degrees' }).max(90, { error: 'must be between −90 and 90 degrees' }),
  /** Marks demo data as invented. */
  invented: z.boolean().default(false),
});

export const VehicleSchema = z
  .strictObject({
    name: z.string().min(1, { error: 'must be a non-empty name' }),
    invented: z.boolean().default(false),
    wetMass_kg: positive('kg'),
    dryMass_kg: positive('kg'),
    /** Propellant that must remain at landing, kg (added to the dry mass). Default 0. */
    propellantReserve_kg: nonNegative('kg').default(0),
    isp_s: positive('seconds'),
    engineCount: z.number().int({ error: 'must be a whole number' }).min(1, { error: 'must be at least 1' }),
    thrustPerEngine_N: positive('newtons'),
    cantAngle_deg: num('degrees').min(0, { error: 'must be in [0, 80) degrees' }).lt(80, { error: 'must be in [0, 80) degrees' }).default(0),
    throttleMin: fraction('fraction of full thrust'),
    throttleMax: fraction('fraction of full thrust'),
    /** Largest thrust tilt from vertical, degrees; 180 leaves it free. */
    pointingLimit_deg: num('degrees from vertical').gt(0, { error: 'must be in (0, 180] degrees' }).max(180, { error: 'must be in (0, 180] degrees' }).default(180),
    /**
     * (Version 2.) Forbidden throttle bands: open intervals [lo, hi] of thrust fraction in which the engine
     * cannot run stably, each inside [throttleMin, throttleMax], in increasing order and not overlapping.
     * Default none.
     */
    throttleBands: z.array(
      z.tuple([fraction('fraction of full thrust'), fraction('fraction of full thrust')], { error: 'must be a pair [lo, hi] of thrust fractions' }),
      { error: 'must be a list of [lo, hi] pairs, e.g. [[0.4, 0.6]]' },
    ).max(8, { error: 'must have at most 8 bands' }).default([]),
    /** (Version 2.) Largest throttle rate |dρ/dt|, fraction of full thrust per second; null: unlimited. */
    throttleRate_perS: positive('fraction of full thrust per second').nullable().default(null),
  })
  .superRefine((v, ctx) => {
    if (v.dryMass_kg + v.propellantReserve_kg >= v.wetMass_kg) {
      ctx.addIssue({
        code: 'custom', path: ['dryMass_kg'], input: v.dryMass_kg,
        message: `plus propellantReserve_kg (${v.propellantReserve_kg}) must be below wetMass_kg (${v.wetMass_kg}); lower the dry mass or the reserve, or raise the wet mass`,
      });
    }
    if (v.throttleMin >= v.throttleMax) {
      ctx.addIssue({ code: 'custom', path: ['throttleMin'], input: v.throttleMin, message: `must be below throttleMax (${v.throttleMax})` });
    }
    const bands = v.throttleBands;
    for (let i = 0; i < bands.length; i++) {
      const [lo, hi] = bands[i];
      const path = ['throttleBands', i];
      if (!(lo < hi)) {
        ctx.addIssue({ code: 'custom', path, input: bands[i], message: `lo ${lo} must be below hi ${hi}: write the band as [lower fraction, upper fraction]` });
      } else if (lo <= v.throttleMin || hi >= v.throttleMax) {
        ctx.addIssue({
          code: 'custom', path, input: bands[i],
          message: `must lie strictly inside [throttleMin ${v.throttleMin}, throttleMax ${v.throttleMax}]: a band reaching a limit only moves that limit; change throttleMin/throttleMax instead`,
        });
      } else if (i > 0 && lo <= bands[i - 1][1]) {
        ctx.addIssue({
          code: 'custom', path, input: bands[i],
          message: `must start above the previous band's hi ${bands[i - 1][1]}: list bands in increasing order and merge overlapping or touching ones`,
        });
      }
    }
  });

export const IgnitionSchema = z.strictObject({
  /** Position at ignition relative to the nominal target, m. */
  position_m: vec3('metres'),
  velocity_mps: vec3('m/s'),
  /** Mass at ignition, kg; default the vehicle's wet mass. */
  mass_kg: positive('kg').optional(),
});

export const ConstraintsSchema = z.strictObject({
  /** Glide-slope angle above the horizontal at the landing point, degrees; null: none. */
  glideSlope_deg: num('degrees above horizontal').gt(0, { error: 'must be between 0 and 90 degrees (or null for none)' }).lt(90, { error: 'must be between 0 and 90 degrees (or null for none)' }).nullable().default(null),
  maxSpeed_mps: positive('m/s').nullable().default(null),
  /** End of powered descent this high above the target (a final vertical segment follows), m. */
  gateHeight_m: nonNegative('metres').default(0),
  /** Downward speed at the gate, m/s. */
  gateDescentRate_mps: nonNegative('m/s').default(0),
  /**
   * Keep every node between ignition and the gate at or above the landing plane (altitude ≥ 0 relative to the
   * target). On by default: a trajectory through the ground is not an answer. Switch it off only knowingly
   * (e.g. to compare with a published case that has no such constraint).
   */
  stayAboveLandingPlane: z.boolean({ error: 'must be true or false' }).default(true),
  /** Lowest altitude above the target while descending, m; null: none beyond the landing plane. */
  minAltitude_m: finite('metres').nullable().default(null),
});

/**
 * The altitude floor above the target the descent keeps, m, or null for none: the landing plane (0) unless
 * switched off, raised by minAltitude_m. The one rule for every command and the app.
 */
export function altitudeFloor_m(c: { stayAboveLandingPlane: boolean; minAltitude_m: number | null }): number | null {
  if (!c.stayAboveLandingPlane) return c.minAltitude_m;
  return Math.max(0, c.minAltitude_m ?? 0);
}

export const DiscretisationSchema = z.strictObject({
  /** Time nodes including ignition and gate. Default 50 (see DEVELOPERS.md, convergence study). */
  nodes: z.number().int({ error: 'must be a whole number' }).min(5, { error: 'must be at least 5' }).max(2000, { error: 'must be at most 2000' }).default(50),
  hold: z.enum(['foh', 'zoh'], { error: 'must be "foh" (piecewise-linear thrust) or "zoh" (piecewise-constant)' }).default('foh'),
});

export const TargetSchema = z.strictObject({
  x_m: finite('metres east of the nominal target'),
  y_m: finite('metres north of the nominal target'),
  /** Height of the target above the nominal target, m. Default 0. */
  z_m: finite('metres').default(0),
});

export const StudySchema = z
  .strictObject({
  format: z.literal(STUDY_FORMAT, { error: `must be "${STUDY_FORMAT}"` }),
  version: z.literal(STUDY_VERSION, { error: `must be ${STUDY_VERSION} (this program reads study format version ${STUDY_VERSION})` }),
  name: z.string().min(1, { error: 'must be a non-empty name' }),
  description: z.string().default(''),
  planet: PlanetSchema,
  site: SiteSchema,
  vehicle: VehicleSchema,
  ignition: IgnitionSchema,
  constraints: ConstraintsSchema.prefault({}),
  discretisation: DiscretisationSchema.prefault({}),
  /** Default target for single-trajectory runs; the nominal target (0, 0, 0) if absent. */
  target: TargetSchema.prefault({ x_m: 0, y_m: 0 }),
  })
  .superRefine((s, ctx) => {
    // (An ignition point below the floor is the descent model's check, setup.ts validateAltitudeFloor.)
    if (s.constraints.stayAboveLandingPlane && s.constraints.minAltitude_m !== null && s.constraints.minAltitude_m < 0) {
      ctx.addIssue({
        code: 'custom', path: ['constraints', 'minAltitude_m'], input: s.constraints.minAltitude_m,
        message: 'must be zero or positive while constraints.stayAboveLandingPlane is true (set it to false to allow a floor below the landing plane)',
      });
    }
    const m = s.ignition.mass_kg;
    const v = s.vehicle;
    if (m !== undefined && (m > v.wetMass_kg || m <= v.dryMass_kg + v.propellantReserve_kg)) {
      ctx.addIssue({
        code: 'custom', path: ['ignition', 'mass_kg'], input: m,
        message: `must be at most vehicle.wetMass_kg (${v.wetMass_kg}) and above dry mass plus reserve (${v.dryMass_kg + v.propellantReserve_kg}); leave it out to start with the wet mass`,
      });
    }
  });

export type Study = z.output<typeof StudySchema>;
export type StudyInput = z.input<typeof StudySchema>;
