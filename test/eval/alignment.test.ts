import { describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../src/model/rng.js';
import { chanceReciprocalRank, crossLanguageAlignment, jensenShannon } from '../../src/eval/index.js';
import { dirichletInto } from '../stats/simulate.js';

describe('Jensen–Shannon divergence (Lin 1991)', () => {
  it('is 0 for equal mixtures, 1 bit for disjoint ones, symmetric, and matches a hand computation', () => {
    expect(jensenShannon([0.3, 0.7], [0.3, 0.7], 2)).toBe(0);
    expect(jensenShannon([1, 0], [0, 1], 2)).toBeCloseTo(1, 12);
    // p = (1, 0), q = (½, ½): m = (¾, ¼); KL(p‖m) = log2(4/3); KL(q‖m) = ½log2(2/3) + ½log2(2)
    // JSD = ½[0.4150375 + ½(−0.5849625) + ½(1)] = ½[0.4150375 + 0.2075187] = 0.3112781
    expect(jensenShannon([1, 0], [0.5, 0.5], 2)).toBeCloseTo(0.3112781, 6);
    expect(jensenShannon([0.5, 0.5], [1, 0], 2)).toBeCloseTo(0.3112781, 6);
  });
});

describe('cross-language partner retrieval', () => {
  it('gives the chance MRR H_n/n for one partner, and agrees with enumeration for two', () => {
    expect(chanceReciprocalRank(4)).toBeCloseTo((1 + 1 / 2 + 1 / 3 + 1 / 4) / 4, 12);
    // n = 4, m = 2: the 6 equally likely partner position pairs {1,2},{1,3},{1,4},{2,3},{2,4},{3,4}
    // have best ranks 1,1,1,2,2,3 → E[1/r] = (3 + 2·½ + ⅓)/6 = 0.7222…
    expect(chanceReciprocalRank(4, 2)).toBeCloseTo((3 + 1 + 1 / 3) / 6, 12);
  });

  it('ranks partners first when mixtures agree and reports chance beside the figures', () => {
    // 3 link groups with English and French members, plus an unlinked French distractor.
    const mixtures = Float64Array.from([
      0.9, 0.1, 0.0, // en g0
      0.1, 0.8, 0.1, // en g1
      0.0, 0.2, 0.8, // en g2
      0.85, 0.1, 0.05, // fr g0
      0.15, 0.75, 0.1, // fr g1
      0.05, 0.15, 0.8, // fr g2
      0.33, 0.33, 0.34, // fr g3 (unlinked)
    ]);
    const result = crossLanguageAlignment({ K: 3, mixtures, docLanguage: [0, 0, 0, 1, 1, 1, 1], docGroup: [0, 1, 2, 0, 1, 2, 3], languages: ['en', 'fr'] });
    const enFr = result.pairs.find((p) => p.from === 'en' && p.to === 'fr')!;
    expect(enFr).toMatchObject({ queries: 3, candidates: 4, precisionAt1: 1, meanReciprocalRank: 1, chancePrecisionAt1: 0.25 });
    expect(enFr.chanceMeanReciprocalRank).toBeCloseTo(chanceReciprocalRank(4), 12);
    expect(enFr.partnerDivergence).toBeLessThan(enFr.otherDivergence);
    const frEn = result.pairs.find((p) => p.from === 'fr')!;
    expect(frEn.queries).toBe(3); // the unlinked document has no partner to find
    expect(result.overall.queries).toBe(6);
  });

  it('counts ties against the query and sits at chance when mixtures carry no signal', () => {
    const tie = crossLanguageAlignment({ K: 2, mixtures: Float64Array.from([0.5, 0.5, 0.5, 0.5, 0.5, 0.5]), docLanguage: [0, 1, 1], docGroup: [0, 0, 1] });
    expect(tie.pairs[0].meanReciprocalRank).toBe(0.5);
    // Random mixtures: 200 groups × 2 languages; MRR should be near chance H_n/n.
    const rng = Xoshiro128.fromSeed(8);
    const n = 200;
    const mixtures = new Float64Array(2 * n * 4);
    for (let d = 0; d < 2 * n; d++) dirichletInto(rng, [1, 1, 1, 1], mixtures, d * 4);
    const docGroup = Array.from({ length: 2 * n }, (_, d) => d % n);
    const docLanguage = Array.from({ length: 2 * n }, (_, d) => (d < n ? 0 : 1));
    const r = crossLanguageAlignment({ K: 4, mixtures, docLanguage, docGroup });
    expect(r.overall.chanceMeanReciprocalRank).toBeCloseTo(chanceReciprocalRank(n), 12);
    expect(r.overall.meanReciprocalRank).toBeLessThan(4 * r.overall.chanceMeanReciprocalRank);
    expect(r.overall.precisionAt1).toBeLessThan(0.05);
  });

  it('caps queries and candidates at random, always keeping the partner and adjusting chance', () => {
    const rng = Xoshiro128.fromSeed(9);
    const n = 300;
    const mixtures = new Float64Array(2 * n * 4);
    for (let g = 0; g < n; g++) {
      dirichletInto(rng, [1, 1, 1, 1], mixtures, g * 4);
      mixtures.copyWithin((n + g) * 4, g * 4, g * 4 + 4); // the partner has the same mixture
    }
    const docGroup = Array.from({ length: 2 * n }, (_, d) => d % n);
    const docLanguage = Array.from({ length: 2 * n }, (_, d) => (d < n ? 0 : 1));
    const r = crossLanguageAlignment({ K: 4, mixtures, docLanguage, docGroup }, { maxQueries: 50, maxCandidates: 40, seed: 3 });
    for (const p of r.pairs) {
      expect(p.queries).toBe(50);
      expect(p.candidates).toBeGreaterThanOrEqual(40);
      expect(p.candidates).toBeLessThanOrEqual(41);
      expect(p.chancePrecisionAt1).toBeGreaterThanOrEqual(1 / 41);
      expect(p.chancePrecisionAt1).toBeLessThanOrEqual(1 / 40);
      expect(p.precisionAt1).toBe(1);
    }
  });
});
