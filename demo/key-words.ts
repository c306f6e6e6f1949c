// The words that make each planted theme recognisable, computed from the phrase material itself
// so truth.json can never disagree with what the generator writes.
import stopwordsIso from 'stopwords-iso/stopwords-iso.json' with { type: 'json' };
import { DEMO_LANGUAGES, THEME_IDS, type DemoLanguage, type ThemeId } from './types.js';
import { PHRASES } from './phrases/index.js';

const STOP: Record<string, string[]> = stopwordsIso as Record<string, string[]>;

const segmenters = new Map<DemoLanguage, Intl.Segmenter>();
function segmenterFor(language: DemoLanguage): Intl.Segmenter {
  let s = segmenters.get(language);
  if (s === undefined) segmenters.set(language, (s = new Intl.Segmenter(language, { granularity: 'word' })));
  return s;
}

/** Lower-cased words of a text as Intl.Segmenter splits them (word-like segments only). */
export function segmentWords(text: string, language: DemoLanguage): string[] {
  const segmenter = segmenterFor(language);
  const out: string[] = [];
  for (const s of segmenter.segment(text.normalize('NFKC'))) {
    if (s.isWordLike) out.push(s.segment.toLocaleLowerCase(language));
  }
  return out;
}

/** Every word a theme's phrase material can produce in one language. */
export function themeWords(language: DemoLanguage, theme: ThemeId): Set<string> {
  const phrases = PHRASES[language].themes[theme];
  const words = new Set<string>();
  for (const text of [...phrases.templates, ...phrases.fillers]) {
    for (const w of segmentWords(text.replaceAll('{x}', ' '), language)) words.add(w);
  }
  return words;
}

/** Function words of a language: the open stop-word list plus the scenario words every theme may use. */
export function functionWords(language: DemoLanguage): Set<string> {
  return new Set([...(STOP[language] ?? []), ...PHRASES[language].sharedWords].map((w) => w.toLocaleLowerCase(language)));
}

// Japanese words written only in hiragana are endings, particles and auxiliaries once
// Intl.Segmenter has split a sentence (common practice); digits carry no theme.
function isFunctionWord(word: string, fn: Set<string>, language: DemoLanguage): boolean {
  if (fn.has(word) || /^\d+$/.test(word)) return true;
  return language === 'ja' && /^[\u3041-\u309f\u30fc]+$/.test(word);
}

/** Words used by more than one theme that are not function words (should be empty). */
export function crossThemeWords(language: DemoLanguage): Map<string, ThemeId[]> {
  const fn = functionWords(language);
  const owners = new Map<string, ThemeId[]>();
  for (const theme of THEME_IDS) {
    for (const w of themeWords(language, theme)) {
      if (isFunctionWord(w, fn, language)) continue;
      owners.set(w, [...(owners.get(w) ?? []), theme]);
    }
  }
  return new Map([...owners].filter(([, themes]) => themes.length > 1));
}

/**
 * Content words used by exactly one theme, per theme and language, sorted. Single letters ("e" of
 * "e-books") are left out; a single kanji is a word (谷, 駅, 机).
 */
export function keyWords(): Record<ThemeId, Record<DemoLanguage, string[]>> {
  const out = {} as Record<ThemeId, Record<DemoLanguage, string[]>>;
  for (const theme of THEME_IDS) out[theme] = {} as Record<DemoLanguage, string[]>;
  for (const language of DEMO_LANGUAGES) {
    const fn = functionWords(language);
    const shared = crossThemeWords(language);
    for (const theme of THEME_IDS) {
      out[theme][language] = [...themeWords(language, theme)]
        .filter((w) => !isFunctionWord(w, fn, language) && !shared.has(w) && ([...w].length > 1 || /\p{Script=Han}/u.test(w)))
        .sort();
    }
  }
  return out;
}
