// Per-language topic relabelling: a search step for the start of a fit.
//
// Why: in a polylingual model only link groups tie topic k of one language to topic k of
// another (Mimno et al., "Polylingual Topic Models", EMNLP 2009). When links are few, a chain can
// settle where language ℓ's "opening hours" topic carries label 3 while the other languages'
// carries label 5; the Gibbs sampler moves one token at a time and practically never swaps two
// whole topics of one language, so the mismatch stays (and drags the languages' topics into
// mixtures of several themes).
//
// Method: exchanging labels a ↔ b on every token of language ℓ leaves the topic-word part of the
// joint likelihood unchanged (β_ℓ is symmetric, so Σ_k over language ℓ's topics is permutation
// invariant; Griffiths & Steyvers, "Finding scientific topics", PNAS 2004, eq. 2). Only the group
// part changes (eq. 3 with α_g from Dirichlet-multinomial regression, Mimno & McCallum, UAI 2008):
//   Δ(a, b) = Σ_{g ∋ ℓ} Σ_{k ∈ {a,b}} [ln Γ(α_gk + n'_gk) − ln Γ(α_gk + n_gk)],
//   n'_ga = n_ga − c_gaℓ + c_gbℓ,  n'_gb = n_gb − c_gbℓ + c_gaℓ   (c = language ℓ's counts in g).
// Greedy: apply the best swap with Δ > 0, recompute, repeat until none improves. Every applied
// swap raises log p(w, z | α, β), so the loop ends. It is a deterministic hill-climbing step on the
// assignment, used only to build the starting state (never between saved samples): any starting
// state is valid for a Markov chain, and the sampler's stationary distribution is untouched.
//
// Cost: one evaluation of all K(K−1)/2 swaps for language ℓ is O(N_ℓ·K + G_ℓ·K) time with O(K²)
// memory (group counts are rebuilt one group at a time; groups are contiguous in the corpus).
import { logRising } from './log-likelihood.js';
import type { Corpus, Priors } from './types.js';

export interface RelabelResult {
  /** Swaps applied. */
  swaps: number;
  /** Increase of log p(w, z | α, β) in nats. */
  gain: number;
}

/** Δ log-likelihood of swapping labels a < b in language ℓ, for all pairs: delta[a·K + b]. */
export function swapGains(corpus: Corpus, z: Uint16Array, priors: Priors, language: number, delta: Float64Array): void {
  const K = priors.K;
  const { alpha, groupPattern } = priors;
  const { docOffsets, groupDocOffsets, docLanguage } = corpus;
  delta.fill(0);
  const n = new Int32Array(K);
  const c = new Int32Array(K);
  const present = new Int32Array(K);
  const base = new Float64Array(K);
  for (let g = 0; g < corpus.numGroups; g++) {
    const d0 = groupDocOffsets[g];
    const d1 = groupDocOffsets[g + 1];
    let m = 0;
    for (let d = d0; d < d1; d++) {
      const own = docLanguage[d] === language;
      for (let i = docOffsets[d]; i < docOffsets[d + 1]; i++) {
        const k = z[i];
        n[k]++;
        if (own && c[k]++ === 0) present[m++] = k;
      }
    }
    if (m > 0) {
      const off = groupPattern[g] * K;
      for (let k = 0; k < K; k++) base[k] = logRising(alpha[off + k], n[k]);
      for (let j = 0; j < m; j++) {
        const a = present[j];
        for (let b = 0; b < K; b++) {
          if (b === a || (c[b] > 0 && b < a)) continue; // a pair with both present is counted once
          const d =
            logRising(alpha[off + a], n[a] - c[a] + c[b]) + logRising(alpha[off + b], n[b] - c[b] + c[a]) - base[a] - base[b];
          delta[a < b ? a * K + b : b * K + a] += d;
        }
      }
    }
    for (let k = 0; k < K; k++) (n[k] = 0), (c[k] = 0);
  }
}

/** Exchanges labels a and b on every token of language ℓ (in place). */
export function swapLabels(corpus: Corpus, z: Uint16Array, language: number, a: number, b: number): void {
  const D = corpus.docOffsets.length - 1;
  for (let d = 0; d < D; d++) {
    if (corpus.docLanguage[d] !== language) continue;
    for (let i = corpus.docOffsets[d]; i < corpus.docOffsets[d + 1]; i++) {
      if (z[i] === a) z[i] = b;
      else if (z[i] === b) z[i] = a;
    }
  }
}

/**
 * Greedy per-language label swaps that raise the joint likelihood (see the file header); z is
 * changed in place. `maxSwaps` bounds the work (common practice: a safety cap, rarely reached).
 */
export function relabelLanguages(corpus: Corpus, z: Uint16Array, priors: Priors, maxSwaps = 1000): RelabelResult {
  const K = priors.K;
  const L = corpus.languages.length;
  const result: RelabelResult = { swaps: 0, gain: 0 };
  if (L < 2 || K < 2) return result;
  const delta = new Float64Array(K * K);
  // Tiny positive gains are rounding noise, not improvements (common practice).
  const tolerance = 1e-9;
  let changed = true;
  while (changed && result.swaps < maxSwaps) {
    changed = false;
    for (let l = 0; l < L && result.swaps < maxSwaps; l++) {
      for (;;) {
        swapGains(corpus, z, priors, l, delta);
        let best = tolerance;
        let bestA = -1;
        let bestB = -1;
        for (let a = 0; a < K; a++) {
          for (let b = a + 1; b < K; b++) {
            if (delta[a * K + b] > best) (best = delta[a * K + b]), (bestA = a), (bestB = b);
          }
        }
        if (bestA < 0) break;
        swapLabels(corpus, z, l, bestA, bestB);
        result.swaps++;
        result.gain += best;
        changed = true;
        if (result.swaps >= maxSwaps) break;
      }
    }
  }
  return result;
}
