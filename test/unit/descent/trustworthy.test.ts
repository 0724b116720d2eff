/**
 * Trustworthy answers (each case was a wrong answer once): no trajectory through the ground by default, no
 * lossy relaxation reported as solved, a propellant tolerance that the free-final-time search really
 * certifies, and the edge cases of the node count and far targets. References: the physics itself (the
 * landing plane, the relaxation's losslessness ‖u‖ = σ from Açıkmeşe & Ploen 2007) and direct fixed-t_f solves.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { discretisationCheck } from '../../../core/descent/refine.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { DescentSolver } from '../../../core/descent/solver.ts';
import type { FixedTimeSolve } from '../../../core/descent/solver.ts';
import { LOSSLESS_TOLERANCE } from '../../../core/descent/trajectory.ts';
import { parseStudyText, studyToDescent } from '../../../core/study/index.ts';
import { StudyError } from '../../../core/study/load.ts';

const demoText = readFileSync(fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url)), 'utf8');
/** The demo study with edits (a JSON round trip of the invented demo). */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- a free-form JSON edit of a test fixture
function variant(edit: (s: Record<string, any>) => void) {
  const s = JSON.parse(demoText);
  edit(s);
  return JSON.stringify(s);
}
const noConstraints = (position: number[], velocity: number[]) => variant((s) => {
  delete s.constraints;
  s.ignition = { position_m: position, velocity_mps: velocity };
});

describe('the landing plane is a constraint by default', () => {
  it('a study without a constraints section keeps every node at or above the target plane (was 39 of 50 below, −220 m)', () => {
    // Ignition 1 km up and 800 m west, moving east and down: reachable with the demo lander.
    const d = studyToDescent(parseStudyText(noConstraints([-800, 0, 1000], [60, 0, -40])));
    expect(d.setup.constraints.minAltitude).toBe(0);
    const r = searchFreeFinalTime(new DescentSolver(d.setup, landreachConicBackend(), d.ignition), d.target, d.ignition);
    expect(r.status).toBe('solved');
    const z = r.trajectory!.series.z;
    // Every node is at or above the plane z = 0 (solver tolerance 1e-8 relative on a ~1 km length scale).
    for (let k = 0; k < z.length; k++) expect(z[k]).toBeGreaterThan(-1e-4);
  });

  it('the same state 400 m up, without the floor, passes far below the plane; with it the answer is not a landing below ground', () => {
    const text = noConstraints([-2500, 400, 400], [90, -10, -70]);
    const off = variant((s) => {
      delete s.constraints;
      s.constraints = { stayAboveLandingPlane: false };
      s.ignition = { position_m: [-2500, 400, 400], velocity_mps: [90, -10, -70] };
    });
    const dOff = studyToDescent(parseStudyText(off));
    const rOff = searchFreeFinalTime(new DescentSolver(dOff.setup, landreachConicBackend(), dOff.ignition), dOff.target, dOff.ignition);
    expect(Math.min(...rOff.trajectory!.series.z)).toBeLessThan(-100); // the reported defect, switched off knowingly
    const d = studyToDescent(parseStudyText(text));
    const r = searchFreeFinalTime(new DescentSolver(d.setup, landreachConicBackend(), d.ignition), d.target, d.ignition);
    // Falling at 70 m/s from 400 m the lander cannot stop above the plane: net deceleration at full
    // throttle is 6·3300·cos 20°·0.85/2100 − 3.71 ≈ 3.8 m/s², stopping distance 70²/(2·3.8) ≈ 650 m > 400 m.
    expect(r.status).not.toBe('solved');
    if (r.trajectory) for (const z of r.trajectory.series.z) expect(z).toBeGreaterThan(-1e-4);
  });

  it('an ignition point below the landing plane is an input error naming the field', () => {
    let err: unknown;
    try {
      parseStudyText(noConstraints([-2500, 400, -500], [90, -10, -70]));
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(StudyError);
    const text = (err as StudyError).problems.map((p) => `${p.field} ${p.message}`).join('\n');
    expect(text).toMatch(/ignition\.position_m/);
    expect(text).toMatch(/below the altitude floor/);
    expect(text).toMatch(/stayAboveLandingPlane/);
  });

  it('a negative minimum altitude needs the floor switched off explicitly', () => {
    expect(() => parseStudyText(variant((s) => { s.constraints.minAltitude_m = -50; }))).toThrow(/minAltitude_m/);
    const d = studyToDescent(parseStudyText(variant((s) => { s.constraints.minAltitude_m = -50; s.constraints.stayAboveLandingPlane = false; })));
    expect(d.setup.constraints.minAltitude).toBe(-50);
  });
});

/** The smallest relaxed propellant over a dense scan of fixed times of flight around t0 (an outside check of the search). */
function scanMinimum(solver: DescentSolver, t0: number, half: number, step: number, target: readonly [number, number, number], ign: Parameters<DescentSolver['solveFixed']>[3]) {
  let best: FixedTimeSolve | null = null;
  for (let t = t0 - half; t <= t0 + half + 1e-9; t += step) {
    const r = solver.solveFixed('min-propellant', t, target, ign);
    if (r.status === 'solved' && (!best || r.propellant < best.propellant)) best = r;
  }
  return best!;
}

describe('lossless or flagged, and a propellant tolerance that holds', () => {
  const vertical = noConstraints([0, 0, 1500], [0, 0, -60]);

  it('a vertical descent from 1,500 m at 60 m/s: "solved" only with a lossless thrust, within 0.01 kg of the best time of flight (was 162.37 kg with σ − ‖u‖ at 8.3 % of full-throttle acceleration)', () => {
    const d = studyToDescent(parseStudyText(vertical));
    const r = searchFreeFinalTime(new DescentSolver(d.setup, landreachConicBackend(), d.ignition), d.target, d.ignition);
    if (r.status === 'solved') {
      expect(r.trajectory!.diagnostics.losslessnessGapRelative).toBeLessThanOrEqual(LOSSLESS_TOLERANCE);
    } else {
      expect(r.status).toBe('relaxation-gap');
    }
    // The stated tolerance against a dense scan of fixed-t_f solves (0.01 s apart, then ±0.01 s finer):
    // nothing in the scan beats the answer by more than 0.01 kg, and the certified lower bound is below the scan.
    const scan = new DescentSolver(d.setup, landreachConicBackend(), d.ignition);
    const coarse = scanMinimum(scan, r.timeOfFlight, 1.5, 0.05, d.target, d.ignition);
    const fine = scanMinimum(scan, coarse.timeOfFlight, 0.05, 0.005, d.target, d.ignition);
    expect(r.propellantLowerBound).toBeLessThanOrEqual(fine.propellant + 1e-6);
    if (r.status === 'solved') expect(r.propellant - fine.propellant).toBeLessThanOrEqual(0.01 + 1e-6);
  });

  it('a throttle range of width 1e-9 is never a lossy "solved" (was solved with σ − ‖u‖ at 65 % of full throttle)', () => {
    const d = studyToDescent(parseStudyText(variant((s) => { s.vehicle.throttleMin = 0.85 - 1e-9; })));
    const r = searchFreeFinalTime(new DescentSolver(d.setup, landreachConicBackend(), d.ignition), d.target, d.ignition);
    if (r.status === 'solved') expect(r.trajectory!.diagnostics.losslessnessGapRelative).toBeLessThanOrEqual(LOSSLESS_TOLERANCE);
    else expect(['relaxation-gap', 'unreachable']).toContain(r.status);
    if (r.status === 'relaxation-gap') {
      expect(Number.isFinite(r.propellantLowerBound)).toBe(true);
      if (Number.isFinite(r.propellant)) expect(r.propellant).toBeGreaterThanOrEqual(r.propellantLowerBound - 1e-6);
    }
  });

  it('demo targets: the answer is within the stated 0.01 kg of a dense fixed-t_f scan', () => {
    const d = studyToDescent(parseStudyText(demoText));
    const setup = { ...d.setup, nodes: 30 };
    const solver = new DescentSolver(setup, landreachConicBackend(), d.ignition);
    const scan = new DescentSolver(setup, landreachConicBackend(), d.ignition);
    for (const target of [[0, 0, 0], [600, -300, 0], [-900, 900, 0]] as [number, number, number][]) {
      const r = searchFreeFinalTime(solver, target, d.ignition, { decode: false });
      expect(r.status).toBe('solved');
      const coarse = scanMinimum(scan, r.timeOfFlight, 2, 0.1, target, d.ignition);
      const fine = scanMinimum(scan, coarse.timeOfFlight, 0.1, 0.01, target, d.ignition);
      expect(r.propellant - fine.propellant).toBeLessThanOrEqual(0.01 + 1e-6);
      expect(r.propellantLowerBound).toBeLessThanOrEqual(fine.propellant + 1e-6);
    }
  });
});

describe('edge cases that once threw away or misreported a result', () => {
  it('at the 2,000-node limit there is nothing finer: no check, and no exception that would discard the result', () => {
    const d = studyToDescent(parseStudyText(demoText));
    // A stand-in coarse result: the check only reads status, t_f and propellant from it.
    const coarse = { status: 'solved', timeOfFlight: 36.6, propellant: 218.7 } as Parameters<typeof discretisationCheck>[4];
    let check: ReturnType<typeof discretisationCheck> | undefined;
    expect(() => { check = discretisationCheck({ ...d.setup, nodes: 2000 }, landreachConicBackend(), d.ignition, [0, 0, 0], coarse); }).not.toThrow();
    expect(check).toBeNull(); // nothing finer than the limit
  });

  it('a target 1,000 km away is unreachable with a closest point, not "no soft landing anywhere"', () => {
    const d = studyToDescent(parseStudyText(demoText));
    const target: [number, number, number] = [1e6, 0, 0];
    const r = searchFreeFinalTime(new DescentSolver({ ...d.setup, nodes: 30 }, landreachConicBackend(), d.ignition), target, d.ignition, { decode: false });
    expect(r.status).toBe('unreachable');
    expect(r.closestPoint).not.toBeNull();
    // The closest point lies toward the target and the miss is the distance to it.
    expect(r.closestPoint![0]).toBeGreaterThan(1000);
    expect(Math.hypot(r.closestPoint![0] - target[0], r.closestPoint![1] - target[1])).toBeCloseTo(r.miss, 3);
  });
});

describe('solver failures are never reported as unreachable', () => {
  /** A solver whose minimum-propellant solves end at the iteration limit without a certificate. */
  class FailingPropellant extends DescentSolver {
    override solveFixed(...args: Parameters<DescentSolver['solveFixed']>): FixedTimeSolve {
      const r = super.solveFixed(...args);
      if (args[0] !== 'min-propellant') return r;
      return { ...r, status: 'max-iterations', propellant: NaN };
    }
  }
  const d = studyToDescent(parseStudyText(demoText));
  const setup = { ...d.setup, nodes: 30 };

  it('a far target whose propellant solves fail without a certificate is a solver failure', () => {
    const r = searchFreeFinalTime(new FailingPropellant(setup, landreachConicBackend(), d.ignition), [12000, 0, 0], d.ignition, { decode: false });
    expect(r.status).toBe('solver-failure');
  });

  it('a reachable target whose propellant solves fail (zero landing error) is a solver failure', () => {
    const r = searchFreeFinalTime(new FailingPropellant(setup, landreachConicBackend(), d.ignition), [200, 0, 0], d.ignition, { decode: false });
    expect(r.status).toBe('solver-failure');
  });
});
