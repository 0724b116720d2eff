/** core/descent: minimum-propellant powered descent to one target, and guidance baselines. */
export * from './constants.ts';
export * from './planet.ts';
export * from './vehicle.ts';
export * from './setup.ts';
export { discretise, type ControlHold, type DiscreteStep } from './discretise.ts';
export { DescentProgram, NODE, type ProgramKind, type ProgramData, type ProgramScales } from './program.ts';
export type { ConicBackend, ConicSession } from './backend.ts';
export { landreachConicBackend } from './conicBackend.ts';
export { DescentSolver, type FixedTimeSolve } from './solver.ts';
export { timeOfFlightBracket, type TimeBracket } from './bracket.ts';
export { searchFreeFinalTime, DEFAULT_PROBES, type DescentResult, type DescentStatus, type SearchOptions } from './search.ts';
export { decodeTrajectory, LOSSLESS_TOLERANCE, type DecodedTrajectory, type TrajectorySeries, type TrajectoryDiagnostics } from './trajectory.ts';
export { polynomialGuidance, flyPolynomial, type BaselineResult } from './baselines/polynomial.ts';
export { gravityTurn, type GravityTurnResult } from './baselines/gravityTurn.ts';
export { discretisationCheck, type DiscretisationCheck } from './refine.ts';
