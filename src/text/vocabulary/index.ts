// Public surface of the vocabulary step.
export { prepareText } from './prepare.js';
export type { ExclusionReason } from './prepare.js';
export { defaultPipelineSettings } from './settings.js';
export { createEncoder } from './encode.js';
export type { EncodedText } from './encode.js';
export { findCollocations, joinCollocations, GAP } from './collocations.js';
export { foldSpelling, sharedSpellings } from './shared-spellings.js';
export type { SharedSpelling, SharedSpellingOptions } from './shared-spellings.js';
