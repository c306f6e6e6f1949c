// Real multilingual text for the glossary tests. Source: the `emojibase-data` npm package,
// version 17.0.0, MIT licence (node_modules/emojibase-data/LICENSE):
//  - <locale>/messages.json, section `subgroups`: the emoji subgroup names translated into each
//    locale ("food & drink"-style names, some with "/" between two words) — the glossary rows;
//  - <locale>/data.json, field `label` of each emoji — the answers (short real phrases).
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

export const EMOJIBASE_LOCALES = ['en', 'es', 'fr', 'de', 'ja'] as const;
/** Glossary headers: language names and autonyms as a researcher might write them. */
export const GLOSSARY_HEADERS = ['English', 'Español', 'français', 'Deutsch', '日本語'];

type Locale = (typeof EMOJIBASE_LOCALES)[number];

function json<T>(locale: Locale, file: string): T {
  return JSON.parse(readFileSync(require.resolve(`emojibase-data/${locale}/${file}`), 'utf8')) as T;
}

/** Subgroup key → translated name per locale (only keys every locale names). */
export function subgroupNames(): { key: string; names: Record<Locale, string> }[] {
  const per = EMOJIBASE_LOCALES.map((l) => new Map(json<{ subgroups: { key: string; message: string }[] }>(l, 'messages.json').subgroups.map((s) => [s.key, s.message])));
  return [...per[0].keys()]
    .filter((key) => per.every((m) => m.get(key)?.trim()))
    .map((key) => ({ key, names: Object.fromEntries(EMOJIBASE_LOCALES.map((l, i) => [l, per[i].get(key)!])) as Record<Locale, string> }));
}

function csvCell(s: string): string {
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function csv(rows: readonly (readonly string[])[]): string {
  return rows.map((r) => r.map(csvCell).join(',')).join('\n') + '\n';
}

/** The glossary file: one row per subgroup, one column per language. */
export function subgroupGlossaryCsv(): string {
  return csv([GLOSSARY_HEADERS, ...subgroupNames().map((s) => EMOJIBASE_LOCALES.map((l) => s.names[l]))]);
}

/**
 * Answers in five languages: the labels of the first `perLanguage` emojis every locale labels,
 * plus every subgroup name as an answer of its own, twice (as two respondents might write it), so
 * the glossary's words occur in answers often enough to pass the vocabulary's minimum count.
 */
export function emojiAnswersCsv(perLanguage = 150): string {
  const labels = EMOJIBASE_LOCALES.map((l) => new Map(json<{ hexcode: string; label: string; group?: number }[]>(l, 'data.json').filter((e) => e.group !== undefined && e.group !== 2).map((e) => [e.hexcode, e.label])));
  const hexcodes = [...labels[0].keys()].filter((h) => labels.every((m) => m.get(h)?.trim())).slice(0, perLanguage);
  const rows: string[][] = [['id', 'text', 'lang']];
  EMOJIBASE_LOCALES.forEach((l, i) => {
    for (const h of hexcodes) rows.push([`${l}-${h}`, labels[i].get(h)!, l]);
    for (const s of subgroupNames()) for (const n of [1, 2]) rows.push([`${l}-sub-${s.key}-${n}`, s.names[l], l]);
  });
  return csv(rows);
}
