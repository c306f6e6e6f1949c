import { afterAll, describe, expect, it } from 'vitest';
import { createParallelSampler, partitionGroups } from '../../src/model/parallel/index.js';
import { createFastSampler } from '../../src/model/fast-sampler.js';
import { countsFromAssignments } from '../../src/model/reference-sampler.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import { describeSamplerExactness, enumerationDistance, enumerationFixture } from './sampler-exactness.case.js';
import { syntheticCorpus } from './fast-fixtures.js';

// With one thread the parallel sampler is the fast exact sweep run through the partition and
// merge machinery, so the whole shared suite applies. With two threads AD-LDA is an approximation
// (Newman et al., JMLR 2009, §2: partitions sample against counts that miss the other partitions'
// moves of the current sweep), so the joint-distribution test is not expected to hold exactly;
// on the enumeration corpus the token-balanced split puts both link groups in partition 1, which
// runs on the worker thread, so the enumeration check proves the worker path samples exactly.
const two = createParallelSampler(2, { keepWorkers: true });
const one = createParallelSampler(1, { keepWorkers: true });
afterAll(async () => {
  await two.close();
  await one.close();
});

describeSamplerExactness('parallel (1 thread)', one, { gewekeDraws: 10_000 });

describe('parallel sampler on a worker thread: exactness', () => {
  it('long-run state frequencies match the enumerated posterior within TV 0.01 (K = 2, 2 threads)', async () => {
    const { corpus } = enumerationFixture(2);
    expect(partitionGroups(corpus, 2)[1], 'every group in the worker partition').toBe(0);
    const tv = await enumerationDistance(two, 2, 200_000);
    expect(tv, `total-variation distance ${tv.toFixed(5)}; tolerance 0.01`).toBeLessThan(0.01);
  });
});

describe('parallel sampler', () => {
  it('keeps every copy of the counts equal to the counts implied by z (2 threads)', async () => {
    const { corpus, priors, z } = syntheticCorpus({ K: 9, groups: 400, patterns: 4, seed: 21 });
    const sampler = two(corpus, z, priors);
    try {
      const rng = Xoshiro128.fromSeed(1);
      for (let t = 0; t < 15; t++) sampler.sweep(rng);
      const expected = countsFromAssignments(corpus, sampler.z, priors.K);
      expect(Array.from(sampler.wordTopicCounts())).toEqual(Array.from(expected.nkw));
      expect(Array.from(sampler.topicTotals())).toEqual(Array.from(expected.nk));
    } finally {
      await sampler.dispose?.();
    }
  });

  it('is deterministic for a given seed and thread count', async () => {
    const run = async () => {
      const { corpus, priors, z } = syntheticCorpus({ K: 6, groups: 300, patterns: 2, seed: 8 });
      const sampler = two(corpus, z, priors);
      const rng = Xoshiro128.fromSeed(77);
      for (let t = 0; t < 6; t++) sampler.sweep(rng);
      const out = Array.from(sampler.z);
      await sampler.dispose?.();
      return out;
    };
    expect(await run()).toEqual(await run());
  });

  it('on one thread draws exactly what the serial fast sampler draws with the same stream', async () => {
    const { corpus, priors, z } = syntheticCorpus({ K: 5, groups: 100, patterns: 2, seed: 4 });
    const par = createParallelSampler(1)(corpus, z.slice(), priors);
    const serial = createFastSampler(corpus, z.slice(), priors);
    // The parallel sampler draws one seed per sweep and samples partition 0 with stream 0.
    const rng = Xoshiro128.fromSeed(3);
    par.sweep(rng);
    const seed = Math.floor(Xoshiro128.fromSeed(3).nextDouble() * 4294967296) | 0;
    serial.sweep(Xoshiro128.fromSeed(seed, 0));
    expect(Array.from(par.z)).toEqual(Array.from(serial.z));
    await par.dispose?.();
  });
});
