// Default settings of the text pipeline (docs/design.md §5). Every value is common practice for short
// survey answers, not taken from a paper; each is a setting the researcher can change.
import type { PipelineSettings } from '../types.js';

export function defaultPipelineSettings(): PipelineSettings {
  return {
    stemming: true,
    foldDiacritics: false,
    // A stem seen once cannot link documents: it only adds noise to a topic (common practice).
    minCount: 2,
    // A stem in more than half of a language's answers is usually the question's own wording.
    maxDocShare: 0.5,
    // Collocations are optional (docs/design.md §5): off until the researcher asks for them.
    collocationNpmi: null,
    collocationMinCount: 5,
    extraStopWords: {},
    minTokens: 1,
  };
}
