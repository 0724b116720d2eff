/** Inputs of the landing-success study: clear errors (field, value, fix), PSD covariances by Cholesky. */
import { describe, expect, it } from 'vitest';
import { applyFactor, covarianceFactor } from '../../../core/uncertainty/covariance.ts';
import { resolveLandingSuccessInputs, DEFAULT_LANDING_SUCCESS } from '../../../core/uncertainty/inputs.ts';
import { sampleStream } from '../../../core/uncertainty/random.ts';

describe('covariance matrices', () => {
  it('factors a full positive-definite matrix: L Lᵀ reproduces it', () => {
    const C = [[2500, 300, -100], [300, 900, 50], [-100, 50, 400]];
    const f = covarianceFactor('c', C, 3, 'm²');
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) {
      let s = 0;
      for (let k = 0; k < 3; k++) s += f.lower[i * 3 + k] * f.lower[j * 3 + k];
      expect(s).toBeCloseTo(C[i][j], 9);
    }
  });

  it('accepts a semi-definite matrix (a perfectly known axis, perfectly correlated axes)', () => {
    expect(() => covarianceFactor('c', [[4, 0, 0], [0, 0, 0], [0, 0, 9]], 3, 'm²')).not.toThrow();
    const f = covarianceFactor('c', [[4, 6, 0], [6, 9, 0], [0, 0, 1]], 3, 'm²'); // ρ = 1 between x and y
    const x = applyFactor(f, [1.3, -0.7, 0.2], [0, 0, 0]);
    expect(x[1]).toBeCloseTo(1.5 * x[0], 12); // y = (σ_y/σ_x) x exactly
  });

  it('refuses a non-symmetric, an indefinite, a wrongly sized or a non-finite matrix, naming the field and the fix', () => {
    expect(() => covarianceFactor('navPositionCovariance_m2', [[1, 2, 0], [0, 1, 0], [0, 0, 1]], 3, 'm²')).toThrow(/navPositionCovariance_m2.*not symmetric: \[0\]\[1\] = 2 but \[1\]\[0\] = 0/);
    // Correlation 1.5 between x and y: a negative eigenvalue.
    expect(() => covarianceFactor('ignitionPositionCovariance_m2', [[1, 1.5, 0], [1.5, 1, 0], [0, 0, 1]], 3, 'm²')).toThrow(/ignitionPositionCovariance_m2.*not positive semi-definite.*within ±1/);
    // Zero variance on x but correlated with y: also not PSD.
    expect(() => covarianceFactor('c', [[0, 1, 0], [1, 1, 0], [0, 0, 1]], 3, 'm²')).toThrow(/not positive semi-definite/);
    expect(() => covarianceFactor('c', [[1, 0], [0, 1]], 3, 'm²')).toThrow(/c: .* must be a 3 × 3 matrix/);
    expect(() => covarianceFactor('c', [[1, 0, 0], [0, NaN, 0], [0, 0, 1]], 3, 'm²')).toThrow(/c\[1\]\[1\]/);
    expect(() => covarianceFactor('c', [[-1, 0, 0], [0, 1, 0], [0, 0, 1]], 3, 'm²')).toThrow(/c\[0\]\[0\]: -1 is a variance and must be ≥ 0/);
  });
});

describe('landing-success inputs', () => {
  it('fills the illustrative defaults', () => {
    const { inputs } = resolveLandingSuccessInputs({});
    expect(inputs).toEqual({ ...DEFAULT_LANDING_SUCCESS });
  });

  it('names the field, the value and the fix', () => {
    expect(() => resolveLandingSuccessInputs({ samples: 0 })).toThrow('samples: 0 must be a whole number from 1 to 100000');
    expect(() => resolveLandingSuccessInputs({ seed: -1 })).toThrow(/seed: -1 must be a whole number/);
    expect(() => resolveLandingSuccessInputs({ replanInterval_s: 0.1 })).toThrow(/replanInterval_s: 0.1 must be a time from 0.5/);
    expect(() => resolveLandingSuccessInputs({ sigmaThrustFraction: 0.5 })).toThrow(/sigmaThrustFraction: 0.5/);
    expect(() => resolveLandingSuccessInputs({ navVelocityCovariance_m2ps2: [[1, 2, 0], [2, 1, 0], [0, 0, 1]] })).toThrow(/navVelocityCovariance_m2ps2: .* not positive semi-definite/);
    expect(() => resolveLandingSuccessInputs({ sample: 10 })).toThrow(/sample: 10 is not an input of the landing-success study; known inputs: samples, seed/);
  });
});

describe('per-sample random streams', () => {
  it('depend on (seed, index) only: the same draws in any order', () => {
    const draws = (seed: number, i: number) => { const s = sampleStream(seed, i); return [s.normal(), s.uniform(), s.normal()]; };
    const forward = [0, 1, 2, 3].map((i) => draws(9, i));
    const backward = [3, 2, 1, 0].map((i) => draws(9, i)).reverse();
    expect(backward).toEqual(forward);
    expect(draws(9, 0)).not.toEqual(draws(9, 1));
    expect(draws(9, 0)).not.toEqual(draws(10, 0));
  });
});
