export type { LanguagePhrases, ThemePhrases } from './phrase-types.js';
import type { DemoLanguage } from '../types.js';
import type { LanguagePhrases } from './phrase-types.js';
import { EN } from './en.js';
import { ES } from './es.js';
import { FR } from './fr.js';
import { DE } from './de.js';
import { JA } from './ja.js';

export const PHRASES: Readonly<Record<DemoLanguage, LanguagePhrases>> = { en: EN, es: ES, fr: FR, de: DE, ja: JA };
