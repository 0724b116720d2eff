/**
 * Published worked examples of minimum-propellant powered descent (Açıkmeşe & Ploen 2007, JGCD 30(5);
 * Blackmore, Açıkmeşe & Scharf 2010, JGCD 33(4)), solved with our own conic solver.
 *
 * Every published figure here is SECOND-HAND: the parameters and results were quoted in the brief
 * (from memory or a secondary source) and have NOT been checked against the papers' text — the papers'
 * results sections were not available to us (a search found only their abstracts and problem
 * statements). So no published figure carries a check alone. Each example is first solved by the
 * independent reference formulation (test/reference/py/descent_reference.py: written from the
 * papers' equations, its own matrices, CVXOPT), which must give our propellant to 1e-6 relative at
 * our optimal t_f and at the published t_f (see independent-model.test.ts for why 1e-6), and the same
 * reachability verdict.
 *
 * Tolerances on the published figures, from the source itself: the quoted parameters are not
 * self-consistent. α is quoted as 5e-4 s/m, but the quoted Isp 225 s and 27° cant give
 * α = 1/(Isp g0 cos φ) = 5.086e-4 s/m (below). We use the derived value; a figure the papers computed
 * with either can therefore only be compared within the change between the two, which the reference
 * computes at the published t_f (about 6 kg of propellant), plus half the last quoted digit. A
 * published t_f is compared the same way: our propellant AT that t_f must match the published
 * propellant (the propellant is flat in t_f near the optimum, so the optimal t_f itself is poorly
 * determined and a window on it would say little).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import type { DescentResult } from '../../../core/descent/search.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { deriveVehicle } from '../../../core/descent/vehicle.ts';
import { G0 } from '../../../core/descent/constants.ts';
import { MIN_ERROR_PROPELLANT_WEIGHT } from '../../../core/descent/program.ts';
import type { IgnitionState } from '../../../core/descent/setup.ts';
import { isPrimalInfeasible } from '../../../core/conic/types.ts';
import { referenceToolsReady } from '../../support/reference-tools.ts';
import { fromSetup, runReference } from './independentReference.ts';
import type { PhysicalScenario, ReferenceJob, ReferenceResult } from './independentReference.ts';
import { ACIKMESE_2007, BLACKMORE_2010_CASE_1, BLACKMORE_2010_CASE_2, marsSetup } from './marsExamples.ts';


const backend = landreachConicBackend();
const CANT = (27 * Math.PI) / 180;
/** α as quoted second-hand (5e-4 s/m), expressed through an Isp: α = 1/(Isp g0 cos φ). */
const ISP_FOR_QUOTED_ALPHA = 1 / (5e-4 * G0 * Math.cos(CANT));
const AGREEMENT = 1e-6;

describe('mass-flow constant α with canted engines', () => {
  it('follows from full engine thrust burning for the cos φ-reduced useful thrust', () => {
    // Each engine burns ṁ_e = T_e/(Isp g0) for its full thrust T_e, but only T_e cos φ points along
    // the vehicle axis. With ‖T‖ = n T_e cos φ · throttle: ṁ = n T_e throttle/(Isp g0) = ‖T‖/(Isp g0 cos φ).
    // For Isp 225 s and φ = 27° this is 5.086e-4 s/m. The papers' α as quoted second-hand (5e-4 s/m) is
    // neither this nor 1/(Isp g0) = 4.532e-4 s/m. We keep the derived value (the independent reference
    // derives the same from the physics, and vertical-min-max.test.ts checks it against the rocket
    // equation); the published propellant figures are compared within the difference (below).
    const v = marsSetup({ glideSlope: true, rotation: false }).vehicle;
    const d = deriveVehicle(v);
    expect(G0).toBe(9.80665); // standard gravity, exact by definition (3rd CGPM 1901)
    expect(d.alpha).toBeCloseTo(1 / (225 * 9.80665 * Math.cos(CANT)), 15);
    expect(d.alpha).toBeCloseTo(5.086e-4, 7);
    expect(d.rho1).toBeCloseTo(6 * 3100 * Math.cos(CANT) * 0.3, 9); // 4971.8 N
    expect(d.rho2).toBeCloseTo(6 * 3100 * Math.cos(CANT) * 0.8, 9); // 13258 N
    expect(deriveVehicle({ ...v, isp: ISP_FOR_QUOTED_ALPHA }).alpha).toBeCloseTo(5e-4, 15);
  });
});

interface Example {
  name: string;
  opts: { glideSlope: boolean; rotation: boolean };
  ignition: IgnitionState;
  /** Second-hand published figures. */
  propellant_kg: number;
  timeOfFlight_s: number;
  /** Half the last quoted digit of the propellant, kg. */
  rounding_kg: number;
}

const EXAMPLES: Example[] = [
  // Açıkmeşe & Ploen 2007, N = 50 here: "about 399.5 kg at t_f ≈ 81 s" with the 4° glide slope and
  // "about 387.9 kg at t_f ≈ 72 s" without (second-hand).
  { name: 'Açıkmeşe & Ploen 2007, 4° glide slope', opts: { glideSlope: true, rotation: false }, ignition: ACIKMESE_2007, propellant_kg: 399.5, timeOfFlight_s: 81, rounding_kg: 0.05 },
  { name: 'Açıkmeşe & Ploen 2007, no glide slope', opts: { glideSlope: false, rotation: false }, ignition: ACIKMESE_2007, propellant_kg: 387.9, timeOfFlight_s: 72, rounding_kg: 0.05 },
  // Blackmore et al. 2010 case 1 (Mars rotation, 500 m cross-range offset): "399.4 kg, 78.4 s" (second-hand).
  { name: 'Blackmore et al. 2010 case 1, Mars rotation', opts: { glideSlope: true, rotation: true }, ignition: BLACKMORE_2010_CASE_1, propellant_kg: 399.4, timeOfFlight_s: 78.4, rounding_kg: 0.05 },
];

/** Blackmore et al. 2010 case 2 (+40 m/s cross-range): infeasible with 400 kg; closest miss "about 268 m" (second-hand). */
const CASE_2_MISS_M = 268;

describe.runIf(referenceToolsReady('cvxopt', 'numpy'))('published Mars examples, free final time, N = 50, each paired with the independent reference', () => {
  const ours: DescentResult[] = [];
  const atPublished: number[] = [];
  const ref: Record<string, ReferenceResult> = {};
  let case2: DescentResult;
  let case2Length = NaN;

  beforeAll(() => {
    const jobs: ReferenceJob[] = [];
    const ask = (key: string, job: PhysicalScenario & Partial<ReferenceJob>) => jobs.push({ ...job, id: key });
    EXAMPLES.forEach((ex, i) => {
      const setup = marsSetup(ex.opts);
      const solver = new DescentSolver(setup, backend, ex.ignition);
      const r = searchFreeFinalTime(solver, [0, 0, 0], ex.ignition);
      ours.push(r);
      atPublished.push(solver.solveFixed('min-propellant', ex.timeOfFlight_s, [0, 0, 0], ex.ignition).propellant);
      const s = fromSetup(ex.name, setup, ex.ignition, [0, 0, 0]);
      ask(`${i}/optimum`, { ...s, timeOfFlight_s: r.timeOfFlight });
      ask(`${i}/published`, { ...s, timeOfFlight_s: ex.timeOfFlight_s });
      ask(`${i}/published-quoted-alpha`, { ...s, vehicle: { ...s.vehicle, isp_s: ISP_FOR_QUOTED_ALPHA }, timeOfFlight_s: ex.timeOfFlight_s });
    });
    const setup = marsSetup({ glideSlope: true, rotation: true });
    const solver = new DescentSolver(setup, backend, BLACKMORE_2010_CASE_2);
    case2 = searchFreeFinalTime(solver, [0, 0, 0], BLACKMORE_2010_CASE_2);
    case2Length = solver.scales.length;
    const s = fromSetup('case 2', setup, BLACKMORE_2010_CASE_2, [0, 0, 0]);
    // Longest possible burn (m0 − m_dry)/(α ρ1) = 158 s: the grid covers every feasible time.
    ask('case2/grid', { ...s, search: { lower_s: 30, upper_s: 150, grid: 9 } });
    ask('case2/miss', { ...s, problem: 'min-landing-error', timeOfFlight_s: case2.timeOfFlight });
    ask('case2/miss-quoted-alpha', { ...s, vehicle: { ...s.vehicle, isp_s: ISP_FOR_QUOTED_ALPHA }, problem: 'min-landing-error', timeOfFlight_s: case2.timeOfFlight });
    for (const r of runReference(jobs)) ref[r.id] = r;
  });

  EXAMPLES.forEach((ex, i) => {
    it(`${ex.name}: the reference agrees; the second-hand ${ex.propellant_kg} kg at ${ex.timeOfFlight_s} s is matched within the α ambiguity`, () => {
      const r = ours[i];
      expect(r.status).toBe('solved');
      expect(r.trajectory!.diagnostics.lossless).toBe(true);
      if (ex.opts.glideSlope) expect(r.trajectory!.diagnostics.glideSlopeMargin).toBeGreaterThan(-1e-6);
      // Independent check: the reference at our optimum and at the published time.
      for (const [key, value] of [['optimum', r.propellant], ['published', atPublished[i]]] as const) {
        const q = ref[`${i}/${key}`];
        expect(q.status).toBe('optimal');
        expect(q.tolerance!).toBeLessThanOrEqual(1e-8);
        expect(Math.abs(value - q.propellant_kg!) / q.propellant_kg!).toBeLessThan(AGREEMENT);
      }
      // Our optimum cannot cost more than the published time does.
      expect(r.propellant).toBeLessThanOrEqual(atPublished[i] * (1 + AGREEMENT));
      // Second-hand figure, within the source's own α ambiguity (computed by the reference) and rounding.
      const derived = ref[`${i}/published`].propellant_kg!;
      const quoted = ref[`${i}/published-quoted-alpha`].propellant_kg!;
      expect(quoted).toBeLessThan(derived); // a smaller α burns less
      expect(Math.abs(ex.propellant_kg - derived)).toBeLessThanOrEqual(derived - quoted + ex.rounding_kg);
    });
  });

  it('Blackmore et al. 2010 case 2: unreachable for both, the same closest miss; the second-hand 268 m within the α ambiguity', () => {
    expect(case2.status).toBe('unreachable');
    expect(case2.infeasibleStatuses.length).toBeGreaterThan(0);
    expect(case2.infeasibleStatuses.every(isPrimalInfeasible)).toBe(true);
    const grid = ref['case2/grid'];
    expect(grid.status).toBe('infeasible');
    expect(grid.failures).toBe(0);
    expect(Math.hypot(case2.closestPoint![0], case2.closestPoint![1])).toBeCloseTo(case2.miss, 6);
    expect(case2.propellant).toBeCloseTo(400, 3); // all usable propellant spent getting as close as possible
    // Closest miss at our t_f: ours minimises e/L − w·z_f, the reference e alone, over the same set,
    // so e_ref ≤ e_ours ≤ e_ref + L·w·ln(m0/m_dry) (independent-model.test.ts).
    const miss = ref['case2/miss'];
    expect(miss.status).toBe('optimal');
    const slack = case2Length * MIN_ERROR_PROPELLANT_WEIGHT * Math.log(1905 / 1505);
    expect(case2.miss).toBeGreaterThanOrEqual(miss.miss_m! * (1 - AGREEMENT));
    expect(case2.miss).toBeLessThanOrEqual(miss.miss_m! * (1 + AGREEMENT) + slack);
    // Second-hand figure: the miss with the quoted α differs from ours by far more than the published
    // figure does (we find about 383 m, the quoted α about 238 m at the same t_f; 268 m lies between).
    const quoted = ref['case2/miss-quoted-alpha'];
    expect(quoted.status).toBe('optimal');
    expect(Math.abs(CASE_2_MISS_M - miss.miss_m!)).toBeLessThanOrEqual(Math.abs(quoted.miss_m! - miss.miss_m!) + 0.5);
  });
});
