// β_ℓ (symmetric topic-word prior per language) by Minka's fixed point.
//
// Method: Minka, "Estimating a Dirichlet distribution" (2000), eq. 55, specialised to a
// symmetric parameter shared by K Pólya distributions over V words:
//   β ← β · Σ_k Σ_w [ψ(n_kw + β) − ψ(β)] / (V · Σ_k [ψ(n_k + Vβ) − ψ(Vβ)]).
// The numerator is evaluated from the count histogram with the digamma recurrence
// ψ(β + n) − ψ(β) = Σ_{i<n} 1/(β + i) (Wallach, "Structured topic models for language", PhD
// thesis, Cambridge 2008, §2.3): with c_i = #(k, w) with n_kw > i, it is Σ_i c_i / (β + i), so one
// iteration costs O(max count) after one O(V·K) pass, whatever the corpus size.
// Notes: the fixed point increases the Pólya likelihood at every step (Minka 2000, §3.3).
import { digamma } from './special-functions.js';

export interface BetaEstimateOptions {
  maxIterations?: number;
  /** Stop when the relative change falls below this. */
  tolerance?: number;
  /** Keep β within [min, max] (common practice, guards degenerate counts). */
  min?: number;
  max?: number;
}

/** Sufficient statistics of one language: c_i = #(k, w) with n_kw > i, and the topic totals n_k. */
export interface BetaHistogram {
  readonly V: number;
  readonly exceed: Float64Array;
  readonly totals: Int32Array;
}

/** Histogram of the counts rows [wordBase·K, wordBase'·K) of n_kw, and n_k for one language. */
export function betaHistogram(nkw: Int32Array, start: number, end: number, totals: Int32Array, V: number): BetaHistogram {
  let max = 0;
  for (let i = start; i < end; i++) if (nkw[i] > max) max = nkw[i];
  const hist = new Float64Array(max + 1);
  for (let i = start; i < end; i++) if (nkw[i] > 0) hist[nkw[i]]++;
  const exceed = new Float64Array(max);
  let acc = 0;
  for (let n = max; n >= 1; n--) {
    acc += hist[n];
    exceed[n - 1] = acc;
  }
  return { V, exceed, totals };
}

/** Minka's fixed point for a symmetric β from one language's histogram. */
export function optimizeBeta(h: BetaHistogram, beta0: number, options: BetaEstimateOptions = {}): number {
  const maxIt = options.maxIterations ?? 200;
  const tol = options.tolerance ?? 1e-9;
  const lo = options.min ?? 1e-6;
  const hi = options.max ?? 1e3;
  let beta = beta0;
  let anyToken = false;
  for (let k = 0; k < h.totals.length; k++) if (h.totals[k] > 0) anyToken = true;
  if (!anyToken) return beta0;
  for (let it = 0; it < maxIt; it++) {
    let num = 0;
    for (let i = 0; i < h.exceed.length; i++) num += h.exceed[i] / (beta + i);
    const vb = h.V * beta;
    const dvb = digamma(vb);
    let den = 0;
    for (let k = 0; k < h.totals.length; k++) if (h.totals[k] > 0) den += digamma(h.totals[k] + vb) - dvb;
    den *= h.V;
    const next = Math.min(hi, Math.max(lo, (beta * num) / den));
    const change = Math.abs(next - beta) / beta;
    beta = next;
    if (change < tol) break;
  }
  return beta;
}
