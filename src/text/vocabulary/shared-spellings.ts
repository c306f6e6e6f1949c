// Words spelled the same in two or more languages of a study — names, loanwords such as "wifi",
// "taxi" or "pizza", numbers — as weak links between the languages' vocabularies.
//
// Why: in a polylingual topic model only link groups tie topic k of one language to topic k of
// another ("Polylingual Topic Models", Mimno et al., EMNLP 2009). With few linked answers, half the
// words of the unlinked answers never occur in a linked one (bench/alignment: 51% of tokens with
// 10% of concepts linked), so nothing ties their topics across languages. Identical spellings are
// the standard seed of bilingual lexicons when no dictionary is at hand (Søgaard, Ruder & Vulić,
// "On the Limitations of Unsupervised Bilingual Dictionary Induction", ACL 2018, §4: identical
// strings as the seed dictionary; Artetxe, Labaka & Agirre, ACL 2017: numerals). Each shared
// spelling becomes link groups of one-word documents, one per language, so the fit treats the
// occurrences in both languages as translations of each other. There are `repeats` such groups,
// a share of the word's rarer count, so the tie weighs in proportion to how much the word is used,
// not one token against hundreds (common practice; the share is ours).
//
// Comparison folds case and diacritics (Unicode NFKD without combining marks), so "café" and
// "Cafe" match. Words must have at least `minCharacters` letters or digits and occur at least
// `minCount` times in each language, which keeps chance coincidences of rare words out.

export interface SharedSpelling {
  /** The folded spelling shared by the members. */
  readonly spelling: string;
  /** One word per language (language index into the study's languages, word id in it). */
  readonly members: readonly { readonly language: number; readonly word: number }[];
  /** Link groups to make of it. */
  readonly repeats: number;
}

export interface SharedSpellingOptions {
  readonly minCount?: number;
  readonly minCharacters?: number;
  /** Groups per shared spelling as a share of its rarest count (at least one). */
  readonly share?: number;
}

/** Case- and diacritic-folded form used to compare spellings. */
export function foldSpelling(word: string): string {
  return word.normalize('NFKD').replace(/\p{M}+/gu, '').toLowerCase();
}

/**
 * Shared spellings across languages. `surfaces[ℓ][w]` is the shown form of word w of language ℓ,
 * `counts[ℓ][w]` its number of tokens in the answers. Deterministic: ordered by spelling.
 */
export function sharedSpellings(surfaces: readonly (readonly string[])[], counts: readonly ArrayLike<number>[], options: SharedSpellingOptions = {}): SharedSpelling[] {
  const minCount = options.minCount ?? 2;
  const minCharacters = options.minCharacters ?? 3;
  const share = options.share ?? 0.5;
  const byKey = new Map<string, { language: number; word: number }[]>();
  surfaces.forEach((words, language) => {
    words.forEach((surface, word) => {
      if (counts[language][word] < minCount) return;
      const key = foldSpelling(surface);
      if ((key.match(/[\p{L}\p{N}]/gu)?.length ?? 0) < minCharacters) return;
      let list = byKey.get(key);
      if (!list) byKey.set(key, (list = []));
      // One word per language: a second surface folding to the same key keeps the more frequent.
      const same = list.findIndex((m) => m.language === language);
      if (same < 0) list.push({ language, word });
      else if (counts[language][word] > counts[language][list[same].word]) list[same] = { language, word };
    });
  });
  const out: SharedSpelling[] = [];
  for (const key of [...byKey.keys()].sort()) {
    const members = byKey.get(key)!;
    if (members.length < 2) continue;
    const rarest = Math.min(...members.map((m) => counts[m.language][m.word]));
    out.push({ spelling: key, members, repeats: Math.max(1, Math.round(share * rarest)) });
  }
  return out;
}
