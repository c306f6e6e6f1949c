// A real multilingual corpus of short texts with known categories, for outside checks of
// cross-language alignment: the CLDR emoji names and keywords as shipped in the `emojibase-data`
// npm package (17.0.0, MIT licence; data.json of the locales en, es, fr, de, ja: fields `label`,
// `tags`, `group`). Each emoji is one concept, written independently by CLDR's translators in every
// language; its group (food & drink, travel & places …) is the known category. Groups "component"
// (skin-tone swatches) and "flags" (country names) are left out, which leaves eight categories.
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

export const EMOJI_LANGUAGES = ['en', 'es', 'fr', 'de', 'ja'] as const;
/** emojibase group numbers left out: 2 = component, 9 = flags. */
const LEFT_OUT_GROUPS = new Set([2, 9]);

interface EmojiEntry {
  label: string;
  hexcode: string;
  tags?: string[];
  group?: number;
}

export interface ConceptText {
  readonly concept: string;
  readonly category: number;
  readonly language: string;
  readonly text: string;
}

/** One short text per (concept, language): the name, then its keywords, comma-separated. */
export function emojiConcepts(languages: readonly string[] = EMOJI_LANGUAGES): ConceptText[] {
  const out: ConceptText[] = [];
  const byLanguage = languages.map((l) => new Map((require(`emojibase-data/${l}/data.json`) as EmojiEntry[]).map((e) => [e.hexcode, e])));
  const reference = require(`emojibase-data/en/data.json`) as EmojiEntry[];
  for (const e of reference) {
    if (e.group === undefined || LEFT_OUT_GROUPS.has(e.group)) continue;
    languages.forEach((language, l) => {
      const entry = byLanguage[l].get(e.hexcode);
      if (!entry) return;
      const words = [entry.label, ...(entry.tags ?? []).filter((t) => t !== entry.label)];
      out.push({ concept: e.hexcode, category: e.group!, language, text: words.join(', ') });
    });
  }
  return out;
}

/** Group names of the locale files (emojibase-data/<locale>/messages.json, `groups`). */
export function emojiGroupNames(language: string): Map<number, string> {
  const m = require(`emojibase-data/${language}/messages.json`) as { groups: { order: number; message: string }[] };
  return new Map(m.groups.map((g) => [g.order, g.message]));
}

/**
 * A real term list: emojibase-data's group and subgroup names (messages.json, `groups` and
 * `subgroups`), translated by CLDR, as a glossary CSV (one row per name, one column per language).
 */
export function emojiGlossaryCsv(languages: readonly string[] = EMOJI_LANGUAGES): string {
  const rows = new Map<string, string[]>();
  languages.forEach((l, i) => {
    const m = require(`emojibase-data/${l}/messages.json`) as { groups: { key: string; message: string }[]; subgroups: { key: string; message: string }[] };
    for (const e of [...m.groups, ...m.subgroups]) {
      if (!rows.has(e.key)) rows.set(e.key, new Array(languages.length).fill(''));
      rows.get(e.key)![i] = e.message.replace(/[",;\n]/g, ' ');
    }
  });
  return [languages.join(','), ...[...rows.values()].map((r) => r.join(','))].join('\n') + '\n';
}
