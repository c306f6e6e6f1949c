// The fit driver: sweeps of a collapsed Gibbs sampler, hyperparameter optimization every few
// sweeps, saved posterior samples after burn-in, progress and checkpoints (docs/design.md §4). Pure:
// the caller (a worker thread, the CLI, a test) decides where progress and checkpoints go.
//
// Schedule (common practice, as in Wallach, Mimno & McCallum, "Rethinking LDA: why priors
// matter", NIPS 2009, §4): λ and β are re-estimated every `optimizeEvery` sweeps from sweep
// `optimizeFrom` on (default: half the burn-in, so that saved samples come from a chain whose
// priors have settled); samples are saved every `sampleEvery` sweeps after `burnIn`.
import { accumulatePhi, groupMixtures, phiByLanguage } from './posterior-samples.js';
import { type Checkpoint, CHECKPOINT_VERSION } from './checkpoint.js';
import { alphaFromLambda, type GroupFeatures, interceptOnlyFeatures } from './features.js';
import { type FitHooks, type FitResult, type FitSettings, resolveFitSettings } from './fit-settings.js';
import { reestimateHyperparameters } from './hyperparameters.js';
import { initialAssignments } from './initialize.js';
import { logJointLikelihood, wordLogLikelihood } from './log-likelihood.js';
import { randomAssignments } from './reference-sampler.js';
import { Xoshiro128 } from './rng.js';
import { searchStart } from './start-search.js';
import type { Corpus, Priors } from './types.js';

/** Periodic checkpoints take at most about 1/(1 + CHECKPOINT_SHARE) of a fit's time (common practice: 5%). */
const CHECKPOINT_SHARE = 19;
/** Checkpoints faster than this keep the fixed cadence of checkpointEvery. */
const SLOW_CHECKPOINT_MS = 1000;

export { DEFAULT_FIT_SETTINGS } from './fit-settings.js';
export type { FitHooks, FitResult, FitSettings, SweepProgress } from './fit-settings.js';

/** Fits the polylingual DMR topic model by collapsed Gibbs sampling. */
export async function fitModel(
  corpus: Corpus,
  features: GroupFeatures | null,
  settings: Partial<FitSettings> & { K: number },
  hooks: FitHooks = {},
): Promise<FitResult> {
  const s = resolveFitSettings(settings);
  const K = s.K;
  const feats = features ?? interceptOnlyFeatures(corpus.numGroups);
  const F = feats.numFeatures;
  const G = corpus.numGroups;
  const N = corpus.words.length;
  const L = corpus.languages.length;
  const rows = corpus.wordBase[L];
  if (feats.groupPattern.length !== G) throw new Error(`Features describe ${feats.groupPattern.length} groups; the corpus has ${G}.`);

  const keep = Math.max(0, Math.min(s.keepThetaSamples, Math.floor(s.maxThetaSampleCells / Math.max(1, G * K))));
  let rng: Xoshiro128;
  let z: Uint16Array;
  let lambda: Float64Array;
  let beta: Float64Array;
  let trace: number[];
  let phiSum: Float64Array;
  let thetaSum: Float64Array;
  let numSamples: number;
  let thetaSamples: Float32Array[];
  let thetaSampleSweeps: number[];
  let optimizations: number;
  let start: number;
  let startSearch: FitResult['diagnostics']['startSearch'] = null;
  const cp = hooks.resumeFrom;
  if (cp) {
    if (cp.version !== CHECKPOINT_VERSION) throw new Error(`Checkpoint version ${cp.version} cannot be resumed by this version.`);
    // Before the first saved sample the sums are all zero and a checkpoint leaves them out.
    const sumsSaved = cp.numSamples > 0 || cp.thetaSum.length > 0;
    if (cp.K !== K || cp.z.length !== N || cp.numFeatures !== F || cp.beta.length !== L || (sumsSaved && (cp.thetaSum.length !== G * K || cp.phiSum.length !== rows * K))) {
      throw new Error('This checkpoint belongs to a different corpus or settings (themes, tokens or covariates differ); start a new run.');
    }
    rng = Xoshiro128.fromState(cp.rngState);
    z = cp.z.slice();
    lambda = cp.lambda.slice();
    beta = cp.beta.slice();
    trace = [...cp.logLikelihoodTrace];
    phiSum = sumsSaved ? cp.phiSum.slice() : new Float64Array(rows * K);
    thetaSum = sumsSaved ? cp.thetaSum.slice() : new Float64Array(G * K);
    numSamples = cp.numSamples;
    thetaSamples = cp.thetaSamples.map((a) => a.slice());
    thetaSampleSweeps = [...cp.thetaSampleSweeps];
    optimizations = cp.optimizations;
    start = cp.sweep;
  } else {
    rng = Xoshiro128.fromSeed(s.seed);
    lambda = new Float64Array(K * F);
    const a0 = s.initialAlpha ?? Math.min(1, 50 / K);
    for (let k = 0; k < K; k++) lambda[k * F] = Math.log(a0);
    beta = new Float64Array(L).fill(s.initialBeta);
    const initPriors: Priors = { K, groupPattern: feats.groupPattern, alpha: alphaFromLambda(lambda, feats.patterns, K, F), beta };
    if (s.startChains > 0) {
      const found = await searchStart(
        corpus,
        feats,
        {
          K,
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
          initial: { lambda, beta },
        },
        rng,
      );
      z = found.z;
      lambda = found.lambda;
      beta = found.beta;
      startSearch = { chainLogLikelihoods: found.chainLogLikelihoods, chainImprovements: found.chainImprovements };
    } else {
      z =
        s.initialization === 'random'
          ? randomAssignments(corpus, K, rng)
          : await initialAssignments(corpus, initPriors, rng, s.samplerFactory, s.warmStartSweeps, s.seedGroupLimit ?? corpus.numGroups);
    }
    trace = [];
    phiSum = new Float64Array(rows * K);
    thetaSum = new Float64Array(G * K);
    numSamples = 0;
    thetaSamples = [];
    thetaSampleSweeps = [];
    optimizations = 0;
    start = 0;
  }

  let priors: Priors = { K, groupPattern: feats.groupPattern, alpha: alphaFromLambda(lambda, feats.patterns, K, F), beta };
  const sampler = s.samplerFactory(corpus, z, priors);
  sampler.trackGroupLogLikelihood?.();
  const began = performance.now();
  let sweep = start;
  let stopped = false;
  let discardedSample: Float32Array | null = null;
  let lastCheckpointEnd = began;
  let lastCheckpointMs = 0;
  // The checkpoint's arrays are views of the live state (a checkpoint of a million answers holds
  // G×K sums of hundreds of MB): onCheckpoint must encode or copy them before it returns.
  const snapshot = (): Checkpoint => ({
    version: CHECKPOINT_VERSION,
    K,
    sweep,
    z: sampler.z.slice(),
    rngState: rng.saveState(),
    lambda: lambda.slice(),
    numFeatures: F,
    beta: beta.slice(),
    logLikelihoodTrace: Float64Array.from(trace),
    phiSum: numSamples > 0 ? phiSum : new Float64Array(0),
    thetaSum: numSamples > 0 ? thetaSum : new Float64Array(0),
    numSamples,
    thetaSamples: [...thetaSamples],
    thetaSampleSweeps: [...thetaSampleSweeps],
    optimizations,
  });
  try {
    while (sweep < s.sweeps) {
      sampler.sweep(rng);
      sweep++;
      if (s.optimizeEvery > 0 && sweep > s.optimizeFrom && sweep % s.optimizeEvery === 0 && sweep < s.sweeps) {
        ({ lambda, beta } = reestimateHyperparameters(corpus, sampler, feats, K, { lambda, beta }, s));
        priors = { K, groupPattern: feats.groupPattern, alpha: alphaFromLambda(lambda, feats.patterns, K, F), beta };
        sampler.setPriors(priors);
        optimizations++;
      }
      const nkw = sampler.wordTopicCounts();
      const nk = sampler.topicTotals();
      // The group part comes from the sweep when the sampler sums it (NaN after new priors).
      const groupPart = sampler.lastGroupLogLikelihood?.() ?? NaN;
      const joint = Number.isFinite(groupPart)
        ? wordLogLikelihood(corpus, K, priors.beta, nkw, nk) + groupPart
        : logJointLikelihood(corpus, sampler.z, K, priors, { nkw, nk });
      const ll = joint / Math.max(1, N);
      trace.push(ll);
      if (sweep > s.burnIn && (sweep - s.burnIn) % s.sampleEvery === 0) {
        accumulatePhi(corpus, K, beta, nkw, nk, phiSum);
        // The oldest kept sample's buffer is reused (G×K floats: 200 MB for a million answers at
        // K = 50), so a long fit does not allocate, fault in and collect one per sample.
        let sample: Float32Array;
        if (keep > 0 && thetaSamples.length >= keep) {
          sample = thetaSamples.shift()!;
          thetaSampleSweeps.shift();
        } else if (keep > 0) sample = new Float32Array(G * K);
        else sample = discardedSample ??= new Float32Array(G * K);
        groupMixtures(corpus, sampler.z, priors, sample, thetaSum);
        numSamples++;
        if (keep > 0) {
          thetaSamples.push(sample);
          thetaSampleSweeps.push(sweep);
        }
      }
      const seconds = (performance.now() - began) / 1000;
      const done = sweep - start;
      hooks.onSweep?.({
        sweep,
        sweeps: s.sweeps,
        tokensPerSecond: seconds > 0 ? (done * N) / seconds : 0,
        logLikelihoodPerToken: ll,
        eta: done > 0 ? (seconds / done) * (s.sweeps - sweep) : 0,
      });
      stopped = sweep < s.sweeps && (hooks.shouldStop?.() ?? false);
      // A periodic checkpoint that took over a second (large studies: hundreds of MB) delays the
      // next until the sampling since it is CHECKPOINT_SHARE times longer; stopping always saves.
      const due =
        s.checkpointEvery > 0 &&
        sweep % s.checkpointEvery === 0 &&
        (lastCheckpointMs < SLOW_CHECKPOINT_MS || performance.now() - lastCheckpointEnd >= CHECKPOINT_SHARE * lastCheckpointMs);
      if (hooks.onCheckpoint && (due || stopped)) {
        const t = performance.now();
        await hooks.onCheckpoint(snapshot());
        lastCheckpointEnd = performance.now();
        lastCheckpointMs = lastCheckpointEnd - t;
      }
      if (stopped) break;
      // Let the event loop deliver messages (cancel requests) between sweeps.
      await new Promise<void>((r) => setImmediate(r));
    }
  } catch (error) {
    await sampler.dispose?.();
    throw error;
  }

  const seconds = (performance.now() - began) / 1000;
  const nkw = sampler.wordTopicCounts().slice();
  const nk = sampler.topicTotals().slice();
  // Without saved samples (stopped early), report the current state's conditional means.
  let phiS = phiSum;
  let thetaS = thetaSum;
  let count = numSamples;
  if (count === 0) {
    phiS = new Float64Array(rows * K);
    thetaS = new Float64Array(G * K);
    accumulatePhi(corpus, K, beta, nkw, nk, phiS);
    groupMixtures(corpus, sampler.z, priors, new Float64Array(G * K), thetaS);
    count = 1;
  }
  const theta = new Float64Array(G * K);
  for (let i = 0; i < theta.length; i++) theta[i] = thetaS[i] / count;
  const checkpoint = snapshot();
  const finalZ = sampler.z.slice();
  await sampler.dispose?.();
  return {
    K,
    languages: corpus.languages,
    phi: phiByLanguage(corpus, K, phiS, count),
    theta,
    thetaSamples,
    thetaSampleSweeps,
    lambda,
    featureNames: feats.encoding.names,
    alpha: priors.alpha,
    groupPattern: feats.groupPattern,
    beta,
    logLikelihoodTrace: Float64Array.from(trace),
    z: finalZ,
    wordTopicCounts: nkw,
    topicTotals: nk,
    checkpoint,
    diagnostics: {
      sampler: sampler.name,
      sweepsCompleted: sweep,
      stopped,
      samples: numSamples,
      tokens: N,
      seconds,
      tokensPerSecond: seconds > 0 ? ((sweep - start) * N) / seconds : 0,
      optimizations,
      finalLogLikelihoodPerToken: trace.length > 0 ? trace[trace.length - 1] : NaN,
      startSearch,
    },
  };
}
