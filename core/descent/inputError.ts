/**
 * The error every descent model check throws: a RangeError (so existing callers keep working) that also
 * carries the field it is about, in the descent model's names (`vehicle.thrustPerEngine`,
 * `constraints.gateHeight`, `ignition.velocity`…). The study file maps these to its own field names
 * (core/study/toDescent.ts) so a user sees the field of the file, its value and the fix.
 */
export type DescentField =
  | 'planet.gravity' | 'planet.rotationRate'
  | 'vehicle.wetMass' | 'vehicle.dryMass' | 'vehicle.isp' | 'vehicle.engineCount' | 'vehicle.thrustPerEngine'
  | 'vehicle.cantAngle' | 'vehicle.throttleMin' | 'vehicle.throttleMax' | 'vehicle.pointingLimit'
  | 'vehicle.throttleBands' | 'vehicle.throttleRate'
  | 'constraints.glideSlope' | 'constraints.maxSpeed' | 'constraints.gateHeight' | 'constraints.gateDescentRate'
  | 'constraints.minAltitude'
  | 'nodes' | 'hold'
  | 'ignition.position' | 'ignition.velocity' | 'ignition.mass'
  | 'target.position' | 'target.height';

export class DescentInputError extends RangeError {
  /**
   * @param field the model field to change
   * @param value the value as the user would write it (with its unit)
   * @param fix what is wrong and how to put it right
   * @param rule which derived rule failed, when it is one (the study file uses it to name the most likely field)
   */
  constructor(readonly field: DescentField, readonly value: string, readonly fix: string, readonly rule?: 'burn-time') {
    super(`${field}: ${value} (${fix})`);
    this.name = 'DescentInputError';
  }
}
