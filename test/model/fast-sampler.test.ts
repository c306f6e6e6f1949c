import { describe, expect, it } from 'vitest';
import { createFastSampler } from '../../src/model/fast-sampler.js';
import { countsFromAssignments } from '../../src/model/reference-sampler.js';
import { describeSamplerExactness } from './sampler-exactness.case.js';
import { syntheticCorpus } from './fast-fixtures.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import { FastState } from '../../src/model/fast-state.js';
import { createScratch, sweepGroups } from '../../src/model/fast-sweep.js';

describeSamplerExactness('fast', createFastSampler);

describe('fast sampler bookkeeping', () => {
  it('keeps n_kw and n_k equal to the counts implied by z after many sweeps (K = 7, several patterns)', () => {
    const { corpus, priors, z } = syntheticCorpus({ K: 7, groups: 300, patterns: 5, seed: 11 });
    const sampler = createFastSampler(corpus, z, priors);
    const rng = Xoshiro128.fromSeed(5);
    for (let t = 0; t < 20; t++) sampler.sweep(rng);
    const expected = countsFromAssignments(corpus, sampler.z, priors.K);
    expect(Array.from(sampler.wordTopicCounts())).toEqual(Array.from(expected.nkw));
    expect(Array.from(sampler.topicTotals())).toEqual(Array.from(expected.nk));
  });

  it('gives the same assignments for the same seed', () => {
    const run = () => {
      const { corpus, priors, z } = syntheticCorpus({ K: 12, groups: 200, patterns: 3, seed: 3 });
      const sampler = createFastSampler(corpus, z, priors);
      const rng = Xoshiro128.fromSeed(9);
      for (let t = 0; t < 5; t++) sampler.sweep(rng);
      return Array.from(sampler.z);
    };
    expect(run()).toEqual(run());
  });

  it('uses new priors after setPriors exactly as if it had started with them', () => {
    const { corpus, priors, z } = syntheticCorpus({ K: 6, groups: 150, patterns: 3, seed: 13 });
    const other = { ...priors, alpha: priors.alpha.map((a, i) => (i % 3 === 0 ? a * 4 : a)), beta: Float64Array.of(0.3, 0.01, 0.2) };
    const switched = createFastSampler(corpus, z.slice(), priors);
    switched.setPriors(other);
    const fresh = createFastSampler(corpus, z.slice(), other);
    const r1 = Xoshiro128.fromSeed(2);
    const r2 = Xoshiro128.fromSeed(2);
    for (let t = 0; t < 4; t++) {
      switched.sweep(r1);
      fresh.sweep(r2);
    }
    expect(Array.from(switched.z)).toEqual(Array.from(fresh.z));
  });

  it('keeps every word list sorted by count, largest first (SparseLDA, KDD 2009, §3.4)', () => {
    const { corpus, priors, z } = syntheticCorpus({ K: 10, groups: 300, patterns: 2, seed: 17 });
    const state = new FastState(corpus, z, priors);
    const scratch = createScratch(priors.K);
    const rng = Xoshiro128.fromSeed(4);
    for (let t = 0; t < 10; t++) sweepGroups(state, scratch, z, priors.groupPattern, 0, corpus.numGroups, rng, null);
    for (let r = 0; r < state.wlLen.length; r++) {
      for (let j = state.wlStart[r] + 1; j < state.wlStart[r] + state.wlLen[r]; j++) {
        expect(state.wlCounts[j - 1] >= state.wlCounts[j] && state.wlCounts[j] > 0, `row ${r}, slot ${j}`).toBe(true);
      }
    }
  });
});
