// Corpus arrays (docs/design.md §3): flat typed arrays built from the text pipeline's per-document
// word ids. Documents sharing a link key form one link group and share one topic mixture
// ("Polylingual Topic Models", Mimno et al., EMNLP 2009, §2); a document without a key is its
// own group. Documents of a group are made contiguous so a sampler can walk a group at a time.
import type { Corpus } from './types.js';

/** One input document: language index, word ids (within its language), optional link key. */
export interface CorpusInputDocument {
  readonly language: number;
  readonly tokens: Int32Array;
  readonly linkKey?: string | null;
}

export interface CorpusInput {
  readonly languages: readonly string[];
  readonly vocabSizes: readonly number[] | Int32Array;
  readonly documents: readonly CorpusInputDocument[];
}

export interface BuiltCorpus {
  readonly corpus: Corpus;
  /** Corpus document index → input index. */
  readonly docOrder: Int32Array;
  /** Group id → input index of its first member (in input order); used to pick covariates. */
  readonly groupFirstInput: Int32Array;
  /** Group id → link key (null for a document without a key). */
  readonly groupKeys: (string | null)[];
}

/** Largest topic count the Uint16 assignment vector can hold. */
export const MAX_TOPICS = 65535;

/**
 * Groups documents by link key. Groups are numbered in order of their first member in the input,
 * and members keep their input order within a group, so the result is deterministic.
 * Throws a plain-language error when a word id is outside its language's vocabulary.
 */
export function buildCorpus(input: CorpusInput): BuiltCorpus {
  const L = input.languages.length;
  if (L === 0) throw new Error('The corpus needs at least one language.');
  if (L > 255) throw new Error(`The corpus has ${L} languages; at most 255 are supported.`);
  if (input.vocabSizes.length !== L) {
    throw new Error(`Got ${input.vocabSizes.length} vocabulary sizes for ${L} languages.`);
  }
  const vocabSizes = Int32Array.from(input.vocabSizes as ArrayLike<number>);
  const wordBase = new Int32Array(L + 1);
  for (let l = 0; l < L; l++) wordBase[l + 1] = wordBase[l] + vocabSizes[l];

  const docs = input.documents;
  const D = docs.length;
  // Group ids in order of first appearance.
  const keyToGroup = new Map<string, number>();
  const docGroupInput = new Int32Array(D);
  const groupFirst: number[] = [];
  const groupKeys: (string | null)[] = [];
  for (let i = 0; i < D; i++) {
    const key = docs[i].linkKey;
    let g: number;
    if (key === undefined || key === null || key === '') {
      g = groupFirst.length;
      groupFirst.push(i);
      groupKeys.push(null);
    } else {
      const found = keyToGroup.get(key);
      if (found === undefined) {
        g = groupFirst.length;
        keyToGroup.set(key, g);
        groupFirst.push(i);
        groupKeys.push(key);
      } else g = found;
    }
    docGroupInput[i] = g;
  }
  const G = groupFirst.length;
  // Counting sort of documents by group (stable: members keep input order).
  const groupDocOffsets = new Int32Array(G + 1);
  for (let i = 0; i < D; i++) groupDocOffsets[docGroupInput[i] + 1]++;
  for (let g = 0; g < G; g++) groupDocOffsets[g + 1] += groupDocOffsets[g];
  const fill = groupDocOffsets.slice(0, G);
  const docOrder = new Int32Array(D);
  for (let i = 0; i < D; i++) docOrder[fill[docGroupInput[i]]++] = i;

  const docOffsets = new Int32Array(D + 1);
  const docLanguage = new Uint8Array(D);
  const docGroup = new Int32Array(D);
  for (let d = 0; d < D; d++) {
    const doc = docs[docOrder[d]];
    if (!(doc.language >= 0 && doc.language < L) || !Number.isInteger(doc.language)) {
      throw new Error(`Document ${docOrder[d] + 1} has language index ${doc.language}; expected 0..${L - 1}.`);
    }
    docOffsets[d + 1] = docOffsets[d] + doc.tokens.length;
    docLanguage[d] = doc.language;
    docGroup[d] = docGroupInput[docOrder[d]];
  }
  const words = new Int32Array(docOffsets[D]);
  for (let d = 0; d < D; d++) {
    const doc = docs[docOrder[d]];
    const V = vocabSizes[doc.language];
    const t = doc.tokens;
    for (let i = 0; i < t.length; i++) {
      if (!(t[i] >= 0 && t[i] < V)) {
        throw new Error(`Document ${docOrder[d] + 1} has word id ${t[i]}, outside the ${input.languages[doc.language]} vocabulary of ${V} words.`);
      }
    }
    words.set(t, docOffsets[d]);
  }
  const corpus: Corpus = {
    languages: [...input.languages],
    vocabSizes,
    wordBase,
    docOffsets,
    words,
    docLanguage,
    docGroup,
    groupDocOffsets,
    numGroups: G,
  };
  return { corpus, docOrder, groupFirstInput: Int32Array.from(groupFirst), groupKeys };
}

/** Token range of group g: [start, end) into corpus.words. */
export function groupTokenRange(corpus: Corpus, g: number): [number, number] {
  return [corpus.docOffsets[corpus.groupDocOffsets[g]], corpus.docOffsets[corpus.groupDocOffsets[g + 1]]];
}

/** Number of tokens per language. */
export function tokensPerLanguage(corpus: Corpus): Float64Array {
  const out = new Float64Array(corpus.languages.length);
  const D = corpus.docOffsets.length - 1;
  for (let d = 0; d < D; d++) out[corpus.docLanguage[d]] += corpus.docOffsets[d + 1] - corpus.docOffsets[d];
  return out;
}
