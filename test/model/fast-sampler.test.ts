import { describe, expect, it } from 'vitest';
import { createFastSampler } from '../../src/model/fast-sampler.js';
import { countsFromAssignments } from '../../src/model/reference-sampler.js';
import { describeSamplerExactness } from './sampler-exactness.case.js';
import { syntheticCorpus } from './fast-fixtures.js';
import { Xoshiro128 } from '../../src/model/rng.js';

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
});
