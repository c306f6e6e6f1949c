// Topic-word distributions and top words, from the counts a sampler keeps.
//
// Method: the posterior-mean estimate φ̂_kℓw = (n_kw + β_ℓ) / (n_k^ℓ + V_ℓ β_ℓ) (Griffiths &
// Steyvers, "Finding scientific topics", PNAS 2004, eq. 6; per language as in Mimno et al.,
// "Polylingual Topic Models", EMNLP 2009).

/** Shapes of the sampler's dense counts (src/model/types.ts, Sampler). */
export interface TopicWordCounts {
  readonly K: number;
  /** V_ℓ per language. */
  readonly vocabSizes: Int32Array;
  /** Prefix sums of vocabSizes (length L+1). */
  readonly wordBase: Int32Array;
  /** n_kw, (ΣV_ℓ)×K row-major, row = wordBase[ℓ] + w. */
  readonly wordTopic: Int32Array;
  /** n_k^ℓ, L×K row-major. */
  readonly topicTotals: Int32Array;
  /** β_ℓ per language. */
  readonly beta: Float64Array;
}

/** φ̂ per language as K×V_ℓ row-major arrays (φ_kw at k·V_ℓ + w); each row sums to 1. */
export function topicWordDistributions(counts: TopicWordCounts): Float64Array[] {
  const { K, vocabSizes, wordBase, wordTopic, topicTotals, beta } = counts;
  const out: Float64Array[] = [];
  for (let l = 0; l < vocabSizes.length; l++) {
    const V = vocabSizes[l];
    const phi = new Float64Array(K * V);
    const b = beta[l];
    for (let k = 0; k < K; k++) {
      const denom = topicTotals[l * K + k] + V * b;
      for (let w = 0; w < V; w++) phi[k * V + w] = (wordTopic[(wordBase[l] + w) * K + k] + b) / denom;
    }
    out.push(phi);
  }
  return out;
}

/**
 * The n most probable words of each theme in one language's φ (K×V row-major), in rank order.
 * Ties keep the lower word id first. O(K·V·n) worst case, O(K·V) typically.
 */
export function topWords(phi: Float64Array, K: number, n: number): Int32Array[] {
  const V = phi.length / K;
  const m = Math.min(n, V);
  const out: Int32Array[] = [];
  for (let k = 0; k < K; k++) {
    const ids = new Int32Array(m);
    const vals = new Float64Array(m).fill(-Infinity);
    const row = k * V;
    for (let w = 0; w < V; w++) {
      const v = phi[row + w];
      if (v <= vals[m - 1]) continue;
      let i = m - 1;
      while (i > 0 && vals[i - 1] < v) {
        vals[i] = vals[i - 1];
        ids[i] = ids[i - 1];
        i--;
      }
      vals[i] = v;
      ids[i] = w;
    }
    out.push(ids);
  }
  return out;
}
