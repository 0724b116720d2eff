/**
 * Coarse-to-fine refinement of the budget boundary: after a footprint run, only the grid cells that the
 * budget contour crosses (their corners on both sides of it) are solved again at `factor` × the
 * resolution. Cells wholly inside or wholly outside are not: within them the boundary cannot pass between
 * grid points, so the refined contour equals the one of a full grid `factor` × finer wherever the coarse
 * grid sees the boundary, at the cost of the boundary cells alone. (The usual caveat of any grid holds: a
 * boundary that bulges into a cell and out again between two corners is seen by neither.)
 */
import type { JobPool } from '../parallel/pool.ts';
import { propellantRegions, type PropellantRegion } from './contours.ts';
import type { RowJob } from './engine.ts';
import { emptyField, TARGET, type FieldRow, type FootprintField } from './field.ts';

export interface BoundaryRefinement {
  factor: number;
  /**
   * The fine field: solved targets exact (the coarse ones copied), targets inside cells wholly within the
   * budget filled by bilinear interpolation of the corners (flagged in `filled`; never above the level),
   * targets of cells wholly outside left pending. For the boundary only: do not report it as a target grid.
   */
  field: FootprintField;
  filled: Uint8Array;
  /** Fine targets solved by the refinement, and the cone-program solves they took. */
  extraTargets: number;
  extraSolves: number;
  /** {propellant ≤ level} from the fine field. */
  region: PropellantRegion;
  cancelled: boolean;
}

export interface RefineOptions {
  level_kg: number;
  /** Subdivisions per coarse cell side (2 … 8). */
  factor: number;
  /** The row jobs' context (as for computeFootprint). */
  context?: unknown;
  signal?: AbortSignal;
}

export async function refineBudgetBoundary(
  coarse: FootprintField,
  pool: JobPool<RowJob, FieldRow>,
  options: RefineOptions,
): Promise<BoundaryRefinement> {
  const { factor: r, level_kg } = options;
  if (!Number.isInteger(r) || r < 2 || r > 8) throw new RangeError(`refinement factor: ${r} (must be a whole number from 2 to 8)`);
  if (!Number.isFinite(level_kg)) throw new RangeError(`refinement level: ${level_kg} kg (must be a finite propellant mass)`);
  const { nx, ny } = coarse;
  if (nx < 2 || ny < 2) throw new RangeError(`refinement needs a grid of at least 2 × 2 targets, got ${nx} × ${ny}`);
  const nxF = (nx - 1) * r + 1;
  const nyF = (ny - 1) * r + 1;
  const lerp = (a: Float64Array, n: number) => Float64Array.from({ length: (n - 1) * r + 1 }, (_, I) => {
    const c = Math.min(n - 2, Math.floor(I / r));
    return a[c] + ((a[c + 1] - a[c]) * (I - c * r)) / r;
  });
  const east = lerp(coarse.east, nx);
  const north = lerp(coarse.north, ny);
  const fine = emptyField({ nx: nxF, ny: nyF, east, north, spacingEast_m: east[1] - east[0], spacingNorth_m: north[1] - north[0] });
  const filled = new Uint8Array(nxF * nyF);
  const toSolve = new Uint8Array(nxF * nyF);
  const hint = new Float32Array(nxF * nyF).fill(NaN);
  const inside = (k: number) => coarse.status[k] === TARGET.reachable && coarse.propellant_kg[k] <= level_kg;

  // Coarse targets carry over exactly.
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) copyTarget(coarse, j * nx + i, fine, j * r * nxF + i * r);

  // Pass 1: every fine target of a cell the level crosses (its closed rectangle, edges included) is solved.
  // Pass 2: the other fine targets of a cell wholly inside are filled; those of a cell wholly outside stay
  // pending. (A target on the edge between a crossed cell and an inside one is solved, not filled.)
  const cells: { corners: number[]; inside: boolean; crossed: boolean; i: number; j: number }[] = [];
  for (let j = 0; j + 1 < ny; j++) {
    for (let i = 0; i + 1 < nx; i++) {
      const corners = [j * nx + i, j * nx + i + 1, (j + 1) * nx + i, (j + 1) * nx + i + 1];
      const ins = corners.map(inside);
      cells.push({ corners, inside: ins[0], crossed: ins.some((v) => v !== ins[0]), i, j });
    }
  }
  const eachFineTarget = (cell: (typeof cells)[number], f: (K: number, w: number[]) => void) => {
    for (let b = 0; b <= r; b++) {
      for (let a = 0; a <= r; a++) {
        if ((a === 0 || a === r) && (b === 0 || b === r)) continue; // a coarse target
        const u = a / r;
        const v = b / r;
        f((cell.j * r + b) * nxF + cell.i * r + a, [(1 - u) * (1 - v), u * (1 - v), (1 - u) * v, u * v]);
      }
    }
  };
  for (const cell of cells) {
    if (!cell.crossed) continue;
    eachFineTarget(cell, (K, w) => {
      toSolve[K] = 1;
      hint[K] = weighted(cell.corners.map((c) => coarse.timeOfFlight_s[c]), w);
    });
  }
  for (const cell of cells) {
    if (cell.crossed || !cell.inside) continue;
    eachFineTarget(cell, (K, w) => {
      if (toSolve[K]) return;
      // Wholly inside: a convex combination of values ≤ level stays ≤ level.
      fine.status[K] = TARGET.reachable;
      fine.propellant_kg[K] = weighted(cell.corners.map((c) => coarse.propellant_kg[c]), w);
      fine.timeOfFlight_s[K] = weighted(cell.corners.map((c) => coarse.timeOfFlight_s[c]), w);
      filled[K] = 1;
    });
  }

  const jobs: RowJob[] = [];
  for (let J = 0; J < nyF; J++) {
    const cols: number[] = [];
    for (let I = 0; I < nxF; I++) if (toSolve[J * nxF + I]) cols.push(I);
    if (cols.length) {
      jobs.push({
        context: options.context ?? null,
        row: J,
        north_m: north[J],
        east_m: east,
        tfHint: hint.slice(J * nxF, (J + 1) * nxF),
        columns: Int32Array.from(cols),
      });
    }
  }
  let next = 0;
  let extraTargets = 0;
  let extraSolves = 0;
  const summary = await pool.run({
    next: () => (next < jobs.length ? { job: jobs[next++] } : null),
    done: () => next >= jobs.length,
    onResult: (row, job) => {
      for (const I of job.columns ?? []) {
        const K = row.row * nxF + I;
        copyTarget(row, I, fine, K);
        extraTargets++;
        extraSolves += row.solves[I];
      }
    },
    signal: options.signal,
  });
  const [region] = propellantRegions(fine, [level_kg]);
  return { factor: r, field: fine, filled, extraTargets, extraSolves, region, cancelled: summary.cancelled };
}

/** The per-target arrays a field and a finished row share. */
type TargetArrays = Pick<FootprintField, 'status' | 'propellant_kg' | 'timeOfFlight_s' | 'peakTilt_deg' | 'miss_m' | 'solves' | 'betweenNodes'>;

function copyTarget(from: TargetArrays, k: number, to: TargetArrays, K: number): void {
  to.status[K] = from.status[k];
  to.propellant_kg[K] = from.propellant_kg[k];
  to.timeOfFlight_s[K] = from.timeOfFlight_s[k];
  to.peakTilt_deg[K] = from.peakTilt_deg[k];
  to.miss_m[K] = from.miss_m[k];
  to.solves[K] = from.solves[k];
  to.betweenNodes[K] = from.betweenNodes[k];
}

/** Σ wᵢ vᵢ over the finite vᵢ, renormalised; NaN if none is finite. */
function weighted(values: number[], w: number[]): number {
  let s = 0;
  let ws = 0;
  for (let q = 0; q < values.length; q++) {
    if (Number.isFinite(values[q])) {
      s += w[q] * values[q];
      ws += w[q];
    }
  }
  return ws > 0 ? s / ws : NaN;
}
