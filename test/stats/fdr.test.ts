import { describe, expect, it } from 'vitest';
import { benjaminiHochberg } from '../../src/stats/index.js';

describe('Benjamini–Hochberg false discovery flags', () => {
  // The 15 p-values of the worked example in Benjamini & Hochberg, JRSS B 1995, §4 (recalled
  // from memory). By hand at q = 0.05 the thresholds are i·0.05/15:
  //   i=4: 0.0095 ≤ 0.01333 yes; i=5: 0.0201 > 0.01667; … i=9: 0.0459 > 0.03 — the largest i
  //   with p_(i) ≤ i·q/m is 4, so four hypotheses are rejected (Bonferroni, 0.05/15 = 0.00333,
  //   would reject only three), as the paper reports.
  const p = [0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.324, 0.4262, 0.5719, 0.6528, 0.759, 1];

  it('rejects the four smallest p-values of the published example', () => {
    const { flags } = benjaminiHochberg(p, 0.05);
    expect(Array.from(flags)).toEqual([1, 1, 1, 1, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]);
  });

  it('gives adjusted p-values that are monotone in p and flag exactly where ≤ q', () => {
    const shuffled = [p[7], p[0], p[14], p[3], p[4], p[1]];
    const { flags, adjusted } = benjaminiHochberg(shuffled, 0.05);
    // m = 6; sorted 0.0001,0.0004,0.0095,0.0201,0.0344,1 → 6p/i = .0006,.0012,.019,.03015,.04128,1
    expect(adjusted[1]).toBeCloseTo(0.0006, 10);
    expect(adjusted[5]).toBeCloseTo(0.0012, 10);
    expect(adjusted[3]).toBeCloseTo(0.019, 10);
    expect(adjusted[4]).toBeCloseTo(0.03015, 10);
    expect(adjusted[0]).toBeCloseTo(0.04128, 10);
    expect(adjusted[2]).toBe(1);
    expect(Array.from(flags)).toEqual([1, 1, 0, 1, 1, 1]);
  });

  it('ignores missing p-values', () => {
    const { flags, adjusted } = benjaminiHochberg([NaN, 0.01], 0.05);
    expect(flags[0]).toBe(0);
    expect(adjusted[0]).toBeNaN();
    expect(adjusted[1]).toBeCloseTo(0.01, 12);
  });
});
