// Coherence of each theme's top words, per language, from document co-occurrence.
//
// Method. With D documents of the language, D(v) the number containing word v and D(v, u) the
// number containing both:
// - NPMI (Bouma, "Normalized (pointwise) mutual information in collocation extraction",
//   GSCL 2009, eq. 7; used for topics by Lau, Newman & Baldwin, "Machine reading tea leaves",
//   EACL 2014, §3): P(v) = D(v)/D, P(v,u) = D(v,u)/D,
//   NPMI(v,u) = log[P(v,u)/(P(v)P(u))] / −log P(v,u), in [−1, 1]; a pair that never co-occurs
//   takes the limit −1 (Bouma 2009, §2.3), and a pair in every document (P(v,u) = 1) scores 1.
//   A theme's score is the mean over all pairs of its top N words.
// - Log-conditional coherence (Mimno, Wallach, Talley, Leenders & McCallum, "Optimizing
//   semantic coherence in topic models", EMNLP 2011, eq. 1), with words v_1..v_N by rank:
//   C = Σ_{m=2..N} Σ_{l<m} log[(D(v_m, v_l) + 1) / D(v_l)]  (natural log; a sum, as published).
// Pairs involving a word absent from every document are skipped and counted.
//
// Efficiency: only the top words' documents are indexed (one pass over the tokens builds a
// posting list per distinct top word); a pair count is a merge of two sorted posting lists.
import { topWords } from './topic-words.js';

/** The corpus arrays coherence needs (a subset of src/model's Corpus). */
export interface CoherenceCorpus {
  readonly docOffsets: Int32Array;
  readonly words: Int32Array;
  readonly docLanguage: Uint8Array;
}

export interface ThemeCoherence {
  readonly theme: number;
  readonly language: number;
  /** Mean NPMI over scored pairs (NaN if none). */
  readonly npmi: number;
  /** Mimno et al. (2011) log-conditional coherence (sum over scored pairs). */
  readonly logConditional: number;
  /** Word pairs scored, and pairs skipped because a word occurs in no document. */
  readonly pairs: number;
  readonly skippedPairs: number;
}

/** Document frequencies and pair co-document counts of a set of words in one language. */
export interface CooccurrenceIndex {
  readonly documents: number;
  docFrequency(word: number): number;
  coDocFrequency(a: number, b: number): number;
}

/** Build posting lists for `wordIds` over the documents of `language`. */
export function buildCooccurrenceIndex(corpus: CoherenceCorpus, language: number, wordIds: Iterable<number>): CooccurrenceIndex {
  const slotOf = new Map<number, number>();
  for (const w of wordIds) if (!slotOf.has(w)) slotOf.set(w, slotOf.size);
  const U = slotOf.size;
  let maxWord = -1;
  for (const w of slotOf.keys()) maxWord = Math.max(maxWord, w);
  const slot = new Int32Array(maxWord + 1).fill(-1);
  for (const [w, s] of slotOf) if (w >= 0) slot[w] = s;

  const D = corpus.docLanguage.length;
  const lastDoc = new Int32Array(U).fill(-1);
  const df = new Int32Array(U);
  let documents = 0;
  const scan = (visit: (s: number, d: number) => void) => {
    lastDoc.fill(-1);
    for (let d = 0; d < D; d++) {
      if (corpus.docLanguage[d] !== language) continue;
      for (let i = corpus.docOffsets[d]; i < corpus.docOffsets[d + 1]; i++) {
        const w = corpus.words[i];
        if (w < 0 || w > maxWord) continue;
        const s = slot[w];
        if (s < 0 || lastDoc[s] === d) continue;
        lastDoc[s] = d;
        visit(s, d);
      }
    }
  };
  for (let d = 0; d < D; d++) if (corpus.docLanguage[d] === language) documents++;
  scan((s) => df[s]++);
  const postings = Array.from({ length: U }, (_, s) => new Int32Array(df[s]));
  const fill = new Int32Array(U);
  scan((s, d) => {
    postings[s][fill[s]++] = d;
  });

  const pairCache = new Map<number, number>();
  return {
    documents,
    docFrequency: (w) => {
      const s = w >= 0 && w <= maxWord ? slot[w] : -1;
      return s < 0 ? 0 : df[s];
    },
    coDocFrequency: (a, b) => {
      const sa = a >= 0 && a <= maxWord ? slot[a] : -1;
      const sb = b >= 0 && b <= maxWord ? slot[b] : -1;
      if (sa < 0 || sb < 0) return 0;
      if (sa === sb) return df[sa];
      const key = sa < sb ? sa * U + sb : sb * U + sa;
      let c = pairCache.get(key);
      if (c === undefined) {
        c = intersectCount(postings[sa], postings[sb]);
        pairCache.set(key, c);
      }
      return c;
    },
  };
}

function intersectCount(a: Int32Array, b: Int32Array): number {
  let i = 0;
  let j = 0;
  let c = 0;
  while (i < a.length && j < b.length) {
    if (a[i] === b[j]) {
      c++;
      i++;
      j++;
    } else if (a[i] < b[j]) i++;
    else j++;
  }
  return c;
}

/** NPMI of one pair from counts (Bouma 2009); NaN when a word never occurs. */
export function npmiFromCounts(dv: number, du: number, dvu: number, D: number): number {
  if (dv === 0 || du === 0 || D === 0) return NaN;
  if (dvu === 0) return -1;
  const pvu = dvu / D;
  if (pvu >= 1) return 1;
  return Math.log(pvu / ((dv / D) * (du / D))) / -Math.log(pvu);
}

/** Coherence of each theme's top words (rank order) in one language. */
export function themeCoherence(corpus: CoherenceCorpus, language: number, topWordsByTheme: readonly Int32Array[]): ThemeCoherence[] {
  const all: number[] = [];
  for (const ids of topWordsByTheme) for (const w of ids) all.push(w);
  const index = buildCooccurrenceIndex(corpus, language, all);
  const D = index.documents;
  return topWordsByTheme.map((ids, theme) => {
    let npmiSum = 0;
    let logCond = 0;
    let pairs = 0;
    let skipped = 0;
    for (let m = 1; m < ids.length; m++) {
      for (let l = 0; l < m; l++) {
        const dl = index.docFrequency(ids[l]);
        const dm = index.docFrequency(ids[m]);
        if (dl === 0 || dm === 0) {
          skipped++;
          continue;
        }
        const dml = index.coDocFrequency(ids[m], ids[l]);
        npmiSum += npmiFromCounts(dm, dl, dml, D);
        logCond += Math.log((dml + 1) / dl);
        pairs++;
      }
    }
    return { theme, language, npmi: pairs > 0 ? npmiSum / pairs : NaN, logConditional: logCond, pairs, skippedPairs: skipped };
  });
}

/** Coherence per theme and language from φ (K×V_ℓ per language) and the top `n` words (10 by default, common practice). */
export function coherenceByLanguage(corpus: CoherenceCorpus, phi: readonly Float64Array[], K: number, n = 10): ThemeCoherence[] {
  const rows: ThemeCoherence[] = [];
  for (let l = 0; l < phi.length; l++) rows.push(...themeCoherence(corpus, l, topWords(phi[l], K, n)));
  return rows;
}
