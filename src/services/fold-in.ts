// Mixtures for answers the fit did not see (held-out answers, answers added later, a new wave
// coded with a saved run), in the shapes the checks, exports and Apply use. The numerics are the
// model's (src/model/fold-in.ts: Gibbs sampling with φ̂ fixed; src/model/features.ts: α from
// λ and the covariates); this file only picks the random stream and the settings.
import { alphaFromLambda, encodeCovariates, foldInGroup as modelFoldInGroup, Xoshiro128, type FeatureEncoding, type Rng } from '../model/index.js';

export interface FoldInDocument {
  /** Index into `phi`. */
  readonly language: number;
  readonly tokens: Int32Array;
  /** α for this document (length K). */
  readonly alpha: Float64Array;
}

export interface FoldInSettings {
  sweeps: number;
  burnIn: number;
  seed: number;
}

export interface FoldInResult {
  /** θ per document, D×K row-major; documents without known words get α normalised. */
  readonly theta: Float64Array;
  /** Unknown words skipped, per document. */
  readonly unknownWords: Int32Array;
}

/** Default: 50 sweeps with 20 burn-in are plenty for one short answer (common practice). */
export const DEFAULT_FOLD_IN: FoldInSettings = { sweeps: 50, burnIn: 20, seed: 1 };

/** Stream of the fold-in's generator (apart from the fit's and the held-out split's). */
const FOLD_IN_STREAM = 104729;

/** `phi[ℓ]` is K×V_ℓ row-major (φ_kw at k·V_ℓ + w), as the model returns it. */
export function foldInDocuments(phi: readonly Float64Array[], K: number, docs: readonly FoldInDocument[], settings: FoldInSettings = DEFAULT_FOLD_IN): FoldInResult {
  const D = docs.length;
  const theta = new Float64Array(D * K);
  const unknownWords = new Int32Array(D);
  const rng = Xoshiro128.fromSeed(settings.seed, FOLD_IN_STREAM);
  for (let d = 0; d < D; d++) {
    unknownWords[d] = modelFoldInGroup(phi, K, [docs[d]], docs[d].alpha, settings, rng, theta.subarray(d * K, (d + 1) * K));
  }
  return { theta, unknownWords };
}

/** θ of one link group (the model's foldInGroup), for callers that keep their own generator. */
export function foldInGroup(
  phi: readonly Float64Array[],
  K: number,
  parts: readonly { language: number; tokens: Int32Array }[],
  alpha: Float64Array,
  settings: FoldInSettings,
  rng: Rng,
  out: Float64Array = new Float64Array(K),
): number {
  return modelFoldInGroup(phi, K, parts, alpha, settings, rng, out);
}

/**
 * α of one answer from its covariates, encoded as in the fit (a level never seen in the fit
 * counts as the baseline): the model's alphaFromLambda for one pattern.
 */
export function alphaForCovariates(lambda: Float64Array, encoding: FeatureEncoding | null, K: number, covariates: Record<string, string | number | null>): Float64Array {
  const F = lambda.length / K;
  const x = encoding ? encodeCovariates(covariates, encoding) : Float64Array.of(1);
  if (x.length === F) return alphaFromLambda(lambda, x, K, F);
  // A shorter encoding (intercept only) multiplies the features it has.
  const padded = new Float64Array(F);
  padded.set(x.subarray(0, F));
  return alphaFromLambda(lambda, padded, K, F);
}
