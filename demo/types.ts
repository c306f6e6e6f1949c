// Types of the invented demo study (issue 3). Plain data: no paths, no I/O.

export const DEMO_LANGUAGES = ['en', 'es', 'fr', 'de', 'ja'] as const;
export type DemoLanguage = (typeof DEMO_LANGUAGES)[number];

export const THEME_IDS = ['hours', 'children', 'quiet', 'digital', 'collection', 'staff', 'access', 'events'] as const;
export type ThemeId = (typeof THEME_IDS)[number];

/** One row of library-survey.csv, in column order. */
export interface DemoRow {
  answer_id: string;
  answer: string;
  /** Language of the questionnaire the person filled in (may differ from what they wrote). */
  questionnaire_language: DemoLanguage;
  /** Shared by an answer and its translation; '' for answers without one. */
  link_key: string;
  branch_region: string;
  channel: string;
  age_band: string;
  wave: string;
  weight: number;
}

export type AnswerKind = 'answer' | 'translation' | 'non-answer';

/** What was planted in one row. */
export interface RowTruth {
  answer_id: string;
  kind: AnswerKind;
  /** Language actually written (the main one for mixed answers); null when no language can be told ("-", "ok"). */
  language: DemoLanguage | null;
  /** Themes of the sentences written, most frequent first (ties in theme order); [] for non-answers. */
  themes: ThemeId[];
  /** Number of sentences written per theme, in THEME_IDS order. */
  sentences: number[];
  /** θ drawn for the link group, in THEME_IDS order, rounded to 4 decimals; null for non-answers. */
  mixture: number[] | null;
  /** Second language of an answer that mixes two. */
  mixedWith?: DemoLanguage;
  declaredMismatch?: true;
  long?: true;
  emoji?: true;
  typos?: true;
  /** answer_id of the original answer, for translations. */
  translationOf?: string;
}

export interface PlantedEffect {
  covariate: 'branch_region' | 'channel' | 'age_band' | 'wave';
  level: string;
  theme: ThemeId;
  /** α_k is multiplied by this for answers at this level. */
  multiplier: number;
  /** λ, the DMR weight of the level's indicator for this theme: ln(multiplier). */
  lambda: number;
}

export interface ThemeTruth {
  id: ThemeId;
  name: string;
  /** Words used only by this theme's phrases, per language (lower-case, as Intl.Segmenter splits them). */
  keyWords: Record<DemoLanguage, string[]>;
}

export interface EffectCheck extends PlantedEffect {
  /** Mean planted share of the theme among answers at the level, and among all others. */
  meanShareAtLevel: number;
  meanShareElsewhere: number;
}

export interface DemoTruth {
  generator: string;
  seed: number;
  answers: number;
  languages: readonly DemoLanguage[];
  themes: ThemeTruth[];
  /** Baseline α per theme (THEME_IDS order) before covariate effects: α_k = base_k · Π multipliers. */
  baseAlpha: number[];
  effects: EffectCheck[];
  counts: Record<string, number>;
  /** Per-row detail; omitted for very large sizes (see perRowLimit). */
  rows: RowTruth[] | null;
}
