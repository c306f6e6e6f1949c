// Survey-weighted means and the Kish effective sample size.
//
// Method: the weighted (Hájek) mean Σ w_i x_i / Σ w_i, and Kish's effective sample size
// n_eff = (Σ w_i)² / Σ w_i² (Kish, "Survey Sampling", Wiley 1965, §11.7: the design effect
// of unequal weighting is n·Σw²/(Σw)²). n_eff equals n when all weights are equal and falls
// towards 1 as one weight dominates.

/** Weighted mean of `values` (all weights 1 when `weights` is omitted); NaN for empty input. */
export function weightedMean(values: ArrayLike<number>, weights?: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return NaN;
  let sum = 0;
  let wsum = 0;
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i] : 1;
    sum += w * values[i];
    wsum += w;
  }
  return wsum > 0 ? sum / wsum : NaN;
}

/** Kish (1965) effective sample size (Σw)²/Σw²; 0 for empty input or all-zero weights. */
export function kishEffectiveN(weights: ArrayLike<number>): number {
  let s1 = 0;
  let s2 = 0;
  for (let i = 0; i < weights.length; i++) {
    const w = weights[i];
    s1 += w;
    s2 += w * w;
  }
  return s2 > 0 ? (s1 * s1) / s2 : 0;
}

/** Kish effective n of the documents listed in `docs`, weights indexed by document. */
export function kishEffectiveNOf(docs: Int32Array, weights?: ArrayLike<number>): number {
  if (!weights) return docs.length;
  let s1 = 0;
  let s2 = 0;
  for (let i = 0; i < docs.length; i++) {
    const w = weights[docs[i]];
    s1 += w;
    s2 += w * w;
  }
  return s2 > 0 ? (s1 * s1) / s2 : 0;
}
