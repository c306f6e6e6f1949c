// Encoding new text with an existing vocabulary (for Apply and held-out fold-in, docs/design.md §4):
// the same tokens, stop words and stems as prepareText, adjacent pairs joined where the
// vocabulary has their collocation, unknown stems skipped and counted.
import { languageKey } from '../language/languages.js';
import { stemmerFor } from '../tokens/stemmer.js';
import { stopWordSet } from '../tokens/stop-words.js';
import { scanTokens } from '../tokens/tokenize.js';
import type { LanguageVocabulary, PipelineSettings } from '../types.js';

export interface EncodedText {
  readonly tokens: Int32Array;
  /** Words (after stop words) whose stem is not in the vocabulary. */
  readonly unknown: number;
}

/** An encoder for one language's vocabulary, prepared with the same settings as the study. */
export function createEncoder(vocabulary: LanguageVocabulary, settings: PipelineSettings): (text: string) => EncodedText {
  const language = languageKey(vocabulary.language);
  const ids = new Map<string, number>();
  vocabulary.stems.forEach((stem, id) => ids.set(stem, id));
  const stop = stopWordSet(language, settings.extraStopWords);
  const stem = stemmerFor(language, settings);
  const joins = settings.collocationNpmi !== null && vocabulary.stems.some((s) => s.includes('_'));
  return (text: string): EncodedText => {
    const stems: (string | null)[] = [];
    scanTokens(text, language, (kind, _surface, normal) => {
      if (kind !== 'word' || stop.has(normal)) {
        if (stems.length > 0 && stems[stems.length - 1] !== null) stems.push(null);
      } else stems.push(stem(normal));
    });
    const out: number[] = [];
    let unknown = 0;
    for (let i = 0; i < stems.length; i++) {
      const s = stems[i];
      if (s === null) continue;
      const next = stems[i + 1];
      if (joins && next !== undefined && next !== null) {
        const pair = ids.get(`${s}_${next}`);
        if (pair !== undefined) {
          out.push(pair);
          i++;
          continue;
        }
      }
      const id = ids.get(s);
      if (id === undefined) unknown++;
      else out.push(id);
    }
    return { tokens: Int32Array.from(out), unknown };
  };
}
