// Cross-language alignment on held-out link groups (docs/design.md §6).
//
// Each held-out document's mixture is inferred from its own language alone (the caller folds
// in each document separately). For every ordered pair of languages (a → b), each document of
// language a with a partner (same link group) in language b is a query; the candidates are all
// held-out documents of language b, ranked by Jensen–Shannon divergence to the query (closest
// first). Reported: precision at 1 and mean reciprocal rank of the best-ranked partner
// (Voorhees, "The TREC-8 question answering track report", TREC 1999, for MRR), with the
// divergence between partners and to non-partners. Ties count against the query (a tied
// non-partner ranks ahead), so the figures are never flattered.
// Chance: with n candidates of which m are partners, in uniformly random order,
//   P(best partner at rank r) = C(n−r, m−1)/C(n, m), so chance P@1 = m/n and chance
//   MRR = Σ_r P(r)/r, which for m = 1 is H_n/n (H_n the n-th harmonic number).
import { Xoshiro128 } from '../model/index.js';
import { jensenShannon } from './divergence.js';

export interface AlignmentInput {
  readonly K: number;
  /** One mixture per held-out document, n×K row-major. */
  readonly mixtures: Float64Array;
  readonly docLanguage: ArrayLike<number>;
  /** Link group per held-out document (documents sharing a group are partners). */
  readonly docGroup: ArrayLike<number>;
  /** Language names for the report (default "0", "1", …). */
  readonly languages?: readonly string[];
}

export interface AlignmentPair {
  readonly from: string;
  readonly to: string;
  readonly queries: number;
  /** Candidates per query (mean; all held-out documents of the target language unless capped). */
  readonly candidates: number;
  readonly precisionAt1: number;
  readonly meanReciprocalRank: number;
  readonly chancePrecisionAt1: number;
  readonly chanceMeanReciprocalRank: number;
  /** Mean JSD (bits) between a query and its partner(s), and to the other candidates. */
  readonly partnerDivergence: number;
  readonly otherDivergence: number;
}

export interface AlignmentResult {
  readonly pairs: AlignmentPair[];
  /** Query-weighted means over all language pairs. */
  readonly overall: Omit<AlignmentPair, 'from' | 'to' | 'candidates'>;
}

/** Expected reciprocal rank of the best of m partners among n candidates in random order. */
export function chanceReciprocalRank(n: number, m = 1): number {
  if (n <= 0 || m <= 0) return NaN;
  // P(r) = C(n−r, m−1)/C(n, m), built by the ratio P(r+1)/P(r) = (n−r−m+1)/(n−r).
  let p = m / n;
  let sum = 0;
  for (let r = 1; r <= n - m + 1; r++) {
    sum += p / r;
    p *= (n - r - m + 1) / (n - r);
  }
  return sum;
}

export interface AlignmentOptions {
  /** At most this many queries per language pair, chosen at random (default 1000, common practice). */
  readonly maxQueries?: number;
  /**
   * At most this many candidates of the other language: a random subset, to which each query's
   * own partners are always added (default 1000). Chance is computed for the pool actually used.
   */
  readonly maxCandidates?: number;
  readonly seed?: number;
}

/** Partner retrieval and divergences for every ordered pair of languages. Cost: Q·C·K per pair. */
export function crossLanguageAlignment(input: AlignmentInput, options: AlignmentOptions = {}): AlignmentResult {
  const { K, mixtures, docLanguage, docGroup } = input;
  const n = docLanguage.length;
  const maxQueries = options.maxQueries ?? 1000;
  const maxCandidates = options.maxCandidates ?? 1000;
  const rng = Xoshiro128.fromSeed(options.seed ?? 1);
  let L = 0;
  for (let d = 0; d < n; d++) L = Math.max(L, docLanguage[d] + 1);
  const names = Array.from({ length: L }, (_, l) => input.languages?.[l] ?? String(l));
  const byLanguage: number[][] = Array.from({ length: L }, () => []);
  for (let d = 0; d < n; d++) byLanguage[docLanguage[d]].push(d);

  const pairs: AlignmentPair[] = [];
  for (let a = 0; a < L; a++) {
    for (let b = 0; b < L; b++) {
      if (a === b || byLanguage[b].length === 0) continue;
      const partnersOf = new Map<number, number[]>();
      for (const c of byLanguage[b]) {
        const list = partnersOf.get(docGroup[c]);
        if (list) list.push(c);
        else partnersOf.set(docGroup[c], [c]);
      }
      const queryDocs = sample(byLanguage[a].filter((q) => partnersOf.has(docGroup[q])), maxQueries, rng);
      if (queryDocs.length === 0) continue;
      const pool = sample(byLanguage[b], maxCandidates, rng);
      let hits = 0;
      let rr = 0;
      let chanceP1 = 0;
      let chanceRr = 0;
      let partnerDiv = 0;
      let partnerCount = 0;
      let otherDiv = 0;
      let otherCount = 0;
      let candidateSum = 0;
      const other = new Float64Array(pool.length);
      for (const q of queryDocs) {
        const partners = partnersOf.get(docGroup[q])!;
        let best = Infinity;
        for (const c of partners) {
          const v = jensenShannon(mixtures, mixtures, K, q * K, c * K);
          best = Math.min(best, v);
          partnerDiv += v;
          partnerCount++;
        }
        let nOther = 0;
        for (const c of pool) {
          if (docGroup[c] === docGroup[q]) continue;
          const v = jensenShannon(mixtures, mixtures, K, q * K, c * K);
          other[nOther++] = v;
          otherDiv += v;
          otherCount++;
        }
        let rank = 1;
        for (let i = 0; i < nOther; i++) if (other[i] <= best) rank++;
        const m = partners.length;
        const size = nOther + m;
        candidateSum += size;
        if (rank === 1) hits++;
        rr += 1 / rank;
        chanceP1 += m / size;
        chanceRr += chanceReciprocalRank(size, m);
      }
      const Q = queryDocs.length;
      pairs.push({
        from: names[a], to: names[b], queries: Q, candidates: Math.round(candidateSum / Q),
        precisionAt1: hits / Q, meanReciprocalRank: rr / Q,
        chancePrecisionAt1: chanceP1 / Q, chanceMeanReciprocalRank: chanceRr / Q,
        partnerDivergence: partnerDiv / partnerCount, otherDivergence: otherCount > 0 ? otherDiv / otherCount : NaN,
      });
    }
  }
  const total = pairs.reduce((s, p) => s + p.queries, 0);
  const mean = (f: (p: AlignmentPair) => number) => (total > 0 ? pairs.reduce((s, p) => s + f(p) * p.queries, 0) / total : NaN);
  return {
    pairs,
    overall: {
      queries: total,
      precisionAt1: mean((p) => p.precisionAt1),
      meanReciprocalRank: mean((p) => p.meanReciprocalRank),
      chancePrecisionAt1: mean((p) => p.chancePrecisionAt1),
      chanceMeanReciprocalRank: mean((p) => p.chanceMeanReciprocalRank),
      partnerDivergence: mean((p) => p.partnerDivergence),
      otherDivergence: mean((p) => p.otherDivergence),
    },
  };
}

/** Up to `max` items of `items` chosen at random (all of them, in order, when there are few). */
function sample(items: number[], max: number, rng: Xoshiro128): number[] {
  if (items.length <= max) return items;
  const a = items.slice();
  for (let i = 0; i < max; i++) {
    const j = i + rng.nextInt(a.length - i);
    [a[i], a[j]] = [a[j], a[i]];
  }
  return a.slice(0, max).sort((x, y) => x - y);
}
