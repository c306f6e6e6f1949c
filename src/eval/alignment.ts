// Cross-language alignment on held-out link groups (DESIGN §6).
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

export function crossLanguageAlignment(input: AlignmentInput): AlignmentResult {
  const { K, mixtures, docLanguage, docGroup } = input;
  const n = docLanguage.length;
  let L = 0;
  for (let d = 0; d < n; d++) L = Math.max(L, docLanguage[d] + 1);
  const names = Array.from({ length: L }, (_, l) => input.languages?.[l] ?? String(l));
  const byLanguage: number[][] = Array.from({ length: L }, () => []);
  for (let d = 0; d < n; d++) byLanguage[docLanguage[d]].push(d);

  const pairs: AlignmentPair[] = [];
  const div = new Float64Array(n);
  for (let a = 0; a < L; a++) {
    for (let b = 0; b < L; b++) {
      if (a === b || byLanguage[b].length === 0) continue;
      const cands = byLanguage[b];
      let queries = 0;
      let hits = 0;
      let rr = 0;
      let chanceP1 = 0;
      let chanceRr = 0;
      let partnerDiv = 0;
      let partnerCount = 0;
      let otherDiv = 0;
      let otherCount = 0;
      for (const q of byLanguage[a]) {
        let best = Infinity;
        let m = 0;
        for (const c of cands) {
          const v = jensenShannon(mixtures, mixtures, K, q * K, c * K);
          div[c] = v;
          if (docGroup[c] === docGroup[q]) {
            m++;
            best = Math.min(best, v);
            partnerDiv += v;
            partnerCount++;
          } else {
            otherDiv += v;
            otherCount++;
          }
        }
        if (m === 0) continue;
        let rank = 1;
        for (const c of cands) if (docGroup[c] !== docGroup[q] && div[c] <= best) rank++;
        queries++;
        if (rank === 1) hits++;
        rr += 1 / rank;
        chanceP1 += m / cands.length;
        chanceRr += chanceReciprocalRank(cands.length, m);
      }
      if (queries === 0) continue;
      pairs.push({
        from: names[a], to: names[b], queries, candidates: cands.length,
        precisionAt1: hits / queries, meanReciprocalRank: rr / queries,
        chancePrecisionAt1: chanceP1 / queries, chanceMeanReciprocalRank: chanceRr / queries,
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
