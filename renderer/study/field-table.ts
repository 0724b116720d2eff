/**
 * The study's numeric input fields as the workspace shows them: group, label, unit, range, default.
 *
 * Field ids are dotted paths into a core/study document (core/study/schema.ts), with array indices for
 * vectors (`ignition.position_m.2` is the altitude); units are in the names. The ranges here are for
 * typing; the document is validated by core/study's zod schema before anything is computed or saved.
 *
 * Defaults describe an INVENTED demo lander at an INVENTED site; they are round illustrative
 * numbers, not any real vehicle's.
 */

export type GroupId = 'planet' | 'vehicle' | 'ignition' | 'constraints' | 'reserve' | 'discretisation';

export interface GroupSpec {
  id: GroupId;
  title: string;
  /** One line saying what the group is for. */
  summary: string;
}

export interface FieldSpec {
  /** Dotted path into the core/study document, e.g. "vehicle.isp_s" or "ignition.position_m.2". */
  id: string;
  group: GroupId;
  label: string;
  /** Unit as shown beside the field ("" for dimensionless). */
  unit: string;
  /** Smallest accepted value (inclusive unless minExclusive). */
  min: number;
  /** Largest accepted value (inclusive). */
  max: number;
  minExclusive?: boolean;
  /** Largest value excluded (the range is [min, maxExclusive)). */
  maxExclusive?: boolean;
  /** Whole numbers only. */
  integer?: boolean;
  /** The study stores null for this value: 0 in the field means "no limit". */
  zeroMeansNone?: boolean;
  /** Arrow-key step of the input. */
  step: number;
  /** Value of the invented demo study (assets/demo/demo-lander.study.json). */
  defaultValue: number;
  /** Tooltip: what the number means. */
  help: string;
}

export const GROUPS: readonly GroupSpec[] = [
  { id: 'planet', title: 'Planet and site', summary: 'Uniform gravity field and latitude of the landing site.' },
  { id: 'vehicle', title: 'Vehicle', summary: 'Mass, engines and thrust-pointing limits.' },
  { id: 'ignition', title: 'Ignition state', summary: 'Where and how fast the vehicle is when the engines light, relative to the nominal target.' },
  { id: 'constraints', title: 'Constraints', summary: 'Path limits the descent must respect.' },
  { id: 'reserve', title: 'Propellant reserve', summary: 'Propellant that must remain after touchdown.' },
  { id: 'discretisation', title: 'Discretisation', summary: 'Time nodes of the convex descent problem for single trajectories.' },
];

/**
 * The first forbidden throttle band (core/study `vehicle.throttleBands[0]`) as two numeric fields: these two ids
 * are not paths of the document; the study model turns them into the band list (renderer/study/study-model.ts).
 */
export const BAND_LOW_FIELD = 'vehicle.throttleBandLow';
export const BAND_HIGH_FIELD = 'vehicle.throttleBandHigh';

/** The numeric inputs of a core/study document (core/study/schema.ts), with the demo study's values. */
export const FIELDS: readonly FieldSpec[] = [
  { id: 'planet.gravity_mps2', group: 'planet', label: 'Surface gravity', unit: 'm/s²', min: 0.01, max: 30, step: 0.01, defaultValue: 3.71, help: 'Magnitude of gravitational acceleration, assumed uniform over the descent.' },
  { id: 'site.latitude_deg', group: 'planet', label: 'Site latitude', unit: '°', min: -90, max: 90, step: 0.1, defaultValue: 18.4, help: 'Latitude of the landing site (sets the direction of the planet rotation vector).' },

  { id: 'vehicle.wetMass_kg', group: 'vehicle', label: 'Mass at ignition', unit: 'kg', min: 1, max: 1e6, step: 10, defaultValue: 2100, help: 'Total vehicle mass when the descent engines light.' },
  { id: 'vehicle.dryMass_kg', group: 'vehicle', label: 'Dry mass', unit: 'kg', min: 1, max: 1e6, step: 10, defaultValue: 1600, help: 'Mass with no usable propellant left.' },
  { id: 'vehicle.isp_s', group: 'vehicle', label: 'Specific impulse', unit: 's', min: 50, max: 500, step: 1, defaultValue: 230, help: 'Vacuum specific impulse of the descent engines.' },
  { id: 'vehicle.engineCount', group: 'vehicle', label: 'Engines', unit: '', min: 1, max: 64, integer: true, step: 1, defaultValue: 6, help: 'Number of identical descent engines.' },
  { id: 'vehicle.thrustPerEngine_N', group: 'vehicle', label: 'Thrust per engine', unit: 'N', min: 1, max: 1e7, step: 100, defaultValue: 3300, help: 'Thrust of one engine at 100 % throttle.' },
  { id: 'vehicle.cantAngle_deg', group: 'vehicle', label: 'Engine cant angle', unit: '°', min: 0, max: 80, maxExclusive: true, step: 1, defaultValue: 20, help: 'Outward tilt of each engine from the thrust axis; the net thrust is n · T · cos(cant).' },
  { id: 'vehicle.throttleMin', group: 'vehicle', label: 'Minimum throttle', unit: '', min: 0, max: 1, step: 0.01, defaultValue: 0.25, help: 'Lowest thrust fraction once lit (the engines cannot be shut down mid-descent).' },
  { id: 'vehicle.throttleMax', group: 'vehicle', label: 'Maximum throttle', unit: '', min: 0, max: 1, minExclusive: true, step: 0.01, defaultValue: 0.85, help: 'Highest thrust fraction allowed for the planned descent (keeps a margin).' },
  { id: BAND_LOW_FIELD, group: 'vehicle', label: 'Forbidden throttle from', unit: '', min: 0, max: 1, zeroMeansNone: true, step: 0.01, defaultValue: 0, help: 'Lower edge of a throttle band the engine cannot run in (0 in both band fields: no band). Further bands in the study file are kept.' },
  { id: BAND_HIGH_FIELD, group: 'vehicle', label: 'Forbidden throttle to', unit: '', min: 0, max: 1, zeroMeansNone: true, step: 0.01, defaultValue: 0, help: 'Upper edge of the forbidden throttle band (0 in both band fields: no band).' },
  { id: 'vehicle.throttleRate_perS', group: 'vehicle', label: 'Throttle rate limit', unit: '/s', min: 0, max: 100, zeroMeansNone: true, step: 0.05, defaultValue: 0, help: 'Largest change of throttle per second, as a fraction of full thrust (0: no limit). Forbidden throttle bands are read from the study file and kept.' },
  { id: 'vehicle.pointingLimit_deg', group: 'vehicle', label: 'Thrust tilt limit', unit: '°', min: 0, max: 180, minExclusive: true, step: 1, defaultValue: 75, help: 'Largest angle between the thrust vector and the local vertical (180: free).' },

  { id: 'ignition.position_m.2', group: 'ignition', label: 'Altitude', unit: 'm', min: 1, max: 1e5, step: 10, defaultValue: 1800, help: 'Height above the nominal target at ignition.' },
  { id: 'ignition.position_m.0', group: 'ignition', label: 'East offset', unit: 'm', min: -1e5, max: 1e5, step: 10, defaultValue: -2500, help: 'East position relative to the nominal target.' },
  { id: 'ignition.position_m.1', group: 'ignition', label: 'North offset', unit: 'm', min: -1e5, max: 1e5, step: 10, defaultValue: 400, help: 'North position relative to the nominal target.' },
  { id: 'ignition.velocity_mps.0', group: 'ignition', label: 'East velocity', unit: 'm/s', min: -3000, max: 3000, step: 1, defaultValue: 90, help: 'Eastward velocity component.' },
  { id: 'ignition.velocity_mps.1', group: 'ignition', label: 'North velocity', unit: 'm/s', min: -3000, max: 3000, step: 1, defaultValue: -10, help: 'Northward velocity component.' },
  { id: 'ignition.velocity_mps.2', group: 'ignition', label: 'Vertical velocity', unit: 'm/s', min: -3000, max: 3000, step: 1, defaultValue: -70, help: 'Upward velocity component (negative while descending).' },

  { id: 'constraints.glideSlope_deg', group: 'constraints', label: 'Glide-slope angle', unit: '°', min: 0, max: 90, maxExclusive: true, zeroMeansNone: true, step: 1, defaultValue: 5, help: 'The vehicle stays above a cone of this elevation angle around the target (0: no glide slope).' },
  { id: 'constraints.maxSpeed_mps', group: 'constraints', label: 'Speed limit', unit: 'm/s', min: 0, max: 5000, zeroMeansNone: true, step: 1, defaultValue: 130, help: 'Largest speed allowed along the descent (0: no limit).' },
  { id: 'constraints.gateHeight_m', group: 'constraints', label: 'Gate height', unit: 'm', min: 0, max: 1e4, step: 1, defaultValue: 20, help: 'Powered descent ends this high above the target; a final vertical segment follows.' },
  { id: 'constraints.gateDescentRate_mps', group: 'constraints', label: 'Gate descent rate', unit: 'm/s', min: 0, max: 100, step: 0.1, defaultValue: 1, help: 'Downward speed at the gate.' },

  { id: 'vehicle.propellantReserve_kg', group: 'reserve', label: 'Reserve at touchdown', unit: 'kg', min: 0, max: 1e6, step: 5, defaultValue: 150, help: 'Targets that need more than (propellant on board − reserve) are outside the footprint.' },

  { id: 'discretisation.nodes', group: 'discretisation', label: 'Time nodes', unit: '', min: 5, max: 2000, integer: true, step: 1, defaultValue: 50, help: 'Nodes of picked-target trajectories (footprint targets use a fixed coarser count).' },
];

/**
 * Presets: whole sets of inputs for INVENTED vehicles at INVENTED sites (illustrative round numbers,
 * no real vehicle). Each lists only the values that differ from the field defaults.
 */
export interface Preset {
  id: string;
  label: string;
  values: Record<string, number>;
}

export const PRESETS: readonly Preset[] = [
  { id: 'demo-lander', label: 'Invented demo lander (defaults)', values: {} },
  {
    id: 'heavy-lander',
    label: 'Invented heavy cargo lander',
    values: {
      'vehicle.wetMass_kg': 9500,
      'vehicle.dryMass_kg': 6800,
      'vehicle.isp_s': 320,
      'vehicle.engineCount': 4,
      'vehicle.thrustPerEngine_N': 15000,
      'vehicle.cantAngle_deg': 10,
      'vehicle.throttleMin': 0.2,
      'vehicle.throttleMax': 0.9,
      'ignition.position_m.2': 3200,
      'ignition.velocity_mps.0': 90,
      'ignition.velocity_mps.2': -70,
      'constraints.maxSpeed_mps': 160,
      'vehicle.propellantReserve_kg': 250,
    },
  },
  {
    id: 'hopper',
    label: 'Invented small hopper, low-gravity body',
    values: {
      'planet.gravity_mps2': 1.62,
      'vehicle.wetMass_kg': 600,
      'vehicle.dryMass_kg': 420,
      'vehicle.isp_s': 210,
      'vehicle.engineCount': 1,
      'vehicle.thrustPerEngine_N': 2400,
      'vehicle.cantAngle_deg': 0,
      'ignition.position_m.2': 600,
      'ignition.position_m.0': -300,
      'ignition.position_m.1': 0,
      'ignition.velocity_mps.0': 20,
      'ignition.velocity_mps.1': 0,
      'ignition.velocity_mps.2': -10,
      'constraints.maxSpeed_mps': 40,
      'vehicle.propellantReserve_kg': 20,
    },
  },
];
