// Bootstrap draws of weighted theme shares per level (see contrasts.ts for the method).
import type { Xoshiro128 } from '../model/index.js';

/**
 * B draws of each level's weighted mean shares, out[(l·K + k)·B + b].
 *
 * Resampling units. By default each document is a unit. With `clusterOfDoc` (e.g. the link
 * group), the documents of one cluster within a level form one unit and are resampled together
 * — the cluster bootstrap for dependent observations (Davison & Hinkley, "Bootstrap Methods and
 * their Application", 1997, §3.8) — because linked answers share one mixture and are not
 * independent. When a level has more than `maxUnits` units, they are partitioned at random into
 * `maxUnits` near-equal random groups (the random-group method of Wolter, "Introduction to
 * Variance Estimation", 2nd ed. 2007, ch. 2): totals of random groups of independent units are
 * themselves independent and the share is the same ratio Σ w θ / Σ w of their totals, so
 * resampling groups estimates the same spread at a cost of maxUnits instead of n per draw.
 * A resample is drawn as multiplicities c_j (uniform indices counted into an Int32Array), and
 * the draw is Σ c_j T_jk / Σ c_j W_j.
 */
export function bootstrapDraws(
  samples: readonly (Float64Array | Float32Array)[], K: number, members: Int32Array[],
  weights: Float64Array | undefined, B: number, maxUnits: number, rng: Xoshiro128,
  clusterOfDoc?: Int32Array,
): Float64Array {
  const L = members.length;
  const S = samples.length;
  const out = new Float64Array(L * K * B);
  const acc = new Float64Array(K);
  for (let l = 0; l < L; l++) {
    if (members[l].length === 0) {
      out.fill(NaN, l * K * B, (l + 1) * K * B);
      continue;
    }
    const { docs, unitStart } = units(members[l], clusterOfDoc);
    const C = unitStart.length - 1;
    const M = Math.min(C, maxUnits);
    const order = M < C ? shuffledRange(C, rng) : null;
    // Group totals: T[s][j·K + k] = Σ_{d∈j} w_d θ_dk, W[j] = Σ_{d∈j} w_d.
    const W = new Float64Array(M);
    const T = samples.map(() => new Float64Array(M * K));
    for (let j = 0; j < M; j++) {
      const first = Math.floor((j * C) / M);
      const last = Math.floor(((j + 1) * C) / M);
      for (let v = first; v < last; v++) {
        const u = order ? order[v] : v;
        for (let i = unitStart[u]; i < unitStart[u + 1]; i++) {
          const d = docs[i];
          const w = weights ? weights[d] : 1;
          W[j] += w;
          const base = d * K;
          for (let s = 0; s < S; s++) {
            const theta = samples[s];
            const t = T[s];
            for (let k = 0; k < K; k++) t[j * K + k] += w * theta[base + k];
          }
        }
      }
    }
    const counts = new Int32Array(M);
    for (let b = 0; b < B; b++) {
      const t = T[b % S];
      counts.fill(0);
      for (let i = 0; i < M; i++) counts[rng.nextInt(M)]++;
      acc.fill(0);
      let wsum = 0;
      for (let j = 0; j < M; j++) {
        const c = counts[j];
        if (c === 0) continue;
        wsum += c * W[j];
        for (let k = 0; k < K; k++) acc[k] += c * t[j * K + k];
      }
      for (let k = 0; k < K; k++) out[(l * K + k) * B + b] = wsum > 0 ? acc[k] / wsum : NaN;
    }
  }
  return out;
}

/** The level's documents ordered so each unit is a contiguous run docs[unitStart[u] .. unitStart[u+1]). */
function units(members: Int32Array, clusterOfDoc?: Int32Array): { docs: Int32Array; unitStart: Int32Array } {
  const n = members.length;
  if (!clusterOfDoc) return { docs: members, unitStart: Int32Array.from({ length: n + 1 }, (_, i) => i) };
  const docs = members.slice().sort((a, b) => clusterOfDoc[a] - clusterOfDoc[b] || a - b);
  const starts = [0];
  for (let i = 1; i < n; i++) if (clusterOfDoc[docs[i]] !== clusterOfDoc[docs[i - 1]]) starts.push(i);
  starts.push(n);
  return { docs, unitStart: Int32Array.from(starts) };
}

/** A seeded random permutation of 0..n−1 (Fisher–Yates; Durstenfeld, CACM 1964). */
function shuffledRange(n: number, rng: Xoshiro128): Int32Array {
  const a = Int32Array.from({ length: n }, (_, i) => i);
  for (let i = n - 1; i > 0; i--) {
    const j = rng.nextInt(i + 1);
    const t = a[i];
    a[i] = a[j];
    a[j] = t;
  }
  return a;
}
