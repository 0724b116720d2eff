/**
 * Seeded SOCP instances with a known outcome by construction (the usual way conic solvers are tested):
 * - feasible: a strictly feasible primal point and a strictly feasible dual point exist, so an optimum exists;
 * - primal-infeasible: a Farkas certificate (y, z), z ∈ K, Aᵀy + Gᵀz = 0, bᵀy + hᵀz < 0 is built in,
 *   and the dual is strictly feasible (so the primal side alone is infeasible);
 * - dual-infeasible: a primal feasible point and a recession direction d (Ad = 0, −Gd ∈ K, cᵀd < 0) are built in.
 * Also a block-banded optimal-control family (3-D double integrator with thrust-norm cones), like a
 * discretised descent problem.
 */
import type { ConicProblem } from '../../core/conic/types.ts';
import { cscFromTriplets } from '../../core/linalg/csc.ts';
import { Rng } from './random.ts';

export type Expected = 'solved' | 'primal-infeasible' | 'dual-infeasible';

export interface Instance {
  name: string;
  expected: Expected;
  problem: ConicProblem;
}

interface Dense {
  rows: number;
  cols: number;
  data: Map<number, number>; // key = i * cols + j
}

const dense = (rows: number, cols: number): Dense => ({ rows, cols, data: new Map() });
const key = (M: Dense, i: number, j: number) => i * M.cols + j;
const get = (M: Dense, i: number, j: number) => M.data.get(key(M, i, j)) ?? 0;
const add = (M: Dense, i: number, j: number, v: number) => M.data.set(key(M, i, j), get(M, i, j) + v);

function toCsc(M: Dense) {
  const r: number[] = [];
  const c: number[] = [];
  const v: number[] = [];
  for (const [k, val] of M.data) {
    if (val === 0) continue;
    r.push(Math.floor(k / M.cols));
    c.push(k % M.cols);
    v.push(val);
  }
  return cscFromTriplets(M.rows, M.cols, r, c, v);
}

function mul(M: Dense, x: ArrayLike<number>): Float64Array {
  const out = new Float64Array(M.rows);
  for (const [k, val] of M.data) out[Math.floor(k / M.cols)] += val * x[k % M.cols];
  return out;
}

function mulT(M: Dense, y: ArrayLike<number>): Float64Array {
  const out = new Float64Array(M.cols);
  for (const [k, val] of M.data) out[k % M.cols] += val * y[Math.floor(k / M.cols)];
  return out;
}

function randomSparse(rng: Rng, rows: number, cols: number, density: number): Dense {
  const M = dense(rows, cols);
  if (rows === 0 || cols === 0) return M;
  // Every row and column gets at least one entry so no constraint or variable is empty.
  for (let i = 0; i < rows; i++) add(M, i, rng.int(0, cols - 1), rng.normal());
  for (let j = 0; j < cols; j++) add(M, rng.int(0, rows - 1), j, rng.normal());
  const extra = Math.round(rows * cols * density);
  for (let k = 0; k < extra; k++) add(M, rng.int(0, rows - 1), rng.int(0, cols - 1), rng.normal());
  return M;
}

/** A random point in the interior of K (cone sizes given), with a margin. */
function interiorPoint(rng: Rng, l: number, soc: number[]): Float64Array {
  const m = l + soc.reduce((a, b) => a + b, 0);
  const v = new Float64Array(m);
  for (let i = 0; i < l; i++) v[i] = rng.uniform(0.1, 2);
  let off = l;
  for (const q of soc) {
    let nrm = 0;
    for (let i = 1; i < q; i++) {
      v[off + i] = rng.normal();
      nrm += v[off + i] ** 2;
    }
    v[off] = Math.sqrt(nrm) + rng.uniform(0.1, 2);
    off += q;
  }
  return v;
}

function randomCones(rng: Rng, mTarget: number): { l: number; soc: number[] } {
  let l = rng.int(Math.floor(mTarget / 4), Math.floor(mTarget / 2));
  const soc: number[] = [];
  let left = mTarget - l;
  if (left === 1) {
    l++;
    left = 0;
  }
  while (left > 0) {
    // Sizes ≥ 2: CVXOPT fails with a domain error on 1-row second-order cones.
    const q = Math.min(left, rng.int(2, 6));
    if (left - q === 1) {
      soc.push(q + 1);
      left -= q + 1;
      continue;
    }
    soc.push(q);
    left -= q;
  }
  return { l, soc };
}

function vec(n: number, f: (i: number) => number): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => f(i));
}

/** Random sizes: n variables, p ≤ n/3 equalities (full row rank with high probability), m ≥ n cone rows. */
function sizes(rng: Rng, nMax: number) {
  const n = rng.int(3, nMax);
  const p = rng.int(0, Math.floor(n / 3));
  const m = rng.int(n, 2 * n);
  return { n, p, m };
}

/** The random part every family shares: sizes, cones, and sparse A and G (in this order from the seed). */
function randomBase(seed: number, nMax: number) {
  const rng = new Rng(seed);
  const { n, p, m } = sizes(rng, nMax);
  const { l, soc } = randomCones(rng, m);
  const density = Math.min(0.3, 4 / n);
  return { rng, n, p, m, l, soc, A: randomSparse(rng, p, n, density), G: randomSparse(rng, m, n, density) };
}

export function feasibleInstance(seed: number, nMax = 40): Instance {
  const { rng, n, p, m, l, soc, A, G } = randomBase(seed, nMax);
  const x0 = vec(n, () => rng.normal());
  const s0 = interiorPoint(rng, l, soc);
  const z0 = interiorPoint(rng, l, soc);
  const y0 = vec(p, () => rng.normal());
  const b = mul(A, x0);
  const h = mul(G, x0);
  for (let i = 0; i < m; i++) h[i] += s0[i];
  const c = mulT(A, y0);
  const gz = mulT(G, z0);
  for (let j = 0; j < n; j++) c[j] = -(c[j] + gz[j]);
  return {
    name: `feasible-${seed} (n=${n}, p=${p}, m=${m})`,
    expected: 'solved',
    problem: { c, A: toCsc(A), b, G: toCsc(G), h, cones: { nonnegative: l, secondOrder: soc } },
  };
}

export function primalInfeasibleInstance(seed: number, nMax = 40): Instance {
  const { rng, n, p, m, l, soc, A, G } = randomBase(seed, nMax);
  // Certificate z0 ∈ int K on all rows, y0 random; fix row r of G so Aᵀy0 + Gᵀz0 = 0.
  const z0 = interiorPoint(rng, l, soc);
  const y0 = vec(p, () => rng.normal());
  const r = l > 0 ? rng.int(0, l - 1) : 0; // an orthant row (or the first cone's t row)
  const v = mulT(A, y0);
  const gz = mulT(G, z0);
  for (let j = 0; j < n; j++) add(G, r, j, -(v[j] + gz[j]) / z0[r]);
  const x0 = vec(n, () => rng.normal());
  const b = mul(A, x0);
  const h = mul(G, x0);
  const s0 = interiorPoint(rng, l, soc);
  for (let i = 0; i < m; i++) h[i] += s0[i];
  // Make bᵀy0 + hᵀz0 = −margin < 0 by moving h[r].
  let byhz = 0;
  for (let i = 0; i < p; i++) byhz += b[i] * y0[i];
  for (let i = 0; i < m; i++) byhz += h[i] * z0[i];
  const margin = rng.uniform(0.5, 5);
  h[r] -= (byhz + margin) / z0[r];
  // Dual strictly feasible (c = −Aᵀy1 − Gᵀz1, z1 ∈ int K), so the problem is infeasible on the primal side only.
  const z1 = interiorPoint(rng, l, soc);
  const y1 = vec(p, () => rng.normal());
  const c = mulT(A, y1);
  const gz1 = mulT(G, z1);
  for (let j = 0; j < n; j++) c[j] = -(c[j] + gz1[j]);
  return {
    name: `primal-infeasible-${seed} (n=${n}, p=${p}, m=${m})`,
    expected: 'primal-infeasible',
    problem: { c, A: toCsc(A), b, G: toCsc(G), h, cones: { nonnegative: l, secondOrder: soc } },
  };
}

export function dualInfeasibleInstance(seed: number, nMax = 40): Instance {
  const { rng, n, p, m, l, soc, A, G } = randomBase(seed, nMax);
  // Recession direction d with support on a few variables; column jStar is adjusted.
  const d = new Float64Array(n);
  const jStar = rng.int(0, n - 1);
  d[jStar] = rng.uniform(0.5, 2) * (rng.next() < 0.5 ? -1 : 1);
  for (let k = 0; k < 2; k++) d[rng.int(0, n - 1)] += rng.normal();
  if (Math.abs(d[jStar]) < 0.5) d[jStar] = 1;
  const ad = mul(A, d);
  for (let i = 0; i < p; i++) add(A, i, jStar, -ad[i] / d[jStar]);
  const sd = interiorPoint(rng, l, soc);
  const gd = mul(G, d);
  for (let i = 0; i < m; i++) add(G, i, jStar, -(gd[i] + sd[i]) / d[jStar]);
  const c = vec(n, () => rng.normal());
  let cd = 0;
  for (let j = 0; j < n; j++) cd += c[j] * d[j];
  c[jStar] -= (cd + rng.uniform(0.5, 3)) / d[jStar];
  const xf = vec(n, () => rng.normal());
  const b = mul(A, xf);
  const h = mul(G, xf);
  const sf = interiorPoint(rng, l, soc);
  for (let i = 0; i < m; i++) h[i] += sf[i];
  return {
    name: `dual-infeasible-${seed} (n=${n}, p=${p}, m=${m})`,
    expected: 'dual-infeasible',
    problem: { c, A: toCsc(A), b, G: toCsc(G), h, cones: { nonnegative: l, secondOrder: soc } },
  };
}

/**
 * Minimum-thrust 3-D double-integrator transfer over N steps (a discretised optimal-control problem):
 * variables per step [r(3), v(3), u(3), σ], ‖u_k‖ ≤ σ_k ≤ uMax, altitude r_z ≥ 0, minimise Σ σ_k Δt.
 * n = 10 N + 6 variables. With uMax large the transfer is feasible; with it tiny it is primal infeasible.
 */
export function controlInstance(seed: number, steps: number, uMax = 12): Instance {
  const rng = new Rng(seed);
  const N = steps;
  const dt = 60 / N;
  const nx = 6;
  const per = 10;
  const n = per * N + nx; // states r,v at 0..N, u,σ at 0..N−1
  const ix = (k: number) => (k < N ? per * k : per * N); // state block start
  const iu = (k: number) => per * k + 6;
  const isg = (k: number) => per * k + 9;
  const Ar: number[] = [];
  const Ac: number[] = [];
  const Av: number[] = [];
  const b: number[] = [];
  let row = 0;
  const eq = (entries: Array<[number, number]>, rhs: number) => {
    for (const [j, v] of entries) {
      Ar.push(row);
      Ac.push(j);
      Av.push(v);
    }
    b.push(rhs);
    row++;
  };
  const g = -3.7;
  const r0 = [rng.uniform(-800, 800), rng.uniform(-800, 800), rng.uniform(1000, 2000)];
  const v0 = [rng.uniform(-30, 30), rng.uniform(-30, 30), rng.uniform(-60, -20)];
  for (let i = 0; i < 3; i++) {
    eq([[ix(0) + i, 1]], r0[i]);
    eq([[ix(0) + 3 + i, 1]], v0[i]);
  }
  for (let k = 0; k < N; k++) {
    for (let i = 0; i < 3; i++) {
      const gi = i === 2 ? g : 0;
      // r⁺ = r + v dt + (u + g) dt²/2 ;  v⁺ = v + (u + g) dt
      eq([[ix(k + 1) + i, 1], [ix(k) + i, -1], [ix(k) + 3 + i, -dt], [iu(k) + i, -dt * dt / 2]], gi * dt * dt / 2);
      eq([[ix(k + 1) + 3 + i, 1], [ix(k) + 3 + i, -1], [iu(k) + i, -dt]], gi * dt);
    }
  }
  for (let i = 0; i < 6; i++) eq([[ix(N) + i, 1]], 0);
  const Gr: number[] = [];
  const Gc: number[] = [];
  const Gv: number[] = [];
  const h: number[] = [];
  let grow = 0;
  const cone = (entries: Array<[number, number]>, rhs: number) => {
    for (const [j, v] of entries) {
      Gr.push(grow);
      Gc.push(j);
      Gv.push(v);
    }
    h.push(rhs);
    grow++;
  };
  // Orthant: σ_k ≤ uMax, altitude −r_z ≤ 0.
  for (let k = 0; k < N; k++) cone([[isg(k), 1]], uMax);
  for (let k = 1; k < N; k++) cone([[ix(k) + 2, -1]], 0);
  const l = grow;
  const soc: number[] = [];
  for (let k = 0; k < N; k++) {
    cone([[isg(k), -1]], 0);
    for (let i = 0; i < 3; i++) cone([[iu(k) + i, -1]], 0);
    soc.push(4);
  }
  const c = new Float64Array(n);
  for (let k = 0; k < N; k++) c[isg(k)] = dt;
  // Impulse bound: v_N = 0 needs Σ u_z Δt = −v0_z − g T, but Σ ‖u‖ Δt ≤ uMax T; violating it proves
  // infeasibility. Otherwise the instance is expected feasible (confirmed against CVXOPT in the tests).
  const T = N * dt;
  const feasible = uMax * T >= Math.abs(v0[2] + g * T);
  return {
    name: `control-${seed} (N=${N}, n=${n}, uMax=${uMax})`,
    expected: feasible ? 'solved' : 'primal-infeasible',
    problem: {
      c,
      A: cscFromTriplets(row, n, Ar, Ac, Av),
      b: Float64Array.from(b),
      G: cscFromTriplets(grow, n, Gr, Gc, Gv),
      h: Float64Array.from(h),
      cones: { nonnegative: l, secondOrder: soc },
    },
  };
}
