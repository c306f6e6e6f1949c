// DMR recovery on invented data with known covariate weights (Mimno & McCallum, UAI 2008, §5
// evaluates DMR by held-out likelihood; here the truth is known, so weights are checked too).
// Held-out perplexity by document completion (Wallach et al., "Evaluation methods for topic
// models", ICML 2009, §5.1): fold in the first half of each held-out document, score the second.
import { describe, expect, it } from 'vitest';
import { buildGroupFeatures, encodeCovariates, type CovariateValue } from '../../src/model/features.js';
import { fitModel, type FitResult } from '../../src/model/fit.js';
import { foldIn } from '../../src/model/fold-in.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import { drawCorpus, matchTopics, pearson } from './synthetic.js';

const K = 6;
const V = 60;
const REGIONS = ['a', 'b', 'c'];

/** True φ: topic k puts most mass on words 10k … 10k+9. */
function truePhi(): Float64Array[] {
  return Array.from({ length: K }, (_, k) => Float64Array.from({ length: V }, (_, w) => (Math.floor(w / 10) === k ? 0.095 : 0.05 / 50)));
}

/** λ: K × [intercept, region=b, region=c, score]. */
const TRUE_LAMBDA = [
  [-1.0, 1.5, -1.0, 0.8],
  [-1.0, -1.2, 1.2, 0.0],
  [-0.5, 0.0, 0.9, -0.9],
  [-1.2, 1.0, 0.0, 1.0],
  [-0.8, -0.8, -1.0, 0.0],
  [-1.0, 0.5, 0.8, -1.1],
];

function study(covariatesMatter: boolean, seed: number) {
  const rng = Xoshiro128.fromSeed(seed);
  const n = 2400;
  const rows: Record<string, CovariateValue>[] = [];
  const groups = [];
  for (let g = 0; g < n; g++) {
    const region = REGIONS[rng.nextInt(3)];
    const score = rng.nextDouble() * 2 - 1;
    rows.push({ region, score });
    const x = [1, region === 'b' ? 1 : 0, region === 'c' ? 1 : 0, score];
    const alpha = Float64Array.from(TRUE_LAMBDA, (l) => Math.exp(covariatesMatter ? l.reduce((s, v, f) => s + v * x[f], 0) : l[0]));
    groups.push({ alpha, docs: [{ language: 0, length: 30 }] });
  }
  const data = drawCorpus(rng, [truePhi()], groups, [V]);
  return { data, rows };
}

async function fitAndScore(covariatesMatter: boolean, seed: number) {
  const { data, rows } = study(covariatesMatter, seed);
  const trainCount = 2000;
  // Hold out the last 400 documents: refit on the first 2000 only.
  const { buildCorpus } = await import('../../src/model/corpus.js');
  const train = buildCorpus({ languages: ['l0'], vocabSizes: [V], documents: data.tokens.slice(0, trainCount).map((tokens) => ({ language: 0, tokens })) });
  const specs = [
    { column: 'region', type: 'categorical' as const },
    { column: 'score', type: 'numeric' as const },
  ];
  const features = buildGroupFeatures(rows.slice(0, trainCount), specs);
  const settings = { K, sweeps: 200, burnIn: 120, sampleEvery: 5, optimizeEvery: 10, seed: 11 };
  const withCov = await fitModel(train.corpus, features, settings);
  const without = await fitModel(train.corpus, null, settings);
  const score = (fit: FitResult, useCovariates: boolean) => {
    let logLik = 0;
    let count = 0;
    const docs = data.tokens.slice(trainCount).map((tokens, i) => ({
      language: 0,
      tokens: tokens.subarray(0, 15),
      features: useCovariates ? encodeCovariates(rows[trainCount + i], features.encoding) : undefined,
    }));
    const { theta } = foldIn({ K, phi: fit.phi, lambda: fit.lambda, numFeatures: useCovariates ? features.numFeatures : 1 }, docs, { sweeps: 40, burnIn: 10, seed: 3 });
    data.tokens.slice(trainCount).forEach((tokens, i) => {
      for (const w of tokens.subarray(15)) {
        let p = 0;
        for (let k = 0; k < K; k++) p += theta[i][k] * fit.phi[0][k * V + w];
        logLik += Math.log(p);
        count++;
      }
    });
    return Math.exp(-logLik / count);
  };
  return { withCov, features, perplexityWith: score(withCov, true), perplexityWithout: score(without, false) };
}

describe('DMR recovery (invented data, known λ)', () => {
  it('recovers the covariate weights (signs right, correlation ≥ 0.9) and lowers held-out perplexity', async () => {
    const { withCov, features, perplexityWith, perplexityWithout } = await fitAndScore(true, 2008);
    expect(features.encoding.names).toEqual(['intercept', 'region=b', 'region=c', 'score']);
    const { match, cos } = matchTopics(truePhi(), withCov.phi[0], V);
    expect(Math.min(...cos)).toBeGreaterThan(0.9);
    const truth: number[] = [];
    const got: number[] = [];
    const F = features.numFeatures;
    for (let k = 0; k < K; k++) {
      for (let f = 1; f < F; f++) {
        truth.push(TRUE_LAMBDA[k][f]);
        got.push(withCov.lambda[match[k] * F + f]);
      }
    }
    for (let i = 0; i < truth.length; i++) {
      if (Math.abs(truth[i]) >= 0.5) expect(Math.sign(got[i]), `weight ${i}: truth ${truth[i]}, fitted ${got[i].toFixed(3)}`).toBe(Math.sign(truth[i]));
    }
    expect(pearson(truth, got)).toBeGreaterThanOrEqual(0.9);
    expect(perplexityWith, `perplexity with covariates ${perplexityWith}, without ${perplexityWithout}`).toBeLessThan(perplexityWithout);
  });

  it('is no worse in held-out perplexity when the covariates are noise', async () => {
    const { perplexityWith, perplexityWithout } = await fitAndScore(false, 2009);
    // "No worse": within 1% (sampling noise of two separate fits).
    expect(perplexityWith, `perplexity with noise covariates ${perplexityWith}, without ${perplexityWithout}`).toBeLessThan(perplexityWithout * 1.01);
  });
});
