// Public surface of the numerical core (docs/design.md §2, §4). Pure: typed arrays in, plain data out.
export type { Corpus, Priors, Rng, Sampler, SamplerFactory } from './types.js';
export { Xoshiro128, RNG_STATE_VERSION } from './rng.js';
export { buildCorpus, groupTokenRange, tokensPerLanguage, MAX_TOPICS } from './corpus.js';
export type { BuiltCorpus, CorpusInput, CorpusInputDocument } from './corpus.js';
export {
  alphaFromLambda,
  buildGroupFeatures,
  encodeCovariates,
  interceptOnlyFeatures,
  learnEncoding,
  MISSING_LEVEL,
} from './features.js';
export type { CovariateSpec, CovariateValue, FeatureEncoding, GroupFeatures } from './features.js';
export { digamma, hurwitzZeta, logGamma, trigamma } from './special-functions.js';
export { sampleDirichlet, sampleDiscrete, sampleGamma, sampleNormal } from './random-variates.js';
export { countsFromAssignments, createReferenceSampler, randomAssignments } from './reference-sampler.js';
export { createFastSampler } from './fast-sampler.js';
export { createParallelSampler } from './parallel/index.js';
export { groupLogLikelihood, logJointLikelihood, logRising, wordLogLikelihood } from './log-likelihood.js';
export { betaHistogram, optimizeBeta } from './beta-optimizer.js';
export type { BetaHistogram, BetaEstimateOptions } from './beta-optimizer.js';
export { minimizeLbfgs } from './lbfgs.js';
export type { LbfgsOptions, LbfgsResult, Objective } from './lbfgs.js';
export { DEFAULT_PRIOR_VARIANCE, digammaRising, dmrHistograms, dmrLogPosterior, optimizeLambda } from './dmr.js';
export type { DmrHistograms, LambdaFit, PriorVariance } from './dmr.js';
export { accumulatePhi, groupMixtures, phiByLanguage } from './posterior-samples.js';
export { CHECKPOINT_VERSION, decodeCheckpoint, encodeCheckpoint } from './checkpoint.js';
export type { Checkpoint } from './checkpoint.js';
export { DEFAULT_FIT_SETTINGS, fitModel } from './fit.js';
export { resolveFitSettings } from './fit-settings.js';
export { initialAssignments } from './initialize.js';
export { searchStart } from './start-search.js';
export type { StartSearchSettings, StartState } from './start-search.js';
export type { FitHooks, FitResult, FitSettings, SweepProgress } from './fit.js';
export { foldIn, foldInGroup } from './fold-in.js';
export type { FoldInDocument, FoldInModel, FoldInResult, FoldInSettings } from './fold-in.js';
