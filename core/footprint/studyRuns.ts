/**
 * The steps of the trade studies that act on a study document, shared by every front end (the CLI runs
 * them in worker threads, the app in Web Workers): the study at another ignition altitude, one altitude's
 * row by the reach boundary or from a footprint field, the dispersion study from a study, the study of one
 * dispersed sample, and the studies' default inputs. Footprints themselves run through engine.ts.
 */
import type { Study } from '../study/schema.ts';
import { studyDescentProblem, studyToDescent } from '../study/toDescent.ts';
import { DescentSolver } from '../descent/solver.ts';
import { searchFreeFinalTime } from '../descent/search.ts';
import { landreachConicBackend } from '../descent/conicBackend.ts';
import { reachBoundary } from '../descent/reach.ts';
import { guaranteedDivertRadius, propellantRegions, regionBounds, ringArea } from './contours.ts';
import { dispersionStudy, sampleDispersions, type DispersedSample, type DispersionResult, type DispersionSigmas } from './dispersion.ts';
import { TARGET, type FootprintField } from './field.ts';
import { ignitionAtAltitude, type AltitudeStudyRow, type IgnitionRule } from './studies.ts';
import { footprintContext } from './studyFootprint.ts';

/** Default reserves: 0 and round steps up to half the usable propellant, kg. */
export function defaultReserves(usable_kg: number): number[] {
  // Round steps (1, 2, 2.5 or 5 × 10^k kg, the largest not above usable / 10) from 0 to half the usable
  // propellant: 6 to 11 values that read 0, 50, 100 … rather than 0, 31.3, 62.5 …
  if (!(usable_kg > 0)) return [0];
  const raw = usable_kg / 10;
  const scale = 10 ** Math.floor(Math.log10(raw));
  const step = [10, 5, 2.5, 2, 1].find((m) => m * scale <= raw * (1 + 1e-12))! * scale;
  const out: number[] = [];
  for (let k = 0; k * step <= (usable_kg / 2) * (1 + 1e-12); k++) out.push(Number((k * step).toPrecision(12)));
  return out;
}

/** Default ignition altitudes: 0.6, 0.8, 1, 1.2 and 1.4 × the study's, rounded to the metre. */
export function defaultAltitudes(studyAltitude_m: number): number[] {
  return [0.6, 0.8, 1, 1.2, 1.4].map((f) => Math.round(f * studyAltitude_m));
}

/** Directions of the reach boundary for the ignition-altitude study (24: every 15°). */
export const DEFAULT_DIRECTIONS = 24;

/** Illustrative 1σ dispersions (not from any mission). */
export const DEFAULT_SIGMAS: DispersionSigmas = { position_m: 50, velocity_mps: 2, mass_kg: 5, thrustFraction: 0.01, ispFraction: 0.005 };

/** Monte Carlo defaults of the dispersion study: samples, seed, and the ellipse probability (2-D 3.409σ). */
export const DEFAULT_DISPERSION = { samples: 1000, seed: 1, probability: 0.997 } as const;

/**
 * The study with its ignition state moved to `altitude_m` by the rule (ignitionAtAltitude). Throws a
 * RangeError naming the field when the moved study is no longer a descent the model can be asked about
 * (the checks every study meets when it is read, core/study studyDescentProblem), e.g. below the gate.
 */
export function studyAtAltitude(study: Study, altitude_m: number, rule: IgnitionRule): Study {
  const state = ignitionAtAltitude(study.ignition.position_m, study.ignition.velocity_mps, altitude_m, rule);
  const moved: Study = { ...study, ignition: { ...study.ignition, position_m: [...state.position], velocity_mps: [...state.velocity] } };
  const p = studyDescentProblem(moved);
  if (p) throw new RangeError(`at an ignition altitude of ${altitude_m} m, ${p.field} (${JSON.stringify(p.value)}) ${p.message}`);
  return moved;
}

/**
 * One altitude by the reach boundary (the study already at that altitude): the guaranteed divert radius is
 * the smallest reach over the directions (an upper bound between directions; more directions tighten it),
 * the area that of the polygon through the reach points.
 */
export function altitudeRowByDirections(study: Study, altitude_m: number, budget_kg: number, directions: number, nodes: number): AltitudeStudyRow {
  const d = studyToDescent(study);
  const setup = { ...d.setup, nodes, vehicle: { ...d.setup.vehicle, dryMass: study.vehicle.dryMass_kg } };
  const solver = new DescentSolver(setup, landreachConicBackend(), d.ignition);
  const boundary = reachBoundary(solver, d.ignition, directions, budget_kg, { targetHeight_m: d.target[2] });
  const reaches = boundary.map((b) => b.result.reach_m);
  const radius = Math.max(0, Math.min(...reaches));
  const ring = boundary.map((b) => [Math.max(0, b.result.reach_m) * Math.cos(b.angle_rad), Math.max(0, b.result.reach_m) * Math.sin(b.angle_rad)] as [number, number]);
  const nominal = searchFreeFinalTime(solver, d.target, d.ignition, { decode: false });
  return {
    altitude_m,
    divertRadius_m: Number.isFinite(radius) ? radius : 0,
    limitedByGrid: false,
    nominalPropellant_kg: nominal.status === 'solved' ? nominal.propellant : NaN,
    area_m2: Math.abs(ringArea(ring)),
    lossyDirections: boundary.filter((b) => Number.isFinite(b.result.losslessnessGap) && !b.result.lossless).length,
  };
}

/** One altitude from its footprint field: region {propellant ≤ budget}, its divert radius, the nominal target's cost. */
export function altitudeRowFromField(field: FootprintField, altitude_m: number, budget_kg: number): AltitudeStudyRow {
  const [region] = propellantRegions(field, [budget_kg]);
  const radius = guaranteedDivertRadius(region.geometry, 0, 0, regionBounds(field));
  const f = field;
  const distance = (k: number) => Math.hypot(f.east[k % f.nx], f.north[Math.floor(k / f.nx)]);
  let nearest = 0;
  for (let k = 1; k < f.nx * f.ny; k++) if (distance(k) < distance(nearest)) nearest = k;
  return {
    altitude_m,
    divertRadius_m: radius.radius_m,
    limitedByGrid: radius.limitedByGrid,
    nominalPropellant_kg: f.status[nearest] === TARGET.reachable ? f.propellant_kg[nearest] : NaN,
    area_m2: region.area_m2,
  };
}

export interface StudyDispersion {
  result: DispersionResult;
  nominalPropellant_kg: number;
  nominalTimeOfFlight_s: number;
}

/** The nominal optimal trajectory of the study, then the open-loop dispersion study around it (dispersion.ts). */
export function dispersionFromStudy(
  study: Study,
  sigmas: DispersionSigmas,
  options: { samples: number; seed: number; probability: number; nodes: number },
): StudyDispersion {
  const d = studyToDescent(study);
  const setup = { ...d.setup, nodes: options.nodes };
  const solver = new DescentSolver(setup, landreachConicBackend(), d.ignition);
  const nominal = searchFreeFinalTime(solver, d.target, d.ignition);
  if (nominal.status !== 'solved' || !nominal.trajectory) {
    throw new RangeError(`the nominal target is ${nominal.status} from the study's ignition state: a dispersion study needs a nominal trajectory`);
  }
  const result = dispersionStudy(setup, d.ignition, nominal.trajectory.series, sigmas, options);
  return { result, nominalPropellant_kg: nominal.propellant, nominalTimeOfFlight_s: nominal.timeOfFlight };
}

/**
 * The study of one dispersed sample (for its footprint) and that sample's budget: a heavier sample carries
 * more propellant (its wet mass is its ignition mass); the budget is its propellant less dry mass and reserve.
 */
export function dispersedSampleStudy(study: Study, s: DispersedSample): { study: Study; budget_kg: number } {
  return {
    study: {
      ...study,
      ignition: { ...study.ignition, position_m: [...s.ignition.position], velocity_mps: [...s.ignition.velocity], mass_kg: s.ignition.mass },
      vehicle: {
        ...study.vehicle,
        wetMass_kg: Math.max(study.vehicle.wetMass_kg, s.ignition.mass),
        isp_s: s.isp_s,
        thrustPerEngine_N: study.vehicle.thrustPerEngine_N * s.thrustScale,
      },
    },
    budget_kg: s.ignition.mass - study.vehicle.dryMass_kg - study.vehicle.propellantReserve_kg,
  };
}

/**
 * The dispersed samples of the probability-of-reach map, each as a study with its budget. They are drawn
 * from `seed + 1`, so they are not the landing-ellipse samples of the same seed.
 */
export function reachSampleStudies(study: Study, sigmas: DispersionSigmas, count: number, seed: number): { study: Study; budget_kg: number }[] {
  const d = studyToDescent(study);
  return sampleDispersions(d.setup, d.ignition, sigmas, count, seed + 1).map((s) => dispersedSampleStudy(study, s));
}

/** Directions of the reach boundary that sizes a footprint grid by default (the CLI and the app). */
export const REACH_EXTENT_DIRECTIONS = 16;

export interface ReachExtent {
  /** Grid half-width, m: 10 % beyond the farthest reach, rounded up to 100 m. */
  extent_m: number;
  /** Farthest reach with the reserve kept over the directions, m from the nominal target. */
  farthest_m: number;
  directions: number;
}

/**
 * The default half-width of a footprint grid, from the vehicle's reach (descent/reach.ts: one max-divert cone
 * program per direction, with the budget, at the footprint's nodes): 10 % beyond the farthest reach along
 * `directions` directions, rounded up to 100 m, so the region {propellant ≤ budget} lies inside the grid with
 * room to show its edge: the square grid contains the whole disc of the farthest sampled reach. The margin is
 * for what lies between sampled directions: a smooth, rounded footprint bulges little between directions
 * 22.5° apart (a circle through two sampled points departs from their chord by 1 − cos 11.25° ≈ 2 %), but
 * nothing bounds a region with a spike between directions; a grid that still cuts the region says so
 * (contours.ts guaranteedDivertRadius: `limitedByGrid`). Throws a RangeError when even the nominal target is
 * out of reach with the reserve kept.
 */
export function reachExtent(study: Study, budget_kg: number, nodes: number, directions = REACH_EXTENT_DIRECTIONS): ReachExtent {
  const ctx = footprintContext(study, nodes);
  const solver = new DescentSolver(ctx.setup, landreachConicBackend(), ctx.ignition);
  const boundary = reachBoundary(solver, ctx.ignition, directions, budget_kg, { targetHeight_m: ctx.targetHeight_m });
  const far = Math.max(...boundary.map((b) => b.result.reach_m));
  if (!(far > 0)) throw new RangeError('the nominal target cannot be reached with the reserve kept: no footprint to draw (lower the reserve or check the ignition state)');
  return { extent_m: Math.ceil((1.1 * far) / 100) * 100, farthest_m: far, directions };
}
