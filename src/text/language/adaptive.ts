// The study-adaptive pass: a multinomial naive Bayes language model learned from the study's own
// confidently identified documents, then used to re-decide the short or uncertain ones.
//
// Method. Two views of a text, each a multinomial per language with additive (Lidstone)
// smoothing (Manning, Raghavan & Schütze 2008, "Introduction to Information Retrieval", §13.2):
//   words:    p(w | ℓ) = (c_ℓ(w) + a) / (N_ℓ + a·V)
//   trigrams: p(g | ℓ) = (c_ℓ(g) + a) / (T_ℓ + a·G), over each word's space-padded character
//             trigrams (Cavnar & Trenkle 1994, "N-gram-based text categorization", SDAIR), so an
//             unseen word still carries evidence through its spelling.
// score(ℓ) = log p(ℓ) + Σ_w log p(w | ℓ) + λ Σ_g log p(g | ℓ), with λ < 1 because a word's
// trigrams are far from independent of it. The prior p(ℓ) is the study's language mix, add-one
// smoothed. The posterior is the softmax of the scores over the candidate languages.
//
// Words and trigrams are interned to ids and counted in flat typed arrays (one slot per study
// language), so scoring a text costs one array read per feature and language, no map lookups.
import { languageWords, wordTrigrams } from './features.js';

/** Additive smoothing of word counts (common practice). */
const WORD_ALPHA = 0.5;
/** Additive smoothing of trigram counts (common practice). */
const TRIGRAM_ALPHA = 0.5;
/** Weight of the trigram view against the word view (common practice; set on UDHR text outside the judged snippets). */
const TRIGRAM_WEIGHT = 0.3;

/** A growable table of counts: one row per feature id, one column per language. */
class CountTable {
  data: Float64Array;
  constructor(readonly width: number) {
    this.data = new Float64Array(width * 1024);
  }
  ensure(rows: number): void {
    if (rows * this.width <= this.data.length) return;
    let size = this.data.length;
    while (size < rows * this.width) size *= 2;
    const next = new Float64Array(size);
    next.set(this.data);
    this.data = next;
  }
}

export class AdaptiveLanguageModel {
  private readonly slots = new Map<string, number>();
  private readonly width: number;
  private readonly wordIds = new Map<string, number>();
  private readonly trigramIds = new Map<string, number>();
  /** Trigram ids per word id. */
  private readonly wordGrams: Int32Array[] = [];
  private readonly words: CountTable;
  private readonly trigrams: CountTable;
  private readonly wordTotals: Float64Array;
  private readonly trigramTotals: Float64Array;
  private readonly documents: Float64Array;
  private readonly documentWords: Float64Array;
  private mix: Float64Array | undefined;
  private ownWords = new Float64Array(0);
  private ownGrams = new Float64Array(0);

  constructor(languages: readonly string[]) {
    languages.forEach((language, slot) => this.slots.set(language, slot));
    this.width = Math.max(1, languages.length);
    this.words = new CountTable(this.width);
    this.trigrams = new CountTable(this.width);
    this.wordTotals = new Float64Array(this.width);
    this.trigramTotals = new Float64Array(this.width);
    this.documents = new Float64Array(this.width);
    this.documentWords = new Float64Array(this.width);
  }

  /** A text as word ids (interning new words and their trigrams). */
  encode(text: string): Int32Array {
    const words = languageWords(text);
    const ids = new Int32Array(words.length);
    for (let i = 0; i < words.length; i++) ids[i] = this.internWord(words[i]);
    return ids;
  }

  private internWord(word: string): number {
    let id = this.wordIds.get(word);
    if (id !== undefined) return id;
    id = this.wordIds.size;
    this.wordIds.set(word, id);
    this.words.ensure(id + 1);
    const grams: string[] = [];
    wordTrigrams(word, grams);
    const gramIds = new Int32Array(grams.length);
    for (let g = 0; g < grams.length; g++) {
      let gid = this.trigramIds.get(grams[g]);
      if (gid === undefined) {
        gid = this.trigramIds.size;
        this.trigramIds.set(grams[g], gid);
        this.trigrams.ensure(gid + 1);
      }
      gramIds[g] = gid;
    }
    this.wordGrams.push(gramIds);
    return id;
  }

  private ensureScratch(): void {
    if (this.ownWords.length < this.wordIds.size) this.ownWords = new Float64Array(this.wordIds.size * 2);
    if (this.ownGrams.length < this.trigramIds.size) this.ownGrams = new Float64Array(this.trigramIds.size * 2);
  }

  /** Prior knowledge: each word of a list counted `weight` times, no document counted. */
  seed(language: string, list: readonly string[], weight: number): void {
    const slot = this.slots.get(language);
    if (slot === undefined) return;
    for (const entry of list) this.add(this.encode(entry), slot, weight, false);
  }

  /** Learn from one document whose language is known with confidence. */
  learn(doc: Int32Array, language: string): void {
    const slot = this.slots.get(language);
    if (slot !== undefined) this.add(doc, slot, 1, true);
  }

  /** Undo `learn` for one document. */
  forget(doc: Int32Array, language: string): void {
    const slot = this.slots.get(language);
    if (slot !== undefined) this.add(doc, slot, -1, true);
  }

  private add(doc: Int32Array, slot: number, weight: number, isDocument: boolean): void {
    const w = this.width;
    const words = this.words.data;
    const trigrams = this.trigrams.data;
    for (let i = 0; i < doc.length; i++) {
      words[doc[i] * w + slot] += weight;
      const grams = this.wordGrams[doc[i]];
      for (let g = 0; g < grams.length; g++) trigrams[grams[g] * w + slot] += weight;
      this.trigramTotals[slot] += weight * grams.length;
    }
    this.wordTotals[slot] += weight * doc.length;
    if (isDocument) {
      this.documents[slot] += weight;
      this.documentWords[slot] += weight * doc.length;
    }
  }

  /** Word tokens learned for a language from documents (seeds not counted). */
  wordsLearned(language: string): number {
    const slot = this.slots.get(language);
    return slot === undefined ? 0 : this.documentWords[slot];
  }

  /** The study's language mix as document counts (add-one smoothed into the prior). */
  setLanguageMix(mix: ReadonlyMap<string, number>): void {
    this.mix = new Float64Array(this.width);
    for (const [language, count] of mix) {
      const slot = this.slots.get(language);
      if (slot !== undefined) this.mix[slot] = count;
    }
  }

  /** The study's language mix as a prior over the candidates (add-one smoothed), aligned with them. */
  mixPrior(candidates: readonly string[]): number[] {
    const counts = candidates.map((c) => {
      const slot = this.slots.get(c);
      return slot === undefined ? 0 : (this.mix !== undefined ? this.mix[slot] : this.documents[slot]) + 1;
    });
    const total = counts.reduce((s, x) => s + x, 0);
    return counts.map((x) => x / total);
  }

  /**
   * Posterior over the candidate languages for a document (word ids from `encode`), best first,
   * or undefined when it has no words. With `own`, the document is assumed learned under that
   * language and its own counts are left out (leave-one-out), so it is judged by the others.
   * `prior` (one probability per candidate) replaces the study's language mix, e.g. with a
   * prior that favours the declared language; a uniform one gives the text's evidence alone.
   */
  posterior(
    doc: Int32Array,
    candidates: readonly string[],
    own?: string,
    prior?: readonly number[],
  ): { language: string; probability: number }[] | undefined {
    if (doc.length === 0 || candidates.length === 0) return undefined;
    const w = this.width;
    const words = this.words.data;
    const trigrams = this.trigrams.data;
    const wordTypes = this.wordIds.size + 1;
    const trigramTypes = this.trigramIds.size + 1;
    const ownSlot = own === undefined ? -1 : (this.slots.get(own) ?? -1);
    let gramCount = 0;
    for (let i = 0; i < doc.length; i++) gramCount += this.wordGrams[doc[i]].length;
    // Multiplicity of each word and trigram in the document itself, for leave-one-out: counted
    // into scratch arrays indexed by id, cleared again after scoring.
    if (ownSlot >= 0) {
      this.ensureScratch();
      for (let i = 0; i < doc.length; i++) {
        this.ownWords[doc[i]]++;
        const grams = this.wordGrams[doc[i]];
        for (let g = 0; g < grams.length; g++) this.ownGrams[grams[g]]++;
      }
    }
    const ownWords = this.ownWords;
    const ownGrams = this.ownGrams;

    let mixTotal = candidates.length;
    for (const c of candidates) {
      const slot = this.slots.get(c);
      if (slot !== undefined) mixTotal += this.mix !== undefined ? this.mix[slot] : this.documents[slot];
    }
    const scores = new Float64Array(candidates.length);
    for (let j = 0; j < candidates.length; j++) {
      const slot = this.slots.get(candidates[j]);
      if (slot === undefined) {
        scores[j] = -Infinity;
        continue;
      }
      const loo = slot === ownSlot;
      const mixCount = this.mix !== undefined ? this.mix[slot] : this.documents[slot];
      let score = prior !== undefined ? Math.log(prior[j]) : Math.log((mixCount + 1) / mixTotal);
      let wordSum = 0;
      let gramSum = 0;
      for (let i = 0; i < doc.length; i++) {
        const id = doc[i];
        wordSum += Math.log(words[id * w + slot] - (loo ? ownWords[id] : 0) + WORD_ALPHA);
        const grams = this.wordGrams[id];
        for (let g = 0; g < grams.length; g++) {
          const gid = grams[g];
          gramSum += Math.log(trigrams[gid * w + slot] - (loo ? ownGrams[gid] : 0) + TRIGRAM_ALPHA);
        }
      }
      const wordTotal = this.wordTotals[slot] - (loo ? doc.length : 0);
      const trigramTotal = this.trigramTotals[slot] - (loo ? gramCount : 0);
      score += wordSum - doc.length * Math.log(wordTotal + WORD_ALPHA * wordTypes);
      score += TRIGRAM_WEIGHT * (gramSum - gramCount * Math.log(trigramTotal + TRIGRAM_ALPHA * trigramTypes));
      scores[j] = score;
    }
    if (ownSlot >= 0) {
      for (let i = 0; i < doc.length; i++) {
        ownWords[doc[i]] = 0;
        const grams = this.wordGrams[doc[i]];
        for (let g = 0; g < grams.length; g++) ownGrams[grams[g]] = 0;
      }
    }
    let max = -Infinity;
    for (const s of scores) if (s > max) max = s;
    if (max === -Infinity) return undefined;
    let sum = 0;
    for (let j = 0; j < scores.length; j++) sum += Math.exp(scores[j] - max);
    return candidates
      .map((language, j) => ({ language, probability: Math.exp(scores[j] - max) / sum }))
      .sort((a, b) => b.probability - a.probability);
  }
}
