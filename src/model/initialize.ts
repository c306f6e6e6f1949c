// Initial topic assignments.
//
// Why not uniformly random: in a polylingual model only link groups tie topic k of one
// language to topic k of another (Mimno et al., "Polylingual Topic Models", EMNLP 2009). From a
// random start each language quickly forms its own topics, and when links are few (10% of
// answers) the Gibbs sampler, which moves one token at a time, rarely swaps a whole topic to
// undo a mismatched pairing. So the links are given the first word:
//   1. the link groups whose documents span two or more languages are sampled alone for a few
//      sweeps (a warm start), which fixes the pairing of topics across languages;
//   2. every other token is then drawn from the collapsed conditional with the topic-word counts
//      of the warm start held fixed (its own group's counts do update, as in the sequential
//      initialization of Griffiths & Steyvers, "Finding scientific topics", PNAS 2004, §3).
//      Holding the word counts fixed carries the cross-language pairing to every document
//      without the rich-get-richer lock-in of a fully sequential pass, which on the bars
//      example of that paper merged two bars into one topic in our tests.
// Without multilingual link groups there is nothing to pair and assignments are uniformly
// random (common practice). Groups added only to tie words across languages (one-word documents
// of words spelled alike, after the answers' groups) do not seed the warm start: single words
// carry no co-occurrence, and on the demo study the warm start on them scrambled the themes.
import type { Corpus, Priors, Rng, SamplerFactory } from './types.js';

/** Groups whose documents are in at least two languages. */
function multilingualGroups(corpus: Corpus): number[] {
  const out: number[] = [];
  for (let g = 0; g < corpus.numGroups; g++) {
    const d0 = corpus.groupDocOffsets[g];
    for (let d = d0 + 1; d < corpus.groupDocOffsets[g + 1]; d++) {
      if (corpus.docLanguage[d] !== corpus.docLanguage[d0] && corpus.docOffsets[d + 1] > corpus.docOffsets[d]) {
        out.push(g);
        break;
      }
    }
  }
  return out;
}

/** The corpus restricted to the given groups, and the token positions they came from. */
function subCorpus(corpus: Corpus, groups: number[]): { sub: Corpus; tokenMap: Int32Array } {
  const docs: number[] = [];
  const groupDocOffsets = new Int32Array(groups.length + 1);
  const docGroup: number[] = [];
  groups.forEach((g, j) => {
    for (let d = corpus.groupDocOffsets[g]; d < corpus.groupDocOffsets[g + 1]; d++) {
      docs.push(d);
      docGroup.push(j);
    }
    groupDocOffsets[j + 1] = docs.length;
  });
  const docOffsets = new Int32Array(docs.length + 1);
  docs.forEach((d, i) => (docOffsets[i + 1] = docOffsets[i] + corpus.docOffsets[d + 1] - corpus.docOffsets[d]));
  const words = new Int32Array(docOffsets[docs.length]);
  const tokenMap = new Int32Array(words.length);
  docs.forEach((d, i) => {
    for (let t = corpus.docOffsets[d], j = docOffsets[i]; t < corpus.docOffsets[d + 1]; t++, j++) {
      words[j] = corpus.words[t];
      tokenMap[j] = t;
    }
  });
  const sub: Corpus = {
    languages: corpus.languages,
    vocabSizes: corpus.vocabSizes,
    wordBase: corpus.wordBase,
    docOffsets,
    words,
    docLanguage: Uint8Array.from(docs, (d) => corpus.docLanguage[d]),
    docGroup: Int32Array.from(docGroup),
    groupDocOffsets,
    numGroups: groups.length,
  };
  return { sub, tokenMap };
}

/**
 * Assignments to start a fit from (see the file header). `warmStartSweeps` = 0 skips step 1.
 */
export async function initialAssignments(
  corpus: Corpus,
  priors: Priors,
  rng: Rng,
  factory: SamplerFactory,
  warmStartSweeps: number,
  /** Only groups below this index may seed the warm start (later ones are extra links). */
  seedGroupLimit = corpus.numGroups,
): Promise<Uint16Array> {
  const K = priors.K;
  const L = corpus.languages.length;
  const N = corpus.words.length;
  const z = new Uint16Array(N);
  const assigned = new Uint8Array(corpus.numGroups);
  const nkw = new Int32Array(corpus.wordBase[L] * K);
  const nk = new Int32Array(L * K);
  const linked = L > 1 && warmStartSweeps > 0 ? multilingualGroups(corpus).filter((g) => g < seedGroupLimit) : [];
  if (linked.length > 0) {
    const { sub, tokenMap } = subCorpus(corpus, linked);
    const subZ = new Uint16Array(sub.words.length);
    for (let i = 0; i < subZ.length; i++) subZ[i] = rng.nextInt(K);
    const subPriors: Priors = { ...priors, groupPattern: Int32Array.from(linked, (g) => priors.groupPattern[g]) };
    const sampler = factory(sub, subZ, subPriors);
    try {
      for (let t = 0; t < warmStartSweeps; t++) sampler.sweep(rng);
      for (let i = 0; i < tokenMap.length; i++) z[tokenMap[i]] = sampler.z[i];
    } finally {
      await sampler.dispose?.();
    }
    for (const g of linked) assigned[g] = 1;
    for (let d = 0; d < corpus.docOffsets.length - 1; d++) {
      if (!assigned[corpus.docGroup[d]]) continue;
      const l = corpus.docLanguage[d];
      for (let i = corpus.docOffsets[d]; i < corpus.docOffsets[d + 1]; i++) {
        nkw[(corpus.wordBase[l] + corpus.words[i]) * K + z[i]]++;
        nk[l * K + z[i]]++;
      }
    }
  }
  if (linked.length === 0) {
    for (let i = 0; i < N; i++) z[i] = rng.nextInt(K);
    return z;
  }
  const ngk = new Int32Array(K);
  const cum = new Float64Array(K);
  for (let g = 0; g < corpus.numGroups; g++) {
    if (assigned[g]) continue;
    ngk.fill(0);
    const aOff = priors.groupPattern[g] * K;
    for (let d = corpus.groupDocOffsets[g]; d < corpus.groupDocOffsets[g + 1]; d++) {
      const l = corpus.docLanguage[d];
      const b = priors.beta[l];
      const vb = corpus.vocabSizes[l] * b;
      for (let i = corpus.docOffsets[d]; i < corpus.docOffsets[d + 1]; i++) {
        const row = (corpus.wordBase[l] + corpus.words[i]) * K;
        let total = 0;
        for (let k = 0; k < K; k++) {
          total += ((ngk[k] + priors.alpha[aOff + k]) * (nkw[row + k] + b)) / (nk[l * K + k] + vb);
          cum[k] = total;
        }
        const u = rng.nextDouble() * total;
        let k = 0;
        while (k < K - 1 && cum[k] <= u) k++;
        z[i] = k;
        ngk[k]++;
      }
    }
  }
  return z;
}
