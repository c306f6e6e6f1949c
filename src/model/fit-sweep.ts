// One sweep of a fit (fit.ts) and the work the schedule (fit-schedule.ts) puts after it:
// re-estimating λ and β, tracing the joint log-likelihood, saving a posterior sample. Always in
// this order, so a resumed or refactored fit draws the same random numbers as an uninterrupted one.
import type { FitRun } from './fit-run.js';
import { isOptimizationSweep, isSampleSweep } from './fit-schedule.js';
import { priorsFrom, reestimateHyperparameters } from './hyperparameters.js';
import { logJointLikelihood, wordLogLikelihood } from './log-likelihood.js';
import { accumulatePhi, groupMixtures } from './posterior-samples.js';

/** Sweeps once and does that sweep's scheduled work; returns the joint log-likelihood per token. */
export function runOneSweep(run: FitRun): number {
  const { sampler, settings, state } = run;
  sampler.sweep(state.rng);
  state.sweep++;
  if (isOptimizationSweep(settings, state.sweep)) reestimatePriors(run);
  const nkw = sampler.wordTopicCounts();
  const nk = sampler.topicTotals();
  const ll = traceLogLikelihood(run, nkw, nk);
  if (isSampleSweep(settings, state.sweep)) saveSample(run, nkw, nk);
  return ll;
}

/** New λ and β from the sampler's counts, and the sampler switched to their priors. */
function reestimatePriors(run: FitRun): void {
  const { corpus, features, settings, sampler, state } = run;
  const K = settings.K;
  const next = reestimateHyperparameters(corpus, sampler, features, K, { lambda: state.lambda, beta: state.beta }, settings);
  state.lambda = next.lambda;
  state.beta = next.beta;
  run.priors = priorsFrom(features, K, state);
  sampler.setPriors(run.priors);
  state.optimizations++;
}

/** Appends the joint log-likelihood per token of the current state to the trace, and returns it. */
function traceLogLikelihood(run: FitRun, nkw: Int32Array, nk: Int32Array): number {
  const { corpus, sampler, priors } = run;
  const K = run.settings.K;
  // The group part comes from the sweep when the sampler sums it (NaN after new priors).
  const groupPart = sampler.lastGroupLogLikelihood?.() ?? NaN;
  const joint = Number.isFinite(groupPart)
    ? wordLogLikelihood(corpus, K, priors.beta, nkw, nk) + groupPart
    : logJointLikelihood(corpus, sampler.z, K, priors, { nkw, nk });
  const ll = joint / Math.max(1, corpus.words.length);
  run.state.trace.push(ll);
  return ll;
}

/** Adds the current state's φ̂ and θ̂ to the sums and keeps its θ sample (the most recent few). */
function saveSample(run: FitRun, nkw: Int32Array, nk: Int32Array): void {
  const { corpus, sampler, state } = run;
  accumulatePhi(corpus, run.settings.K, state.beta, nkw, nk, state.phiSum);
  const sample = thetaSampleBuffer(run);
  groupMixtures(corpus, sampler.z, run.priors, sample, state.thetaSum);
  state.numSamples++;
  if (run.keepSamples > 0) {
    state.thetaSamples.push(sample);
    state.thetaSampleSweeps.push(state.sweep);
  }
}

/** Where the next θ sample goes; the oldest kept sample leaves the kept ones when its buffer is taken. */
function thetaSampleBuffer(run: FitRun): Float32Array {
  const { state, keepSamples } = run;
  const cells = run.corpus.numGroups * run.settings.K;
  // The oldest kept sample's buffer is reused (G×K floats: 200 MB for a million answers at
  // K = 50), so a long fit does not allocate, fault in and collect one per sample.
  if (keepSamples > 0 && state.thetaSamples.length >= keepSamples) {
    const oldest = state.thetaSamples.shift()!;
    state.thetaSampleSweeps.shift();
    return oldest;
  }
  if (keepSamples > 0) return new Float32Array(cells);
  return (run.discardedSample ??= new Float32Array(cells));
}
