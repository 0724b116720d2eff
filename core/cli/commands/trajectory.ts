/**
 * `landreach trajectory STUDY.json [--target x,y[,z]] [--json out.json] [--csv out.csv] [--no-refine]`
 *
 * Minimum-propellant trajectory to one target: prints a short summary and writes the full time series.
 * Output files are written whole or not at all (temporary file + rename).
 */
import { parseVehicleFlag, readStudy, VEHICLE_FLAGS_USAGE, type VehicleFlags, writeFilesAtomically } from '../files.ts';
import type { CliCommand, CliIo } from '../command.ts';
import { UsageError } from '../command.ts';
import { studyDescentProblem, studyToDescent } from '../../study/index.ts';
import type { Study } from '../../study/index.ts';
import { DescentSolver } from '../../descent/solver.ts';
import { searchFreeFinalTime } from '../../descent/search.ts';
import type { DescentResult } from '../../descent/search.ts';
import { landreachConicBackend } from '../../descent/conicBackend.ts';
import { discretisationCheck } from '../../descent/refine.ts';
import { verifyBetweenNodes, type BetweenNodesReport } from '../../descent/verify.ts';
import { polynomialGuidance } from '../../descent/baselines/polynomial.ts';
import { gravityTurn } from '../../descent/baselines/gravityTurn.ts';
import type { Vec3 } from '../../descent/constants.ts';
import { APP_VERSION, CAUTION, inputsHash } from '../../study/provenance.ts';
import type { Flags } from '../dem.ts';

export interface BaselineFigures {
  polynomial: { propellant_kg: number | null; tf_s: number | null; miss_m: number | null; velocity_error_mps: number | null; saturated_fraction: number | null };
  gravity_turn: { propellant_kg: number | null; tf_s: number | null; landing_m: number[]; touchdown_speed_mps: number | null; out_of_propellant: boolean };
}

const USAGE = `Usage: landreach trajectory STUDY.json [options]

Solves the minimum-propellant powered descent (lossless convexification, free final time) from the
study's ignition state to one target, prints a summary and optionally writes the full time series.

Options:
  --target X,Y[,Z]   target in metres east, north (and up) of the nominal target (default: the study's)
  --json FILE        write the full result as JSON (status, propellant_kg, tf_s, series, ...)
  --csv FILE         write the time series as CSV (one row per node)
  --no-refine        skip the discretisation check (the same target solved again with 2N − 1 nodes)
  --baselines        also fly polynomial guidance to the target and a gravity-turn soft landing,
                     for comparison with the optimum (propellant, miss, landing point)
  --terrain DEM      check the trajectory's clearance above the terrain (GeoTIFF, PNG16 or JSON grid;
                     nodes and the straight segments between them, sampled at the DEM's pixel size);
                     a GeoTIFF is read only under the ground track: at full resolution when that window
                     has at most 4096 × 4096 cells, else from an overview or as block averages (said)
  --clearance-m C    required height above the terrain, m (default 0; with --terrain)
  --target-east-m E, --target-north-m N
                     the nominal target on the DEM, in the DEM's frame (default: the DEM's centre)
${VEHICLE_FLAGS_USAGE}

Status: solved (a flyable optimum, lossless, propellant certified to 0.01 kg), relaxation-gap (the
convex relaxation was not lossless: the best flyable trajectory found and the certified lower bound are
both reported), unreachable (certified, with the closest reachable point), solver-failure, and with a
forbidden throttle band (--throttle-band or vehicle.throttleBands) undecided: the relaxation ignoring the
band does not exclude the target, but no band-respecting trajectory was found (only the lower bound is
reported). With a band, solved / relaxation-gap mean a band-respecting trajectory within / beyond 0.01 kg
of the certified lower bound (the band gap is printed).
Every returned trajectory is re-simulated densely between the nodes; a constraint missed there beyond
its tolerance is a warning.

Exit codes: 0 solved, relaxation-gap, undecided or unreachable (see "status"), 1 solver failure, 2 bad usage or bad study file.

${CAUTION}`;

interface Options {
  terrain: string | null;
  clearance_m: number;
  demFlags: Flags;
  study: string;
  target: Vec3 | null;
  json: string | null;
  csv: string | null;
  refine: boolean;
  baselines: boolean;
  vehicle: VehicleFlags;
}

function parseArgs(args: string[]): Options {
  const o: Options = { study: '', target: null, json: null, csv: null, refine: true, baselines: false, terrain: null, clearance_m: 0, demFlags: {}, vehicle: {} };
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    const used = parseVehicleFlag(args, i, o.vehicle);
    if (used > 0) { i += used - 1; continue; }
    const value = () => {
      const v = args[++i];
      if (v === undefined || v.startsWith('--')) throw new UsageError(`${a} needs a value (see landreach trajectory --help)`);
      return v;
    };
    if (a === '--target') {
      const text = value();
      const parts = text.split(',').map((s) => Number(s.trim()));
      if ((parts.length !== 2 && parts.length !== 3) || !parts.every(Number.isFinite)) {
        throw new UsageError(`--target: '${text}' (must be X,Y or X,Y,Z in metres, e.g. --target 250,-100)`);
      }
      o.target = [parts[0], parts[1], parts[2] ?? 0];
    } else if (a === '--json') o.json = value();
    else if (a === '--csv') o.csv = value();
    else if (a === '--no-refine') o.refine = false;
    else if (a === '--baselines') o.baselines = true;
    else if (a === '--terrain') o.terrain = value();
    else if (a === '--clearance-m') {
      const t = value();
      const v = Number(t);
      if (!Number.isFinite(v) || v < 0 || t.trim() === '') throw new UsageError(`--clearance-m ${t}: must be zero or a positive height in metres`);
      o.clearance_m = v;
    } else if (a === '--target-east-m' || a === '--target-north-m' || DEM_READER_FLAGS.includes(a)) o.demFlags[a.slice(2)] = value();
    else if (a.startsWith('--')) throw new UsageError(`unknown option '${a}' (see landreach trajectory --help)`);
    else if (!o.study) o.study = a;
    else throw new UsageError(`unexpected argument '${a}': give one study file`);
  }
  if (!o.terrain && Object.keys(o.demFlags).length) throw new UsageError(`--${Object.keys(o.demFlags)[0]} only applies with --terrain DEM`);
  if (!o.study) throw new UsageError('missing STUDY.json (usage: landreach trajectory STUDY.json [--target x,y] [--json out.json] [--csv out.csv])');
  return o;
}

const round = (v: number, digits = 6) => (Number.isFinite(v) ? Number(v.toPrecision(digits + 3)) : null);
const deg = (rad: number) => (rad * 180) / Math.PI;

export function resultToJson(
  study: Study, r: DescentResult, nodes: number, refine: { nodes: number; propellant: number } | null,
  baselines: BaselineFigures | null = null, hash = '', between: BetweenNodesReport | null = null,
) {
  const t = r.trajectory;
  const s = t?.series;
  const arr = (a: Float64Array | undefined, f: (v: number) => number = (v) => v) => (a ? Array.from(a, (v) => round(f(v))) : []);
  return {
    format: 'landreach-trajectory',
    version: 1,
    caution: CAUTION,
    appVersion: APP_VERSION,
    createdAt: new Date().toISOString(),
    study: study.name,
    /** SHA-256 of the study and the target: equal inputs, equal hash. */
    inputsHash: hash,
    status: r.status,
    problem: r.kind,
    propellant_kg: round(r.propellant),
    /** Certified lower bound on the minimum propellant over all times of flight (null when unknown). */
    propellant_lower_bound_kg: round(r.propellantLowerBound),
    tf_s: round(r.timeOfFlight),
    nodes,
    solves: r.solves,
    target_m: r.target,
    closest_point_m: r.closestPoint,
    miss_m: round(r.miss),
    tf_bracket_s: [round(r.bracket.lower), round(r.bracket.upper)],
    infeasibility_certificates: r.infeasibleStatuses,
    /** Forbidden throttle bands: band-respecting propellant less the certified lower bound, kg (null without bands). */
    band_gap_kg: round(r.bandGap_kg),
    /** Forbidden throttle bands: max–min–max switch indices (hold intervals) of the returned trajectory. */
    band_switches: r.bandStructure ? [r.bandStructure.i1, r.bandStructure.i2] : null,
    band_solves: r.bandSolves,
    losslessness_gap_mps2: t ? round(t.diagnostics.losslessnessGap) : null,
    losslessness_gap_relative: t ? round(t.diagnostics.losslessnessGapRelative) : null,
    lossless: t ? t.diagnostics.lossless : null,
    margins: t
      ? {
          max_tilt_deg: round(deg(t.diagnostics.maxTilt)),
          min_throttle: round(t.diagnostics.minThrottle),
          max_throttle: round(t.diagnostics.maxThrottle),
          max_speed_mps: round(t.diagnostics.maxSpeed),
          glide_slope_margin_deg: round(deg(t.diagnostics.glideSlopeMargin)),
          altitude_margin_m: round(t.diagnostics.altitudeMargin),
          speed_margin_mps: round(t.diagnostics.speedMargin),
        }
      : null,
    /** Dense re-simulation of the returned thrust (core/descent/verify.ts): margins between the nodes. */
    between_nodes: between
      ? {
          substeps: between.substeps,
          altitude_margin_m: round(between.altitudeMargin_m),
          glide_slope_margin_m: round(between.glideSlopeMargin_m),
          speed_margin_mps: round(between.speedMargin_mps),
          thrust_lower_margin: round(between.thrustLowerMargin),
          thrust_upper_margin: round(between.thrustUpperMargin),
          pointing_margin_deg: round(deg(between.pointingMargin_rad)),
          band_margin: round(between.bandMargin),
          throttle_rate_margin_per_s: round(between.throttleRateMargin_perS),
          touchdown_position_error_m: round(between.touchdownPositionError_m),
          touchdown_velocity_error_mps: round(between.touchdownVelocityError_mps),
          propellant_kg: round(between.propellant_kg),
          violations: between.violations,
        }
      : null,
    discretisation_check: refine
      ? { nodes: refine.nodes, propellant_kg: round(refine.propellant), difference_kg: round(r.propellant - refine.propellant) }
      : null,
    baselines,
    warnings: r.warnings,
    series: {
      t_s: arr(s?.t), x_m: arr(s?.x), y_m: arr(s?.y), z_m: arr(s?.z),
      vx_mps: arr(s?.vx), vy_mps: arr(s?.vy), vz_mps: arr(s?.vz), mass_kg: arr(s?.mass),
      thrust_x_N: arr(s?.thrustX), thrust_y_N: arr(s?.thrustY), thrust_z_N: arr(s?.thrustZ),
      throttle: arr(s?.throttle), tilt_deg: arr(s?.tilt, deg), mass_flow_kgps: arr(s?.massFlow),
    },
  };
}

export function seriesToCsv(r: DescentResult): string {
  const s = r.trajectory?.series;
  const head = 't_s,x_m,y_m,z_m,vx_mps,vy_mps,vz_mps,mass_kg,thrust_x_N,thrust_y_N,thrust_z_N,throttle,tilt_deg,mass_flow_kgps';
  const lines = [`# ${CAUTION}`, head];
  if (s) {
    for (let k = 0; k < s.t.length; k++) {
      lines.push([s.t[k], s.x[k], s.y[k], s.z[k], s.vx[k], s.vy[k], s.vz[k], s.mass[k], s.thrustX[k], s.thrustY[k], s.thrustZ[k], s.throttle[k], deg(s.tilt[k]), s.massFlow[k]]
        .map((v) => String(round(v))).join(','));
    }
  }
  return lines.join('\n') + '\n';
}

function summary(r: DescentResult, refine: { nodes: number; propellant: number } | null, nodes: number, baselines: BaselineFigures | null): string {
  const f = (v: number, d = 2) => (Number.isFinite(v) ? v.toFixed(d) : '—');
  const lines = [`status            ${r.status}`];
  if (r.status === 'unreachable' && r.closestPoint) {
    lines.push(`closest point     ${f(r.closestPoint[0], 1)} m E, ${f(r.closestPoint[1], 1)} m N (miss ${f(r.miss, 1)} m)`);
  }
  lines.push(`propellant        ${f(r.propellant)} kg${r.status === 'unreachable' ? ' (minimum-landing-error trajectory)' : r.status === 'relaxation-gap' ? ' (best flyable trajectory found)' : ''}`);
  if (r.status === 'relaxation-gap' || r.status === 'undecided' || Number.isFinite(r.bandGap_kg)) lines.push(`lower bound       ${f(r.propellantLowerBound)} kg (certified by the convex relaxation${Number.isFinite(r.bandGap_kg) || r.status === 'undecided' ? ' ignoring the throttle band' : ''})`);
  if (Number.isFinite(r.bandGap_kg)) lines.push(`band gap          ${f(r.bandGap_kg, 3)} kg (band-respecting trajectory less the lower bound; switches at intervals ${r.bandStructure ? `${r.bandStructure.i1}, ${r.bandStructure.i2}` : '—'}, ${r.bandSolves} band solves)`);
  lines.push(`time of flight    ${f(r.timeOfFlight)} s  (bracket ${f(r.bracket.lower, 1)}–${f(r.bracket.upper, 1)} s)`);
  if (r.trajectory) {
    const d = r.trajectory.diagnostics;
    lines.push(`max tilt          ${f(deg(d.maxTilt), 1)}°`);
    lines.push(`losslessness gap  ${d.losslessnessGap.toExponential(2)} m/s² (${d.lossless ? 'lossless' : 'NOT lossless'})`);
  }
  lines.push(`nodes, solves     ${nodes}, ${r.solves}`);
  if (refine) lines.push(`with ${refine.nodes} nodes     ${f(refine.propellant, 3)} kg (difference ${f(r.propellant - refine.propellant, 3)} kg)`);
  if (baselines) {
    const p = baselines.polynomial;
    const g = baselines.gravity_turn;
    lines.push(`polynomial        ${f(p.propellant_kg ?? NaN)} kg, miss ${f(p.miss_m ?? NaN, 1)} m, t_f ${f(p.tf_s ?? NaN)} s (guidance baseline)`);
    lines.push(`gravity turn      ${f(g.propellant_kg ?? NaN)} kg, lands at ${f(g.landing_m[0], 0)} m E, ${f(g.landing_m[1], 0)} m N (no targeting)${g.out_of_propellant ? ', RUNS OUT OF PROPELLANT in the air' : ''}`);
  }
  for (const w of r.warnings) lines.push(`warning: ${w}`);
  lines.push('', CAUTION, '');
  return lines.join('\n');
}

/** Reader flags `trajectory --terrain` passes on (the footprint command's names). */
const DEM_READER_FLAGS = ['--window', '--body-radius-m', '--origin-lat-deg', '--origin-lon-deg', '--vertical-scale', '--pixel-size-m', '--height-scale-m', '--height-offset-m'];


export const trajectoryCommand: CliCommand = {
  name: 'trajectory',
  summary: 'minimum-propellant trajectory to one target (summary, JSON, CSV)',
  usage: USAGE,
  async run(args: string[], io: CliIo): Promise<number> {
    const o = parseArgs(args);
    const study = readStudy(o.study, o.vehicle);
    const d = studyToDescent(study);
    const target = o.target ?? d.target;
    if (o.target) {
      // The study was checked against its own target's height; another height is another landing plane.
      const p = studyDescentProblem(study, target);
      if (p) {
        const about = p.field.startsWith('target') ? '' : ` with this target, ${p.field} (${JSON.stringify(p.value)})`;
        throw new UsageError(`--target ${o.target.join(',')}:${about} ${p.message}`);
      }
    }
    let solver: DescentSolver;
    try {
      solver = new DescentSolver(d.setup, landreachConicBackend(), d.ignition);
    } catch (err) {
      if (err instanceof RangeError) throw new UsageError(`${o.study}: ${err.message}`);
      throw err;
    }
    let r: DescentResult;
    try {
      r = searchFreeFinalTime(solver, target, d.ignition);
    } catch (err) {
      if (err instanceof RangeError) throw new UsageError(`${o.study}: ${err.message}`);
      throw err;
    }
    const between = r.trajectory && r.kind !== 'min-landing-error' ? verifyBetweenNodes(d.setup, r.trajectory, target) : null;
    for (const v of between?.violations ?? []) r.warnings.push(`re-simulation: ${v}`);
    const check = o.refine ? discretisationCheck(d.setup, landreachConicBackend(), d.ignition, target, r) : null;
    const refine = check ? { nodes: check.nodes, propellant: check.propellant } : null;
    let baselines: BaselineFigures | null = null;
    if (o.baselines) {
      const p = polynomialGuidance(d.setup, d.ignition, target);
      const g = gravityTurn(d.setup, d.ignition, target[2]);
      baselines = {
        polynomial: { propellant_kg: round(p.propellant), tf_s: round(p.timeOfFlight), miss_m: round(p.miss), velocity_error_mps: round(p.velocityError), saturated_fraction: round(p.saturatedFraction) },
        gravity_turn: { propellant_kg: round(g.propellant), tf_s: round(g.timeOfFlight), landing_m: g.landing.map((v) => round(v) ?? NaN), touchdown_speed_mps: round(g.touchdownSpeed), out_of_propellant: g.outOfPropellant },
      };
    }
    // Loaded only with --terrain: the DEM readers and projections are most of the command line's code.
    const clearance = o.terrain && r.trajectory ? await (await import('../terrainClearance.ts')).terrainClearance(o.terrain, o.demFlags, o.clearance_m, r.trajectory, io) : null;
    if (clearance && !clearance.ok) {
      r.warnings.push(clearance.unknown > 0 && clearance.nodeViolations === 0 && clearance.segmentViolations === 0
        ? `terrain clearance unknown at ${clearance.unknown} node(s) (off the DEM or over no-data)`
        : `terrain clearance: ${clearance.nodeViolations} node(s) and ${clearance.segmentViolations} segment(s) less than ${o.clearance_m} m above the terrain (smallest ${clearance.minClearance_m.toFixed(1)} m)`);
    }
    const files: { path: string; text: string }[] = [];
    if (o.json) {
      const hash = await inputsHash({ study, target });
      files.push({ path: o.json, text: JSON.stringify({ ...resultToJson(study, r, d.setup.nodes, refine, baselines, hash, between), terrain_clearance: clearance }, null, 1) + '\n' });
    }
    if (o.csv) files.push({ path: o.csv, text: seriesToCsv(r) });
    if (files.length) writeFilesAtomically(files);
    io.stdout(summary(r, refine, d.setup.nodes, baselines));
    return r.status === 'solver-failure' ? 1 : 0;
  },
};
