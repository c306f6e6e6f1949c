import type { DemoLanguage, ThemeId } from '../types.js';

/**
 * A theme's phrase material in one language. A sentence is a template with an optional `{x}`
 * slot filled from `fillers`. Fillers are listed in the same concept order in every language so
 * a translation can reuse the same filler index.
 */
export interface ThemePhrases {
  readonly templates: readonly string[];
  readonly fillers: readonly string[];
}

export interface LanguagePhrases {
  readonly language: DemoLanguage;
  readonly themes: Readonly<Record<ThemeId, ThemePhrases>>;
  /** Answers that say nothing ("nothing", "n/a", …) in this language. */
  readonly nonAnswers: readonly string[];
  /** Put before a later sentence of an answer. */
  readonly connectors: readonly string[];
  /** Scenario words every theme may use (library, branch …), besides the language's stop words. */
  readonly sharedWords: readonly string[];
  /** Joins sentences ('' for Japanese, ' ' otherwise). */
  readonly sentenceGap: string;
}
