// What each theme is called on the pages: the label the researcher saved, or else a label
// suggested from the theme's most distinctive words (src/eval/label-suggestion.ts), marked as a
// suggestion until it is accepted. Also the order in which languages are shown: the language
// the researcher named first, then the others by number of answers (most first). A study whose
// languages were found by the import keeps them in alphabetical order, which says nothing of
// what matters most, so there the language with the most answers comes first.
import { suggestThemeLabels, type LabelSuggestion } from '../../eval/index.js';
import { getThemeLabels, type Store, type Study } from '../../store/index.js';
import type { RunData } from './run-data.js';

export interface ThemeName {
  readonly k: number;
  /** What to print: the saved label, else the suggestion. */
  readonly text: string;
  /** The saved label, or null when none has been given. */
  readonly saved: string | null;
  readonly suggestion: string;
  /** True when `text` is a suggestion nobody has accepted yet. */
  readonly suggested: boolean;
  /** Most distinctive words per language, in the page's language order. */
  readonly words: LabelSuggestion['words'];
}

/** Languages of the run, in the order a reader wants them. */
export function languageOrder(study: Pick<Study, 'languages'>, data: Pick<RunData, 'model' | 'docLanguage'>): string[] {
  const { languages } = data.model;
  const answers = new Array<number>(languages.length).fill(0);
  for (const l of data.docLanguage) if (l >= 0) answers[l]++;
  const declared = study.languages.filter((l) => languages.includes(l));
  const alphabetical = declared.length > 1 && declared.every((l, i) => i === 0 || declared[i - 1].localeCompare(l) < 0);
  const first = alphabetical ? undefined : declared[0];
  return languages
    .map((language, l) => ({ language, n: answers[l] }))
    .sort((a, b) => (a.language === first ? -1 : b.language === first ? 1 : b.n - a.n || a.language.localeCompare(b.language)))
    .map((x) => x.language);
}

const suggestionCache = new WeakMap<RunData, { key: string; list: LabelSuggestion[] }>();

/** Suggested labels of every theme (kept with the run's cached data). */
export function themeSuggestions(study: Pick<Study, 'languages'>, data: RunData): LabelSuggestion[] {
  const order = languageOrder(study, data);
  const key = order.join(',');
  const hit = suggestionCache.get(data);
  if (hit && hit.key === key) return hit.list;
  const { model } = data;
  const { K } = model;
  const L = model.languages.length;
  // A theme's weight in language ℓ: its overall share times the part of it written in ℓ.
  const themeWeights = model.languages.map((_, l) => Array.from({ length: K }, (_, k) => data.shares[k] * data.balance[k * L + l]));
  const list = suggestThemeLabels({
    K,
    languages: model.languages,
    phi: model.phi,
    words: model.vocabularies.map((v) => v.stems.map((s, w) => v.surfaces[w] || s)),
    themeWeights,
    primary: Math.max(0, model.languages.indexOf(order[0])),
  }).map((s) => ({ ...s, words: order.map((language) => s.words.find((w) => w.language === language)!).filter(Boolean) }));
  suggestionCache.set(data, { key, list });
  return list;
}

/** Below this share a theme's words are its prior's, not the answers' (common practice). */
const ALMOST_EMPTY = 0.001;

export function themeNames(store: Store, study: Study, data: RunData): ThemeName[] {
  const saved = getThemeLabels(store, data.model.run.id);
  return themeSuggestions(study, data).map((s) => {
    const label = saved.get(s.theme) ?? null;
    const suggestion = data.shares[s.theme] < ALMOST_EMPTY ? 'almost no answers' : s.label;
    return { k: s.theme, text: label ?? suggestion, saved: label, suggestion, suggested: label === null, words: s.words };
  });
}

/** "3. swings, park, fence" — a theme's number and name for chart rows and column heads. */
export function numbered(name: Pick<ThemeName, 'k' | 'text'>): string {
  return `${name.k + 1}. ${name.text}`;
}
