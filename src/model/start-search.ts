// The start search: several short independent chains, each improved by merge–split
// perturbations, and the one with the highest joint log-likelihood becomes the fit's start.
//
// Why: collapsed Gibbs sampling on short multilingual answers stops in local modes (a theme split
// over two topics, two themes sharing one, a topic paired with the wrong topic in another
// language); see src/model/README.md. Running several chains from different random starts and
// keeping the most probable one is the standard remedy (common practice; Griffiths & Steyvers,
// "Finding scientific topics", PNAS 2004, §3, compare chains by their likelihood). Within a chain,
// a perturbation — alternately a merge–split (merge-split.ts, after Jain & Neal, J. Comput. Graph.
// Stat. 2004) and a reset of one language with the others fixed (language-reset.ts) — is followed by `relaxSweeps` Gibbs sweeps and kept only if the joint log-likelihood is then higher
// than before it (iterated local search, common practice).
//
// Determinism and resume: every chain draws its seed from the fit's generator, so the search is
// reproducible from the fit's seed; it runs before sweep 1, so the first checkpoint already holds
// its outcome (z, λ, β and the generator state after it).
import { tokensPerLanguage } from './corpus.js';
import { initialAssignments } from './initialize.js';
import { resetLanguage } from './language-reset.js';
import { type Hyperparameters, priorsFrom, type ReestimateOptions, reestimateHyperparameters } from './hyperparameters.js';
import { logJointLikelihood } from './log-likelihood.js';
import { perturbMergeSplit } from './merge-split.js';
import { randomAssignments } from './reference-sampler.js';
import { relabelLanguages } from './relabel.js';
import { Xoshiro128 } from './rng.js';
import type { GroupFeatures } from './features.js';
import type { Corpus, Sampler, SamplerFactory } from './types.js';

export interface StartSearchSettings extends ReestimateOptions {
  K: number;
  chains: number;
  /** Sweeps of each chain before the perturbations. */
  sweeps: number;
  perturbations: number;
  relaxSweeps: number;
  /** Restricted Gibbs sweeps of each proposed split. */
  restrictedSweeps: number;
  optimizeEvery: number;
  initialization: 'sequential' | 'random';
  warmStartSweeps: number;
  samplerFactory: SamplerFactory;
  initial: Hyperparameters;
}

export interface StartState extends Hyperparameters {
  z: Uint16Array;
  /** Final joint log-likelihood per token of every chain (the best one is kept). */
  chainLogLikelihoods: number[];
  /** Perturbations kept, per chain. */
  chainImprovements: number[];
}

interface Chain extends Hyperparameters {
  sampler: Sampler;
}

async function runSweeps(corpus: Corpus, chain: Chain, features: GroupFeatures, s: StartSearchSettings, sweeps: number, rng: Xoshiro128): Promise<void> {
  for (let t = 1; t <= sweeps; t++) {
    chain.sampler.sweep(rng);
    // Optimize in the second half only, so the priors follow a chain that has moved (as in fit.ts).
    if (s.optimizeEvery > 0 && t > sweeps / 2 && t % s.optimizeEvery === 0) {
      const h = reestimateHyperparameters(corpus, chain.sampler, features, s.K, chain, s);
      chain.lambda = h.lambda;
      chain.beta = h.beta;
      chain.sampler.setPriors(priorsFrom(features, s.K, h));
    }
  }
}

async function restart(corpus: Corpus, chain: Chain, features: GroupFeatures, s: StartSearchSettings, z: Uint16Array): Promise<void> {
  await chain.sampler.dispose?.();
  chain.sampler = s.samplerFactory(corpus, z, priorsFrom(features, s.K, chain));
}

async function runChain(corpus: Corpus, features: GroupFeatures, s: StartSearchSettings, rng: Xoshiro128): Promise<StartState> {
  const K = s.K;
  const N = Math.max(1, corpus.words.length);
  const priors0 = priorsFrom(features, K, s.initial);
  const z0 =
    s.initialization === 'random'
      ? randomAssignments(corpus, K, rng)
      : await initialAssignments(corpus, priors0, rng, s.samplerFactory, s.warmStartSweeps);
  const chain: Chain = { lambda: s.initial.lambda.slice(), beta: s.initial.beta.slice(), sampler: s.samplerFactory(corpus, z0, priors0) };
  let improvements = 0;
  const tokens = tokensPerLanguage(corpus);
  const order = corpus.languages.map((_, l) => l).sort((a, b) => tokens[a] - tokens[b] || a - b);
  try {
    await runSweeps(corpus, chain, features, s, s.sweeps, rng);
    const z = chain.sampler.z.slice();
    if (relabelLanguages(corpus, z, priorsFrom(features, K, chain)).swaps > 0) await restart(corpus, chain, features, s, z);
    let current = logJointLikelihood(corpus, chain.sampler.z, K, priorsFrom(features, K, chain));
    for (let p = 0; p < s.perturbations; p++) {
      const saved = { z: chain.sampler.z.slice(), lambda: chain.lambda, beta: chain.beta };
      const trial = saved.z.slice();
      const priors = priorsFrom(features, K, chain);
      // Alternate merge–split with resets of one language, smallest languages first.
      if (order.length > 1 && p % 2 === 1) resetLanguage(corpus, trial, priors, order[(p >> 1) % order.length], s.restrictedSweeps, rng);
      else perturbMergeSplit(corpus, trial, priors, rng, s.restrictedSweeps);
      await restart(corpus, chain, features, s, trial);
      await runSweeps(corpus, chain, features, s, s.relaxSweeps, rng);
      // A perturbation often leaves one language's topic under the wrong label; relabel before
      // judging, since a swap only raises the likelihood (relabel.ts).
      const relaxed = chain.sampler.z.slice();
      if (relabelLanguages(corpus, relaxed, priorsFrom(features, K, chain)).swaps > 0) await restart(corpus, chain, features, s, relaxed);
      const ll = logJointLikelihood(corpus, chain.sampler.z, K, priorsFrom(features, K, chain));
      if (ll > current) {
        current = ll;
        improvements++;
      } else {
        chain.lambda = saved.lambda;
        chain.beta = saved.beta;
        await restart(corpus, chain, features, s, saved.z);
      }
    }
    return {
      z: chain.sampler.z.slice(),
      lambda: chain.lambda,
      beta: chain.beta,
      chainLogLikelihoods: [current / N],
      chainImprovements: [improvements],
    };
  } finally {
    await chain.sampler.dispose?.();
  }
}

/** Runs the start search (see the file header); `rng` is the fit's generator and advances. */
export async function searchStart(corpus: Corpus, features: GroupFeatures, s: StartSearchSettings, rng: Xoshiro128): Promise<StartState> {
  const seeds = Array.from({ length: Math.max(1, s.chains) }, () => rng.nextUint32());
  let best: StartState | null = null;
  const lls: number[] = [];
  const kept: number[] = [];
  for (const seed of seeds) {
    const state = await runChain(corpus, features, s, Xoshiro128.fromSeed(seed));
    lls.push(state.chainLogLikelihoods[0]);
    kept.push(state.chainImprovements[0]);
    if (!best || state.chainLogLikelihoods[0] > best.chainLogLikelihoods[0]) best = state;
  }
  return { ...best!, chainLogLikelihoods: lls, chainImprovements: kept };
}
