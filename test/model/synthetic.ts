// Invented data for the recovery tests: documents drawn from the polylingual DMR model itself.
import { buildCorpus, type BuiltCorpus } from '../../src/model/corpus.js';
import { sampleDirichlet, sampleDiscrete } from '../../src/model/random-variates.js';
import type { Rng } from '../../src/model/types.js';

export interface SyntheticGroup {
  /** Mixture prior of the group. */
  alpha: Float64Array;
  /** Languages and lengths of its documents. */
  docs: { language: number; length: number }[];
}

export interface SyntheticCorpus {
  built: BuiltCorpus;
  /** True θ per input group (in the order given). */
  theta: Float64Array[];
  /** Input document → input group. */
  docGroup: number[];
  tokens: Int32Array[];
  languages: number[];
}

/**
 * Draws θ_g ~ Dir(α_g), then each token's topic from θ_g and word from φ_k^ℓ (K×V_ℓ rows).
 * Groups with more than one document get link keys.
 */
export function drawCorpus(rng: Rng, phi: Float64Array[][], groups: SyntheticGroup[], vocabSizes: number[]): SyntheticCorpus {
  const documents: { language: number; tokens: Int32Array; linkKey: string | null }[] = [];
  const theta: Float64Array[] = [];
  const docGroup: number[] = [];
  groups.forEach((g, gi) => {
    const th = sampleDirichlet(rng, g.alpha);
    theta.push(th);
    for (const d of g.docs) {
      const tokens = new Int32Array(d.length);
      for (let i = 0; i < d.length; i++) {
        const k = sampleDiscrete(rng, th, 1);
        tokens[i] = sampleDiscrete(rng, phi[d.language][k], 1);
      }
      documents.push({ language: d.language, tokens, linkKey: g.docs.length > 1 ? `g${gi}` : null });
      docGroup.push(gi);
    }
  });
  const built = buildCorpus({ languages: vocabSizes.map((_, i) => `l${i}`), vocabSizes, documents });
  return { built, theta, docGroup, tokens: documents.map((d) => d.tokens), languages: documents.map((d) => d.language) };
}

export function cosine(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let ab = 0;
  let aa = 0;
  let bb = 0;
  for (let i = 0; i < a.length; i++) {
    ab += a[i] * b[i];
    aa += a[i] * a[i];
    bb += b[i] * b[i];
  }
  return ab / Math.sqrt(aa * bb);
}

/** Row k of a K×V row-major matrix. */
export function row(m: Float64Array, k: number, V: number): Float64Array {
  return m.subarray(k * V, (k + 1) * V);
}

/**
 * Best one-to-one matching of true topics to fitted topics by cosine (exhaustive search over
 * assignments by a greedy pass then pairwise swaps; fine for K ≤ 20).
 */
export function matchTopics(truth: Float64Array[], fitted: Float64Array, V: number): { match: number[]; cos: number[] } {
  const K = truth.length;
  const sim = truth.map((t) => Array.from({ length: fitted.length / V }, (_, k) => cosine(t, row(fitted, k, V))));
  const match = new Array<number>(K).fill(-1);
  const used = new Set<number>();
  const pairs: [number, number, number][] = [];
  sim.forEach((r, i) => r.forEach((s, k) => pairs.push([s, i, k])));
  pairs.sort((a, b) => b[0] - a[0]);
  for (const [, i, k] of pairs) {
    if (match[i] === -1 && !used.has(k)) {
      match[i] = k;
      used.add(k);
    }
  }
  let improved = true;
  while (improved) {
    improved = false;
    for (let i = 0; i < K; i++) {
      for (let j = i + 1; j < K; j++) {
        if (sim[i][match[j]] + sim[j][match[i]] > sim[i][match[i]] + sim[j][match[j]] + 1e-12) {
          [match[i], match[j]] = [match[j], match[i]];
          improved = true;
        }
      }
    }
  }
  return { match, cos: match.map((k, i) => sim[i][k]) };
}

export function pearson(a: number[], b: number[]): number {
  const n = a.length;
  const ma = a.reduce((s, v) => s + v, 0) / n;
  const mb = b.reduce((s, v) => s + v, 0) / n;
  let ab = 0;
  let aa = 0;
  let bb = 0;
  for (let i = 0; i < n; i++) {
    ab += (a[i] - ma) * (b[i] - mb);
    aa += (a[i] - ma) ** 2;
    bb += (b[i] - mb) ** 2;
  }
  return ab / Math.sqrt(aa * bb);
}
