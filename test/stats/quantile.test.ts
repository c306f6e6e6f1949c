import { describe, expect, it } from 'vitest';
import { percentileInterval, quantile, quantileBins } from '../../src/stats/index.js';

describe('sample quantiles and quantile bins', () => {
  // Hyndman & Fan (1996) definition 7: h = (n−1)p. For 1,2,3,4 and p = 0.25, h = 0.75 →
  // 1 + 0.75·(2 − 1) = 1.75; p = 0.5 → h = 1.5 → 2.5.
  it('interpolates between order statistics (Hyndman & Fan 1996, definition 7)', () => {
    expect(quantile([4, 1, 3, 2], 0.25)).toBeCloseTo(1.75, 12);
    expect(quantile([4, 1, 3, 2], 0.5)).toBeCloseTo(2.5, 12);
    expect(quantile([4, NaN, 1], 1)).toBe(4);
    expect(quantile([], 0.5)).toBeNaN();
  });

  it('takes the 2.5% and 97.5% points for a 95% interval', () => {
    const draws = Array.from({ length: 201 }, (_, i) => i); // 0..200, h = 200·0.025 = 5
    const [lo, hi] = percentileInterval(draws, 0.95);
    expect(lo).toBeCloseTo(5, 9);
    expect(hi).toBeCloseTo(195, 9);
  });

  it('cuts a numeric covariate into quartile bins and leaves missing values out', () => {
    const ages = [18, 25, 30, 35, 40, 45, 50, 55, 60, NaN, 70, 80];
    const { levels, levelOfDoc } = quantileBins(ages, 4);
    expect(levels.length).toBe(4);
    expect(levelOfDoc[9]).toBe(-1);
    expect(levelOfDoc[0]).toBe(0);
    expect(levelOfDoc[11]).toBe(3);
    expect(levels[3].endsWith(']')).toBe(true);
    for (let i = 1; i < ages.length; i++) {
      if (!Number.isNaN(ages[i]) && !Number.isNaN(ages[i - 1])) expect(levelOfDoc[i]).toBeGreaterThanOrEqual(levelOfDoc[i - 1]);
    }
  });

  it('merges bins when many values are tied, and keeps a constant variable as one bin', () => {
    // Sorted 1,1,1,1,1,2,3,4: the 25% and 50% points are both 1, the 75% point is 2.25 → 2 bins.
    expect(quantileBins([1, 1, 1, 1, 1, 2, 3, 4], 4).levels).toEqual(['[1, 2.25)', '[2.25, 4]']);
    const constant = quantileBins([5, 5, 5], 4);
    expect(constant.levels).toEqual(['[5, 5]']);
    expect(Array.from(constant.levelOfDoc)).toEqual([0, 0, 0]);
  });
});
