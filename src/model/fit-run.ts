// What a fit carries from sweep to sweep (fit.ts): the chain's state — what a checkpoint saves —
// and the run around it: the sampler, the priors it samples with, where θ samples go. One shared
// shape, so the start, the sweep, the checkpoint and the result can each be a small function.
import type { GroupFeatures } from './features.js';
import type { FitResult, FitSettings } from './fit-settings.js';
import { priorsFrom } from './hyperparameters.js';
import type { Xoshiro128 } from './rng.js';
import type { Corpus, Priors, Sampler } from './types.js';

/** The chain's state; a checkpoint holds exactly this, with z taken from the sampler. */
export interface ChainState {
  readonly rng: Xoshiro128;
  /** λ, K×F row-major, and β per language (replaced, not mutated, by each optimization). */
  lambda: Float64Array;
  beta: Float64Array;
  /** Joint log-likelihood per token after each sweep. */
  readonly trace: number[];
  /** Posterior-sample accumulators (posterior-samples.ts), (ΣV_ℓ)×K and G×K. */
  readonly phiSum: Float64Array;
  readonly thetaSum: Float64Array;
  numSamples: number;
  /** The most recent kept θ samples (G×K each) and the sweeps they come from. */
  readonly thetaSamples: Float32Array[];
  readonly thetaSampleSweeps: number[];
  optimizations: number;
  /** Sweeps completed. */
  sweep: number;
}

export type StartSearchOutcome = FitResult['diagnostics']['startSearch'];

/** Where a chain begins: its state, the assignments its sampler starts from, the start search's outcome. */
export interface ChainStart {
  readonly state: ChainState;
  readonly z: Uint16Array;
  readonly startSearch: StartSearchOutcome;
}

export interface FitRun {
  readonly corpus: Corpus;
  readonly features: GroupFeatures;
  readonly settings: FitSettings;
  readonly sampler: Sampler;
  readonly state: ChainState;
  /** Sweeps completed when this fit began (0, or the checkpoint's). */
  readonly startSweep: number;
  readonly startSearch: StartSearchOutcome;
  /** Priors of the current λ and β (replaced after each optimization). */
  priors: Priors;
  /** Whole θ samples kept: keepThetaSamples, bounded by maxThetaSampleCells. */
  readonly keepSamples: number;
  /** With keepSamples = 0, the one buffer every θ sample is drawn into. */
  discardedSample: Float32Array | null;
}

/** Number of whole θ samples a fit keeps (each is G×K Float32 cells). */
export function thetaSamplesToKeep(s: FitSettings, G: number): number {
  return Math.max(0, Math.min(s.keepThetaSamples, Math.floor(s.maxThetaSampleCells / Math.max(1, G * s.K))));
}

/** The run of a chain from its start: the sampler is built on the start's assignments and priors. */
export function openRun(corpus: Corpus, features: GroupFeatures, settings: FitSettings, start: ChainStart): FitRun {
  const keepSamples = thetaSamplesToKeep(settings, corpus.numGroups);
  const { state, startSearch } = start;
  const priors = priorsFrom(features, settings.K, state);
  const sampler = settings.samplerFactory(corpus, start.z, priors);
  sampler.trackGroupLogLikelihood?.();
  return { corpus, features, settings, sampler, state, startSweep: state.sweep, startSearch, priors, keepSamples, discardedSample: null };
}
