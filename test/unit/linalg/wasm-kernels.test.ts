/**
 * The WebAssembly kernels against the portable TypeScript implementation (same algorithm, so the results
 * agree to rounding) and against dense Gaussian elimination (test/support/dense.ts, a textbook solve), plus
 * a check that the committed kernel bytes are a fresh compile of their AssemblyScript source.
 */
import { readFile } from 'node:fs/promises';
import { describe, expect, it } from 'vitest';
import { cscFromTriplets, type CscMatrix } from '../../../core/linalg/csc.ts';
import { ldlSymbolic } from '../../../core/linalg/ldl.ts';
import { JsLdlSystem, type LdlSystem } from '../../../core/linalg/ldlSystem.ts';
import { minimumDegreeOrdering } from '../../../core/linalg/ordering.ts';
import { WasmLdlSystem, wasmKernelsAvailable } from '../../../core/linalg/wasm/ldlWasm.ts';
import { ConicWorkspace, iterationModule } from '../../../core/conic/index.ts';
import { denseSolve, quasiDefinite } from '../../support/dense.ts';
import { Rng } from '../../support/random.ts';
import { controlInstance, dualInfeasibleInstance, feasibleInstance, primalInfeasibleInstance } from '../../support/socp-instances.ts';
import { referenceToolsReady } from '../../support/reference-tools.ts';

/** Upper triangle of P M Pᵀ (perm[k] = original row of permuted row k), rows sorted, as CSC. */
function permutedUpper(M: number[][], perm: Int32Array): CscMatrix {
  const r: number[] = [];
  const c: number[] = [];
  const v: number[] = [];
  for (let i = 0; i < M.length; i++) {
    for (let j = i; j < M.length; j++) {
      const x = M[perm[i]][perm[j]];
      if (x !== 0 || i === j) {
        r.push(i);
        c.push(j);
        v.push(x);
      }
    }
  }
  return cscFromTriplets(M.length, M.length, r, c, v);
}

function systems(M: number[][], n1: number) {
  const natural = permutedUpper(M, Int32Array.from(M, (_, i) => i));
  const perm = minimumDegreeOrdering(natural);
  const U = permutedUpper(M, perm);
  const sign = Int8Array.from(perm, (orig) => (orig < n1 ? 1 : -1));
  const symbolic = ldlSymbolic(U);
  const make = (S: new (...a: ConstructorParameters<typeof JsLdlSystem>) => LdlSystem) => {
    const s = new S(U, symbolic, sign, perm);
    s.matrix.values.set(U.values);
    return s;
  };
  return { js: make(JsLdlSystem), wasm: make(WasmLdlSystem), perm, symbolic };
}

// Both embedded modules must compile here; if not, the kernels' tests fail under CI=true and are skipped
// with a warning elsewhere (test/support/reference-tools.ts): never a silent pass on the portable path.
describe.runIf(referenceToolsReady('wasm'))('WebAssembly LDLᵀ kernels', () => {
  it('are the ones the solver picks (the availability check agrees with the solver\'s own)', () => {
    expect(wasmKernelsAvailable()).toBe(true);
    expect(iterationModule()).not.toBeNull();
  });

  it('agree with the portable implementation and with dense elimination on random quasi-definite systems', () => {
    const rng = new Rng(2027);
    for (let trial = 0; trial < 40; trial++) {
      const n1 = rng.int(2, 40);
      const n2 = rng.int(1, 30);
      const M = quasiDefinite(rng, n1, n2, rng.uniform(0.05, 0.4));
      const { js, wasm } = systems(M, n1);
      expect(js.refactor(1e-13, 1e-7)).toBe(true);
      expect(wasm.refactor(1e-13, 1e-7)).toBe(true);
      expect(wasm.regularisedPivots).toBe(js.regularisedPivots);
      const b = Float64Array.from(M, () => rng.normal());
      const xj = new Float64Array(b.length);
      const xw = new Float64Array(b.length);
      // Same operations in the same order: the same bits, for every step limit and shift.
      for (const [steps, shift] of [[0, 0], [1, 1e-3], [3, 1e-3], [3, 0]]) {
        expect(js.solveRefined(b, xj, shift, 1e-14, steps)).toBe(true);
        expect(wasm.solveRefined(b, xw, shift, 1e-14, steps)).toBe(true);
        expect(wasm.lastRefinementSteps).toBe(js.lastRefinementSteps);
        expect(Object.is(wasm.lastRelativeResidual, js.lastRelativeResidual)).toBe(true);
        expect(Array.from(xw)).toEqual(Array.from(xj));
        // With no step allowed the residual is not measured; otherwise it is, before the last step.
        if (steps === 0) expect(js.lastRelativeResidual).toBeNaN();
        else expect(js.lastRelativeResidual).toBeGreaterThanOrEqual(0);
      }
      expect(js.solveRefined(b, xj, 0, 1e-14, 3)).toBe(true);
      const ref = denseSolve(M, Array.from(b));
      ref.forEach((v, i) => expect(xj[i]).toBeCloseTo(v, 9));
    }
  });

  it('solve two right-hand sides at once with the same bits as two single refined solves', () => {
    // The SIMD pair kernel (ldlSolveRefinedPair) against the one-vector kernel: each side keeps its own
    // refinement (own step limit; a zero right-hand side stops at once while the other side refines on).
    const rng = new Rng(77);
    for (let trial = 0; trial < 20; trial++) {
      const n1 = rng.int(2, 30);
      const n2 = rng.int(1, 25);
      const M = quasiDefinite(rng, n1, n2, rng.uniform(0.05, 0.4));
      const natural = permutedUpper(M, Int32Array.from(M, (_, i) => i));
      const perm = minimumDegreeOrdering(natural);
      const U = permutedUpper(M, perm);
      const sign = Int8Array.from(perm, (orig) => (orig < n1 ? 1 : -1));
      const dim = M.length;
      const sys = new WasmLdlSystem(U, ldlSymbolic(U), sign, perm, { reserveBytes: 8 * (12 * dim + 2) });
      sys.matrix.values.set(U.values);
      expect(sys.refactor(1e-13, 1e-7)).toBe(true);
      const buf = sys.memory.buffer;
      const rhsA = sys.reserved;
      const rhsB = rhsA + 8 * dim;
      const outA = rhsB + 8 * dim;
      const outB = outA + 8 * dim;
      const pair = outB + 8 * dim;
      const info = pair + 64 * dim;
      const a = Float64Array.from(M, () => rng.normal());
      const b = trial % 4 === 0 ? new Float64Array(dim) : Float64Array.from(M, () => rng.normal());
      new Float64Array(buf, rhsA, dim).set(a);
      new Float64Array(buf, rhsB, dim).set(b);
      const shift = trial % 2 === 0 ? 0 : 1e-3;
      const [maxA, maxB] = [rng.int(0, 3), rng.int(0, 3)];
      const at = sys.at;
      const k = sys.exports as unknown as Record<string, (...args: number[]) => number>;
      const code = k.ldlSolveRefinedPair(
        dim, at.Lp, at.Li, at.Lx, at.Rp, at.Ri, at.Rx, at.Dinv, at.Ap, at.Ai, at.Ax, at.sign, shift, at.perm,
        rhsA, rhsB, outA, outB, pair, 1e-14, maxA, maxB, info,
      );
      expect(code).toBeGreaterThanOrEqual(0);
      const pairA = new Float64Array(buf, outA, dim).slice();
      const pairB = new Float64Array(buf, outB, dim).slice();
      const infoPair = new Float64Array(buf, info, 2).slice();
      const single = new Float64Array(dim);
      expect(sys.solveRefined(a, single, shift, 1e-14, maxA)).toBe(true);
      expect(Array.from(pairA)).toEqual(Array.from(single));
      expect(code % 1024).toBe(sys.lastRefinementSteps);
      expect(infoPair[0]).toBe(sys.lastRelativeResidual);
      expect(sys.solveRefined(b, single, shift, 1e-14, maxB)).toBe(true);
      expect(Array.from(pairB)).toEqual(Array.from(single));
      expect(Math.floor(code / 1024)).toBe(sys.lastRefinementSteps);
    }
  });

  it('replace pivots of the wrong sign the same way (dynamic regularisation)', () => {
    // [[1, 1], [1, 1]] is singular; with expected signs (+, −) the second pivot 0 becomes −δ.
    const M = [[1, 1], [1, 1]];
    const { js, wasm } = systems(M, 1);
    expect(js.refactor(1e-13, 1e-7)).toBe(true);
    expect(wasm.refactor(1e-13, 1e-7)).toBe(true);
    expect(js.regularisedPivots).toBe(1);
    expect(wasm.regularisedPivots).toBe(1);
  });

  it('report a non-finite solution as a failure', () => {
    const M = [[1, 0], [0, -1]];
    const { wasm } = systems(M, 1);
    wasm.matrix.values.fill(NaN);
    wasm.refactor(1e-13, 1e-7);
    expect(wasm.solveRefined(Float64Array.from([Infinity, 1]), new Float64Array(2), 0, 1e-14, 2)).toBe(false);
  });

  it('take the interior-point solver through the same iterations to the same bits as the TypeScript step', () => {
    // The WebAssembly iteration (core/conic/wasm) against the workspace's own TypeScript step, on solved and
    // primal-infeasible control instances (uMax = 1 cannot cancel the descent rate) and re-solves. Both run
    // the same operations in the same order (no fused multiply-add in either), so the results are equal.
    const cases = [controlInstance(7, 30), controlInstance(8, 12, 1), controlInstance(9, 70)];
    for (const { problem, expected } of cases) {
      const wasm = new ConicWorkspace(problem, { kernels: 'wasm' });
      const js = new ConicWorkspace(problem, { kernels: 'javascript' });
      for (const b of [problem.b, problem.b.map((v, i) => (i < 6 ? v * 0.9 : v))]) {
        wasm.update({ b });
        js.update({ b });
        const a = wasm.solve();
        const r = js.solve();
        expect(a.status).toBe(expected);
        expect(r.status).toBe(expected);
        expect(a.info.iterations).toBe(r.info.iterations);
        expect([a.info.kernels, r.info.kernels]).toEqual(['wasm', 'javascript']);
        for (const part of ['x', 'y', 'z', 's'] as const) expect(Array.from(a[part])).toEqual(Array.from(r[part]));
      }
    }
  });

  it('give the same bits as the TypeScript path on random solved, primal-infeasible and dual-infeasible programs', () => {
    // The seeded generators of the CVXOPT comparison (test/support/socp-instances.ts), cold solves.
    const cases = Array.from({ length: 20 }, (_, k) => [
      feasibleInstance(1000 + k, 60), primalInfeasibleInstance(1000 + k, 60), dualInfeasibleInstance(1000 + k, 60),
    ]).flat();
    let retries = 0;
    for (const { problem, name } of cases) {
      const a = new ConicWorkspace(problem, { kernels: 'wasm' }).solve();
      const r = new ConicWorkspace(problem, { kernels: 'javascript' }).solve();
      expect(a.status, name).toBe(r.status);
      expect(a.info.iterations, name).toBe(r.info.iterations);
      expect(a.info.regularisationRetries, name).toBe(r.info.regularisationRetries);
      retries += a.info.regularisationRetries ?? 0;
      for (const part of ['x', 'y', 'z', 's'] as const) expect(Array.from(a[part]), `${name} ${part}`).toEqual(Array.from(r[part]));
    }
    // The factorisation's retry with a larger regularisation is among the paths compared.
    expect(retries).toBeGreaterThan(0);
  });

  it.each(['kernels', 'iteration'] as const)(
    'are a fresh compile of their AssemblyScript source: %s module (run `npm run build:kernels` after editing it)',
    async (name) => {
      const { compileKernels, generatedModule, MODULES } = await import('../../../bin/build-kernels.mjs');
      const committed = await readFile(new URL(`../../../${MODULES[name].output}`, import.meta.url), 'utf8');
      expect(committed).toBe(generatedModule(await compileKernels(name), name));
    },
    60_000,
  );
});

describe('kernel choice', () => {
  it('is validated with a message naming the field and the choices', () => {
    const { problem } = controlInstance(7, 5);
    expect(() => new ConicWorkspace(problem, { kernels: 'fortran' as never })).toThrow(
      /invalid kernels: fortran \(must be one of auto, wasm, javascript\)/,
    );
  });
});
