// Language tags as people write them in survey exports → BCP 47 primary language subtags.
//
// Accepts ISO 639-1 (`en`), ISO 639-2/T and /B and ISO 639-3 (`eng`, `fre`, `ger`, `cmn`),
// BCP 47 tags with script/region/variant subtags (`en-GB`, `zh-Hant-TW`, `pt_BR`), POSIX locale
// names (`de_DE.UTF-8`), English language names and autonyms (`Spanish`, `español`), all
// case-insensitive. Only languages in the table (language-tag-data.ts) are known; anything else
// is `null`, so a caller can count it and leave the decision to language identification.
// BCP 47 itself: "Tags for Identifying Languages", RFC 5646 (2009), section 2.1.

import { LANGUAGE_ROWS, SUBTAG_ALIASES } from './language-tag-data.js';

const bySubtag = new Map<string, string>(); // subtag → detector ISO 639-3 code
const byCode = new Map<string, string>(); // 2- or 3-letter code → subtag
const byName = new Map<string, string>(); // lower-cased name → subtag

for (const [subtag, detector, otherCodes, englishNames, autonyms] of LANGUAGE_ROWS) {
  bySubtag.set(subtag, detector);
  byCode.set(subtag, subtag);
  byCode.set(detector, subtag);
  for (const code of otherCodes) byCode.set(code, subtag);
  for (const name of [...englishNames, ...autonyms]) byName.set(foldName(name), subtag);
}
for (const [alias, subtag] of Object.entries(SUBTAG_ALIASES)) byCode.set(alias, subtag);

function foldName(name: string): string {
  return name.normalize('NFC').toLocaleLowerCase('und').replace(/\s+/g, ' ').trim();
}

/**
 * The BCP 47 primary language subtag for a tag, code or language name, or null when the
 * value is empty, `und`/`mul`/`zxx`, or not a language this table knows.
 */
export function normalizeLanguageTag(tag: string): string | null {
  const raw = tag.normalize('NFC').trim();
  if (raw === '') return null;

  // Names first: "Chinese (Simplified)" and "Norwegian Bokmål" are names, not tags.
  const name = foldName(raw.replace(/\s*[([].*$/, ''));
  const named = byName.get(name);
  if (named !== undefined) return named;

  // A POSIX locale may carry an encoding or modifier: de_DE.UTF-8, sr_RS@latin.
  const code = raw.replace(/[.@].*$/, '').replace(/_/g, '-').toLowerCase();
  if (!/^[a-z]{2,3}(-[a-z0-9]{1,8})*$/.test(code)) return null;
  const primary = code.split('-')[0];
  return byCode.get(primary) ?? null;
}

/**
 * The ISO 639-3 code a trigram detector such as franc reports for a BCP 47 subtag (or any tag
 * normalizeLanguageTag accepts): the individual language for macrolanguages (zh → cmn,
 * ar → arb, fa → pes, ms → zlm, sw → swh). Null when unknown.
 */
export function toIso6393(subtag: string): string | null {
  const normalized = normalizeLanguageTag(subtag);
  return normalized === null ? null : (bySubtag.get(normalized) ?? null);
}

/** From a detector's ISO 639-3 code (e.g. franc's `cmn`) back to the BCP 47 subtag. */
export function fromIso6393(code: string): string | null {
  return byCode.get(code.trim().toLowerCase()) ?? null;
}

/** Every subtag the table knows, sorted. */
export function knownLanguageSubtags(): string[] {
  return [...bySubtag.keys()].sort();
}
