// Stop words per language: the open list (stopwords-iso 1.1.0) — optionally less the theme words
// the shipped survey lexicon keeps — plus the lexicon's fillers (lexicons/survey-fillers) and the
// study's own list, all compared in normal form (NFKC,
// language-aware lower case) — the form `tokenize` gives a word before stemming.
import { surveyLexicon } from './lexicons.js';
import { normalizeText } from './normalize.js';
import { openStopWords } from './stop-word-lists.js';

/**
 * Every stop word of a language. `extra` is the study's own list per language; its '*' entry
 * applies to all languages.
 */
export function stopWordSet(
  language: string,
  extra: Readonly<Record<string, readonly string[]>> = {},
  options: { keepThemeWords?: boolean } = {},
): Set<string> {
  const out = new Set(shippedStopWords(language, options.keepThemeWords === true));
  for (const word of [...(extra[language] ?? []), ...(extra['*'] ?? [])]) {
    const normal = normalizeText(word, language).trim();
    if (normal !== '') out.add(normal);
  }
  return out;
}

const shipped = new Map<string, ReadonlySet<string>>();

/**
 * The open list and the survey fillers of a language, normalised once per process; with
 * `keepThemeWords`, less the lexicon's `keep` words. Off by default for now: the demo study's
 * truth (demo/key-words.ts) counts the open list's words as stop words.
 */
function shippedStopWords(language: string, keepThemeWords: boolean): ReadonlySet<string> {
  const id = `${language}:${keepThemeWords ? 'keep' : 'all'}`;
  let set = shipped.get(id);
  if (set === undefined) {
    const words = new Set<string>();
    const lexicon = surveyLexicon(language);
    const keep = new Set(keepThemeWords ? (lexicon?.keep ?? []).map((word) => normalizeText(word, language).trim()) : []);
    for (const word of openStopWords(language)) {
      const normal = normalizeText(word, language).trim();
      if (normal !== '' && !keep.has(normal)) words.add(normal);
    }
    for (const word of lexicon?.fillers ?? []) {
      const normal = normalizeText(word, language).trim();
      if (normal !== '') words.add(normal);
    }
    set = words;
    shipped.set(id, set);
  }
  return set;
}
