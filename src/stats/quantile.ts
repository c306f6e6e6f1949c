// Sample quantiles.
//
// Method: linear interpolation between order statistics, definition 7 of Hyndman & Fan,
// "Sample quantiles in statistical packages", The American Statistician 50(4), 1996:
// h = (n−1)p, Q(p) = x_⌊h⌋ + (h − ⌊h⌋)(x_⌊h⌋+1 − x_⌊h⌋).

/** Quantile p ∈ [0,1] of values already sorted ascending (NaN for empty input). */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  if (n === 1) return sorted[0];
  const h = (n - 1) * Math.min(1, Math.max(0, p));
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** Quantile p of unsorted values (copies and sorts; NaN values are ignored). */
export function quantile(values: ArrayLike<number>, p: number): number {
  return quantileSorted(sortedFinite(values), p);
}

/** Ascending copy of the non-NaN values. */
export function sortedFinite(values: ArrayLike<number>): Float64Array {
  let count = 0;
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i])) count++;
  const out = new Float64Array(count);
  let j = 0;
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i])) out[j++] = values[i];
  return out.sort();
}

/** Percentile interval [lo, hi] covering `level` (e.g. 0.95) of the draws. */
export function percentileInterval(draws: ArrayLike<number>, level = 0.95): [number, number] {
  const sorted = sortedFinite(draws);
  const tail = (1 - level) / 2;
  return [quantileSorted(sorted, tail), quantileSorted(sorted, 1 - tail)];
}
