// Features for the study-adaptive language model: lower-cased letter runs ("words") and the
// character trigrams of each word padded with spaces. Deliberately independent of the tokenizer
// so that language identification does not depend on the language it is trying to find.
import { removeInvisibles } from '../tokens/invisible.js';

const WORD = /[\p{L}\p{M}]+/gu;
// Scripts written without spaces: their "words" are long runs; character bigrams stand in.
const UNSPACED = /[\p{Script=Han}\p{Script=Hiragana}\p{Script=Katakana}\p{Script=Thai}\p{Script=Lao}\p{Script=Khmer}\p{Script=Myanmar}]/u;

/** Lower-cased words of a text (letter runs; apostrophes and digits separate words). */
export function languageWords(text: string): string[] {
  // Invisible format characters (soft hyphen, U+FEFF, bidi controls) would cut words apart.
  const lower = removeInvisibles(text.normalize('NFKC')).toLowerCase();
  const runs = lower.match(WORD);
  if (runs === null) return [];
  const out: string[] = [];
  for (const run of runs) {
    if (run.length > 2 && UNSPACED.test(run)) {
      // Overlapping character bigrams: a word-free view of unspaced scripts.
      const chars = Array.from(run);
      for (let i = 0; i + 1 < chars.length; i++) out.push(chars[i] + chars[i + 1]);
    } else out.push(run);
  }
  return out;
}

/** Character trigrams of a word padded with one space on each side (" de " → " de", "de "). */
export function wordTrigrams(word: string, into: string[]): void {
  const padded = ` ${word} `;
  if (padded.length < 3) return;
  for (let i = 0; i + 3 <= padded.length; i++) into.push(padded.slice(i, i + 3));
}
