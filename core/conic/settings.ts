/** Solver settings: every option, its meaning and its default. Validated once, at construction. */
export interface SolverSettings {
  /** Iteration limit. Default 100. */
  maxIterations: number;
  /** Primal and dual residual tolerance, relative to the data norms. Default 1e-8. */
  feasibilityTolerance: number;
  /** Absolute duality-gap tolerance. Default 1e-8. */
  gapAbsoluteTolerance: number;
  /** Relative duality-gap tolerance. Default 1e-8. */
  gapRelativeTolerance: number;
  /** Infeasibility-certificate tolerance: ‖Aᵀy + Gᵀz‖ with bᵀy + hᵀz = −1 (resp. ‖Ax‖, ‖Gx + s‖ with cᵀx = −1). Default 1e-8. */
  infeasibilityTolerance: number;
  /** Reduced-accuracy counterparts, used for the `almost-*` outcomes. Defaults 1e-4, 5e-5, 5e-5, 1e-5. */
  feasibilityToleranceInaccurate: number;
  gapAbsoluteToleranceInaccurate: number;
  gapRelativeToleranceInaccurate: number;
  infeasibilityToleranceInaccurate: number;
  /** Fraction of the step to the cone boundary that is taken. Default 0.99. */
  stepFraction: number;
  /** Smallest step before the solver declares it is stuck. Default 1e-8. */
  minStep: number;
  /** Static KKT regularisation δ (relative to the largest diagonal entry). Default 1e-8. */
  staticRegularisation: number;
  /** Dynamic regularisation: pivots smaller than this are replaced by ±`dynamicRegularisationDelta`. Default 1e-13. */
  dynamicRegularisationEps: number;
  /** Default 2e-7. */
  dynamicRegularisationDelta: number;
  /**
   * Iterative-refinement steps (at most) of the τ-direction and predictor solves; the corrector is the
   * refined predictor plus an unrefined solve of the difference. Default 1: on the control and descent
   * problems of the benchmarks a second step changed neither the iterations nor the optimum, none cost
   * iterations (DEVELOPERS.md).
   */
  refinementMaxIterations: number;
  /** Refinement stops once the residual is below this, relative to 1 + ‖rhs‖∞. Default 1e-14 (the value ECOS uses; looser values were measured to cost more iterations than they save). */
  refinementTolerance: number;
  /** Ruiz equilibration passes (0 disables). Default 15. */
  equilibrationIterations: number;
  /** Bounds on each equilibration scale factor. Defaults 1e-4, 1e4. */
  equilibrationMin: number;
  equilibrationMax: number;
  /** Print one line per iteration through `log`. Default false. */
  verbose: boolean;
  /**
   * Kernels for the sparse LDLᵀ factorisation and solves: `wasm` (WebAssembly, about three times faster),
   * `javascript` (portable), or `auto` — WebAssembly where the environment offers it. Default `auto`.
   */
  kernels: KernelChoice;
}

export type KernelChoice = 'auto' | 'wasm' | 'javascript';
const KERNEL_CHOICES: readonly KernelChoice[] = ['auto', 'wasm', 'javascript'];

export const DEFAULT_SETTINGS: Readonly<SolverSettings> = Object.freeze({
  maxIterations: 100,
  feasibilityTolerance: 1e-8,
  gapAbsoluteTolerance: 1e-8,
  gapRelativeTolerance: 1e-8,
  infeasibilityTolerance: 1e-8,
  feasibilityToleranceInaccurate: 1e-4,
  gapAbsoluteToleranceInaccurate: 5e-5,
  gapRelativeToleranceInaccurate: 5e-5,
  infeasibilityToleranceInaccurate: 1e-5,
  stepFraction: 0.99,
  minStep: 1e-8,
  staticRegularisation: 1e-8,
  dynamicRegularisationEps: 1e-13,
  dynamicRegularisationDelta: 2e-7,
  refinementMaxIterations: 1,
  refinementTolerance: 1e-14,
  equilibrationIterations: 15,
  equilibrationMin: 1e-4,
  equilibrationMax: 1e4,
  verbose: false,
  kernels: 'auto',
});

type NumericKey = { [K in keyof SolverSettings]: SolverSettings[K] extends number ? K : never }[keyof SolverSettings];

const INTEGER_KEYS: ReadonlySet<string> = new Set(['maxIterations', 'refinementMaxIterations', 'equilibrationIterations']);
const ALLOW_ZERO: ReadonlySet<string> = new Set(['refinementMaxIterations', 'equilibrationIterations', 'staticRegularisation']);

/** Merge user settings over the defaults and validate every value; throws RangeError naming the field. */
export function resolveSettings(user: Partial<SolverSettings> = {}): SolverSettings {
  const out: SolverSettings = { ...DEFAULT_SETTINGS };
  for (const [key, value] of Object.entries(user)) {
    if (!(key in DEFAULT_SETTINGS)) {
      throw new RangeError(`unknown solver setting: ${key} (known: ${Object.keys(DEFAULT_SETTINGS).join(', ')})`);
    }
    if (value === undefined) continue;
    (out as unknown as Record<string, unknown>)[key] = value;
  }
  for (const key of Object.keys(DEFAULT_SETTINGS) as (keyof SolverSettings)[]) {
    const v = out[key];
    if (key === 'verbose') {
      if (typeof v !== 'boolean') throw new RangeError(`invalid verbose: ${String(v)} (must be true or false)`);
      continue;
    }
    if (key === 'kernels') {
      if (!KERNEL_CHOICES.includes(v as KernelChoice)) {
        throw new RangeError(`invalid kernels: ${String(v)} (must be one of ${KERNEL_CHOICES.join(', ')})`);
      }
      continue;
    }
    const k = key as NumericKey;
    const num = out[k];
    if (typeof num !== 'number' || !Number.isFinite(num)) {
      throw new RangeError(`invalid ${k}: ${String(num)} (must be a finite number)`);
    }
    if (INTEGER_KEYS.has(k) && !Number.isInteger(num)) {
      throw new RangeError(`invalid ${k}: ${num} (must be a whole number)`);
    }
    if (ALLOW_ZERO.has(k) ? num < 0 : num <= 0) {
      throw new RangeError(`invalid ${k}: ${num} (must be ${ALLOW_ZERO.has(k) ? 'zero or positive' : 'positive'}${INTEGER_KEYS.has(k) ? ' integer' : ''})`);
    }
  }
  if (out.stepFraction >= 1) throw new RangeError(`invalid stepFraction: ${out.stepFraction} (must be in (0, 1))`);
  if (out.equilibrationMin > 1 || out.equilibrationMax < 1) {
    throw new RangeError(`invalid equilibration bounds: [${out.equilibrationMin}, ${out.equilibrationMax}] (must contain 1)`);
  }
  return out;
}
