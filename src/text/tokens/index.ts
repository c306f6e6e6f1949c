// Public surface of the token step: tokens, stop words, non-answers, stemming.
export { tokenize, scanTokens } from './tokenize.js';
export type { TokenSink } from './tokenize.js';
export type { Token, TokenKind, TokenizeOptions } from './token.js';
export { composeText, lowerCase, normalizeText } from './normalize.js';
export { stopWordSet } from './stop-words.js';
export { openStopWords } from './stop-word-lists.js';
export { isNonAnswer, MAX_SHORT_WORDS } from './non-answer.js';
export { SURVEY_LEXICONS, surveyLexicon } from './lexicons.js';
export type { SurveyLexicon } from './lexicons.js';
export { foldDiacritics, stemmerFor, stemmerName } from './stemmer.js';
export type { StemOptions } from './stemmer.js';
