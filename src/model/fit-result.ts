// The result of a fit (fit.ts): posterior means of φ and θ over the saved samples, the final state
// and its checkpoint, and diagnostics. Releases the sampler once the last of its state is read.
import type { FitResult } from './fit-settings.js';
import { checkpointOf } from './fit-checkpoint.js';
import type { FitRun } from './fit-run.js';
import { accumulatePhi, groupMixtures, phiByLanguage } from './posterior-samples.js';

/** The fit's result; `began` is the performance.now() at the first sweep. */
export async function fitResult(run: FitRun, stopped: boolean, began: number): Promise<FitResult> {
  const { corpus, features, sampler, state } = run;
  const K = run.settings.K;
  const seconds = (performance.now() - began) / 1000;
  const nkw = sampler.wordTopicCounts().slice();
  const nk = sampler.topicTotals().slice();
  const sums = posteriorSums(run, nkw, nk);
  const theta = meanTheta(run, sums.thetaSum, sums.count);
  const checkpoint = checkpointOf(run);
  const finalZ = sampler.z.slice();
  await sampler.dispose?.();
  return {
    K,
    languages: corpus.languages,
    phi: phiByLanguage(corpus, K, sums.phiSum, sums.count),
    theta,
    thetaSamples: state.thetaSamples,
    thetaSampleSweeps: state.thetaSampleSweeps,
    lambda: state.lambda,
    featureNames: features.encoding.names,
    alpha: run.priors.alpha,
    groupPattern: features.groupPattern,
    beta: state.beta,
    logLikelihoodTrace: Float64Array.from(state.trace),
    z: finalZ,
    wordTopicCounts: nkw,
    topicTotals: nk,
    checkpoint,
    diagnostics: fitDiagnostics(run, stopped, seconds),
  };
}

interface PosteriorSums {
  phiSum: Float64Array;
  thetaSum: Float64Array;
  count: number;
}

/** The sums of φ̂ and θ̂ to average, and over how many samples. */
function posteriorSums(run: FitRun, nkw: Int32Array, nk: Int32Array): PosteriorSums {
  const { corpus, state } = run;
  const K = run.settings.K;
  if (state.numSamples !== 0) return { phiSum: state.phiSum, thetaSum: state.thetaSum, count: state.numSamples };
  // Without saved samples (stopped early), report the current state's conditional means.
  const phiSum = new Float64Array(corpus.wordBase[corpus.languages.length] * K);
  const thetaSum = new Float64Array(corpus.numGroups * K);
  accumulatePhi(corpus, K, state.beta, nkw, nk, phiSum);
  groupMixtures(corpus, run.sampler.z, run.priors, new Float64Array(corpus.numGroups * K), thetaSum);
  return { phiSum, thetaSum, count: 1 };
}

/** θ̂, G×K: the θ sums divided by the number of samples. */
function meanTheta(run: FitRun, thetaSum: Float64Array, count: number): Float64Array {
  const theta = new Float64Array(run.corpus.numGroups * run.settings.K);
  for (let i = 0; i < theta.length; i++) theta[i] = thetaSum[i] / count;
  return theta;
}

function fitDiagnostics(run: FitRun, stopped: boolean, seconds: number): FitResult['diagnostics'] {
  const { state } = run;
  const N = run.corpus.words.length;
  return {
    sampler: run.sampler.name,
    sweepsCompleted: state.sweep,
    stopped,
    samples: state.numSamples,
    tokens: N,
    seconds,
    tokensPerSecond: seconds > 0 ? ((state.sweep - run.startSweep) * N) / seconds : 0,
    optimizations: state.optimizations,
    finalLogLikelihoodPerToken: state.trace.length > 0 ? state.trace[state.trace.length - 1] : NaN,
    startSearch: run.startSearch,
  };
}
