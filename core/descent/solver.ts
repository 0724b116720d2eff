/**
 * One descent solver per setup: it keeps one solver session per problem kind, opened once, and
 * re-solves it with new values for each time of flight, target and ignition state.
 */
import type { ConicSolution, SolveStatus } from '../conic/types.ts';
import { isInfeasible, isSolved } from '../conic/types.ts';
import type { ConicBackend, ConicSession } from './backend.ts';
import type { Vec3 } from './constants.ts';
import type { ProgramData, ProgramKind, ProgramScales } from './program.ts';
import { DescentProgram, chooseScales, landsOnTarget, NODE } from './program.ts';
import type { DescentSetup, IgnitionState } from './setup.ts';
import { validateIgnition, validateSetup } from './setup.ts';

export interface FixedTimeSolve {
  kind: ProgramKind;
  timeOfFlight: number;
  status: SolveStatus;
  /** Propellant used, kg (NaN unless solved). */
  propellant: number;
  /** Horizontal miss from the target, m (minimum-landing-error problems; NaN otherwise or unless solved). */
  miss: number;
  solution: ConicSolution;
}

export class DescentSolver {
  readonly scales: ProgramScales;
  private readonly programs = new Map<ProgramKind, { program: DescentProgram; session: ConicSession; last: ConicSolution | null }>();
  /** Number of conic solves so far. */
  solves = 0;
  /**
   * Start each solve from the last solved point of the same problem kind (a neighbouring time of flight
   * or target). Measured on the demo study at N = 30–50: 11–12 interior-point iterations cold, 6–8 warm.
   */
  warmStart = true;
  /** Warm-started solves that ended without an answer and were solved again from a cold start. */
  coldRetries = 0;

  constructor(
    readonly setup: DescentSetup,
    readonly backend: ConicBackend,
    nominalIgnition: IgnitionState,
  ) {
    validateSetup(setup);
    validateIgnition(nominalIgnition, setup);
    this.nominal = nominalIgnition;
    this.scales = chooseScales(setup, Math.hypot(...nominalIgnition.position));
  }

  private readonly nominal: IgnitionState;

  program(kind: ProgramKind): DescentProgram {
    return this.entry(kind, { timeOfFlight: 60, target: [0, 0, 0], ignition: this.nominal }).program;
  }

  private entry(kind: ProgramKind, data: ProgramData) {
    if (kind === 'max-divert' && data.direction === undefined) {
      data = { ...data, direction: [1, 0], propellantBudget: 0.5 * (data.ignition.mass - this.setup.vehicle.dryMass) };
    }
    let e = this.programs.get(kind);
    if (!e) {
      const program = new DescentProgram(this.setup, kind, data, this.scales);
      e = { program, session: this.backend.open(program.problem), last: null };
      this.programs.set(kind, e);
    }
    return e;
  }

  /**
   * Back to the state of a new solver: no warm start from earlier solves, and every conic session as
   * newly opened (its equilibration starts afresh). Solves after a reset give the same bits as on a new
   * DescentSolver with the same setup (the symbolic analysis is kept: it depends on the pattern only).
   */
  reset(): void {
    for (const e of this.programs.values()) {
      e.last = null;
      e.session.reset?.();
    }
  }

  /**
   * The last solved point of each problem kind, to start later solves from (`resetTo`). Monte Carlo samples
   * start from the nominal optimum this way: a fixed start, so a sample does not depend on the samples its
   * worker solved before, without paying a cold start per sample.
   */
  warmStarts(): ReadonlyMap<ProgramKind, ConicSolution> {
    const out = new Map<ProgramKind, ConicSolution>();
    // Copies: a later solve must not change what was saved.
    for (const [kind, e] of this.programs) {
      if (e.last) out.set(kind, { ...e.last, x: e.last.x.slice(), y: e.last.y.slice(), z: e.last.z.slice(), s: e.last.s.slice() });
    }
    return out;
  }

  /** `reset()`, then warm starts from `saved` (from `warmStarts()` of a solver with the same setup). */
  resetTo(saved: ReadonlyMap<ProgramKind, ConicSolution>): void {
    this.reset();
    for (const [kind, solution] of saved) {
      const e = this.programs.get(kind);
      if (e) e.last = solution;
    }
  }

  /** Solves one fixed-final-time problem (`extra`: the direction and budget of a max-divert problem). */
  solveFixed(
    kind: ProgramKind,
    timeOfFlight: number,
    target: Vec3,
    ignition: IgnitionState,
    extra: Pick<ProgramData, 'direction' | 'propellantBudget' | 'thrustDirections' | 'throttleIntervals'> = {},
  ): FixedTimeSolve {
    const data: ProgramData = { timeOfFlight, target, ignition, ...extra };
    const e = this.entry(kind, data);
    e.session.update(e.program.update(data));
    const warm = this.warmStart && e.last ? e.last : undefined;
    let solution = e.session.solve(warm && { x: warm.x, y: warm.y, z: warm.z, s: warm.s });
    this.solves++;
    // A warm start far from a nearly infeasible problem's path can end without an answer: retry cold.
    if (warm && !isSolved(solution.status) && !isInfeasible(solution.status)) {
      solution = e.session.solve();
      this.solves++;
      this.coldRetries++;
    }
    if (solution.status === 'solved') e.last = solution;
    let propellant = NaN;
    let miss = NaN;
    if (solution.status === 'solved' || solution.status === 'almost-solved') {
      const N = this.setup.nodes;
      const zf = e.program.value(solution.x, (N - 1) * NODE.size + NODE.z);
      propellant = ignition.mass - Math.exp(zf);
      if (kind === 'min-landing-error') {
        const o = (N - 1) * NODE.size + NODE.r;
        miss = Math.hypot(e.program.value(solution.x, o) - target[0], e.program.value(solution.x, o + 1) - target[1]);
      }
    }
    return { kind, timeOfFlight, status: solution.status, propellant, miss, solution };
  }

  /**
   * dJ/dt_f at a solved point, J the problem's objective in solver units, by the envelope theorem: with
   * Aᵀy + Gᵀz + c = 0 at the optimum, dJ/dt_f = ∂L/∂t_f = yᵀ(A′x − b′) + zᵀ(G′x − h′), where the data
   * derivatives come from central differences of the problem refresh (no extra solve). NaN unless solved.
   */
  objectiveSlope(r: FixedTimeSolve, target: Vec3, ignition: IgnitionState): number {
    if (!(r.status === 'solved' || r.status === 'almost-solved')) return NaN;
    const e = this.programs.get(r.kind)!;
    const P = e.program.problem;
    const eps = 1e-5 * r.timeOfFlight;
    const { x, y, z } = r.solution;
    // L(t) = yᵀ(A(t)x − b(t)) + zᵀ(G(t)x − h(t)) at the fixed solution; dJ/dt_f = L′(t_f) (central difference).
    const lagrangianTerms = (tf: number) => {
      e.program.update({ timeOfFlight: tf, target, ignition });
      let sum = 0;
      for (let i = 0; i < P.b.length; i++) sum -= y[i] * P.b[i];
      for (let i = 0; i < P.h.length; i++) sum -= z[i] * P.h[i];
      for (const [M, w] of [[P.A, y], [P.G, z]] as const) {
        for (let j = 0; j < M.n; j++) {
          const xj = x[j];
          if (xj === 0) continue;
          for (let q = M.colPtr[j]; q < M.colPtr[j + 1]; q++) sum += w[M.rowIdx[q]] * M.values[q] * xj;
        }
      }
      return sum;
    };
    return (lagrangianTerms(r.timeOfFlight + eps) - lagrangianTerms(r.timeOfFlight - eps)) / (2 * eps);
  }

  /**
   * dPropellant/dt_f at a solved minimum-propellant point, kg/s: J = −z_N, so dP/dt_f = e^{z_N} dJ/dt_f.
   * NaN unless `r` is a solved minimum-propellant result.
   */
  timeDerivative(r: FixedTimeSolve, target: Vec3, ignition: IgnitionState): number {
    if (!landsOnTarget(r.kind)) return NaN;
    return (ignition.mass - r.propellant) * this.objectiveSlope(r, target, ignition);
  }
}
