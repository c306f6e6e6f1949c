// False-discovery-rate control for many pairwise contrasts.
//
// Method: the step-up procedure of Benjamini & Hochberg, "Controlling the false discovery
// rate: a practical and powerful approach to multiple testing", JRSS B 57(1), 1995: sort the
// m p-values, find the largest i with p_(i) ≤ (i/m)·q and flag p_(1..i). Adjusted p-values
// p̃_(i) = min_{j ≥ i} min(1, m·p_(j)/j) are flagged exactly when p̃ ≤ q.

export interface FdrResult {
  /** 1 where the hypothesis is rejected at false discovery rate q. */
  readonly flags: Uint8Array;
  /** Benjamini–Hochberg adjusted p-values, in input order. */
  readonly adjusted: Float64Array;
}

/** Benjamini–Hochberg (1995) at level q; NaN p-values are never flagged and not counted in m. */
export function benjaminiHochberg(p: ArrayLike<number>, q = 0.05): FdrResult {
  const n = p.length;
  const flags = new Uint8Array(n);
  const adjusted = new Float64Array(n).fill(NaN);
  const order: number[] = [];
  for (let i = 0; i < n; i++) if (!Number.isNaN(p[i])) order.push(i);
  order.sort((a, b) => p[a] - p[b]);
  const m = order.length;
  let running = 1;
  for (let r = m - 1; r >= 0; r--) {
    const i = order[r];
    running = Math.min(running, (m * p[i]) / (r + 1));
    adjusted[i] = Math.min(1, running);
  }
  for (let r = 0; r < m; r++) {
    const i = order[r];
    if (adjusted[i] <= q) flags[i] = 1;
  }
  return { flags, adjusted };
}
