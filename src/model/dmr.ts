// Covariate weights λ of Dirichlet-multinomial regression by L-BFGS.
//
// Method: Mimno & McCallum, "Topic models conditioned on arbitrary features with
// Dirichlet-multinomial regression", UAI 2008, eq. 3–4: with α_pk = exp(λ_k · x_p), maximize
//   ℓ(λ) = Σ_g [ln Γ(A_g) − ln Γ(A_g + n_g) + Σ_k (ln Γ(α_gk + n_gk) − ln Γ(α_gk))]
//          − Σ_k Σ_f λ_kf² / (2σ_f²),
//   ∂ℓ/∂λ_kf = Σ_g x_gf α_gk [ψ(A_g) − ψ(A_g + n_g) + ψ(α_gk + n_gk) − ψ(α_gk)] − λ_kf / σ_f²,
// (σ_0² for the intercept, σ_f² for the other features; docs/design.md §4). Without covariates x = [1]
// and this learns an asymmetric α (Wallach, Mimno & McCallum, "Rethinking LDA: why priors
// matter", NIPS 2009).
// Count histograms (Wallach, "Structured topic models for language", PhD thesis, Cambridge
// 2008, §2.3): groups sharing a pattern share α, so the sums only need, per (pattern, topic),
// how many groups have n_gk = n, and per pattern how many groups have length n. These are built
// once from z (a sort of the non-zero (g, k) cells), after which one evaluation costs
// O(#distinct (pattern, topic, count) + P·K·F), independent of the number of groups.
import { minimizeLbfgs, type LbfgsOptions } from './lbfgs.js';
import { alphaFromLambda } from './features.js';
import { logRising } from './log-likelihood.js';
import { digamma } from './special-functions.js';
import type { Corpus } from './types.js';

/** Run-length encoded histograms: entry i says `count[i]` groups have value n[i] at key[i]. */
export interface DmrHistograms {
  readonly K: number;
  readonly numPatterns: number;
  /** key = p·K + k, n = n_gk ≥ 1. */
  readonly cellKey: Int32Array;
  readonly cellN: Int32Array;
  readonly cellCount: Float64Array;
  /** key = p, n = n_g ≥ 1. */
  readonly lengthKey: Int32Array;
  readonly lengthN: Int32Array;
  readonly lengthCount: Float64Array;
}

function runLength(keys: Float64Array, M: number): { key: Int32Array; n: Int32Array; count: Float64Array } {
  keys.sort();
  const key: number[] = [];
  const n: number[] = [];
  const count: number[] = [];
  for (let i = 0; i < keys.length; ) {
    let j = i;
    while (j < keys.length && keys[j] === keys[i]) j++;
    key.push(Math.floor(keys[i] / M));
    n.push(keys[i] % M);
    count.push(j - i);
    i = j;
  }
  return { key: Int32Array.from(key), n: Int32Array.from(n), count: Float64Array.from(count) };
}

/** Builds the histograms from the assignments (one pass over tokens and a sort). */
export function dmrHistograms(corpus: Corpus, z: Uint16Array, K: number, groupPattern: Int32Array, numPatterns: number): DmrHistograms {
  const { docOffsets, groupDocOffsets } = corpus;
  const G = corpus.numGroups;
  let maxLen = 0;
  let cells = 0;
  let nonEmpty = 0;
  const ngk = new Int32Array(K);
  const touched = new Int32Array(K);
  for (let g = 0; g < G; g++) {
    const len = docOffsets[groupDocOffsets[g + 1]] - docOffsets[groupDocOffsets[g]];
    maxLen = Math.max(maxLen, len);
    if (len > 0) nonEmpty++;
    cells += Math.min(len, K);
  }
  const M = maxLen + 1;
  if (numPatterns * K * M > Number.MAX_SAFE_INTEGER) throw new Error('Too many patterns × topics × group length for the histogram keys.');
  const cellKeys = new Float64Array(cells);
  const lengthKeys = new Float64Array(nonEmpty);
  let c = 0;
  let e = 0;
  for (let g = 0; g < G; g++) {
    const t0 = docOffsets[groupDocOffsets[g]];
    const t1 = docOffsets[groupDocOffsets[g + 1]];
    if (t0 === t1) continue;
    const p = groupPattern[g];
    lengthKeys[e++] = p * M + (t1 - t0);
    let m = 0;
    for (let i = t0; i < t1; i++) if (ngk[z[i]]++ === 0) touched[m++] = z[i];
    for (let j = 0; j < m; j++) {
      const k = touched[j];
      cellKeys[c++] = (p * K + k) * M + ngk[k];
      ngk[k] = 0;
    }
  }
  const cellsRl = runLength(cellKeys.subarray(0, c), M);
  const lengthRl = runLength(lengthKeys, M);
  return {
    K,
    numPatterns,
    cellKey: cellsRl.key,
    cellN: cellsRl.n,
    cellCount: cellsRl.count,
    lengthKey: lengthRl.key,
    lengthN: lengthRl.n,
    lengthCount: lengthRl.count,
  };
}

/** ψ(a + n) − ψ(a) for integer n ≥ 0 (recurrence A&S 6.3.5 for small n). */
export function digammaRising(a: number, n: number): number {
  if (n <= 8) {
    let s = 0;
    for (let i = 0; i < n; i++) s += 1 / (a + i);
    return s;
  }
  return digamma(a + n) - digamma(a);
}

export interface PriorVariance {
  /** σ² of the intercept (weak regularization; default 100, common practice). */
  intercept: number;
  /** σ² of every other feature (moderate; default 1, common practice). */
  features: number;
}

export const DEFAULT_PRIOR_VARIANCE: PriorVariance = { intercept: 100, features: 1 };

/** The DMR log posterior ℓ(λ) and its gradient (written into grad, K×F). */
export function dmrLogPosterior(
  h: DmrHistograms,
  patterns: Float64Array,
  F: number,
  lambda: Float64Array,
  variance: PriorVariance,
  grad?: Float64Array,
): number {
  const K = h.K;
  const P = h.numPatterns;
  const alpha = alphaFromLambda(lambda, patterns, K, F);
  const alphaSum = new Float64Array(P);
  for (let p = 0; p < P; p++) for (let k = 0; k < K; k++) alphaSum[p] += alpha[p * K + k];
  const dAlpha = grad ? new Float64Array(P * K) : null;
  const dSum = grad ? new Float64Array(P) : null;
  let value = 0;
  for (let i = 0; i < h.cellKey.length; i++) {
    const a = alpha[h.cellKey[i]];
    value += h.cellCount[i] * logRising(a, h.cellN[i]);
    if (dAlpha) dAlpha[h.cellKey[i]] += h.cellCount[i] * digammaRising(a, h.cellN[i]);
  }
  for (let i = 0; i < h.lengthKey.length; i++) {
    const A = alphaSum[h.lengthKey[i]];
    value -= h.lengthCount[i] * logRising(A, h.lengthN[i]);
    if (dSum) dSum[h.lengthKey[i]] += h.lengthCount[i] * digammaRising(A, h.lengthN[i]);
  }
  for (let k = 0; k < K; k++) {
    for (let f = 0; f < F; f++) {
      const l = lambda[k * F + f];
      value -= (l * l) / (2 * (f === 0 ? variance.intercept : variance.features));
    }
  }
  if (grad && dAlpha && dSum) {
    for (let k = 0; k < K; k++) {
      for (let f = 0; f < F; f++) grad[k * F + f] = -lambda[k * F + f] / (f === 0 ? variance.intercept : variance.features);
    }
    for (let p = 0; p < P; p++) {
      for (let k = 0; k < K; k++) {
        const d = alpha[p * K + k] * (dAlpha[p * K + k] - dSum[p]);
        if (d === 0) continue;
        for (let f = 0; f < F; f++) grad[k * F + f] += d * patterns[p * F + f];
      }
    }
  }
  return value;
}

export interface LambdaFit {
  lambda: Float64Array;
  logPosterior: number;
  iterations: number;
  converged: boolean;
}

/** Maximizes the DMR log posterior over λ (K×F) from lambda0 by L-BFGS. */
export function optimizeLambda(
  h: DmrHistograms,
  patterns: Float64Array,
  F: number,
  lambda0: Float64Array,
  variance: PriorVariance = DEFAULT_PRIOR_VARIANCE,
  options: LbfgsOptions = {},
): LambdaFit {
  const result = minimizeLbfgs(
    (x, g) => {
      const v = dmrLogPosterior(h, patterns, F, x, variance, g);
      for (let i = 0; i < g.length; i++) g[i] = -g[i];
      return -v;
    },
    lambda0,
    { maxIterations: 100, gradientTolerance: 1e-5, functionTolerance: 1e-10, ...options },
  );
  return { lambda: result.x, logPosterior: -result.f, iterations: result.iterations, converged: result.converged };
}
