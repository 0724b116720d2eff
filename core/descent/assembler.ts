/**
 * Fixed-pattern assembly of a conic problem.
 *
 * A problem is described once by an `emit` function that calls `a`, `g`, `b`, `h`, `c` in a fixed
 * order. The first pass records the sparsity pattern; later passes only refresh the values, so
 * changing the time of flight, the target or the ignition state never changes the pattern (one
 * symbolic analysis serves every target of a grid). Rows and columns carry scale factors (the problem
 * is solved in nondimensional units); an SOC block shares one row scale so the cone is unchanged.
 */
import type { ConicProblem } from '../conic/types.ts';
import type { CscMatrix } from '../linalg/csc.ts';

/** Row reference: orthant rows are ≥ 0, second-order-cone rows are encoded as −1 − (row within SOC part). */
export type GRow = number;

export interface Emitter {
  /** New equality row with a row scale; returns its index. */
  eqRow(scale: number): number;
  /** New orthant row (s ≥ 0); returns its reference. */
  orthRow(scale: number): GRow;
  /** New second-order cone of `size` rows (t first); returns the reference of its first row. */
  soc(size: number, scale: number): GRow;
  a(row: number, col: number, value: number): void;
  b(row: number, value: number): void;
  g(row: GRow, col: number, value: number): void;
  h(row: GRow, value: number): void;
  c(col: number, value: number): void;
}

interface PassState {
  eqScale: number[];
  gScaleOrth: number[];
  gScaleSoc: number[];
  socSizes: number[];
  aVals: number[];
  gVals: number[];
  // Pattern pass only.
  aRows: number[];
  aCols: number[];
  gRows: number[];
  gCols: number[];
  bEntries: [number, number][];
  hEntries: [GRow, number][];
  cEntries: [number, number][];
}

function freshState(): PassState {
  return {
    eqScale: [], gScaleOrth: [], gScaleSoc: [], socSizes: [], aVals: [], gVals: [],
    aRows: [], aCols: [], gRows: [], gCols: [], bEntries: [], hEntries: [], cEntries: [],
  };
}

function makeEmitter(st: PassState, colScale: Float64Array): Emitter {
  const gScale = (r: GRow) => (r >= 0 ? st.gScaleOrth[r] : st.gScaleSoc[-1 - r]);
  return {
    eqRow(scale) {
      st.eqScale.push(scale);
      return st.eqScale.length - 1;
    },
    orthRow(scale) {
      st.gScaleOrth.push(scale);
      return st.gScaleOrth.length - 1;
    },
    soc(size, scale) {
      const first = st.gScaleSoc.length;
      for (let i = 0; i < size; i++) st.gScaleSoc.push(scale);
      st.socSizes.push(size);
      return -1 - first;
    },
    a(row, col, value) {
      st.aRows.push(row);
      st.aCols.push(col);
      st.aVals.push(value * st.eqScale[row] * colScale[col]);
    },
    b(row, value) {
      st.bEntries.push([row, value * st.eqScale[row]]);
    },
    g(row, col, value) {
      st.gRows.push(row);
      st.gCols.push(col);
      st.gVals.push(value * gScale(row) * colScale[col]);
    },
    h(row, value) {
      st.hEntries.push([row, value * gScale(row)]);
    },
    c(col, value) {
      st.cEntries.push([col, value * colScale[col]]);
    },
  };
}

/** CSC pattern plus, for each emitted entry, the slot its value goes to (duplicates share a slot). */
function buildPattern(m: number, n: number, rows: number[], cols: number[]): { M: CscMatrix; slot: Int32Array } {
  const nnzIn = rows.length;
  const order = Array.from({ length: nnzIn }, (_, k) => k).sort((p, q) => cols[p] - cols[q] || rows[p] - rows[q]);
  const slot = new Int32Array(nnzIn);
  const colPtr = new Int32Array(n + 1);
  const rowIdx: number[] = [];
  let lastR = -1;
  let lastC = -1;
  for (const k of order) {
    if (rows[k] !== lastR || cols[k] !== lastC) {
      rowIdx.push(rows[k]);
      colPtr[cols[k] + 1]++;
      lastR = rows[k];
      lastC = cols[k];
    }
    slot[k] = rowIdx.length - 1;
  }
  for (let j = 0; j < n; j++) colPtr[j + 1] += colPtr[j];
  return { M: { m, n, colPtr, rowIdx: Int32Array.from(rowIdx), values: new Float64Array(rowIdx.length) }, slot };
}

/** Values of a refreshed problem, in the shape `ConicWorkspace.update` takes. */
export interface ProblemValues {
  c: Float64Array;
  b: Float64Array;
  h: Float64Array;
  AValues: Float64Array;
  GValues: Float64Array;
}

export class FixedPatternProblem<D> {
  readonly problem: ConicProblem;
  readonly colScale: Float64Array;
  private readonly aSlot: Int32Array;
  private readonly gSlot: Int32Array;
  private readonly orthCount: number;
  private readonly eqScale: Float64Array;
  private readonly gScaleOrth: Float64Array;
  private readonly gScaleSoc: Float64Array;
  private readonly aTrip: Float64Array;
  private readonly gTrip: Float64Array;

  constructor(
    readonly numVariables: number,
    colScale: Float64Array,
    private readonly emit: (e: Emitter, data: D) => void,
    data: D,
  ) {
    this.colScale = colScale;
    const st = freshState();
    emit(makeEmitter(st, colScale), data);
    const p = st.eqScale.length;
    const l = st.gScaleOrth.length;
    const m = l + st.gScaleSoc.length;
    this.orthCount = l;
    const resolve = (r: GRow) => (r >= 0 ? r : l + (-1 - r));
    const A = buildPattern(p, numVariables, st.aRows, st.aCols);
    const G = buildPattern(m, numVariables, st.gRows.map(resolve), st.gCols);
    this.aSlot = A.slot;
    this.gSlot = G.slot;
    this.eqScale = Float64Array.from(st.eqScale);
    this.gScaleOrth = Float64Array.from(st.gScaleOrth);
    this.gScaleSoc = Float64Array.from(st.gScaleSoc);
    this.aTrip = new Float64Array(A.slot.length);
    this.gTrip = new Float64Array(G.slot.length);
    this.problem = {
      c: new Float64Array(numVariables),
      A: A.M,
      b: new Float64Array(p),
      G: G.M,
      h: new Float64Array(m),
      cones: { nonnegative: l, secondOrder: st.socSizes },
    };
    this.scatter(st);
  }

  /** Recomputes every value for new data; the pattern must come out identical (checked by counts). */
  refresh(data: D): ProblemValues {
    const p = this.problem;
    const l = this.orthCount;
    const colScale = this.colScale;
    const { eqScale, gScaleOrth, gScaleSoc, aTrip, gTrip, aSlot, gSlot } = this;
    p.b.fill(0);
    p.h.fill(0);
    p.c.fill(0);
    let ia = 0;
    let ig = 0;
    let nEq = 0;
    let nOrth = 0;
    let nSoc = 0;
    const gScale = (r: GRow) => (r >= 0 ? gScaleOrth[r] : gScaleSoc[-1 - r]);
    const e: Emitter = {
      eqRow: () => nEq++,
      orthRow: () => nOrth++,
      soc(size) {
        const first = nSoc;
        nSoc += size;
        return -1 - first;
      },
      a(row, col, value) {
        aTrip[ia++] = value * eqScale[row] * colScale[col];
      },
      b(row, value) {
        p.b[row] += value * eqScale[row];
      },
      g(row, col, value) {
        gTrip[ig++] = value * gScale(row) * colScale[col];
      },
      h(row, value) {
        p.h[row >= 0 ? row : l + (-1 - row)] += value * gScale(row);
      },
      c(col, value) {
        p.c[col] += value * colScale[col];
      },
    };
    this.emit(e, data);
    if (ia !== aSlot.length || ig !== gSlot.length || nOrth !== l || nEq !== eqScale.length || nSoc !== gScaleSoc.length) {
      throw new Error('internal: problem pattern changed between refreshes');
    }
    p.A.values.fill(0);
    for (let k = 0; k < ia; k++) p.A.values[aSlot[k]] += aTrip[k];
    p.G.values.fill(0);
    for (let k = 0; k < ig; k++) p.G.values[gSlot[k]] += gTrip[k];
    return { c: p.c, b: p.b, h: p.h, AValues: p.A.values, GValues: p.G.values };
  }

  private scatter(st: PassState): void {
    const p = this.problem;
    const l = this.orthCount;
    p.A.values.fill(0);
    for (let k = 0; k < st.aVals.length; k++) p.A.values[this.aSlot[k]] += st.aVals[k];
    p.G.values.fill(0);
    for (let k = 0; k < st.gVals.length; k++) p.G.values[this.gSlot[k]] += st.gVals[k];
    p.b.fill(0);
    for (const [r, v] of st.bEntries) p.b[r] += v;
    p.h.fill(0);
    for (const [r, v] of st.hEntries) p.h[r >= 0 ? r : l + (-1 - r)] += v;
    p.c.fill(0);
    for (const [j, v] of st.cEntries) p.c[j] += v;
  }

  /** Physical value of variable j from a scaled solution vector. */
  unscale(x: ArrayLike<number>, j: number): number {
    return x[j] * this.colScale[j];
  }
}
