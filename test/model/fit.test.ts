import { describe, expect, it } from 'vitest';
import { buildGroupFeatures } from '../../src/model/features.js';
import { decodeCheckpoint, encodeCheckpoint, type Checkpoint } from '../../src/model/checkpoint.js';
import { fitModel, type FitResult } from '../../src/model/fit.js';
import { logJointLikelihood } from '../../src/model/log-likelihood.js';
import { foldIn } from '../../src/model/fold-in.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import type { Priors } from '../../src/model/types.js';
import { exactLogJoint, enumerationFixture } from './sampler-exactness.case.js';
import { drawCorpus } from './synthetic.js';

/** A small invented two-language corpus with a categorical covariate. */
function smallStudy() {
  const rng = Xoshiro128.fromSeed(99);
  const K = 4;
  const phi = [0, 1].map((l) =>
    Array.from({ length: K }, (_, k) => Float64Array.from({ length: 20 }, (_, w) => (Math.floor(w / 5) === k ? 0.18 : 0.1 / 15) + l * 0)),
  );
  const groups = Array.from({ length: 120 }, (_, g) => ({
    alpha: new Float64Array(K).fill(0.5),
    docs: g % 4 === 0 ? [{ language: 0, length: 8 }, { language: 1, length: 6 }] : [{ language: g % 2, length: 10 }],
  }));
  const data = drawCorpus(rng, phi, groups, [20, 20]);
  const rows = [...data.built.groupFirstInput].map((i) => ({ channel: ['web', 'phone', 'mail'][data.docGroup[i] % 3] }));
  const features = buildGroupFeatures(rows, [{ column: 'channel', type: 'categorical' }]);
  return { corpus: data.built.corpus, features, K };
}

function expectSameResult(a: FitResult, b: FitResult): void {
  expect(b.z).toEqual(a.z);
  expect(b.logLikelihoodTrace).toEqual(a.logLikelihoodTrace);
  expect(b.lambda).toEqual(a.lambda);
  expect(b.beta).toEqual(a.beta);
  expect(b.theta).toEqual(a.theta);
  b.phi.forEach((p, l) => expect(p).toEqual(a.phi[l]));
  expect(b.thetaSamples).toEqual(a.thetaSamples);
}

describe('fitModel', () => {
  const settings = { sweeps: 40, burnIn: 10, sampleEvery: 3, optimizeEvery: 5, checkpointEvery: 0, seed: 5 };

  it('gives exactly the uninterrupted result after stopping, saving to bytes and resuming', async () => {
    const { corpus, features, K } = smallStudy();
    const whole = await fitModel(corpus, features, { K, ...settings });
    let saved: Checkpoint | null = null;
    const first = await fitModel(corpus, features, { K, ...settings }, {
      shouldStop: () => true,
      onCheckpoint: (cp) => {
        saved = cp;
      },
      onSweep: () => {},
    });
    expect(first.diagnostics.stopped).toBe(true);
    expect(first.diagnostics.sweepsCompleted).toBe(1);
    // Stop again later, to resume from a state with optimizations and samples behind it.
    let count = 0;
    let later: Checkpoint | null = null;
    await fitModel(corpus, features, { K, ...settings }, {
      resumeFrom: decodeCheckpoint(encodeCheckpoint(saved!)),
      shouldStop: () => ++count === 25,
      onCheckpoint: (cp) => {
        later = cp;
      },
    });
    expect(later!.sweep).toBe(26);
    expect(later!.numSamples).toBeGreaterThan(0);
    const resumed = await fitModel(corpus, features, { K, ...settings }, { resumeFrom: decodeCheckpoint(encodeCheckpoint(later!)) });
    expectSameResult(whole, resumed);
  });

  it('is reproducible for a seed and differs for another seed', async () => {
    const { corpus, features, K } = smallStudy();
    const a = await fitModel(corpus, features, { K, ...settings, sweeps: 15 });
    const b = await fitModel(corpus, features, { K, ...settings, sweeps: 15 });
    const c = await fitModel(corpus, features, { K, ...settings, sweeps: 15, seed: 6 });
    expectSameResult(a, b);
    expect(c.z).not.toEqual(a.z);
  });

  it('reports progress every sweep and returns probability distributions', async () => {
    const { corpus, features, K } = smallStudy();
    const seen: number[] = [];
    const fit = await fitModel(corpus, features, { K, ...settings, sweeps: 20 }, { onSweep: (p) => seen.push(p.sweep) });
    expect(seen).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    for (const phi of fit.phi) {
      for (let k = 0; k < K; k++) expect(phi.subarray(k * 20, (k + 1) * 20).reduce((s, v) => s + v, 0)).toBeCloseTo(1, 12);
    }
    for (let g = 0; g < corpus.numGroups; g++) expect(fit.theta.subarray(g * K, (g + 1) * K).reduce((s, v) => s + v, 0)).toBeCloseTo(1, 12);
    expect(fit.lambda.length).toBe(K * features.numFeatures);
  });

  it('refuses a checkpoint from another corpus with a plain message', async () => {
    const { corpus, features, K } = smallStudy();
    const fit = await fitModel(corpus, features, { K, ...settings, sweeps: 12 });
    await expect(fitModel(corpus, features, { K: K + 1, ...settings }, { resumeFrom: fit.checkpoint })).rejects.toThrow(/different corpus or settings/);
    const bytes = encodeCheckpoint(fit.checkpoint);
    bytes[4] = 99;
    expect(() => decodeCheckpoint(bytes)).toThrow(/version 99/);
  });
});

describe('logJointLikelihood', () => {
  it('equals the exact rising-factorial joint on every assignment of the tiny corpus', () => {
    const { corpus, priors } = enumerationFixture(3);
    const N = corpus.words.length;
    const z = new Uint16Array(N);
    for (let s = 0; s < 3 ** N; s++) {
      for (let i = 0, r = s; i < N; i++, r = Math.floor(r / 3)) z[i] = r % 3;
      expect(logJointLikelihood(corpus, z, 3, priors)).toBeCloseTo(exactLogJoint(corpus, z, priors), 10);
    }
  });

  it('handles counts above the small-count table (large documents)', () => {
    const { corpus } = enumerationFixture(2);
    const big = { ...corpus, words: corpus.words };
    const priors: Priors = { K: 1, groupPattern: Int32Array.of(0, 0), alpha: Float64Array.of(0.7), beta: Float64Array.of(0.3, 0.2) };
    // One topic: the word part is Π_ℓ Pólya(counts | β); compare the two code paths on a long corpus.
    const rng = Xoshiro128.fromSeed(3);
    const words = Int32Array.from({ length: 500 }, () => rng.nextInt(2));
    const long = { ...big, words, docOffsets: Int32Array.of(0, 500, 500, 500), docLanguage: Uint8Array.of(0, 1, 0) };
    expect(logJointLikelihood(long, new Uint16Array(500), 1, priors)).toBeCloseTo(exactLogJoint(long, new Uint16Array(500), priors), 8);
  });
});

describe('foldIn', () => {
  it('recovers a mixture from fixed topics and skips unknown words', () => {
    const K = 2;
    const phi = [Float64Array.of(0.5, 0.5, 0, 0, 0, 0, 0.5, 0.5)]; // topic 0: words 0–1, topic 1: words 2–3
    const tokens = Int32Array.of(0, 1, 0, 1, 0, 1, 2, 3, -1, 9);
    const { theta, unknownWords } = foldIn({ K, phi, lambda: Float64Array.of(Math.log(0.1), Math.log(0.1)), numFeatures: 1 }, [{ language: 0, tokens }], {
      sweeps: 200,
      burnIn: 20,
      seed: 1,
    });
    expect(unknownWords[0]).toBe(2);
    // Exact: 6 words of topic 0, 2 of topic 1 ⇒ θ = (6 + 0.1, 2 + 0.1) / 8.2.
    expect(theta[0][0]).toBeCloseTo(6.1 / 8.2, 10);
  });

  it('uses the covariate prior when a document has no known words', () => {
    const { theta } = foldIn({ K: 2, phi: [Float64Array.of(1, 0)], lambda: Float64Array.of(0, 1, 0, -1), numFeatures: 2 }, [
      { language: 0, tokens: Int32Array.of(5), features: Float64Array.of(1, 1) },
    ]);
    expect(theta[0][0]).toBeCloseTo(Math.E / (Math.E + 1 / Math.E), 12);
  });
});
