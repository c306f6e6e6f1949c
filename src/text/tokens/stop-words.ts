// Stop words per language: the open list (stopwords-iso 1.1.0), the shipped survey fillers
// (lexicons/survey-fillers) and the study's own list, all compared in normal form (NFKC,
// language-aware lower case) — the form `tokenize` gives a word before stemming.
import { surveyLexicon } from './lexicons.js';
import { normalizeText } from './normalize.js';
import { openStopWords } from './stop-word-lists.js';

/**
 * Every stop word of a language. `extra` is the study's own list per language; its '*' entry
 * applies to all languages.
 */
export function stopWordSet(language: string, extra: Readonly<Record<string, readonly string[]>> = {}): Set<string> {
  const out = new Set(shippedStopWords(language));
  for (const word of [...(extra[language] ?? []), ...(extra['*'] ?? [])]) {
    const normal = normalizeText(word, language).trim();
    if (normal !== '') out.add(normal);
  }
  return out;
}

const shipped = new Map<string, ReadonlySet<string>>();

/** The open list and the survey fillers of a language, normalised once per process. */
function shippedStopWords(language: string): ReadonlySet<string> {
  let set = shipped.get(language);
  if (set === undefined) {
    const words = new Set<string>();
    for (const word of [...openStopWords(language), ...(surveyLexicon(language)?.fillers ?? [])]) {
      const normal = normalizeText(word, language).trim();
      if (normal !== '') words.add(normal);
    }
    set = words;
    shipped.set(language, set);
  }
  return set;
}
