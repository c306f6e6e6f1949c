// The invented scenario: the Vallendra Regional Libraries, a library network in a fictional
// multilingual region, asked its users one open question in two waves. Every name and number here
// is invented for Themata's demo (nowhere real); the proportions are plausible, not measured.
import { DEMO_LANGUAGES, type DemoLanguage, type PlantedEffect, type ThemeId } from './types.js';

export const NETWORK_NAME = 'Vallendra Regional Libraries';
export const QUESTION = 'What one change would improve your library?';

export const THEME_NAMES: Readonly<Record<ThemeId, string>> = {
  hours: 'Opening hours',
  children: 'Children and family programmes',
  quiet: 'Quiet study space and noise',
  digital: 'Digital services (wifi, e-books, computers)',
  collection: 'The collection (new titles, books in more languages)',
  staff: 'Staff and service',
  access: 'Access and transport (parking, bus stops, ramps, lifts)',
  events: 'Events and community (café, workshops, clubs)',
};

export const REGIONS = ['Corvane', 'Lunmere', 'Ostrevale', 'Sarnwick'] as const;
export const REGION_SHARES = [0.3, 0.25, 0.2, 0.25];
/** Language mix of each region's respondents, in DEMO_LANGUAGES order (en, es, fr, de, ja). */
export const REGION_LANGUAGES: Readonly<Record<(typeof REGIONS)[number], number[]>> = {
  Corvane: [0.45, 0.1, 0.35, 0.05, 0.05],
  Lunmere: [0.3, 0.1, 0.1, 0.45, 0.05],
  Ostrevale: [0.3, 0.45, 0.1, 0.1, 0.05],
  Sarnwick: [0.3, 0.15, 0.15, 0.15, 0.25],
};
export const CHANNELS = ['web', 'paper', 'kiosk'] as const;
export const CHANNEL_SHARES = [0.5, 0.3, 0.2];
export const AGE_BANDS = ['16-29', '30-44', '45-64', '65+'] as const;
export const AGE_SHARES = [0.22, 0.28, 0.3, 0.2];
export const WAVES = ['2025', '2026'] as const;
export const WAVE_SHARES = [0.5, 0.5];

/** Survey weight factors (invented post-stratification): age band × channel × log-normal noise. */
export const AGE_WEIGHT: Readonly<Record<string, number>> = { '16-29': 1.4, '30-44': 1.0, '45-64': 0.85, '65+': 0.9 };
export const CHANNEL_WEIGHT: Readonly<Record<string, number>> = { web: 0.9, paper: 1.2, kiosk: 1.0 };
export const WEIGHT_NOISE_SD = 0.2;

/**
 * Baseline Dirichlet parameters per theme (THEME_IDS order). Their sum (≈0.9) is below 1 so most
 * answers are about one or two themes, as short survey answers are.
 */
export const BASE_ALPHA = [0.12, 0.1, 0.1, 0.11, 0.14, 0.12, 0.1, 0.1];

/** Planted covariate effects: α_k is multiplied by `multiplier` for answers at the level. */
export const PLANTED: readonly Omit<PlantedEffect, 'lambda'>[] = [
  { covariate: 'branch_region', level: 'Ostrevale', theme: 'access', multiplier: 5 },
  { covariate: 'channel', level: 'web', theme: 'digital', multiplier: 3 },
  { covariate: 'age_band', level: '16-29', theme: 'quiet', multiplier: 4 },
  { covariate: 'age_band', level: '30-44', theme: 'children', multiplier: 4 },
  { covariate: 'wave', level: '2026', theme: 'hours', multiplier: 4 },
];

/** Noise and structure rates (invented, chosen to be visible in a 4,000-answer study). */
export const RATES = {
  nonAnswer: 0.045,
  translation: 0.1,
  mixed: 0.015,
  long: 0.012,
  emoji: 0.05,
  declaredMismatch: 0.03,
  typoAnswer: 0.3,
  typoWord: 0.05,
  noAccents: 0.1,
  lowerCase: 0.06,
};
/** Sentences per ordinary answer: 1, 2, 3 or 4 with these probabilities. */
export const SENTENCE_COUNTS = [0.42, 0.36, 0.16, 0.06];

export const EMOJI = ['🙂', '📚', '👍', '🙏', '😊', '❤️', '😩', '⏰', '🚌', '☕', '👶', '💻', '🤫', '😡', '✨'];
/** Non-answers from which no language can be told. */
export const NEUTRAL_NON_ANSWERS = ['-', '--', '...', '?', '.', 'x', 'ok', 'OK', 'n/a', 'N/A', '👍', '🤷'];

export function languageIndex(language: DemoLanguage): number {
  return DEMO_LANGUAGES.indexOf(language);
}
