// The start search (src/model/start-search.ts) and its moves, on invented two-language data.
import { describe, expect, it } from 'vitest';
import type { Checkpoint } from '../../src/model/checkpoint.js';
import { buildGroupFeatures } from '../../src/model/features.js';
import { fitModel } from '../../src/model/fit.js';
import { logJointLikelihood } from '../../src/model/log-likelihood.js';
import { swapGains, swapLabels } from '../../src/model/relabel.js';
import { alphaFromLambda } from '../../src/model/features.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import { drawCorpus } from './synthetic.js';

function study() {
  const rng = Xoshiro128.fromSeed(41);
  const K = 4;
  const phi = [0, 1].map(() => Array.from({ length: K }, (_, k) => Float64Array.from({ length: 20 }, (_, w) => (Math.floor(w / 5) === k ? 0.18 : 0.1 / 15))));
  const groups = Array.from({ length: 80 }, (_, g) => ({
    alpha: new Float64Array(K).fill(0.5),
    docs: g % 4 === 0 ? [{ language: 0, length: 8 }, { language: 1, length: 6 }] : [{ language: g % 2, length: 10 }],
  }));
  const data = drawCorpus(rng, phi, groups, [20, 20]);
  const rows = [...data.built.groupFirstInput].map((i) => ({ channel: ['web', 'phone'][data.docGroup[i] % 2] }));
  return { corpus: data.built.corpus, features: buildGroupFeatures(rows, [{ column: 'channel', type: 'categorical' }]), K };
}

describe('start search', () => {
  it('predicts the exact change of the joint log-likelihood for every label swap in a language', () => {
    const { corpus, features, K } = study();
    const rng = Xoshiro128.fromSeed(3);
    const z = Uint16Array.from(corpus.words, () => rng.nextInt(K));
    const lambda = Float64Array.from({ length: K * features.numFeatures }, () => rng.nextDouble() - 0.5);
    const priors = { K, groupPattern: features.groupPattern, alpha: alphaFromLambda(lambda, features.patterns, K, features.numFeatures), beta: Float64Array.of(0.1, 0.2) };
    const before = logJointLikelihood(corpus, z, K, priors);
    const delta = new Float64Array(K * K);
    swapGains(corpus, z, priors, 1, delta);
    for (let a = 0; a < K; a++) {
      for (let b = a + 1; b < K; b++) {
        const t = z.slice();
        swapLabels(corpus, t, 1, a, b);
        expect(delta[a * K + b]).toBeCloseTo(logJointLikelihood(corpus, t, K, priors) - before, 8);
      }
    }
  });

  it('is reproducible for a seed and resumes exactly from its first checkpoint', async () => {
    const { corpus, features, K } = study();
    const settings = { K, sweeps: 20, burnIn: 5, sampleEvery: 3, optimizeEvery: 5, checkpointEvery: 0, seed: 8, startChains: 2, startSweeps: 10, startPerturbations: 2, startRelaxSweeps: 4, startRestrictedSweeps: 3 };
    const a = await fitModel(corpus, features, settings);
    const b = await fitModel(corpus, features, settings);
    expect(b.z).toEqual(a.z);
    expect(a.diagnostics.startSearch!.chainLogLikelihoods).toHaveLength(2);
    let saved: Checkpoint | null = null;
    await fitModel(corpus, features, settings, { shouldStop: () => true, onCheckpoint: (cp) => void (saved = cp) });
    const resumed = await fitModel(corpus, features, settings, { resumeFrom: saved! });
    expect(resumed.z).toEqual(a.z);
    expect(resumed.logLikelihoodTrace).toEqual(a.logLikelihoodTrace);
    expect(resumed.lambda).toEqual(a.lambda);
  });
});
