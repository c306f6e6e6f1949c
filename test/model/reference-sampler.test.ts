import { describe, expect, it } from 'vitest';
import { createReferenceSampler } from '../../src/model/reference-sampler.js';
import type { Priors, SamplerFactory } from '../../src/model/types.js';
import { describeSamplerExactness, enumerationDistance, gewekeTest } from './sampler-exactness.case.js';

describeSamplerExactness('reference', createReferenceSampler);

describe('the exactness suite can fail', () => {
  // A sampler that ignores the per-pattern α (uses α = 1 everywhere) is wrong; the suite must say so.
  const ignoresAlpha: SamplerFactory = (corpus, z, priors) => {
    const flat: Priors = { ...priors, alpha: new Float64Array(priors.alpha.length).fill(1) };
    const inner = createReferenceSampler(corpus, z, flat);
    return { ...inner, name: 'wrong', z: inner.z, sweep: (rng) => inner.sweep(rng), setPriors: () => {}, wordTopicCounts: () => inner.wordTopicCounts(), topicTotals: () => inner.topicTotals() };
  };

  it('rejects a sampler with the wrong document-topic prior by enumeration', async () => {
    expect(await enumerationDistance(ignoresAlpha, 2, 50_000)).toBeGreaterThan(0.03);
  });

  it('rejects a sampler with the wrong document-topic prior by the joint distribution test', async () => {
    const result = await gewekeTest(ignoresAlpha, 5_000);
    expect(Math.max(...result.z.map(Math.abs))).toBeGreaterThan(3.29);
  });
});
