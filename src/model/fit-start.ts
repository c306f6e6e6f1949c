// Where a fit's chain begins (fit.ts): the state saved in a checkpoint, checked against this corpus
// and these settings, or a fresh start from the initial priors — the start search's best chain, or
// the initialization. Kept apart so the driver reads as its schedule.
import { type Checkpoint, CHECKPOINT_VERSION } from './checkpoint.js';
import type { GroupFeatures } from './features.js';
import type { ChainStart, ChainState } from './fit-run.js';
import type { FitSettings } from './fit-settings.js';
import { type Hyperparameters, priorsFrom } from './hyperparameters.js';
import { initialAssignments } from './initialize.js';
import { randomAssignments } from './reference-sampler.js';
import { Xoshiro128 } from './rng.js';
import { searchStart, type StartSearchSettings } from './start-search.js';
import type { Corpus } from './types.js';

/**
 * The chain's starting point. Synchronous when nothing needs awaiting (a resume, a random start),
 * so that the first sweep then runs before fitModel returns, as it always has.
 */
export function startingPoint(
  corpus: Corpus,
  features: GroupFeatures,
  s: FitSettings,
  resumeFrom: Checkpoint | undefined,
): ChainStart | Promise<ChainStart> {
  return resumeFrom ? resumedStart(corpus, features, s.K, resumeFrom) : freshStart(corpus, features, s);
}

/** The state saved in a checkpoint (copied), refused with a plain message if it belongs elsewhere. */
function resumedStart(corpus: Corpus, features: GroupFeatures, K: number, cp: Checkpoint): ChainStart {
  const sumsSaved = checkResumable(corpus, features, K, cp);
  const rows = corpus.wordBase[corpus.languages.length];
  const G = corpus.numGroups;
  const rng = Xoshiro128.fromState(cp.rngState);
  const z = cp.z.slice();
  const state: ChainState = {
    rng,
    lambda: cp.lambda.slice(),
    beta: cp.beta.slice(),
    trace: [...cp.logLikelihoodTrace],
    phiSum: sumsSaved ? cp.phiSum.slice() : new Float64Array(rows * K),
    thetaSum: sumsSaved ? cp.thetaSum.slice() : new Float64Array(G * K),
    numSamples: cp.numSamples,
    thetaSamples: cp.thetaSamples.map((a) => a.slice()),
    thetaSampleSweeps: [...cp.thetaSampleSweeps],
    optimizations: cp.optimizations,
    sweep: cp.sweep,
  };
  return { state, z, startSearch: null };
}

/** Throws unless the checkpoint fits this corpus and K; returns whether it holds the posterior sums. */
function checkResumable(corpus: Corpus, features: GroupFeatures, K: number, cp: Checkpoint): boolean {
  const G = corpus.numGroups;
  const L = corpus.languages.length;
  const rows = corpus.wordBase[L];
  if (cp.version !== CHECKPOINT_VERSION) throw new Error(`Checkpoint version ${cp.version} cannot be resumed by this version.`);
  // Before the first saved sample the sums are all zero and a checkpoint leaves them out.
  const sumsSaved = cp.numSamples > 0 || cp.thetaSum.length > 0;
  if (
    cp.K !== K ||
    cp.z.length !== corpus.words.length ||
    cp.numFeatures !== features.numFeatures ||
    cp.beta.length !== L ||
    (sumsSaved && (cp.thetaSum.length !== G * K || cp.phiSum.length !== rows * K))
  ) {
    throw new Error('This checkpoint belongs to a different corpus or settings (themes, tokens or covariates differ); start a new run.');
  }
  return sumsSaved;
}

/** A new chain from the seed: the start search's best chain when it is on, else the initialization. */
function freshStart(corpus: Corpus, features: GroupFeatures, s: FitSettings): ChainStart | Promise<ChainStart> {
  const K = s.K;
  const rng = Xoshiro128.fromSeed(s.seed);
  const initial = initialHyperparameters(s, features.numFeatures, corpus.languages.length);
  if (s.startChains > 0) return searchedStart(corpus, features, s, rng, initial);
  if (s.initialization === 'random') return { z: randomAssignments(corpus, K, rng), state: newChainState(corpus, K, rng, initial), startSearch: null };
  return initializedStart(corpus, features, s, rng, initial);
}

/** λ with every intercept log α₀ (other features 0) and β₀ per language; fit-settings.ts gives the values' sources. */
function initialHyperparameters(s: FitSettings, F: number, L: number): Hyperparameters {
  const K = s.K;
  const lambda = new Float64Array(K * F);
  const a0 = s.initialAlpha ?? Math.min(1, 50 / K);
  for (let k = 0; k < K; k++) lambda[k * F] = Math.log(a0);
  return { lambda, beta: new Float64Array(L).fill(s.initialBeta) };
}

async function searchedStart(corpus: Corpus, features: GroupFeatures, s: FitSettings, rng: Xoshiro128, initial: Hyperparameters): Promise<ChainStart> {
  const found = await searchStart(corpus, features, searchSettings(s, initial), rng);
  return {
    z: found.z,
    state: newChainState(corpus, s.K, rng, { lambda: found.lambda, beta: found.beta }),
    startSearch: { chainLogLikelihoods: found.chainLogLikelihoods, chainImprovements: found.chainImprovements },
  };
}

async function initializedStart(corpus: Corpus, features: GroupFeatures, s: FitSettings, rng: Xoshiro128, initial: Hyperparameters): Promise<ChainStart> {
  const priors = priorsFrom(features, s.K, initial);
  const z = await initialAssignments(corpus, priors, rng, s.samplerFactory, s.warmStartSweeps, s.seedGroupLimit ?? corpus.numGroups);
  return { z, state: newChainState(corpus, s.K, rng, initial), startSearch: null };
}

function searchSettings(s: FitSettings, initial: Hyperparameters): StartSearchSettings {
  return {
    K: s.K,
    chains: s.startChains,
    sweeps: s.startSweeps,
    perturbations: s.startPerturbations,
    relaxSweeps: s.startRelaxSweeps,
    restrictedSweeps: s.startRestrictedSweeps,
    optimizeEvery: s.optimizeEvery,
    initialization: s.initialization,
    warmStartSweeps: s.warmStartSweeps,
    samplerFactory: s.startSamplerFactory ?? s.samplerFactory,
    optimizeBeta: s.optimizeBeta,
    optimizeLambda: s.optimizeLambda,
    priorVariance: s.priorVariance,
    initial: { lambda: initial.lambda, beta: initial.beta },
  };
}

/** A chain at sweep 0 with these hyperparameters: empty trace, no samples, no optimizations. */
function newChainState(corpus: Corpus, K: number, rng: Xoshiro128, h: Hyperparameters): ChainState {
  return {
    rng,
    lambda: h.lambda,
    beta: h.beta,
    trace: [],
    phiSum: new Float64Array(corpus.wordBase[corpus.languages.length] * K),
    thetaSum: new Float64Array(corpus.numGroups * K),
    numSamples: 0,
    thetaSamples: [],
    thetaSampleSweeps: [],
    optimizations: 0,
    sweep: 0,
  };
}
