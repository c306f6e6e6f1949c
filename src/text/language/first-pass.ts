// The first two steps of language identification for one text (docs/design.md §5): the script narrows
// the candidates among the study's languages (often to one), then franc's trigram profile picks
// among what is left.
import { removeInvisibles } from '../tokens/invisible.js';
import { LANGUAGES, type Script } from './languages.js';
import { isNeutralText } from './neutral.js';
import { countScripts } from './scripts.js';
import { trigramGuess } from './trigram.js';

/** Fewer letters than this: no evidence at all (common practice). */
const MIN_LETTERS = 2;
/** A trigram decision counts as confident, and is learned from, with this much text (common practice). */
export const CONFIDENT_LETTERS = 40;
/** …and this margin over the runner-up language (common practice). */
const CONFIDENT_MARGIN = 0.02;

export interface FirstPass {
  /** Letters in the text. */
  readonly letters: number;
  /** The script and trigram choice, or null when there is no evidence. */
  readonly language: string | null;
  readonly confidence: number;
  /** Sure enough to learn from. */
  readonly confident: boolean;
  /** The study's languages written in the text's majority script. */
  readonly candidates: string[];
  /** Trigram detection was skipped (short text, asked to defer): `language` is not decided yet. */
  readonly deferred?: boolean;
}

const NONE: FirstPass = { letters: 0, language: null, confidence: 0, confident: false, candidates: [] };

/**
 * When to skip the trigram step (the costliest part of the first pass) and leave the choice to
 * the study model, running it later only if that model cannot decide: 'never', for 'short'
 * texts (too short to be confident anyway), or 'always'.
 */
export type TrigramDeferral = 'never' | 'short' | 'always';

/** Script, then trigrams, for one text; `study` holds table keys (see languageKey). */
export function firstPass(text: string, study: readonly string[], defer: TrigramDeferral = 'never'): FirstPass {
  if (study.length === 0) return NONE;
  // Soft hyphens, byte-order marks and bidi controls inside words would break trigrams.
  const normal = removeInvisibles(text.normalize('NFKC'));
  const { counts, letters } = countScripts(normal);
  if (letters < MIN_LETTERS) return NONE;
  // Emoticons, single letters, "ok", "haha": letters, but no evidence of any language.
  if (isNeutralText(normal)) return NONE;
  const script = majorityScript(counts);
  if (script === undefined) return NONE;
  const candidates = candidatesFor(script, counts, study);
  if (candidates.length === 0) return { ...NONE, letters };
  // Mixed-script answers: the majority script's share bounds the confidence.
  const share = (counts[script] ?? 0) / letters;
  if (candidates.length === 1) return { letters, language: candidates[0], confidence: round(share), confident: true, candidates };
  if (script !== 'Han' && (defer === 'always' || (defer === 'short' && letters < CONFIDENT_LETTERS))) {
    return { letters, language: null, confidence: 0, confident: false, candidates, deferred: true };
  }
  const guess = trigramGuess(normal, candidates);
  // Han without any Kana is Chinese writing far more often than Japanese written in kanji only.
  if (guess === undefined && script === 'Han' && candidates.includes('zh')) {
    return { letters, language: 'zh', confidence: round(0.9 * share), confident: true, candidates };
  }
  if (guess === undefined) return { letters, language: candidates[0], confidence: round(1 / candidates.length), confident: false, candidates };
  const confident = letters >= CONFIDENT_LETTERS && guess.margin >= CONFIDENT_MARGIN;
  // Grows with the margin and the amount of text (common practice, not calibrated).
  const confidence = Math.min(0.99, 0.5 + guess.margin * 5 * Math.min(1, letters / CONFIDENT_LETTERS));
  return { letters, language: guess.language, confidence: round(confidence * share), confident, candidates };
}

function majorityScript(counts: Partial<Record<Script, number>>): Script | undefined {
  let best: Script | undefined;
  let bestCount = 0;
  for (const [script, count] of Object.entries(counts) as [Script, number][]) {
    if (count > bestCount) {
      best = script;
      bestCount = count;
    }
  }
  // Japanese mixes Kana with Han: Kana beside a Han majority marks Japanese writing.
  if (best === 'Han' && (counts.Kana ?? 0) > 0) return 'Kana';
  return best;
}

function candidatesFor(script: Script, counts: Partial<Record<Script, number>>, study: readonly string[]): string[] {
  const out = study.filter((language) => LANGUAGES[language]?.script === script);
  if (out.length === 0 && script === 'Kana' && study.includes('zh') && (counts.Han ?? 0) > 0) return ['zh'];
  // Han alone may be Japanese written in kanji only.
  if (script === 'Han' && study.includes('ja')) out.push('ja');
  return out;
}

export function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}
