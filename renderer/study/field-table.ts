/**
 * The study's input fields as the workspace shows them: group, label, unit, range, default.
 *
 * This table is a stand-in until core/study's schema lands; the workspace never reads it directly,
 * only through the StudyModel interface (study-model.ts), so swapping it for the schema touches one
 * file. Field ids are dotted paths into the study document (`vehicle.isp_s`), units are in the names.
 *
 * Defaults describe an INVENTED demo lander at an INVENTED site; they are round illustrative
 * numbers, not any real vehicle's.
 */

export type GroupId = 'planet' | 'vehicle' | 'ignition' | 'constraints' | 'reserve' | 'grid' | 'terrain';

export interface GroupSpec {
  id: GroupId;
  title: string;
  /** One line saying what the group is for. */
  summary: string;
}

export interface FieldSpec {
  /** Dotted path into the study document, e.g. "vehicle.thrustMax_N". */
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
  /** Whole numbers only. */
  integer?: boolean;
  /** Arrow-key step of the input. */
  step: number;
  /** Value of the invented demo study. */
  defaultValue: number;
  /** Tooltip: what the number means. */
  help: string;
}

export const GROUPS: readonly GroupSpec[] = [
  { id: 'planet', title: 'Planet', summary: 'Uniform gravity field at the landing site.' },
  { id: 'vehicle', title: 'Vehicle', summary: 'Mass, engine and thrust-pointing limits.' },
  { id: 'ignition', title: 'Ignition state', summary: 'Where and how fast the vehicle is when the engine lights, relative to the nominal target.' },
  { id: 'constraints', title: 'Constraints', summary: 'Path limits the descent must respect.' },
  { id: 'reserve', title: 'Propellant reserve', summary: 'Propellant that must remain after touchdown.' },
  { id: 'grid', title: 'Target grid', summary: 'Extent and resolution of the footprint computation.' },
  { id: 'terrain', title: 'Terrain', summary: 'Hazard thresholds applied to the elevation model.' },
];

export const FIELDS: readonly FieldSpec[] = [
  { id: 'planet.surfaceGravity_mps2', group: 'planet', label: 'Surface gravity', unit: 'm/s²', min: 0.01, max: 30, step: 0.01, defaultValue: 3.71, help: 'Magnitude of gravitational acceleration, assumed uniform over the descent.' },

  { id: 'vehicle.wetMass_kg', group: 'vehicle', label: 'Mass at ignition', unit: 'kg', min: 1, max: 1e6, step: 10, defaultValue: 2400, help: 'Total vehicle mass when the descent engine lights.' },
  { id: 'vehicle.dryMass_kg', group: 'vehicle', label: 'Dry mass', unit: 'kg', min: 1, max: 1e6, step: 10, defaultValue: 1700, help: 'Mass with no usable propellant left.' },
  { id: 'vehicle.isp_s', group: 'vehicle', label: 'Specific impulse', unit: 's', min: 50, max: 500, step: 1, defaultValue: 228, help: 'Vacuum specific impulse of the descent engine(s).' },
  { id: 'vehicle.thrustMax_N', group: 'vehicle', label: 'Maximum thrust', unit: 'N', min: 1, max: 1e7, step: 100, defaultValue: 18000, help: 'Total thrust at 100 % throttle.' },
  { id: 'vehicle.throttleMin', group: 'vehicle', label: 'Minimum throttle', unit: '', min: 0, max: 1, step: 0.01, defaultValue: 0.3, help: 'Lowest thrust fraction once lit (the engine cannot be shut down mid-descent).' },
  { id: 'vehicle.throttleMax', group: 'vehicle', label: 'Maximum throttle', unit: '', min: 0, max: 1, minExclusive: true, step: 0.01, defaultValue: 0.8, help: 'Highest thrust fraction allowed for the planned descent (keeps a margin).' },
  { id: 'vehicle.pointingLimit_deg', group: 'vehicle', label: 'Thrust tilt limit', unit: '°', min: 0, max: 180, step: 1, defaultValue: 45, help: 'Largest angle between the thrust vector and the local vertical.' },

  { id: 'ignition.altitude_m', group: 'ignition', label: 'Altitude', unit: 'm', min: 1, max: 1e5, step: 10, defaultValue: 1800, help: 'Height above the nominal target at ignition.' },
  { id: 'ignition.east_m', group: 'ignition', label: 'East offset', unit: 'm', min: -1e5, max: 1e5, step: 10, defaultValue: -1200, help: 'East position relative to the nominal target.' },
  { id: 'ignition.north_m', group: 'ignition', label: 'North offset', unit: 'm', min: -1e5, max: 1e5, step: 10, defaultValue: -400, help: 'North position relative to the nominal target.' },
  { id: 'ignition.velocityEast_mps', group: 'ignition', label: 'East velocity', unit: 'm/s', min: -3000, max: 3000, step: 1, defaultValue: 55, help: 'Eastward velocity component.' },
  { id: 'ignition.velocityNorth_mps', group: 'ignition', label: 'North velocity', unit: 'm/s', min: -3000, max: 3000, step: 1, defaultValue: 15, help: 'Northward velocity component.' },
  { id: 'ignition.velocityUp_mps', group: 'ignition', label: 'Vertical velocity', unit: 'm/s', min: -3000, max: 3000, step: 1, defaultValue: -45, help: 'Upward velocity component (negative while descending).' },

  { id: 'constraints.glideSlope_deg', group: 'constraints', label: 'Glide-slope angle', unit: '°', min: 0, max: 89, step: 1, defaultValue: 8, help: 'The vehicle stays above a cone of this elevation angle around the target.' },
  { id: 'constraints.speedMax_mps', group: 'constraints', label: 'Speed limit', unit: 'm/s', min: 0.1, max: 5000, step: 1, defaultValue: 110, help: 'Largest speed allowed along the descent.' },
  { id: 'constraints.flightTimeMin_s', group: 'constraints', label: 'Shortest flight time', unit: 's', min: 1, max: 3600, step: 1, defaultValue: 15, help: 'Lower end of the free-final-time search.' },
  { id: 'constraints.flightTimeMax_s', group: 'constraints', label: 'Longest flight time', unit: 's', min: 1, max: 3600, step: 1, defaultValue: 110, help: 'Upper end of the free-final-time search.' },

  { id: 'reserve.propellantReserve_kg', group: 'reserve', label: 'Reserve at touchdown', unit: 'kg', min: 0, max: 1e6, step: 5, defaultValue: 80, help: 'Targets that need more than (propellant on board − reserve) are outside the footprint.' },

  { id: 'grid.halfWidth_m', group: 'grid', label: 'Half-width', unit: 'm', min: 10, max: 2e5, step: 50, defaultValue: 3000, help: 'The target grid spans ± this distance east and north of the nominal target.' },
  { id: 'grid.spacing_m', group: 'grid', label: 'Spacing', unit: 'm', min: 1, max: 2e4, step: 10, defaultValue: 150, help: 'Distance between neighbouring targets.' },
  { id: 'grid.directions', group: 'grid', label: 'Reach directions', unit: '', min: 4, max: 720, integer: true, step: 1, defaultValue: 36, help: 'Number of compass directions searched for the reach boundary.' },

  { id: 'terrain.hazardSlope_deg', group: 'terrain', label: 'Hazard slope', unit: '°', min: 0, max: 90, step: 0.5, defaultValue: 12, help: 'Terrain steeper than this is marked unsafe.' },
  { id: 'terrain.hazardRoughness_m', group: 'terrain', label: 'Hazard roughness', unit: 'm', min: 0, max: 100, step: 0.05, defaultValue: 0.4, help: 'Terrain rougher than this (residual height over one lander footprint) is marked unsafe.' },
];

/** Largest number of grid targets a study may ask for (401 × 401); beyond it the run is impractical. */
export const MAX_GRID_TARGETS = 401 * 401;

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
      'vehicle.thrustMax_N': 60000,
      'vehicle.throttleMin': 0.2,
      'vehicle.throttleMax': 0.9,
      'ignition.altitude_m': 3200,
      'ignition.velocityEast_mps': 90,
      'ignition.velocityUp_mps': -70,
      'constraints.speedMax_mps': 160,
      'constraints.flightTimeMax_s': 160,
      'reserve.propellantReserve_kg': 250,
    },
  },
  {
    id: 'hopper',
    label: 'Invented small hopper, low-gravity body',
    values: {
      'planet.surfaceGravity_mps2': 1.62,
      'vehicle.wetMass_kg': 600,
      'vehicle.dryMass_kg': 420,
      'vehicle.isp_s': 210,
      'vehicle.thrustMax_N': 2400,
      'ignition.altitude_m': 600,
      'ignition.east_m': -300,
      'ignition.north_m': 0,
      'ignition.velocityEast_mps': 20,
      'ignition.velocityNorth_mps': 0,
      'ignition.velocityUp_mps': -10,
      'constraints.speedMax_mps': 40,
      'reserve.propellantReserve_kg': 20,
      'grid.halfWidth_m': 1000,
      'grid.spacing_m': 50,
    },
  },
];
