import { describe, expect, it } from 'vitest';
import { ConicWorkspace, resolveSettings } from '../../../core/conic/index.ts';
import { cscEmpty, cscFromDense } from '../../../core/linalg/csc.ts';
import type { ConicProblem } from '../../../core/conic/types.ts';

const base = (): ConicProblem => ({
  c: Float64Array.from([1, 1]),
  A: cscFromDense([[1, 1]]),
  b: Float64Array.from([1]),
  G: cscFromDense([
    [-1, 0],
    [0, -1],
  ]),
  h: Float64Array.from([0, 0]),
  cones: { nonnegative: 2, secondOrder: [] },
});

describe('problem validation names the field and the fix', () => {
  it.each([
    ['c empty', (p: ConicProblem) => ({ ...p, c: new Float64Array(0), A: cscEmpty(1, 0), G: cscEmpty(2, 0) }), /no variables/],
    ['b length', (p: ConicProblem) => ({ ...p, b: Float64Array.from([1, 2]) }), /invalid b: length 2, expected 1/],
    ['h length', (p: ConicProblem) => ({ ...p, h: Float64Array.from([0]) }), /invalid h: length 1, expected 2/],
    ['A columns', (p: ConicProblem) => ({ ...p, A: cscFromDense([[1, 1, 1]]) }), /invalid A: 3 columns, expected 2/],
    ['NaN in c', (p: ConicProblem) => ({ ...p, c: Float64Array.from([1, NaN]) }), /invalid c\[1\]: NaN \(must be finite\)/],
    ['Infinity in h', (p: ConicProblem) => ({ ...p, h: Float64Array.from([0, Infinity]) }), /invalid h\[1\]: Infinity/],
    ['NaN in G', (p: ConicProblem) => ({ ...p, G: cscFromDense([[NaN, 0], [0, -1]]) }), /invalid G: entry \(0, 0\) is NaN/],
    ['cone sizes', (p: ConicProblem) => ({ ...p, cones: { nonnegative: 1, secondOrder: [2] } }), /sizes sum to 3 but G has 2 rows/],
    ['cone size zero', (p: ConicProblem) => ({ ...p, cones: { nonnegative: 2, secondOrder: [0] } }), /secondOrder\[0\]: 0 \(must be an integer ≥ 1\)/],
    ['negative orthant', (p: ConicProblem) => ({ ...p, cones: { nonnegative: -1, secondOrder: [3] } }), /cones.nonnegative: -1/],
    ['plain array', (p: ConicProblem) => ({ ...p, c: [1, 1] as unknown as Float64Array }), /invalid c: expected a Float64Array/],
  ])('%s', (_name, mutate, message) => {
    expect(() => new ConicWorkspace(mutate(base()))).toThrow(message);
  });

  it('rejects updates of the wrong length or with non-finite values', () => {
    const ws = new ConicWorkspace(base());
    expect(() => ws.update({ b: Float64Array.from([1, 2]) })).toThrow(/invalid update.b: expected a Float64Array of length 1/);
    expect(() => ws.update({ GValues: Float64Array.from([NaN, 1]) })).toThrow(/invalid update.GValues\[0\]: NaN/);
  });
});

describe('settings are validated at construction', () => {
  it.each([
    [{ maxIterations: -3 }, /invalid maxIterations: -3 \(must be positive integer\)/],
    [{ maxIterations: 2.5 }, /invalid maxIterations: 2.5 \(must be a whole number\)/],
    [{ feasibilityTolerance: 0 }, /invalid feasibilityTolerance: 0 \(must be positive\)/],
    [{ stepFraction: 1 }, /invalid stepFraction: 1 \(must be in \(0, 1\)\)/],
    [{ verbose: 'yes' as unknown as boolean }, /invalid verbose/],
    [{ maxIterationz: 3 } as unknown as object, /unknown solver setting: maxIterationz/],
    [{ equilibrationMin: 2 }, /equilibration bounds/],
  ])('%o', (settings, message) => {
    expect(() => resolveSettings(settings)).toThrow(message);
    expect(() => new ConicWorkspace(base(), settings)).toThrow(message);
  });

  it('keeps documented defaults for what is not given', () => {
    const s = resolveSettings({ maxIterations: 50 });
    expect(s.maxIterations).toBe(50);
    expect(s.feasibilityTolerance).toBe(1e-8);
  });
});
