/**
 * Our descent MODEL against an independent reference formulation.
 *
 * The reference (test/reference/py/descent_reference.py) is written from the published equations —
 * Açıkmeşe & Ploen 2007 (JGCD 30(5)): z = ln m, the slack σ, the linearised upper and second-order
 * lower thrust bounds in z, pointing, glide slope, speed; Blackmore, Açıkmeşe & Scharf 2010 (JGCD
 * 33(4)): the rotating-frame terms −2ω×ṙ − ω×(ω×r) — with its own discretisation (an inertial-frame
 * solution with Rodrigues rotations and Gauss–Legendre quadrature, not a matrix exponential) and
 * its own matrices, solved by CVXOPT's conelp (Debian python3-cvxopt). It reads only the physical
 * description of each scenario (independentScenarios.ts, all invented), never our matrices.
 *
 * Tolerances, from the methods:
 * - Fixed t_f: the optimal propellant must agree to 1e-6 relative. Both programs model the same
 *   continuous problem with an exact discretisation of the same hold, so they differ only by round-off
 *   in the step maps (≈1e-15) and by the solvers' stopping tolerances: ours stops at 1e-8 relative
 *   gap and residuals (core/conic/settings.ts), CVXOPT here at 1e-9 (1e-8 at most on a retry, which
 *   is checked), so z_f = ln m_f is known to ≈1e-8 and the propellant (60–300 kg of a 1–2 t vehicle)
 *   to ≈1e-7 relative. 1e-6 leaves a 10×
 *   margin, and every scenario shows that leaving out any constraint it claims active moves the
 *   reference optimum by more than 1e-4 relative, 100× the tolerance.
 * - Free t_f: our search states that it stops once the remaining propellant gain is below 0.01 kg
 *   (core/descent/search.ts, propellantTolerance). The reference's grid + golden-section minimum is
 *   an upper bound on the true minimum, so ours ≤ reference + 0.01 kg (+1e-6 relative) must hold; and
 *   at our t_f the reference's fixed-t_f propellant must equal ours to 1e-6 relative (so ours cannot be
 *   below the true minimum either).
 * - Reachability: where the reference finds every grid time infeasible, ours must report
 *   `unreachable` with certificates; at a fixed t_f both must agree on feasibility.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { DescentSolver } from '../../../core/descent/solver.ts';
import type { FixedTimeSolve } from '../../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import type { DescentResult } from '../../../core/descent/search.ts';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { deriveVehicle } from '../../../core/descent/vehicle.ts';
import { MIN_ERROR_PROPELLANT_WEIGHT } from '../../../core/descent/program.ts';
import { isPrimalInfeasible } from '../../../core/conic/types.ts';
import { referenceToolsReady } from '../../support/reference-tools.ts';
import { runReference, toIgnition, toSetup } from './independentReference.ts';
import type { PhysicalScenario, ReferenceJob, ReferenceMargins, ReferenceResult } from './independentReference.ts';
import { INDEPENDENT_CASES } from './independentScenarios.ts';
import type { Claim, IndependentCase } from './independentScenarios.ts';


const AGREEMENT = 1e-6;
/** Stated propellant tolerance of the free-final-time search, kg (core/descent/search.ts). */
const SEARCH_PROPELLANT_TOLERANCE = 0.01;
/** A claimed-active constraint must move the reference optimum by more than this, relative. */
const SENSITIVITY = 100 * AGREEMENT;
/**
 * "≈ 0" for the reference's smallest slack of an active constraint, relative to the scenario's scale
 * (full-throttle acceleration, ignition distance, speed limit): interior-point slacks of constraints
 * with a positive multiplier shrink with the duality gap (1e-9 here); inactive ones stay O(1).
 */
const ACTIVE_SLACK = 1e-5;

/** Our propellant and the reference's agree to AGREEMENT, the reference solved at 1e-8 or tighter. */
function expectAgreement(ours: number, ref: ReferenceResult): void {
  expect(ref.status).toBe('optimal');
  expect(ref.tolerance!).toBeLessThanOrEqual(1e-8);
  expect(Math.abs(ours - ref.propellant_kg!) / ref.propellant_kg!).toBeLessThan(AGREEMENT);
}

const relaxable = new Set<Claim>(['upperThrust', 'lowerThrust', 'pointing', 'glideSlope', 'speed', 'altitude']);

/** A variant of the scenario without the claimed constraint (the reference solves it). */
function without(s: PhysicalScenario, claim: Claim): ReferenceJob {
  if (claim === 'rotation') return { ...s, planet: { ...s.planet, rotationRate: [0, 0, 0] } };
  if (claim === 'gate') return { ...s, constraints: { ...s.constraints, gateHeight_m: 0, gateDescentRate_mps: 0 } };
  return { ...s, relax: [claim] };
}

/** The reference's smallest slack of a claimed constraint, divided by its scale. */
function relativeSlack(s: PhysicalScenario, m: ReferenceMargins, claim: Claim): number {
  const length = Math.hypot(...[0, 1, 2].map((i) => s.ignition.position_m[i] - s.target_m[i]));
  switch (claim) {
    case 'upperThrust': return m.upperThrust;
    case 'lowerThrust': return m.lowerThrust!;
    case 'pointing': return m.pointing!;
    case 'glideSlope': return m.glideSlope! / length;
    case 'altitude': return m.altitude! / length;
    case 'speed': return m.speed! / s.constraints.maxSpeed_mps!;
    default: return NaN; // rotation and the gate are equalities in the dynamics and boundary
  }
}

interface Outcome {
  c: IndependentCase;
  fixed?: FixedTimeSolve;
  infeasible?: FixedTimeSolve;
  free?: DescentResult;
  /** Free search with the floor removed (the floor-crash case). */
  freeWithoutFloor?: DescentResult;
  solverLength: number;
  ref: Record<string, ReferenceResult>;
}

const outcomes: Outcome[] = [];

describe.runIf(referenceToolsReady('cvxopt', 'numpy'))('our descent model vs an independent reference formulation (Python + CVXOPT)', () => {
  beforeAll(() => {
    // Our solves first (they fix the times at which the reference is asked), then one reference run.
    const jobs: ReferenceJob[] = [];
    const asked: { o: Outcome; key: string }[] = [];
    const ask = (o: Outcome, key: string, job: ReferenceJob) => {
      asked.push({ o, key });
      jobs.push({ ...job, id: `${o.c.scenario.id}/${key}` });
    };
    for (const c of INDEPENDENT_CASES) {
      const s = c.scenario;
      const setup = toSetup(s);
      const ign = toIgnition(s);
      const solver = new DescentSolver(setup, landreachConicBackend(), ign);
      const o: Outcome = { c, ref: {}, solverLength: solver.scales.length };
      let t: number | null = null;
      if (c.mode.kind === 'fixed') {
        t = c.mode.timeOfFlight_s;
        o.fixed = solver.solveFixed('min-propellant', t, s.target_m, ign);
        o.infeasible = solver.solveFixed('min-propellant', c.mode.infeasibleTime_s, s.target_m, ign);
        ask(o, 'infeasible', { ...s, timeOfFlight_s: c.mode.infeasibleTime_s });
      } else {
        o.free = searchFreeFinalTime(solver, s.target_m, ign);
        const { lower_s, upper_s, grid } = c.mode;
        ask(o, 'search', { ...s, search: { lower_s, upper_s, grid, tol_s: c.mode.kind === 'free' ? c.mode.tol_s : undefined } });
        if (c.mode.kind === 'free') t = o.free.timeOfFlight;
        if (c.mode.kind === 'unreachable' && Number.isFinite(o.free.timeOfFlight)) {
          ask(o, 'landingError', { ...s, problem: 'min-landing-error', timeOfFlight_s: o.free.timeOfFlight });
        }
        if (c.mode.kind === 'unreachable' && c.active.includes('altitude')) {
          const open = { ...s, constraints: { ...s.constraints, minAltitude_m: null } };
          o.freeWithoutFloor = searchFreeFinalTime(new DescentSolver(toSetup(open), landreachConicBackend(), ign), s.target_m, ign);
          ask(o, 'withoutFloor', { ...open, timeOfFlight_s: o.freeWithoutFloor.timeOfFlight });
        }
      }
      if (t !== null) {
        ask(o, 'base', { ...s, timeOfFlight_s: t });
        for (const claim of c.active) ask(o, `without:${claim}`, { ...without(s, claim), timeOfFlight_s: t });
      }
      outcomes.push(o);
    }
    runReference(jobs).forEach((r, i) => {
      asked[i].o.ref[asked[i].key] = r;
    });
  });

  for (const c of INDEPENDENT_CASES) {
    it(`${c.scenario.id}: ${c.description}`, () => {
      const o = outcomes.find((q) => q.c === c)!;
      const s = c.scenario;
      if (c.mode.kind === 'fixed') {
        expect(o.fixed!.status).toBe('solved');
        expectAgreement(o.fixed!.propellant, o.ref.base);
        // Same verdict at a time too short to land.
        expect(isPrimalInfeasible(o.infeasible!.status)).toBe(true);
        expect(o.ref.infeasible.status).toBe('infeasible');
      }
      if (c.mode.kind === 'free') {
        const search = o.ref.search;
        expect(o.free!.status).toBe('solved');
        expect(search.status).toBe('optimal');
        expect(search.atGridEdge).toBe(false); // the reference's minimum lies inside its interval
        expectAgreement(o.free!.propellant, o.ref.base);
        expect(o.free!.propellant).toBeLessThanOrEqual(search.propellant_kg! * (1 + AGREEMENT) + SEARCH_PROPELLANT_TOLERANCE);
      }
      if (c.mode.kind !== 'unreachable') {
        // Each claimed constraint binds: ≈ 0 slack in the reference, and its optimum moves without it.
        const base = o.ref.base;
        for (const claim of c.active) {
          if (relaxable.has(claim)) expect(Math.abs(relativeSlack(s, base.margins!, claim)), claim).toBeLessThan(ACTIVE_SLACK);
          // (At a free-t_f optimum on the edge of the feasible times the variant may even be infeasible.)
          const alt = o.ref[`without:${claim}`];
          const moved = alt.status === 'infeasible' ? Infinity : Math.abs(alt.propellant_kg! - base.propellant_kg!) / base.propellant_kg!;
          expect(moved, claim).toBeGreaterThan(SENSITIVITY);
        }
        expect(base.margins!.losslessGap).toBeLessThan(1e-6); // σ = ‖u‖ in the reference too
      }
      if (c.mode.kind === 'unreachable') {
        const search = o.ref.search;
        expect(search.status).toBe('infeasible');
        expect(search.failures).toBe(0); // a certificate at every grid time
        expect(search.evaluations!.every(([, p]) => p === null)).toBe(true);
        expect(o.free!.status).toBe('unreachable');
        expect(o.free!.infeasibleStatuses.length).toBeGreaterThan(0);
        expect(o.free!.infeasibleStatuses.every(isPrimalInfeasible)).toBe(true);
        if (o.ref.landingError) {
          // Closest landing point at our t_f: ours minimises e/L − w·z_f (program.ts), the reference e
          // alone, over the same feasible set. So e_ref ≤ e_ours ≤ e_ref + L·w·(z_ours − z_ref) ≤
          // e_ref + L·w·ln(m0/m_dry).
          const ref = o.ref.landingError;
          expect(ref.status).toBe('optimal');
          const slack = o.solverLength * MIN_ERROR_PROPELLANT_WEIGHT * Math.log(s.ignition.mass_kg / s.vehicle.dryMass_kg);
          expect(o.free!.miss).toBeGreaterThanOrEqual(ref.miss_m! * (1 - AGREEMENT));
          expect(o.free!.miss).toBeLessThanOrEqual(ref.miss_m! * (1 + AGREEMENT) + slack);
        }
        if (c.active.includes('altitude')) {
          // Outside reason: the vertical speed falls at most at ρ2/m_dry − g (full thrust, lightest
          // mass), so from 40 m/s it cannot reach zero within 150 m: the vehicle must cross the plane.
          const { rho2 } = deriveVehicle(toSetup(s).vehicle);
          const brake = rho2 / s.vehicle.dryMass_kg + s.planet.gravity[2];
          expect(s.ignition.velocity_mps[2] ** 2 / (2 * brake)).toBeGreaterThan(s.ignition.position_m[2] - s.target_m[2]);
          // Without the floor both find a landing, with the same propellant at our t_f.
          expect(o.freeWithoutFloor!.status).toBe('solved');
          const open = o.ref.withoutFloor;
          expectAgreement(o.freeWithoutFloor!.propellant, open);
          expect(Math.min(...open.altitude_m!)).toBeLessThan(-1); // and that landing dips below the plane
        }
      }
    });
  }

  it('the claims cover every constraint, free and fixed t_f, ZOH and FOH, and an unreachable target', () => {
    const claims = new Set(INDEPENDENT_CASES.flatMap((c) => c.active));
    for (const k of ['upperThrust', 'lowerThrust', 'pointing', 'glideSlope', 'speed', 'altitude', 'rotation', 'gate'] as Claim[]) expect(claims.has(k), k).toBe(true);
    const kinds = new Set(INDEPENDENT_CASES.map((c) => c.mode.kind));
    expect([...kinds].sort()).toEqual(['fixed', 'free', 'unreachable']);
    expect(new Set(INDEPENDENT_CASES.map((c) => c.scenario.hold))).toEqual(new Set(['zoh', 'foh']));
    expect(INDEPENDENT_CASES.length).toBeGreaterThanOrEqual(6);
  });
});
