// Fold-in inference for new or held-out documents (docs/design.md §4).
//
// Method: with the topic-word distributions fixed at the posterior mean φ̂ and the document's
// prior α_k = exp(λ_k · x) from its covariates (Mimno & McCallum, UAI 2008), Gibbs-sample the
// document's own assignments from p(z_i = k | rest) ∝ (n_dk + α_k) φ̂_kw (Wallach, Murray,
// Salakhutdinov & Mimno, "Evaluation methods for topic models", ICML 2009, §4) and average
// θ = (n_dk + α_k)/(n_d + A) over the sweeps after burn-in. Word ids outside the fitted
// vocabulary (−1 or ≥ V_ℓ) are skipped and counted.
import { Xoshiro128 } from './rng.js';
import type { Rng } from './types.js';

export interface FoldInModel {
  readonly K: number;
  /** φ̂ per language, K×V_ℓ row-major (as in FitResult.phi). */
  readonly phi: readonly Float64Array[];
  /** λ, K×F row-major. */
  readonly lambda: Float64Array;
  readonly numFeatures: number;
}

export interface FoldInDocument {
  readonly language: number;
  readonly tokens: Int32Array;
  /** x = [1, features…] (length F); default: intercept only. */
  readonly features?: Float64Array;
}

export interface FoldInSettings {
  sweeps: number;
  burnIn: number;
  seed: number;
}

export interface FoldInResult {
  /** θ per document (length K each). */
  theta: Float64Array[];
  /** Tokens skipped per document because their word is outside the fitted vocabulary. */
  unknownWords: Int32Array;
}

export function foldIn(model: FoldInModel, docs: readonly FoldInDocument[], settings: Partial<FoldInSettings> = {}): FoldInResult {
  const sweeps = settings.sweeps ?? 50;
  const burnIn = settings.burnIn ?? 10;
  if (!(burnIn >= 0 && burnIn < sweeps)) throw new Error(`Fold-in burn-in (${burnIn}) must be below its sweeps (${sweeps}).`);
  const rng = Xoshiro128.fromSeed(settings.seed ?? 1);
  const { K, phi, lambda, numFeatures: F } = model;
  const alpha = new Float64Array(K);
  const theta: Float64Array[] = [];
  const unknownWords = new Int32Array(docs.length);
  docs.forEach((doc, d) => {
    if (!phi[doc.language]) throw new Error(`Document ${d + 1} has language index ${doc.language}, which the model does not have.`);
    for (let k = 0; k < K; k++) {
      let s = lambda[k * F];
      if (doc.features) for (let f = 1; f < F; f++) s += lambda[k * F + f] * doc.features[f];
      alpha[k] = Math.exp(s);
    }
    const out = new Float64Array(K);
    unknownWords[d] = foldInGroup(phi, K, [doc], alpha, { sweeps, burnIn }, rng, out);
    theta.push(out);
  });
  return { theta, unknownWords };
}

/**
 * θ of one link group from the tokens of its documents (possibly in several languages) under a
 * given α, written into `out` (the method above; a group's documents share one mixture, as in
 * the fit). Draws from `rng`, so a caller folding in many groups keeps one stream. Returns the
 * number of unknown words skipped; a group without known words gets α normalised.
 */
export function foldInGroup(
  phi: readonly Float64Array[],
  K: number,
  parts: readonly { readonly language: number; readonly tokens: Int32Array }[],
  alpha: Float64Array,
  settings: { sweeps: number; burnIn: number },
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
  let aSum = 0;
  for (let k = 0; k < K; k++) aSum += alpha[k];
  out.fill(0);
  const n = words.length;
  if (n === 0) {
    for (let k = 0; k < K; k++) out[k] = alpha[k] / aSum;
    return unknown;
  }
  const z = new Int32Array(n);
  const nk = new Float64Array(K);
  const cum = new Float64Array(K);
  for (let i = 0; i < n; i++) nk[(z[i] = rng.nextInt(K))]++;
  let kept = 0;
  const burnIn = Math.min(settings.burnIn, settings.sweeps - 1);
  for (let s = 1; s <= settings.sweeps; s++) {
    for (let i = 0; i < n; i++) {
      const table = rows[i];
      const V = table.length / K;
      const w = words[i];
      nk[z[i]]--;
      let total = 0;
      for (let k = 0; k < K; k++) {
        total += (nk[k] + alpha[k]) * table[k * V + w];
        cum[k] = total;
      }
      const u = rng.nextDouble() * total;
      let k = 0;
      while (k < K - 1 && cum[k] <= u) k++;
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
