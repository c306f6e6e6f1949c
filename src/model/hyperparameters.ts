// One re-estimation of the hyperparameters from a sampler's current state (docs/design.md §4): β_ℓ by
// Minka's fixed point ("Estimating a Dirichlet distribution", 2000) on count histograms, λ by
// L-BFGS on the DMR log posterior (Mimno & McCallum, UAI 2008). Shared by the fit driver and the
// start search so both schedules optimize the same way.
import { betaHistogram, optimizeBeta } from './beta-optimizer.js';
import { dmrHistograms, optimizeLambda, type PriorVariance } from './dmr.js';
import { alphaFromLambda, type GroupFeatures } from './features.js';
import type { Corpus, Priors, Sampler } from './types.js';

export interface Hyperparameters {
  lambda: Float64Array;
  beta: Float64Array;
}

export interface ReestimateOptions {
  optimizeBeta: boolean;
  optimizeLambda: boolean;
  priorVariance: PriorVariance;
}

/** Priors for λ and β. */
export function priorsFrom(features: GroupFeatures, K: number, h: Hyperparameters): Priors {
  return { K, groupPattern: features.groupPattern, alpha: alphaFromLambda(h.lambda, features.patterns, K, features.numFeatures), beta: h.beta };
}

/** New λ and β from the sampler's counts (inputs are not mutated). */
export function reestimateHyperparameters(
  corpus: Corpus,
  sampler: Sampler,
  features: GroupFeatures,
  K: number,
  h: Hyperparameters,
  options: ReestimateOptions,
): Hyperparameters {
  const L = corpus.languages.length;
  let { lambda, beta } = h;
  if (options.optimizeBeta) {
    const nkw = sampler.wordTopicCounts();
    const nk = sampler.topicTotals();
    beta = beta.slice();
    for (let l = 0; l < L; l++) {
      const hist = betaHistogram(nkw, corpus.wordBase[l] * K, corpus.wordBase[l + 1] * K, nk.subarray(l * K, (l + 1) * K), corpus.vocabSizes[l]);
      beta[l] = optimizeBeta(hist, beta[l]);
    }
  }
  if (options.optimizeLambda) {
    const hist = dmrHistograms(corpus, sampler.z, K, features.groupPattern, features.numPatterns);
    lambda = optimizeLambda(hist, features.patterns, features.numFeatures, lambda, options.priorVariance).lambda;
  }
  return { lambda, beta };
}
