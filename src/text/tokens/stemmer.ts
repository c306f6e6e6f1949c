// Stemming per language (docs/design.md §5): the Snowball algorithms (Porter 2001, "Snowball: A language
// for stemming algorithms", snowball.tartarus.org) via snowball-stemmers 0.6.0, and for English
// the original Porter algorithm (Porter 1980, "An algorithm for suffix stripping", Program 14(3))
// via the stemmer package 2.0.1. Optional diacritic folding after stemming, so "café"/"cafe"
// meet only after the stemmer has used the accents it needs.
import { newStemmer } from 'snowball-stemmers';
import { stemmer as porter } from 'stemmer';
import { languageInfo } from '../language/languages.js';

export interface StemOptions {
  /** false: words are kept whole (lower-cased). */
  stemming: boolean;
  foldDiacritics: boolean;
}

/** Stems are cached per word: survey vocabularies repeat (common practice). */
const MAX_CACHE = 200_000;

// Combining diacritical marks (U+0300–U+036F) only: the vowel signs of Indic scripts, Thai tone
// marks and the Japanese voicing marks are letters' parts, not accents, and must stay.
const DIACRITICS = /[\u0300-\u036f]/g;

/** Remove Latin/Greek/Cyrillic accents: "Ñandú" → "Nandu", "ё" → "е". */
export function foldDiacritics(word: string): string {
  // Letters that do not decompose but are usually written plain when accents are dropped.
  return word.normalize('NFD').replace(DIACRITICS, '').normalize('NFC').replace(/ß/g, 'ss').replace(/ø/g, 'o').replace(/æ/g, 'ae').replace(/ł/g, 'l');
}

/** Which algorithm stems a language: 'porter' (English), a Snowball name, or null (none). */
export function stemmerName(language: string): string | null {
  if (language === 'en') return 'porter';
  return languageInfo(language)?.snowball ?? null;
}

/** A stemming function for one language, with a per-word cache. */
export function stemmerFor(language: string, options: StemOptions): (word: string) => string {
  const name = options.stemming ? stemmerName(language) : null;
  const base: (word: string) => string =
    name === null ? (w) => w : name === 'porter' ? porter : snowballStem(name);
  const fold = options.foldDiacritics;
  const cache = new Map<string, string>();
  return (word: string): string => {
    let stem = cache.get(word);
    if (stem !== undefined) return stem;
    stem = base(word);
    if (stem === '') stem = word;
    if (fold) stem = foldDiacritics(stem);
    if (cache.size >= MAX_CACHE) cache.clear();
    cache.set(word, stem);
    return stem;
  };
}

function snowballStem(name: string): (word: string) => string {
  const s = newStemmer(name);
  // Russian: the current Snowball algorithm reads "ё" as "е" before stemming (the package's
  // older revision does not); folding first gives the current algorithm's stems.
  if (name === 'russian') return (word) => s.stem(word.replace(/ё/g, 'е'));
  return (word) => s.stem(word);
}
