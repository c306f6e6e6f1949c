// Fold-in inference for new or held-out documents (DESIGN §4).
//
// Method: with the topic-word distributions fixed at the posterior mean φ̂ and the document's
// prior α_k = exp(λ_k · x) from its covariates (Mimno & McCallum, UAI 2008), Gibbs-sample the
// document's own assignments from p(z_i = k | rest) ∝ (n_dk + α_k) φ̂_kw (Wallach, Murray,
// Salakhutdinov & Mimno, "Evaluation methods for topic models", ICML 2009, §4) and average
// θ = (n_dk + α_k)/(n_d + A) over the sweeps after burn-in. Word ids outside the fitted
// vocabulary (−1 or ≥ V_ℓ) are skipped and counted.
import { Xoshiro128 } from './rng.js';

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
  const nk = new Int32Array(K);
  const cum = new Float64Array(K);
  const theta: Float64Array[] = [];
  const unknownWords = new Int32Array(docs.length);
  docs.forEach((doc, d) => {
    const ph = phi[doc.language];
    if (!ph) throw new Error(`Document ${d + 1} has language index ${doc.language}, which the model does not have.`);
    const V = ph.length / K;
    let A = 0;
    for (let k = 0; k < K; k++) {
      let s = lambda[k * F];
      if (doc.features) for (let f = 1; f < F; f++) s += lambda[k * F + f] * doc.features[f];
      alpha[k] = Math.exp(s);
      A += alpha[k];
    }
    const known: number[] = [];
    for (const w of doc.tokens) {
      if (w >= 0 && w < V) known.push(w);
      else unknownWords[d]++;
    }
    const n = known.length;
    const out = new Float64Array(K);
    if (n === 0) {
      for (let k = 0; k < K; k++) out[k] = alpha[k] / A;
      theta.push(out);
      return;
    }
    const z = new Uint16Array(n);
    nk.fill(0);
    for (let i = 0; i < n; i++) nk[(z[i] = rng.nextInt(K))]++;
    for (let t = 0; t < sweeps; t++) {
      for (let i = 0; i < n; i++) {
        nk[z[i]]--;
        const w = known[i];
        let total = 0;
        for (let k = 0; k < K; k++) {
          total += (nk[k] + alpha[k]) * ph[k * V + w];
          cum[k] = total;
        }
        const u = rng.nextDouble() * total;
        let k = 0;
        while (k < K - 1 && cum[k] <= u) k++;
        z[i] = k;
        nk[k]++;
      }
      if (t >= burnIn) for (let k = 0; k < K; k++) out[k] += (nk[k] + alpha[k]) / (n + A);
    }
    for (let k = 0; k < K; k++) out[k] /= sweeps - burnIn;
    theta.push(out);
  });
  return { theta, unknownWords };
}
