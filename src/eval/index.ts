// Public surface of src/eval: held-out perplexity, coherence, cross-language alignment,
// stability and the K comparison (docs/design.md §6). Pure functions over typed arrays.
export { topicWordDistributions, topWords, type TopicWordCounts } from './topic-words.js';
export {
  splitDocument,
  documentCompletionPerplexity,
  type SplitMode,
  type DocumentSplit,
  type HeldOutCorpus,
  type ObservedDocument,
  type FoldInFunction,
  type PerplexityResult,
} from './perplexity.js';
export {
  themeCoherence,
  coherenceByLanguage,
  buildCooccurrenceIndex,
  npmiFromCounts,
  type CoherenceCorpus,
  type ThemeCoherence,
  type CooccurrenceIndex,
} from './coherence.js';
export { jensenShannon } from './divergence.js';
export { crossLanguageAlignment, chanceReciprocalRank, type AlignmentInput, type AlignmentPair, type AlignmentResult } from './alignment.js';
export { hungarian, assignRectangular, type Assignment } from './hungarian.js';
export { themeCosineMatrix, matchThemes, stabilityAcrossRuns, type RunThemes, type ThemeMatching, type StabilityResult } from './stability.js';
export { buildKComparison, meanCoherence, type KRunSummary, type KComparisonRow } from './k-comparison.js';
export { relevance, relevantWords, suggestThemeLabels, type LabelSuggestion, type LabelSuggestionInput } from './label-suggestion.js';
export {
  themeAlignment,
  wilsonLower,
  wordThemeMixture,
  type AlignmentStatus,
  type LanguagePairAgreement,
  type MatchedPair,
  type ThemeAlignmentCell,
  type ThemeAlignmentResult,
} from './theme-alignment.js';
export { heldOutGroups } from './held-out-split.js';
