// Public surface of the demo study: what other parts of Themata need, without file paths.
import type { ColumnMapping } from '../src/text/types.js';

export { generateDemo, demoItems, TruthSummary, DEFAULT_ANSWERS, DEFAULT_SEED, PER_ROW_TRUTH_LIMIT } from './generator.js';
export type { DemoOptions, DemoItem } from './generator.js';
export { demoCsv, DEMO_CSV_COLUMNS } from './csv.js';
export { demoXlsx } from './xlsx.js';
export { demoTruthJson } from './truth-json.js';
export { NETWORK_NAME, QUESTION, THEME_NAMES, REGIONS, CHANNELS, AGE_BANDS, WAVES } from './scenario.js';
export { DEMO_LANGUAGES, THEME_IDS } from './types.js';
export type { DemoLanguage, ThemeId, DemoRow, DemoTruth, RowTruth, PlantedEffect, ThemeTruth, EffectCheck, AnswerKind } from './types.js';

/** File names of the committed demo (in the demo/ folder). */
export const DEMO_FILE_NAMES = { csv: 'library-survey.csv', xlsx: 'library-survey.xlsx', truth: 'truth.json' } as const;

/** How to map the demo's columns on import. */
export const DEMO_COLUMNS: ColumnMapping = {
  id: 'answer_id',
  text: ['answer'],
  language: 'questionnaire_language',
  link: 'link_key',
  covariates: [
    { column: 'branch_region', type: 'categorical' },
    { column: 'channel', type: 'categorical' },
    { column: 'age_band', type: 'categorical' },
    { column: 'wave', type: 'categorical' },
  ],
  weight: 'weight',
};
