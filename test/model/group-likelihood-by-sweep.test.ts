// The group part of the joint likelihood summed during the sweep (FastScratch.trackGroupLogLik)
// must equal the same sum computed afterwards from z (log-likelihood.ts, groupLogLikelihood), on
// one thread and split across partitions, and must not pretend to hold after new priors.
import { afterAll, describe, expect, it } from 'vitest';
import { createFastSampler } from '../../src/model/fast-sampler.js';
import { createParallelSampler } from '../../src/model/parallel/index.js';
import { groupLogLikelihood } from '../../src/model/log-likelihood.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import type { SamplerFactory } from '../../src/model/types.js';
import { syntheticCorpus } from './fast-fixtures.js';

const two = createParallelSampler(2, { keepWorkers: true });
afterAll(() => two.close());

describe.each([
  ['fast', createFastSampler as SamplerFactory],
  ['parallel, 2 threads', two as SamplerFactory],
])('group likelihood summed while sweeping (%s)', (_, factory) => {
  it('equals the sum computed from z after the sweep, and is NaN before a tracked sweep and after new priors', async () => {
    const { corpus, priors, z } = syntheticCorpus({ K: 8, groups: 400, patterns: 4, seed: 17 });
    const sampler = factory(corpus, z, priors);
    try {
      const rng = Xoshiro128.fromSeed(2);
      sampler.sweep(rng);
      expect(sampler.lastGroupLogLikelihood!(), 'not tracked yet').toBeNaN();
      sampler.trackGroupLogLikelihood!();
      for (let t = 0; t < 5; t++) {
        sampler.sweep(rng);
        const expected = groupLogLikelihood(corpus, sampler.z, priors.K, priors);
        // Same terms, summed in another order: equal to rounding.
        expect(sampler.lastGroupLogLikelihood!()).toBeCloseTo(expected, 8);
      }
      const other = { ...priors, alpha: priors.alpha.map((a) => a * 1.5) };
      sampler.setPriors(other);
      expect(sampler.lastGroupLogLikelihood!(), 'stale after setPriors').toBeNaN();
      sampler.sweep(rng);
      expect(sampler.lastGroupLogLikelihood!()).toBeCloseTo(groupLogLikelihood(corpus, sampler.z, priors.K, other), 8);
    } finally {
      await sampler.dispose?.();
    }
  });
});
