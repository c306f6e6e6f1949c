// Mixtures for answers the fit did not see (held-out answers, answers added later, a new wave
// coded with a saved run): Gibbs sampling on each document's own tokens with φ̂ fixed, θ
// averaged over post-burn-in sweeps ("Evaluation methods for topic models", Wallach et al.,
// ICML 2009, §4: the document-completion setting fixes the topic-word distributions). Unknown
// words (id < 0 or outside the vocabulary) are skipped and counted.
import { encodeCovariates, type FeatureEncoding } from '../model/features.js';
import { Xoshiro128 } from '../model/rng.js';
import type { Rng } from '../model/types.js';

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

/** `phi[ℓ]` is K×V_ℓ row-major (φ_kw at k·V_ℓ + w), as the model returns it. */
export function foldInDocuments(phi: readonly Float64Array[], K: number, docs: readonly FoldInDocument[], settings: FoldInSettings = DEFAULT_FOLD_IN): FoldInResult {
  const D = docs.length;
  const theta = new Float64Array(D * K);
  const unknownWords = new Int32Array(D);
  const rng = Xoshiro128.fromSeed(settings.seed, 104729);
  for (let d = 0; d < D; d++) {
    unknownWords[d] = foldInGroup(phi, K, [docs[d]], docs[d].alpha, settings, rng, theta.subarray(d * K, (d + 1) * K));
  }
  return { theta, unknownWords };
}

/**
 * θ of one link group from the tokens of its documents (possibly in several languages), written
 * into `out`; returns the number of unknown words skipped.
 */
export function foldInGroup(
  phi: readonly Float64Array[],
  K: number,
  parts: readonly { language: number; tokens: Int32Array }[],
  alpha: Float64Array,
  settings: FoldInSettings,
  rng: Rng,
  out: Float64Array = new Float64Array(K),
): number {
  const rows: Float64Array[] = [];
  const words: number[] = [];
  let unknown = 0;
  for (const part of parts) {
    const table = phi[part.language];
    const V = table ? table.length / K : 0;
    for (const w of part.tokens) {
      if (w >= 0 && w < V) {
        rows.push(table);
        words.push(w);
      } else unknown++;
    }
  }
  const vocab = rows.map((t) => t.length / K);
  let aSum = 0;
  for (let k = 0; k < K; k++) aSum += alpha[k];
  out.fill(0);
  if (words.length === 0) {
    for (let k = 0; k < K; k++) out[k] = alpha[k] / aSum;
    return unknown;
  }
  const n = words.length;
  const z = new Int32Array(n);
  const nk = new Float64Array(K);
  const p = new Float64Array(K);
  for (let i = 0; i < n; i++) nk[(z[i] = rng.nextInt(K))]++;
  let kept = 0;
  const burnIn = Math.min(settings.burnIn, settings.sweeps - 1);
  for (let s = 1; s <= settings.sweeps; s++) {
    for (let i = 0; i < n; i++) {
      const table = rows[i];
      const V = vocab[i];
      const w = words[i];
      nk[z[i]]--;
      let total = 0;
      for (let k = 0; k < K; k++) {
        total += (nk[k] + alpha[k]) * table[k * V + w];
        p[k] = total;
      }
      const u = rng.nextDouble() * total;
      let k = 0;
      while (k < K - 1 && p[k] <= u) k++;
      z[i] = k;
      nk[k]++;
    }
    if (s > burnIn) {
      for (let k = 0; k < K; k++) out[k] += (nk[k] + alpha[k]) / (n + aSum);
      kept++;
    }
  }
  for (let k = 0; k < K; k++) out[k] /= kept;
  return unknown;
}

/**
 * α of one answer from its covariates: α_k = exp(λ_k · x) with x encoded as in the fit
 * (Mimno & McCallum, UAI 2008, eq. 1); a level never seen in the fit counts as the baseline.
 */
export function alphaForCovariates(
  lambda: Float64Array,
  encoding: FeatureEncoding | null,
  K: number,
  covariates: Record<string, string | number | null>,
): Float64Array {
  const F = lambda.length / K;
  const x = encoding ? encodeCovariates(covariates, encoding) : Float64Array.of(1);
  const alpha = new Float64Array(K);
  for (let k = 0; k < K; k++) {
    let s = 0;
    for (let f = 0; f < F && f < x.length; f++) s += lambda[k * F + f] * x[f];
    alpha[k] = Math.exp(s);
  }
  return alpha;
}
