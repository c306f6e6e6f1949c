// The services' view of a fit: one function from a corpus, its covariate features and plain
// settings to the arrays a run keeps (FitOutput), with checkpoints as bytes. It delegates to the
// model's fit driver (src/model/fit.ts) and picks the sampler from the thread count; the rest of
// the services layer (storing, exporting, applying) depends only on FitOutput.
import { decodeCheckpoint, encodeCheckpoint } from '../model/index.js';
import { createFastSampler } from '../model/index.js';
import type { FeatureEncoding, GroupFeatures } from '../model/index.js';
import { fitModel } from '../model/index.js';
import { createParallelSampler } from '../model/index.js';
import { createReferenceSampler } from '../model/index.js';
import type { Corpus, SamplerFactory } from '../model/index.js';

export interface EngineSettings {
  K: number;
  sweeps: number;
  burnIn: number;
  seed: number;
  threads: number;
  /** Keep a posterior sample every this many sweeps after burn-in. */
  sampleEvery: number;
  /** At most this many θ samples are kept (the latest). */
  maxSamples: number;
  /** Checkpoint every this many sweeps (0 = only when stopped). */
  checkpointEvery: number;
  /** On one thread: the fast exact sampler (default) or the reference one. */
  sampler?: 'fast' | 'reference';
  /** The answers' link groups come first; later groups only tie words (see withoutExtraGroups). */
  answerGroups?: number;
}

export interface SweepReport {
  sweep: number;
  sweeps: number;
  tokensPerSecond: number;
  logLikelihoodPerToken: number;
  secondsLeft: number;
}

export interface EngineHooks {
  onSweep?: (report: SweepReport) => void;
  shouldStop?: () => boolean;
  onCheckpoint?: (sweep: number, bytes: Uint8Array) => void;
  /** Continue from a checkpoint saved by onCheckpoint. */
  resumeFrom?: Uint8Array;
}

/** What a fit leaves behind (posterior means unless said otherwise). */
export interface FitOutput {
  readonly K: number;
  /** φ̂ per language, K×V_ℓ row-major: phi[ℓ][k*V_ℓ + w]; each row sums to 1. */
  readonly phi: Float64Array[];
  /** θ̂ per link group, G×K row-major. */
  readonly thetaGroups: Float64Array;
  /** Saved posterior samples of the group mixtures, each G×K. */
  readonly thetaSamples: Float32Array[];
  /** α per pattern (P×K) and the pattern of each group. */
  readonly alpha: Float64Array;
  readonly groupPattern: Int32Array;
  readonly beta: Float64Array;
  /** DMR weights λ, K×F row-major (feature 0 = intercept). */
  readonly lambda: Float64Array;
  readonly featureNames: string[];
  readonly encoding: FeatureEncoding | null;
  /** Log-likelihood per token after each sweep. */
  readonly trace: number[];
  readonly sweepsDone: number;
  readonly stopped: boolean;
  readonly seconds: number;
  readonly tokens: number;
  readonly tokensPerSecond: number;
  readonly sampler: string;
}

/** The sampler for a thread count: the fast exact sampler on one thread, the parallel one above. */
export function samplerFor(threads: number, sampler: 'fast' | 'reference' = 'fast'): SamplerFactory {
  if (threads > 1) return createParallelSampler(threads);
  return sampler === 'reference' ? createReferenceSampler : createFastSampler;
}

/**
 * Every fit starts the same way, whatever its size: from the linked groups (src/model/initialize.ts:
 * the multilingual link groups are sampled alone for a few sweeps, then every other token is drawn
 * once with their topic-word counts held fixed). The start search of src/model/start-search.ts
 * (independent chains with merge–split perturbations) is not used here: on a real corpus of
 * 8,220 short texts in five languages (the CLDR emoji names of `emojibase-data`, bench/alignment)
 * it cost 2.5–10 times the fit's own sweeps and did not raise agreement across languages
 * (0.50–0.54 with it, 0.52–0.56 without, two seeds, 10% of concepts linked).
 */
export async function fitCorpus(corpus: Corpus, features: GroupFeatures | null, settings: EngineSettings, hooks: EngineHooks = {}): Promise<FitOutput> {
  const result = await fitModel(
    corpus,
    features,
    {
      K: settings.K,
      sweeps: settings.sweeps,
      burnIn: settings.burnIn,
      seed: settings.seed,
      sampleEvery: Math.max(1, settings.sampleEvery),
      keepThetaSamples: settings.maxSamples,
      checkpointEvery: settings.checkpointEvery,
      samplerFactory: samplerFor(settings.threads, settings.sampler),
      seedGroupLimit: settings.answerGroups ?? null,
    },
    {
      onSweep: (p) => hooks.onSweep?.({ sweep: p.sweep, sweeps: p.sweeps, tokensPerSecond: p.tokensPerSecond, logLikelihoodPerToken: p.logLikelihoodPerToken, secondsLeft: p.eta }),
      shouldStop: () => hooks.shouldStop?.() ?? false,
      ...(hooks.onCheckpoint ? { onCheckpoint: (cp) => hooks.onCheckpoint!(cp.sweep, encodeCheckpoint(cp)) } : {}),
      ...(hooks.resumeFrom ? { resumeFrom: decodeCheckpoint(hooks.resumeFrom) } : {}),
    },
  );
  const d = result.diagnostics;
  return {
    K: result.K,
    phi: result.phi,
    thetaGroups: result.theta,
    thetaSamples: result.thetaSamples,
    alpha: result.alpha,
    groupPattern: result.groupPattern,
    beta: result.beta,
    lambda: result.lambda,
    featureNames: result.featureNames,
    encoding: features?.encoding ?? null,
    trace: Array.from(result.logLikelihoodTrace),
    sweepsDone: d.sweepsCompleted,
    stopped: d.stopped,
    seconds: d.seconds,
    tokens: d.tokens,
    tokensPerSecond: d.tokensPerSecond,
    sampler: d.sampler,
  };
}

/**
 * The output restricted to the first `groups` link groups (and their `tokens`): the fit may add groups after the
 * answers' own (words spelled the same in several languages, fit-job.ts) that tie the languages'
 * topics but are not answers, so their mixtures are not kept.
 */
export function withoutExtraGroups(out: FitOutput, groups: number, tokens: number): FitOutput {
  if (out.groupPattern.length === groups) return out;
  const K = out.K;
  return {
    ...out,
    thetaGroups: out.thetaGroups.slice(0, groups * K),
    thetaSamples: out.thetaSamples.map((t) => t.slice(0, groups * K)),
    groupPattern: out.groupPattern.slice(0, groups),
    tokens,
  };
}
