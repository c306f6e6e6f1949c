// Answers written in two languages ("one sentence in another language"): each sentence is
// identified on its own, and the answer goes by the language that holds most of its words; the
// other language and its share are kept so that the review can list the answer.
//
// Sentence-level identification is the usual unit for mixed documents (common practice; cf.
// Lui, Lau & Baldwin 2014, "Automatic detection and language identification of multilingual
// documents", TACL 2), coarser than word-level code-switching, which this does not find.
import type { AdaptiveLanguageModel } from './adaptive.js';
import { firstPass } from './first-pass.js';

/** A sentence decides its language only with this many words (common practice). */
const MIN_SENTENCE_WORDS = 3;
/** …and when the study model is this sure of it (common practice, as the relabelling bar). */
const SENTENCE_POSTERIOR = 0.9;
/** Characters per word in scripts written without spaces (common practice for Japanese and Chinese). */
const CHARS_PER_WORD = 2;

const SENTENCE_END = /(?<=[.!?;。！？])\s+|(?<=[。！？])|\n+/u;
const SPACED_WORD = /[\p{L}\p{M}]+/gu;
const UNSPACED = /[\p{Script=Han}\p{Script=Hiragana}\p{Script=Katakana}\p{Script=Thai}\p{Script=Lao}\p{Script=Khmer}\p{Script=Myanmar}]/gu;

export interface MixedLanguages {
  /** The language of most of the answer's words. */
  readonly majority: string;
  /** Its share of the words in sentences whose language is known. */
  readonly majorityShare: number;
  /** The other language, and its share. */
  readonly minority: string;
  readonly minorityShare: number;
}

/** Word count of a sentence, unspaced scripts counted by characters per word. */
export function sentenceWords(sentence: string): number {
  const unspaced = sentence.match(UNSPACED)?.length ?? 0;
  const spaced = sentence.replace(UNSPACED, ' ').match(SPACED_WORD)?.length ?? 0;
  return spaced + Math.ceil(unspaced / CHARS_PER_WORD);
}

/**
 * The two languages of an answer written in more than one, or undefined when all its
 * sentences that can be judged agree (or fewer than two can). `label` is the language the
 * whole answer is learned under (its words are then left out of that language's counts).
 */
export function mixedLanguages(
  text: string,
  study: readonly string[],
  model: AdaptiveLanguageModel,
  label: string | undefined,
  trained: (candidates: readonly string[]) => boolean,
): MixedLanguages | undefined {
  const sentences = text.split(SENTENCE_END).filter((s) => s.trim() !== '');
  if (sentences.length < 2) return undefined;
  const weight = new Map<string, number>();
  for (const sentence of sentences) {
    const words = sentenceWords(sentence);
    if (words < MIN_SENTENCE_WORDS) continue;
    const language = sentenceLanguage(sentence, study, model, label, trained);
    if (language !== undefined) weight.set(language, (weight.get(language) ?? 0) + words);
  }
  if (weight.size < 2) return undefined;
  const ranked = [...weight.entries()].sort((a, b) => b[1] - a[1]);
  const total = ranked.reduce((s, [, w]) => s + w, 0);
  return {
    majority: ranked[0][0],
    majorityShare: ranked[0][1] / total,
    minority: ranked[1][0],
    minorityShare: ranked[1][1] / total,
  };
}

function sentenceLanguage(
  sentence: string,
  study: readonly string[],
  model: AdaptiveLanguageModel,
  label: string | undefined,
  trained: (candidates: readonly string[]) => boolean,
): string | undefined {
  // Script only first (no trigram step): the study model usually decides the sentence.
  const pass = firstPass(sentence, study, 'always');
  if (pass.candidates.length === 0) return undefined;
  if (pass.candidates.length === 1) return pass.candidates[0];
  if (trained(pass.candidates)) {
    // The sentence's words were learned under the answer's label: leave them out of it.
    const own = label !== undefined && pass.candidates.includes(label) ? label : undefined;
    const best = model.posterior(model.encode(sentence), pass.candidates, own)?.[0];
    return best !== undefined && best.probability >= SENTENCE_POSTERIOR ? best.language : undefined;
  }
  const full = pass.deferred === true ? firstPass(sentence, study) : pass;
  return full.confident ? (full.language ?? undefined) : undefined;
}
