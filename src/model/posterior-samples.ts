// Saved posterior samples (docs/design.md §4): after burn-in, every few sweeps, the conditional means
// E[φ_kℓ | z] = (n_kw + β_ℓ)/(n_k^ℓ + V_ℓβ_ℓ) and E[θ_g | z] = (n_gk + α_gk)/(n_g + A_g) are
// added to running sums, so φ̂ and θ̂ are posterior means over samples (Griffiths & Steyvers,
// "Finding scientific topics", PNAS 2004, eq. 6–7, averaged over samples as in their §3), and
// the last few θ samples are kept whole for interval estimates downstream.
import type { Corpus, Priors } from './types.js';

/** Adds E[φ | z] to phiSum ((ΣV_ℓ)×K). */
export function accumulatePhi(corpus: Corpus, K: number, beta: Float64Array, nkw: Int32Array, nk: Int32Array, phiSum: Float64Array): void {
  const L = corpus.languages.length;
  const inv = new Float64Array(K);
  for (let l = 0; l < L; l++) {
    const b = beta[l];
    const vb = corpus.vocabSizes[l] * b;
    for (let k = 0; k < K; k++) inv[k] = 1 / (nk[l * K + k] + vb);
    for (let i = corpus.wordBase[l] * K, end = corpus.wordBase[l + 1] * K; i < end; i += K) {
      for (let k = 0; k < K; k++) phiSum[i + k] += (nkw[i + k] + b) * inv[k];
    }
  }
}

/** Writes E[θ_g | z] (G×K) into out and adds it to thetaSum. */
export function groupMixtures(corpus: Corpus, z: Uint16Array, priors: Priors, out: Float32Array | Float64Array, thetaSum?: Float64Array): void {
  const K = priors.K;
  const { alpha, groupPattern } = priors;
  const ngk = new Int32Array(K);
  const { docOffsets, groupDocOffsets } = corpus;
  // Σ_k α_pk once per covariate pattern (summed in the same order as before, so equal bits).
  const P = alpha.length / K;
  const alphaSum = new Float64Array(P);
  for (let p = 0; p < P; p++) {
    let A = 0;
    for (let k = 0; k < K; k++) A += alpha[p * K + k];
    alphaSum[p] = A;
  }
  for (let g = 0; g < corpus.numGroups; g++) {
    const t0 = docOffsets[groupDocOffsets[g]];
    const t1 = docOffsets[groupDocOffsets[g + 1]];
    for (let i = t0; i < t1; i++) ngk[z[i]]++;
    const off = groupPattern[g] * K;
    const inv = 1 / (t1 - t0 + alphaSum[groupPattern[g]]);
    const row = g * K;
    if (thetaSum) {
      for (let k = 0; k < K; k++) {
        const v = (ngk[k] + alpha[off + k]) * inv;
        out[row + k] = v;
        thetaSum[row + k] += v;
      }
    } else {
      for (let k = 0; k < K; k++) out[row + k] = (ngk[k] + alpha[off + k]) * inv;
    }
    for (let i = t0; i < t1; i++) ngk[z[i]] = 0;
  }
}

/** φ̂ per language as K×V_ℓ row-major (topic rows) from phiSum ((ΣV_ℓ)×K) and a sample count. */
export function phiByLanguage(corpus: Corpus, K: number, phiSum: Float64Array, numSamples: number): Float64Array[] {
  const out: Float64Array[] = [];
  for (let l = 0; l < corpus.languages.length; l++) {
    const V = corpus.vocabSizes[l];
    const base = corpus.wordBase[l];
    const phi = new Float64Array(K * V);
    for (let w = 0; w < V; w++) for (let k = 0; k < K; k++) phi[k * V + w] = phiSum[(base + w) * K + k] / numSamples;
    out.push(phi);
  }
  return out;
}
