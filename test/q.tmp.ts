import { readFileSync } from 'node:fs';
import { parseStudyText, studyToDescent } from '../core/study/index.ts';
import { DescentSolver } from '../core/descent/solver.ts';
import { searchFreeFinalTime } from '../core/descent/search.ts';
import { searchFreeFinalTimeBySlope, optimalValueSlope } from '../core/descent/slopeSearch.ts';
import { landreachConicBackend } from '../core/descent/conicBackend.ts';
const d = studyToDescent(parseStudyText(readFileSync('assets/demo/demo-lander.study.json', 'utf8')));
const nodes = 30;
const s = new DescentSolver({ ...d.setup, nodes }, landreachConicBackend(), d.ignition);
// envelope slope vs finite difference of J
const f1 = s.solveFixed('min-propellant', 50, [0, 0, 0], d.ignition);
const g = optimalValueSlope(s, f1, [0, 0, 0], d.ignition);
const fp = s.solveFixed('min-propellant', 50.01, [0, 0, 0], d.ignition).solution.info.primalObjective;
const fm = s.solveFixed('min-propellant', 49.99, [0, 0, 0], d.ignition).solution.info.primalObjective;
console.log('slope envelope', g, 'fd', (fp - fm) / 0.02);
const ref = new DescentSolver({ ...d.setup, nodes }, landreachConicBackend(), d.ignition);
let tf: number | undefined, k: number | undefined, tfr: number | undefined;
let worst = 0, solves = 0, rsolves = 0, fast = 0;
const u0 = process.cpuUsage();
let t1 = 0;
for (let j = 0; j < 7; j++) for (let i = 0; i < 7; i++) {
  const ii = j % 2 ? 6 - i : i; const target: [number, number, number] = [(ii - 3) * 200, (j - 3) * 200, 0];
  const c0 = process.cpuUsage().user;
  const r = searchFreeFinalTimeBySlope(s, target, d.ignition, { tfGuess: tf, curvatureGuess: k });
  t1 += process.cpuUsage().user - c0;
  const q = searchFreeFinalTime(ref, target, d.ignition, { tfGuess: tfr, decode: false });
  if (r.result.status === 'solved') { tf = r.result.timeOfFlight; if (Number.isFinite(r.curvature)) k = r.curvature; }
  if (q.status === 'solved') tfr = q.timeOfFlight;
  solves += r.result.solves; rsolves += q.solves; if (r.fast) fast++;
  if (r.result.status !== q.status) console.log('status differs', target, r.result.status, q.status);
  else if (q.status === 'solved') worst = Math.max(worst, r.result.propellant - q.propellant);
  if (q.status === 'solved' && r.result.propellant - q.propellant > 0.01) console.log(target, r.result.propellant, q.propellant, r.result.timeOfFlight, q.timeOfFlight, r.fast);
}
console.log('worst excess kg', worst, 'solves/target slope', solves / 49, 'robust', rsolves / 49, 'fast', fast, 'cpu ms/target slope', (t1 / 1000 / 49).toFixed(1));
