// What the pipeline knows about each language it supports: the ISO 639-3 code the trigram
// detector (franc 6.2.0) uses, the script the language is written in, and the Snowball
// algorithm that stems it. Keyed by the BCP 47 language subtag (ISO 639-1 where one exists).
// Tags arrive in many spellings (`en`, `eng`, `en-GB`, `zh-Hans`); `languageKey` reduces them to
// the key of this table with the shared normalizeLanguageTag.
import { normalizeLanguageTag } from '../language-tags.js';

export type Script =
  | 'Latin'
  | 'Cyrillic'
  | 'Greek'
  | 'Arabic'
  | 'Hebrew'
  | 'Devanagari'
  | 'Bengali'
  | 'Tamil'
  | 'Armenian'
  | 'Georgian'
  | 'Thai'
  | 'Lao'
  | 'Khmer'
  | 'Myanmar'
  | 'Hangul'
  | 'Kana'
  | 'Han';

export interface LanguageInfo {
  /** ISO 639-3 code as used by franc's trigram data; undefined when franc has no model. */
  readonly franc?: string;
  readonly script: Script;
  /** Snowball algorithm name in snowball-stemmers 0.6.0, if one exists. */
  readonly snowball?: string;
  /** Written without spaces between words: segment with Intl.Segmenter. */
  readonly segmenter?: boolean;
}

const L = (franc: string | undefined, script: Script, snowball?: string, segmenter?: boolean): LanguageInfo => ({
  franc,
  script,
  snowball,
  segmenter,
});

export const LANGUAGES: Readonly<Record<string, LanguageInfo>> = {
  en: L('eng', 'Latin', 'english'),
  es: L('spa', 'Latin', 'spanish'),
  fr: L('fra', 'Latin', 'french'),
  de: L('deu', 'Latin', 'german'),
  it: L('ita', 'Latin', 'italian'),
  pt: L('por', 'Latin', 'portuguese'),
  nl: L('nld', 'Latin', 'dutch'),
  sv: L('swe', 'Latin', 'swedish'),
  da: L('dan', 'Latin', 'danish'),
  nb: L('nob', 'Latin', 'norwegian'),
  nn: L('nno', 'Latin', 'norwegian'),
  fi: L('fin', 'Latin', 'finnish'),
  ca: L('cat', 'Latin', 'catalan'),
  ro: L('ron', 'Latin', 'romanian'),
  hu: L('hun', 'Latin', 'hungarian'),
  tr: L('tur', 'Latin', 'turkish'),
  az: L('azj', 'Latin'),
  pl: L('pol', 'Latin'),
  cs: L('ces', 'Latin', 'czech'),
  sk: L('slk', 'Latin'),
  sl: L('slv', 'Latin', 'slovene'),
  hr: L('hrv', 'Latin'),
  bs: L('bos', 'Latin'),
  et: L('ekk', 'Latin'),
  lv: L('lvs', 'Latin'),
  lt: L('lit', 'Latin'),
  gl: L('glg', 'Latin'),
  eu: L(undefined, 'Latin', 'basque'),
  ga: L(undefined, 'Latin', 'irish'),
  af: L('afr', 'Latin'),
  id: L('ind', 'Latin'),
  ms: L('zlm', 'Latin'),
  fil: L('tgl', 'Latin'),
  vi: L('vie', 'Latin'),
  sw: L('swh', 'Latin'),
  ru: L('rus', 'Cyrillic', 'russian'),
  uk: L('ukr', 'Cyrillic'),
  bg: L('bul', 'Cyrillic'),
  sr: L('srp', 'Cyrillic'),
  mk: L('mkd', 'Cyrillic'),
  be: L('bel', 'Cyrillic'),
  kk: L('kaz', 'Cyrillic'),
  el: L(undefined, 'Greek'),
  ar: L('arb', 'Arabic', 'arabic'),
  fa: L('pes', 'Arabic'),
  ur: L('urd', 'Arabic'),
  he: L('heb', 'Hebrew'),
  hi: L('hin', 'Devanagari'),
  mr: L('mar', 'Devanagari'),
  ne: L('npi', 'Devanagari'),
  bn: L(undefined, 'Bengali'),
  ta: L(undefined, 'Tamil', 'tamil'),
  hy: L(undefined, 'Armenian', 'armenian'),
  ka: L(undefined, 'Georgian'),
  th: L(undefined, 'Thai', undefined, true),
  lo: L(undefined, 'Lao', undefined, true),
  km: L(undefined, 'Khmer', undefined, true),
  my: L('mya', 'Myanmar', undefined, true),
  ko: L(undefined, 'Hangul'),
  ja: L(undefined, 'Kana', undefined, true),
  zh: L(undefined, 'Han', undefined, true),
};

/**
 * The table key (BCP 47 primary language subtag) for a language tag in any spelling
 * normalizeLanguageTag accepts (`en`, `eng`, `en-GB`, `Spanish`, `zh_Hans`); a tag it does not
 * know falls back to its lower-cased primary subtag, which can still be used with fewer
 * features (no trigram model, no stemmer).
 */
export function languageKey(tag: string): string {
  let key = keys.get(tag);
  if (key === undefined) {
    key = normalizeLanguageTag(tag) ?? (tag.trim().toLowerCase().split(/[-_]/)[0] ?? '');
    // Tags repeat (one per document): remember them, within reason.
    if (keys.size < 10_000) keys.set(tag, key);
  }
  return key;
}

const keys = new Map<string, string>();

export function languageInfo(tag: string): LanguageInfo | undefined {
  return LANGUAGES[languageKey(tag)];
}
