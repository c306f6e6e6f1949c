// Text normalisation before tokens are cut: compatibility composition and language-aware
// lower-casing.
//
// NFKC (Unicode Standard Annex #15, "Unicode Normalization Forms", §1.2 and Figure 6) folds
// compatibility variants to their ordinary letters: the ligature "ﬁ" → "fi", full-width "Ａ" → "A",
// superscript "²" → "2", so that every spelling of a word counts as the same word.
// Invisible format characters (byte-order marks, zero-width spaces, soft hyphens, bidi controls)
// are removed after NFKC, and NFKC runs again if any were, since a removed character may have sat
// between a letter and its combining mark (see invisible.ts).
// Lower-casing follows the language: Turkish and Azeri map "I" to dotless "ı" and "İ" to "i"
// (Unicode SpecialCasing.txt, the `tr`/`az` conditional mappings); elsewhere the default mapping.

import { removeInvisibles } from './invisible.js';

// Apostrophe look-alikes (right single quotation mark, modifier letter apostrophe, prime, grave,
// acute) become the ASCII apostrophe so that "don’t" and "don't" are one word (common practice).
const APOSTROPHES = /[\u2019\u2018\u02BC\u2032\u0060\u00B4]/g;

const LOCALE_CASING = new Set(['tr', 'az', 'lt']);

/** NFKC, invisible format characters removed, apostrophes unified (no change of case). */
export function composeText(text: string): string {
  const composed = text.normalize('NFKC');
  const visible = removeInvisibles(composed);
  return (visible === composed ? composed : visible.normalize('NFKC')).replace(APOSTROPHES, "'");
}

/** NFKC, apostrophe unification and lower-casing for the given language (BCP 47 subtag). */
export function normalizeText(text: string, language: string): string {
  return lowerCase(composeText(text), language);
}

/** Language-aware lower-casing (SpecialCasing.txt conditional mappings for tr, az, lt). */
export function lowerCase(text: string, language: string): string {
  return LOCALE_CASING.has(language) ? text.toLocaleLowerCase(language) : text.toLowerCase();
}
