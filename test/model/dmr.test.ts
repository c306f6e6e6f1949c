import { describe, expect, it } from 'vitest';
import { buildCorpus } from '../../src/model/corpus.js';
import { buildGroupFeatures } from '../../src/model/features.js';
import { dmrHistograms, dmrLogPosterior, optimizeLambda } from '../../src/model/dmr.js';
import { groupLogLikelihood } from '../../src/model/log-likelihood.js';
import { Xoshiro128 } from '../../src/model/rng.js';

/** A small invented corpus with a categorical and a numeric covariate and random z. */
function fixture(seed: number) {
  const rng = Xoshiro128.fromSeed(seed);
  const K = 4;
  const docs = [];
  const rows: Record<string, string | number>[] = [];
  for (let i = 0; i < 60; i++) {
    const len = 1 + rng.nextInt(12);
    docs.push({ language: 0, tokens: new Int32Array(len), linkKey: i % 5 === 0 ? `k${i % 3}` : null });
    rows.push({ region: ['north', 'south', 'east'][rng.nextInt(3)], age: 20 + rng.nextInt(50) });
  }
  const built = buildCorpus({ languages: ['en'], vocabSizes: [1], documents: docs });
  const features = buildGroupFeatures([...built.groupFirstInput].map((i) => rows[i]), [
    { column: 'region', type: 'categorical' },
    { column: 'age', type: 'numeric' },
  ]);
  const z = new Uint16Array(built.corpus.words.length);
  for (let i = 0; i < z.length; i++) z[i] = rng.nextInt(K);
  const F = features.numFeatures;
  const lambda = Float64Array.from({ length: K * F }, () => rng.nextDouble() - 0.5);
  return { corpus: built.corpus, features, z, K, F, lambda };
}

describe('DMR log posterior', () => {
  it('equals the direct per-group sum (histograms lose nothing)', () => {
    const { corpus, features, z, K, F, lambda } = fixture(1);
    const h = dmrHistograms(corpus, z, K, features.groupPattern, features.numPatterns);
    const variance = { intercept: 1e300, features: 1e300 }; // prior ≈ 0: compare the likelihood part
    const fromHist = dmrLogPosterior(h, features.patterns, F, lambda, variance);
    const alpha = new Float64Array(features.numPatterns * K);
    for (let p = 0; p < features.numPatterns; p++) {
      for (let k = 0; k < K; k++) {
        let s = 0;
        for (let f = 0; f < F; f++) s += lambda[k * F + f] * features.patterns[p * F + f];
        alpha[p * K + k] = Math.exp(s);
      }
    }
    const direct = groupLogLikelihood(corpus, z, K, { K, groupPattern: features.groupPattern, alpha, beta: Float64Array.of(1) });
    expect(Math.abs(fromHist - direct) / Math.abs(direct)).toBeLessThan(1e-12);
  });

  it('has a gradient that matches central finite differences', () => {
    const { corpus, features, z, K, F, lambda } = fixture(2);
    const h = dmrHistograms(corpus, z, K, features.groupPattern, features.numPatterns);
    const variance = { intercept: 10, features: 0.5 };
    const grad = new Float64Array(K * F);
    dmrLogPosterior(h, features.patterns, F, lambda, variance, grad);
    const eps = 1e-6;
    for (let i = 0; i < lambda.length; i++) {
      const plus = Float64Array.from(lambda);
      const minus = Float64Array.from(lambda);
      plus[i] += eps;
      minus[i] -= eps;
      const fd = (dmrLogPosterior(h, features.patterns, F, plus, variance) - dmrLogPosterior(h, features.patterns, F, minus, variance)) / (2 * eps);
      expect(Math.abs(grad[i] - fd), `∂/∂λ[${i}]: analytic ${grad[i]}, finite difference ${fd}`).toBeLessThan(1e-5 * Math.max(1, Math.abs(fd)));
    }
  });

  it('is increased by optimizeLambda to a point where the gradient vanishes', () => {
    const { corpus, features, z, K, F } = fixture(3);
    const h = dmrHistograms(corpus, z, K, features.groupPattern, features.numPatterns);
    const variance = { intercept: 100, features: 1 };
    const start = new Float64Array(K * F);
    const before = dmrLogPosterior(h, features.patterns, F, start, variance);
    const fit = optimizeLambda(h, features.patterns, F, start, variance, { functionTolerance: 0, gradientTolerance: 1e-7, maxIterations: 500 });
    expect(fit.logPosterior).toBeGreaterThan(before);
    const grad = new Float64Array(K * F);
    dmrLogPosterior(h, features.patterns, F, fit.lambda, variance, grad);
    expect(Math.max(...grad.map(Math.abs))).toBeLessThan(1e-3);
  });
});
