// Trigram detection with franc 6.2.0 (rank-order trigram profiles after Cavnar & Trenkle 1994,
// "N-gram-based text categorization", SDAIR), restricted to the study's candidate languages.
import { francAll } from 'franc';
import { LANGUAGES } from './languages.js';

/** Characters given to franc: enough for a confident profile, bounded cost (common practice). */
const MAX_SAMPLE = 400;

export interface TrigramGuess {
  readonly language: string;
  /** 1 − the runner-up's normalised score: 0 when two languages tie, larger when one stands out. */
  readonly margin: number;
}

/** Best candidate by trigram profile, or undefined when franc cannot say (no letters, no model). */
export function trigramGuess(text: string, candidates: readonly string[]): TrigramGuess | undefined {
  const byCode = new Map<string, string>();
  for (const language of candidates) {
    const code = LANGUAGES[language]?.franc;
    if (code !== undefined) byCode.set(code, language);
  }
  if (byCode.size === 0) return undefined;
  if (byCode.size === 1) {
    const [only] = byCode.values();
    return { language: only, margin: 1 };
  }
  const ranked = francAll(text.length > MAX_SAMPLE ? text.slice(0, MAX_SAMPLE) : text, { only: [...byCode.keys()], minLength: 1 });
  const top = ranked[0];
  if (top === undefined || top[0] === 'und') return undefined;
  const language = byCode.get(top[0]);
  if (language === undefined) return undefined;
  const runnerUp = ranked[1]?.[1] ?? 0;
  return { language, margin: Math.max(0, top[1] - runnerUp) };
}

