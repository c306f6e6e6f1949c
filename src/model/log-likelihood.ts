// Joint log-likelihood log p(w, z | α, β) of the collapsed polylingual DMR model (docs/design.md §4):
//   Σ_g [ln Γ(A_g) − ln Γ(A_g + n_g) + Σ_k (ln Γ(α_gk + n_gk) − ln Γ(α_gk))]
// + Σ_ℓ Σ_k [ln Γ(V_ℓ β_ℓ) − ln Γ(V_ℓ β_ℓ + n_k^ℓ) + Σ_w (ln Γ(β_ℓ + n_kw^ℓ) − ln Γ(β_ℓ))],
// Griffiths & Steyvers, "Finding scientific topics", PNAS 2004, eq. 2–3, with one mixture per
// link group (Mimno et al., EMNLP 2009) and α_g = exp(λ·x_g) (Mimno & McCallum, UAI 2008).
// Only non-zero counts contribute; group counts are scanned one group at a time into a scratch
// array (no dense G×K array), touching only the topics present.
import { logGamma } from './special-functions.js';
import { countsFromAssignments } from './reference-sampler.js';
import type { Corpus, Priors } from './types.js';

const SMALL = 64;

/** ln Γ(a + n) − ln Γ(a) for integer n ≥ 0: a product for small n, ln Γ otherwise. */
export function logRising(a: number, n: number): number {
  if (n === 0) return 0;
  if (n <= 8) {
    let p = a;
    for (let i = 1; i < n; i++) p *= a + i;
    return Math.log(p);
  }
  return logGamma(a + n) - logGamma(a);
}

/**
 * log p(w, z | α, β). `counts` may pass the sampler's n_kw and n_k^ℓ to avoid recounting.
 */
export function logJointLikelihood(
  corpus: Corpus,
  z: Uint16Array,
  K: number,
  priors: Priors,
  counts?: { nkw: Int32Array; nk: Int32Array },
): number {
  const { nkw, nk } = counts ?? countsFromAssignments(corpus, z, K);
  return wordLogLikelihood(corpus, K, priors.beta, nkw, nk) + groupLogLikelihood(corpus, z, K, priors);
}

/** The topic-word part: Σ_ℓ Σ_k [...] from the counts. */
export function wordLogLikelihood(corpus: Corpus, K: number, beta: Float64Array, nkw: Int32Array, nk: Int32Array): number {
  const L = corpus.languages.length;
  let total = 0;
  const table = new Float64Array(SMALL);
  for (let l = 0; l < L; l++) {
    const b = beta[l];
    const V = corpus.vocabSizes[l];
    // ln Γ(b + n) − ln Γ(b) tabulated for small n, where almost every count falls.
    const lgb = logGamma(b);
    for (let n = 0; n < SMALL; n++) table[n] = n === 0 ? 0 : table[n - 1] + Math.log(b + n - 1);
    const start = corpus.wordBase[l] * K;
    const end = corpus.wordBase[l + 1] * K;
    let s = 0;
    for (let i = start; i < end; i++) {
      const n = nkw[i];
      if (n === 0) continue;
      s += n < SMALL ? table[n] : logGamma(b + n) - lgb;
    }
    const lgvb = logGamma(V * b);
    for (let k = 0; k < K; k++) s += lgvb - logGamma(V * b + nk[l * K + k]);
    total += s;
  }
  return total;
}

/** The group part Σ_g [...], one group at a time. */
export function groupLogLikelihood(corpus: Corpus, z: Uint16Array, K: number, priors: Priors): number {
  const { alpha, groupPattern } = priors;
  const P = alpha.length / K;
  const alphaSum = new Float64Array(P);
  for (let p = 0; p < P; p++) for (let k = 0; k < K; k++) alphaSum[p] += alpha[p * K + k];
  const ngk = new Int32Array(K);
  const touched = new Int32Array(K);
  const { docOffsets, groupDocOffsets } = corpus;
  let total = 0;
  for (let g = 0; g < corpus.numGroups; g++) {
    const t0 = docOffsets[groupDocOffsets[g]];
    const t1 = docOffsets[groupDocOffsets[g + 1]];
    if (t0 === t1) continue;
    let m = 0;
    for (let i = t0; i < t1; i++) {
      const k = z[i];
      if (ngk[k]++ === 0) touched[m++] = k;
    }
    const off = groupPattern[g] * K;
    let s = -logRising(alphaSum[groupPattern[g]], t1 - t0);
    for (let j = 0; j < m; j++) {
      const k = touched[j];
      s += logRising(alpha[off + k], ngk[k]);
      ngk[k] = 0;
    }
    total += s;
  }
  return total;
}
