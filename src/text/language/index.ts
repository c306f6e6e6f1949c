// Public surface of language identification.
export { identifyLanguages, languageDisagreements } from './identify.js';
export type { IdentifyOptions, LanguageDisagreement } from './identify.js';
export { DECLARED_PRIOR } from './declared-prior.js';
export { isNeutralText } from './neutral.js';
export { LANGUAGES, languageInfo, languageKey } from './languages.js';
export type { LanguageInfo, Script } from './languages.js';
export { countScripts } from './scripts.js';
