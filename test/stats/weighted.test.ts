import { describe, expect, it } from 'vitest';
import { kishEffectiveN, kishEffectiveNOf, weightedMean } from '../../src/stats/index.js';

describe('survey-weighted mean and Kish effective sample size', () => {
  // Worked example computed by hand from the published formulas (not copied from a book):
  // Kish, "Survey Sampling" (1965), n_eff = (Σw)²/Σw²; weighted mean Σwx/Σw.
  // x = [2, 4, 6, 8, 10], w = [1, 1, 2, 2, 4]
  // Σw = 10, Σwx = 2 + 4 + 12 + 16 + 40 = 74 → mean 7.4
  // Σw² = 1 + 1 + 4 + 4 + 16 = 26 → n_eff = 100/26 = 3.846153…
  const x = [2, 4, 6, 8, 10];
  const w = [1, 1, 2, 2, 4];

  it('weights each value by its survey weight', () => {
    expect(weightedMean(x, w)).toBeCloseTo(7.4, 12);
    expect(weightedMean(x)).toBeCloseTo(6, 12);
  });

  it('shrinks the effective sample size by the spread of the weights', () => {
    expect(kishEffectiveN(w)).toBeCloseTo(100 / 26, 12);
    expect(kishEffectiveNOf(Int32Array.from([0, 1, 2, 3, 4]), w)).toBeCloseTo(100 / 26, 12);
  });

  it('gives n for equal weights and about 1 when one weight dominates', () => {
    expect(kishEffectiveN([3, 3, 3, 3])).toBeCloseTo(4, 12);
    expect(kishEffectiveN([1e6, 1, 1])).toBeLessThan(1.01);
    expect(kishEffectiveNOf(Int32Array.from([0, 2]))).toBe(2);
  });

  it('returns NaN for an empty level rather than a fake zero share', () => {
    expect(weightedMean([])).toBeNaN();
    expect(weightedMean([1, 2], [0, 0])).toBeNaN();
    expect(kishEffectiveN([])).toBe(0);
  });
});
