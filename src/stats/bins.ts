// Quantile bins for numeric covariates, so that shares can be shown per range of the variable.
import { quantileSorted, sortedFinite } from './quantile.js';

export interface Binning {
  /** Bin index per document; -1 where the value is missing (NaN). */
  readonly levelOfDoc: Int32Array;
  /** One label per bin, e.g. "[18, 30)", the last bin closed "[60, 85]". */
  readonly levels: string[];
  /** Bin edges (length levels.length + 1). */
  readonly edges: Float64Array;
}

/**
 * Cut `values` at their empirical quantiles into at most `bins` bins (quartiles by default,
 * common practice). Quantiles by Hyndman & Fan (1996) definition 7. Equal edges (many tied
 * values) are merged, so fewer bins may come back; a constant variable gives one bin.
 */
export function quantileBins(values: ArrayLike<number>, bins = 4): Binning {
  const sorted = sortedFinite(values);
  const levelOfDoc = new Int32Array(values.length).fill(-1);
  if (sorted.length === 0) return { levelOfDoc, levels: [], edges: new Float64Array(0) };
  const raw: number[] = [sorted[0]];
  for (let b = 1; b < bins; b++) {
    const e = quantileSorted(sorted, b / bins);
    if (e > raw[raw.length - 1]) raw.push(e);
  }
  const max = sorted[sorted.length - 1];
  if (max > raw[raw.length - 1] || raw.length === 1) raw.push(max);
  const edges = Float64Array.from(raw);
  const nb = edges.length - 1;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isNaN(v)) continue;
    let b = 0;
    while (b < nb - 1 && v >= edges[b + 1]) b++;
    levelOfDoc[i] = b;
  }
  const levels: string[] = [];
  for (let b = 0; b < nb; b++) {
    levels.push(`[${fmt(edges[b])}, ${fmt(edges[b + 1])}${b === nb - 1 ? ']' : ')'}`);
  }
  return { levelOfDoc, levels, edges };
}

function fmt(x: number): string {
  return String(Number(x.toPrecision(4)));
}
