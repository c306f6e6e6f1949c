import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { createParallelSampler, partitionGroups } from '../../src/model/parallel/index.js';
import { createFastSampler } from '../../src/model/fast-sampler.js';
import { countsFromAssignments } from '../../src/model/reference-sampler.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import { describeSamplerExactness, enumerationFixture } from './sampler-exactness.case.js';
import { syntheticCorpus } from './fast-fixtures.js';
import { FastState } from '../../src/model/fast-state.js';
import { createScratch, sweepGroups } from '../../src/model/fast-sweep.js';
import type { Corpus, Priors } from '../../src/model/types.js';

/**
 * AD-LDA written out on one thread (Newman et al., JMLR 2009, §2, eq. 3): every partition sweeps
 * its groups against its own copy of the counts, then each copy adds the other partitions' moves.
 * The threaded sampler must draw exactly this, whatever the order of its hand-offs.
 */
function serialAdLda(corpus: Corpus, z: Uint16Array, priors: Priors, partitions: number) {
  const bounds = partitionGroups(corpus, partitions);
  const copies = Array.from({ length: partitions }, () => new FastState(corpus, z, priors, false));
  const scratches = copies.map(() => createScratch(priors.K));
  const logs = copies.map(() => new Int32Array(2 * corpus.words.length + 2));
  return {
    z,
    sweep(rng: Xoshiro128): void {
      const seed = Math.floor(rng.nextDouble() * 4294967296) | 0;
      const lengths = copies.map((st, p) => sweepGroups(st, scratches[p], z, priors.groupPattern, bounds[p], bounds[p + 1], Xoshiro128.fromSeed(seed, p), logs[p]));
      copies.forEach((st, p) => logs.forEach((log, q) => q !== p && st.applyMoves(log, lengths[q])));
    },
    setPriors(next: Priors): void {
      for (const st of copies) st.setPriors(next);
    },
  };
}

// With one thread the parallel sampler is the fast exact sweep run through the partition and
// merge machinery, so the whole shared suite applies. With two threads AD-LDA is an approximation
// (Newman et al., JMLR 2009, §2: partitions sample against counts that miss the other partitions'
// moves of the current sweep), so the joint-distribution test is not expected to hold exactly;
// on the enumeration corpus the token-balanced split puts both link groups in partition 1, which
// runs on the worker thread, where it must draw exactly what the serial fast sampler (which passes
// the suite) draws from the same stream.
const two = createParallelSampler(2, { keepWorkers: true });
const one = createParallelSampler(1, { keepWorkers: true });
afterAll(async () => {
  await two.close();
  await one.close();
});

describeSamplerExactness('parallel (1 thread)', one, { gewekeDraws: 10_000 });

describe('parallel sampler on a worker thread: exactness', () => {
  // Draw-for-draw equivalence instead of a second long-run frequency check: a long chain on two
  // threads needs four thread hand-offs per sweep, which on a busy machine makes 10^5 sweeps slow.
  it('on the enumeration corpus (every group in the worker partition) draws exactly what the serial fast sampler draws', async () => {
    for (const K of [2, 3]) {
      const { corpus, priors } = enumerationFixture(K);
      expect(partitionGroups(corpus, 2)[1], 'every group in the worker partition').toBe(0);
      const z0 = Uint16Array.from({ length: corpus.words.length }, (_, i) => i % K);
      const par = two(corpus, z0.slice(), priors);
      const serial = createFastSampler(corpus, z0.slice(), priors);
      const rng = Xoshiro128.fromSeed(K);
      try {
        for (let t = 0; t < 300; t++) {
          // The parallel sampler draws one seed per sweep; partition p uses stream p.
          const before = Xoshiro128.fromState(rng.saveState());
          par.sweep(rng);
          const seed = Math.floor(before.nextDouble() * 4294967296) | 0;
          serial.sweep(Xoshiro128.fromSeed(seed, 1));
          expect(Array.from(par.z), `K = ${K}, sweep ${t}`).toEqual(Array.from(serial.z));
        }
      } finally {
        await par.dispose?.();
      }
    }
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

  it('draws exactly what AD-LDA written out on one thread draws, through reads of the counts and new priors (2 threads)', async () => {
    const { corpus, priors, z } = syntheticCorpus({ K: 7, groups: 500, patterns: 3, seed: 44 });
    const other = { ...priors, alpha: priors.alpha.map((a, i) => (i % 3 === 0 ? a * 2 : a)), beta: Float64Array.of(0.05, 0.2, 0.01) };
    const sampler = two(corpus, z.slice(), priors);
    const serial = serialAdLda(corpus, z.slice(), priors, 2);
    const rngA = Xoshiro128.fromSeed(9);
    const rngB = Xoshiro128.fromSeed(9);
    try {
      for (let t = 0; t < 12; t++) {
        sampler.sweep(rngA);
        serial.sweep(rngB);
        expect(Array.from(sampler.z), `sweep ${t}`).toEqual(Array.from(serial.z));
        // Reading the counts between sweeps settles the merge early; it must not change the draws.
        if (t % 3 === 1) expect(Array.from(sampler.topicTotals())).toEqual(Array.from(countsFromAssignments(corpus, sampler.z, priors.K).nk));
        if (t === 6) {
          sampler.setPriors(other);
          serial.setPriors(other);
        }
      }
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

  it('starts its workers under plain `node --import tsx` too, with the same draws as under vitest', async () => {
    // The production start path (npm start, the CLI, bench) is node --import tsx, not vitest.
    const code = `
      import { buildCorpus } from './src/model/corpus.ts';
      import { createParallelSampler } from './src/model/parallel/index.ts';
      import { Xoshiro128 } from './src/model/rng.ts';
      const docs = [];
      for (let d = 0; d < 40; d++) docs.push({ language: d % 2, tokens: Int32Array.from({ length: 6 }, (_, i) => (d * 7 + i * 3) % 5), linkKey: d % 3 === 0 ? 'k' + (d >> 2) : null });
      const { corpus } = buildCorpus({ languages: ['en', 'fr'], vocabSizes: [5, 5], documents: docs });
      const priors = { K: 4, groupPattern: new Int32Array(corpus.numGroups), alpha: Float64Array.of(0.2, 0.4, 0.6, 0.8), beta: Float64Array.of(0.1, 0.3) };
      const sampler = createParallelSampler(2)(corpus, new Uint16Array(corpus.words.length), priors);
      const rng = Xoshiro128.fromSeed(12);
      for (let t = 0; t < 10; t++) sampler.sweep(rng);
      console.log(JSON.stringify(Array.from(sampler.z)));
      await sampler.dispose();
    `;
    const root = fileURLToPath(new URL('../../', import.meta.url));
    const out = execFileSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', code], { cwd: root, encoding: 'utf8' });
    const fromNode = JSON.parse(out.trim().split('\n').pop() ?? '[]') as number[];

    const { buildCorpus } = await import('../../src/model/corpus.js');
    const docs = [];
    for (let d = 0; d < 40; d++) docs.push({ language: d % 2, tokens: Int32Array.from({ length: 6 }, (_, i) => (d * 7 + i * 3) % 5), linkKey: d % 3 === 0 ? 'k' + (d >> 2) : null });
    const { corpus } = buildCorpus({ languages: ['en', 'fr'], vocabSizes: [5, 5], documents: docs });
    const priors = { K: 4, groupPattern: new Int32Array(corpus.numGroups), alpha: Float64Array.of(0.2, 0.4, 0.6, 0.8), beta: Float64Array.of(0.1, 0.3) };
    const sampler = two(corpus, new Uint16Array(corpus.words.length), priors);
    const rng = Xoshiro128.fromSeed(12);
    for (let t = 0; t < 10; t++) sampler.sweep(rng);
    const inVitest = Array.from(sampler.z);
    await sampler.dispose?.();
    expect(fromNode.length).toBe(corpus.words.length);
    expect(fromNode).toEqual(inVitest);
  });

  it('sends new priors to every worker: setPriors(B) then sweeping equals starting with B', async () => {
    const { corpus, priors, z } = syntheticCorpus({ K: 5, groups: 200, patterns: 3, seed: 31 });
    const other = { ...priors, alpha: priors.alpha.map((a, i) => (i % 2 === 0 ? a * 3 : a / 2)), beta: Float64Array.of(0.2, 0.02, 0.05) };
    const runWith = async (switchPriors: boolean) => {
      const sampler = createParallelSampler(2)(corpus, z.slice(), switchPriors ? priors : other);
      if (switchPriors) sampler.setPriors(other);
      const rng = Xoshiro128.fromSeed(5);
      for (let t = 0; t < 4; t++) sampler.sweep(rng);
      const out = Array.from(sampler.z);
      await sampler.dispose?.();
      return out;
    };
    expect(await runWith(true)).toEqual(await runWith(false));
  });
});
