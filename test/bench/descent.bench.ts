/**
 * Descent benchmark: free-final-time solves for a grid of targets around the demo study's nominal
 * target, warm-started from the neighbour's t_f as a footprint run would, with our solver and with
 * CVXOPT (conelp through the test bridge; a dense KKT factorisation with second-order cones) running the
 * very same search on a few of the targets.
 * Target (issue 3): one free-final-time target solve under 20 ms at N = 50. Two paths are timed: the
 * bracketing search warm-started from the neighbour's t_f (`descent.msPerTarget`), and the footprint's
 * continuation path for neighbouring targets (`descent.continuation.*`).
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseStudyText, studyToDescent } from '../../core/study/index.ts';
import { DescentSolver } from '../../core/descent/solver.ts';
import { searchFreeFinalTime } from '../../core/descent/search.ts';
import { landreachConicBackend } from '../../core/descent/conicBackend.ts';
import { DescentProgram } from '../../core/descent/program.ts';
import type { Vec3 } from '../../core/descent/constants.ts';
import { cvxoptAvailable } from '../reference/cvxopt.ts';
import { cvxoptBackend } from '../reference/descent/cvxoptBackend.ts';
import { descentEvaluator } from '../../core/footprint/descentEvaluator.ts';
import { TARGET } from '../../core/footprint/field.ts';

const DEMO = fileURLToPath(new URL('../../assets/demo/demo-lander.study.json', import.meta.url));

function targets(n: number, spacing: number): Vec3[] {
  // Row-major grid visited in a serpentine so every target has a solved neighbour before it.
  const out: Vec3[] = [];
  const h = (n - 1) / 2;
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const ii = j % 2 === 0 ? i : n - 1 - i;
      out.push([(ii - h) * spacing, (j - h) * spacing, 0]);
    }
  }
  return out;
}

export async function benchDescent(): Promise<Record<string, number>> {
  const d = studyToDescent(parseStudyText(readFileSync(DEMO, 'utf8')));
  const setup = { ...d.setup, nodes: 50 };
  const grid = targets(5, 300);
  const ours = new DescentSolver(setup, landreachConicBackend(), d.ignition);
  // Warm-up (JIT) on the nominal target, then cold searches (no neighbour), each on a fresh solver (so
  // ordering and symbolic analysis included): the median of five, as the first ones still run partly on
  // V8's baseline tiers.
  searchFreeFinalTime(ours, [0, 0, 0], d.ignition, { decode: false });
  const coldTimes: number[] = [];
  let coldSolves = 0;
  for (let r = 0; r < 5; r++) {
    const coldSolver = new DescentSolver(setup, landreachConicBackend(), d.ignition);
    const tc = performance.now();
    searchFreeFinalTime(coldSolver, [150, -150, 0], d.ignition, { decode: false });
    coldTimes.push(performance.now() - tc);
    coldSolves = coldSolver.solves;
  }
  const coldMs = coldTimes.sort((a, b) => a - b)[2];
  let tfGuess: number | undefined;
  const solvesBefore = ours.solves;
  let solved = 0;
  const t0 = performance.now();
  for (const t of grid) {
    const r = searchFreeFinalTime(ours, t, d.ignition, { tfGuess, decode: false });
    if (r.status === 'solved') {
      tfGuess = r.timeOfFlight;
      solved++;
    }
  }
  const oursMs = performance.now() - t0;
  const oursSolves = ours.solves - solvesBefore;

  // Problem refresh alone (values for a new t_f and target, pattern kept).
  const prog = new DescentProgram(setup, 'min-propellant', { timeOfFlight: 40, target: [0, 0, 0], ignition: d.ignition });
  const reps = 2000;
  const t1 = performance.now();
  for (let k = 0; k < reps; k++) prog.update({ timeOfFlight: 30 + (k % 20), target: [k, -k, 0], ignition: d.ignition });
  const refreshUs = ((performance.now() - t1) / reps) * 1000;

  // The footprint's path for a neighbour (core/footprint/descentEvaluator.ts: t_f extrapolated along the
  // row, two opening probes, certified slope search; the bracketing search only as a fallback), at the
  // solver's default 1e-8 tolerances and N = 50. A first pass over the grid warms the JIT up; a fresh
  // evaluator, primed on the nominal target (its symbolic analysis), is then timed.
  const continuation = () => {
    const ev = descentEvaluator({ setup, ignition: d.ignition, targetHeight_m: 0, solver: {} });
    ev(0, 0, undefined);
    return ev;
  };
  const runContinuation = (ev: ReturnType<typeof continuation>) => {
    let tf: number | undefined;
    let solves = 0;
    const outcomes = grid.map((t) => {
      const o = ev(t[0], t[1], tf);
      if (o.code === TARGET.reachable) tf = o.timeOfFlight_s;
      solves += o.solves;
      return o;
    });
    return { outcomes, solves };
  };
  runContinuation(continuation());
  const evTimed = continuation();
  const t4 = performance.now();
  const cont = runContinuation(evTimed);
  const contMs = performance.now() - t4;
  // Agreement with the bracketing search run above to a tighter t_f tolerance (same targets).
  const check = new DescentSolver(setup, landreachConicBackend(), d.ignition);
  let checkGuess: number | undefined;
  let maxDiff = 0;
  grid.forEach((t, k) => {
    const r = searchFreeFinalTime(check, t, d.ignition, { tfGuess: checkGuess, decode: false, tfTolerance: 0.02 });
    if (r.status === 'solved') {
      checkGuess = r.timeOfFlight;
      maxDiff = Math.max(maxDiff, Math.abs(r.propellant - cont.outcomes[k].propellant_kg));
    }
  });

  const out: Record<string, number> = {
    'descent.targets': grid.length,
    'descent.continuation.msPerTarget': contMs / grid.length,
    'descent.continuation.solvesPerTarget': cont.solves / grid.length,
    'descent.continuation.maxPropellantDiff_kg': maxDiff,
    'descent.solvedTargets': solved,
    'descent.msPerTarget': oursMs / grid.length,
    'descent.solvesPerTarget': oursSolves / grid.length,
    'descent.msPerSolve': oursMs / oursSolves,
    'descent.refreshUsPerSolve': refreshUs,
    'descent.cold.msPerTarget': coldMs,
    'descent.cold.solvesPerTarget': coldSolves,
  };

  if (cvxoptAvailable()) {
    const sub = grid.slice(0, 3);
    const be = cvxoptBackend();
    const ref = new DescentSolver(setup, be, d.ignition);
    const ourSub = new DescentSolver(setup, landreachConicBackend(), d.ignition);
    let guessRef: number | undefined;
    let guessOurs: number | undefined;
    const t2 = performance.now();
    for (const t of sub) {
      const r = searchFreeFinalTime(ref, t, d.ignition, { tfGuess: guessRef, decode: false });
      if (r.status === 'solved') guessRef = r.timeOfFlight;
    }
    const refWallMs = performance.now() - t2;
    const t3 = performance.now();
    for (const t of sub) {
      const r = searchFreeFinalTime(ourSub, t, d.ignition, { tfGuess: guessOurs, decode: false });
      if (r.status === 'solved') guessOurs = r.timeOfFlight;
    }
    const oursSubMs = performance.now() - t3;
    // The continuation path on CVXOPT: the same evaluator, the same first targets, conelp time only.
    const beCont = cvxoptBackend();
    const evRef = descentEvaluator({ setup, ignition: d.ignition, targetHeight_m: 0 }, beCont);
    evRef(0, 0, undefined);
    const solverSecondsBefore = beCont.stats.solverSeconds;
    let tfRef: number | undefined;
    for (const t of sub) {
      const o = evRef(t[0], t[1], tfRef);
      if (o.code === TARGET.reachable) tfRef = o.timeOfFlight_s;
    }
    const evOurs = continuation();
    let tfOurs: number | undefined;
    const t5 = performance.now();
    for (const t of sub) {
      const o = evOurs(t[0], t[1], tfOurs);
      if (o.code === TARGET.reachable) tfOurs = o.timeOfFlight_s;
    }
    const oursContSubMs = performance.now() - t5;
    const cvxContMs = (beCont.stats.solverSeconds - solverSecondsBefore) * 1000;
    out['descent.continuation.cvxopt.msPerTarget'] = cvxContMs / sub.length;
    out['descent.continuation.speedupVsCvxopt'] = cvxContMs / oursContSubMs;
    out['descent.cvxopt.msPerTarget'] = (be.stats.solverSeconds * 1000) / sub.length;
    out['descent.cvxopt.wallMsPerTarget'] = refWallMs / sub.length;
    out['descent.cvxopt.solvesPerTarget'] = be.stats.solves / sub.length;
    // > 1 means ours is faster; CVXOPT time counts only conelp itself (process start-up excluded).
    out['descent.speedupVsCvxopt'] = (be.stats.solverSeconds * 1000) / oursSubMs;
  }
  return out;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  benchDescent().then((r) => {
    for (const [k, v] of Object.entries(r)) console.log(`${k.padEnd(34)} ${v.toPrecision(4)}`);
  });
}
