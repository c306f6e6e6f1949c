import { describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../src/model/rng.js';
import { groupContrasts, type ContrastCovariate } from '../../src/stats/index.js';
import { dirichletInto } from './simulate.js';

const MEANS = [
  [0.5, 0.3, 0.2],
  [0.3, 0.3, 0.4],
];
const CONCENTRATION = 5;

/** Two groups of n documents each, θ_d ~ Dir(5·mean of its group), weights 1–3 independent of θ. */
function synthetic(seed: number, n: number) {
  const rng = Xoshiro128.fromSeed(seed);
  const K = 3;
  const D = 2 * n;
  const theta = new Float64Array(D * K);
  const levelOfDoc = new Int32Array(D);
  const weights = new Float64Array(D);
  for (let d = 0; d < D; d++) {
    const g = d < n ? 0 : 1;
    levelOfDoc[d] = g;
    weights[d] = 1 + rng.nextInt(3);
    dirichletInto(rng, MEANS[g].map((m) => m * CONCENTRATION), theta, d * K);
  }
  const covariate: ContrastCovariate = { name: 'region', kind: 'categorical', levels: ['north', 'south'], levelOfDoc };
  return { theta: { K, D, samples: [theta] }, covariate, weights };
}

describe('group contrasts', () => {
  it('reports weighted shares, n and Kish effective n per level in the export row shape', () => {
    // Two documents in level a (weights 1 and 3), one in level b. Theme 0 share in a:
    // (1·0.2 + 3·0.6)/4 = 0.5; n_eff = 4²/(1+9) = 1.6 (Kish 1965).
    const theta = Float64Array.from([0.2, 0.8, 0.6, 0.4, 0.9, 0.1]);
    const result = groupContrasts(
      { K: 2, D: 3, samples: [theta] },
      { name: 'g', kind: 'categorical', levels: ['a', 'b'], levelOfDoc: Int32Array.from([0, 0, 1]) },
      { weights: Float64Array.from([1, 3, 2]), draws: 50, themeLabels: ['cost', 'staff'] },
    );
    const row = result.shares[0];
    expect(Object.keys(row)).toEqual(['covariate', 'level', 'theme', 'themeLabel', 'share', 'low', 'high', 'n', 'effectiveN']);
    expect(row).toMatchObject({ covariate: 'g', level: 'a', theme: 0, themeLabel: 'cost', n: 2 });
    expect(row.share).toBeCloseTo(0.5, 12);
    expect(row.effectiveN).toBeCloseTo(1.6, 12);
    expect(row.low).toBeGreaterThanOrEqual(0.2 - 1e-12);
    expect(row.high).toBeLessThanOrEqual(0.6 + 1e-12);
    expect(result.shares[2]).toMatchObject({ level: 'b', theme: 0, n: 1, share: 0.9, low: 0.9, high: 0.9 });
    expect(result.differences[0].difference).toBeCloseTo(0.5 - 0.9, 12);
  });

  it('is reproducible for a seed and changes with the seed', () => {
    const data = synthetic(7, 60);
    const a = groupContrasts(data.theta, data.covariate, { weights: data.weights, draws: 200, seed: 3 });
    const b = groupContrasts(data.theta, data.covariate, { weights: data.weights, draws: 200, seed: 3 });
    const c = groupContrasts(data.theta, data.covariate, { weights: data.weights, draws: 200, seed: 4 });
    expect(b.shares).toEqual(a.shares);
    expect(c.shares[0].low).not.toBe(a.shares[0].low);
  });

  it('covers the true group shares and differences in 90–98% of 200 seeded replications', () => {
    // Outside check by simulation: the truth is known (the Dirichlet means); weights are
    // independent of θ, so the weighted mean estimates the group mean. 95% percentile
    // intervals should cover it about 95% of the time (Efron & Tibshirani, "An Introduction
    // to the Bootstrap", 1993, ch. 13: percentile intervals are first-order accurate).
    const reps = 200;
    const hits = { northTheme0: 0, southTheme2: 0, southTheme1: 0, diffTheme0: 0, diffTheme1: 0 };
    for (let r = 0; r < reps; r++) {
      const data = synthetic(1000 + r, 120);
      const res = groupContrasts(data.theta, data.covariate, { weights: data.weights, draws: 300, seed: r + 1, fdr: null });
      const share = (level: number, k: number) => res.shares[level * 3 + k];
      const covers = (row: { low: number; high: number }, truth: number) => (row.low <= truth && truth <= row.high ? 1 : 0);
      hits.northTheme0 += covers(share(0, 0), 0.5);
      hits.southTheme2 += covers(share(1, 2), 0.4);
      hits.southTheme1 += covers(share(1, 1), 0.3);
      hits.diffTheme0 += covers(res.differences[0], 0.5 - 0.3);
      hits.diffTheme1 += covers(res.differences[1], 0);
    }
    const rates = Object.fromEntries(Object.entries(hits).map(([key, h]) => [key, h / reps]));
    console.log('coverage of nominal 95% intervals over 200 replications:', rates);
    for (const rate of Object.values(rates)) {
      expect(rate).toBeGreaterThanOrEqual(0.9);
      expect(rate).toBeLessThanOrEqual(0.98);
    }
  });

  it('keeps coverage when large levels are resampled as random groups of documents', () => {
    // Same outside check as above, with each 240-document level resampled as 60 random groups
    // (Wolter, "Introduction to Variance Estimation", 2007, ch. 2, random groups).
    const reps = 200;
    let hits = 0;
    let diffHits = 0;
    for (let r = 0; r < reps; r++) {
      const data = synthetic(5000 + r, 240);
      const res = groupContrasts(data.theta, data.covariate, { weights: data.weights, draws: 300, seed: r + 1, fdr: null, maxResamplingUnits: 60 });
      const row = res.shares[0];
      if (row.low <= 0.5 && 0.5 <= row.high) hits++;
      const diff = res.differences[2];
      if (diff.low <= -0.2 && -0.2 <= diff.high) diffHits++;
    }
    console.log(`coverage with random groups: share ${hits / reps}, difference ${diffHits / reps}`);
    for (const rate of [hits / reps, diffHits / reps]) {
      expect(rate).toBeGreaterThanOrEqual(0.9);
      expect(rate).toBeLessThanOrEqual(0.98);
    }
  });

  it('gives intervals as wide with random groups as with single documents', () => {
    const data = synthetic(21, 4000);
    const exact = groupContrasts(data.theta, data.covariate, { weights: data.weights, draws: 1000, seed: 1 });
    const grouped = groupContrasts(data.theta, data.covariate, { weights: data.weights, draws: 1000, seed: 1, maxResamplingUnits: 400 });
    expect(grouped.notes.some((n) => n.includes('random groups'))).toBe(true);
    for (let i = 0; i < exact.shares.length; i++) {
      const we = exact.shares[i].high - exact.shares[i].low;
      const wg = grouped.shares[i].high - grouped.shares[i].low;
      expect(wg / we).toBeGreaterThan(0.85);
      expect(wg / we).toBeLessThan(1.15);
      expect(grouped.shares[i].share).toBeCloseTo(exact.shares[i].share, 12);
    }
  });

  it('resamples link groups together: four identical copies per group double the interval width', () => {
    // Each of 300 answers per level appears 4 times (one link group = 4 documents with one θ).
    // Independent information is 300 answers, not 1200, so the honest standard error is
    // √4 = 2 times the naive one (Davison & Hinkley 1997, §3.8, cluster resampling).
    const base = synthetic(31, 300);
    const D = base.theta.D * 4;
    const theta = new Float64Array(D * 3);
    const levelOfDoc = new Int32Array(D);
    const clusterOfDoc = new Int32Array(D);
    for (let d = 0; d < D; d++) {
      const src = d >> 2;
      theta.set((base.theta.samples[0] as Float64Array).subarray(src * 3, src * 3 + 3), d * 3);
      levelOfDoc[d] = base.covariate.kind === 'categorical' ? base.covariate.levelOfDoc[src] : 0;
      clusterOfDoc[d] = src;
    }
    const covariate: ContrastCovariate = { name: 'region', kind: 'categorical', levels: ['north', 'south'], levelOfDoc };
    const naive = groupContrasts({ K: 3, D, samples: [theta] }, covariate, { draws: 2000, seed: 4 });
    const clustered = groupContrasts({ K: 3, D, samples: [theta] }, covariate, { draws: 2000, seed: 4, clusterOfDoc });
    const single = groupContrasts(base.theta, base.covariate, { draws: 2000, seed: 4 });
    const width = (r: typeof naive) => r.shares[0].high - r.shares[0].low;
    expect(width(clustered) / width(naive)).toBeGreaterThan(1.75);
    expect(width(clustered) / width(naive)).toBeLessThan(2.25);
    expect(width(clustered) / width(single)).toBeGreaterThan(0.9);
    expect(width(clustered) / width(single)).toBeLessThan(1.1);
    expect(clustered.shares[0].share).toBeCloseTo(single.shares[0].share, 12);
    // With clusters and the random-group cap together, the width stays honest.
    const capped = groupContrasts({ K: 3, D, samples: [theta] }, covariate, { draws: 2000, seed: 4, clusterOfDoc, maxResamplingUnits: 100 });
    expect(width(capped) / width(single)).toBeGreaterThan(0.85);
    expect(width(capped) / width(single)).toBeLessThan(1.15);
  });

  it('finds a planted difference and flags it after false-discovery control, but not a null one', () => {
    const data = synthetic(11, 400);
    const res = groupContrasts(data.theta, data.covariate, { weights: data.weights, draws: 400, seed: 2 });
    const [d0, d1, d2] = res.differences;
    expect(d0).toMatchObject({ levelA: 'north', levelB: 'south', theme: 0, discovery: true });
    expect(d0.low).toBeGreaterThan(0);
    expect(d2.high).toBeLessThan(0);
    expect(d1.low).toBeLessThan(0);
    expect(d1.high).toBeGreaterThan(0);
    expect(d1.discovery).toBe(false);
    expect(d0.p).toBeLessThan(0.01);
  });

  it('widens intervals when posterior samples of θ disagree', () => {
    const data = synthetic(5, 200);
    const base = data.theta.samples[0] as Float64Array;
    const shifted = base.map((v, i) => (i % 3 === 0 ? v * 0.8 : v)); // a second, different posterior sample
    const one = groupContrasts(data.theta, data.covariate, { draws: 400, seed: 9 });
    const two = groupContrasts({ ...data.theta, samples: [base, shifted] }, data.covariate, { draws: 400, seed: 9 });
    const width = (r: typeof one) => r.shares[0].high - r.shares[0].low;
    expect(width(two)).toBeGreaterThan(width(one) * 1.5);
    expect(two.posteriorSamples).toBe(2);
  });

  it('bins a numeric covariate by quantiles and leaves out missing values and bad weights', () => {
    const data = synthetic(3, 100);
    const age = new Float64Array(200).map((_, d) => (d === 5 ? NaN : 20 + (d % 50)));
    const weights = Float64Array.from(data.weights);
    weights[7] = -1;
    const res = groupContrasts(data.theta, { name: 'age', kind: 'numeric', values: age, bins: 4 }, { weights, draws: 100 });
    expect(res.levels.length).toBe(4);
    expect(res.excludedDocuments).toBe(2);
    expect(res.shares.filter((r) => r.theme === 0).reduce((s, r) => s + r.n, 0)).toBe(198);
    expect(res.differences.length).toBe(6 * 3);
  });

  it('compares every level with a chosen reference level only', () => {
    const levelOfDoc = Int32Array.from([0, 1, 2, 0, 1, 2]);
    const theta = new Float64Array(12).fill(0.5);
    const res = groupContrasts({ K: 2, D: 6, samples: [theta] }, { name: 'c', kind: 'categorical', levels: ['x', 'y', 'z'], levelOfDoc }, { draws: 20, reference: 'y' });
    expect(res.differences.map((r) => `${r.levelA}-${r.levelB}`)).toEqual(['x-y', 'x-y', 'z-y', 'z-y']);
    expect(() => groupContrasts({ K: 2, D: 6, samples: [theta] }, { name: 'c', kind: 'categorical', levels: ['x', 'y', 'z'], levelOfDoc }, { reference: 'w' })).toThrow(/Reference level "w"/);
  });
});
