// The final decision for one text (identify.ts prepares the study model): by the text alone,
// or with its declared language as a prior (declared-prior.ts).
import type { LanguageDecision } from '../types.js';
import type { AdaptiveLanguageModel } from './adaptive.js';
import { combineGuess, declaredPrior } from './declared-prior.js';
import { firstPass, round, type FirstPass } from './first-pass.js';

/** Without a study model, a trigram guess on fewer letters than this is no decision (common practice). */
const MIN_LETTERS_ALONE = 8;
/** The model must have learned this many words of two candidates to speak (common practice). */
export const MIN_LEARNED_WORDS = 50;
/** Below this posterior the adaptive pass leaves a text undetermined (common practice). */
const MIN_POSTERIOR = 0.3;
/**
 * An answer of at most SHORT_WORDS words without a declared language is decided only when its
 * best language is at least this many times as probable as the runner-up: the bar of "positive
 * evidence" for Bayes factors in Kass & Raftery (1995), "Bayes Factors", JASA 90, applied to the
 * posterior odds. Below it the answer stays undetermined rather than forced into a language:
 * one or two words are where names, brands and loanwords spelled alike in several languages
 * ("Netflix", "pizza", "taxi") sit, and where a naive Bayes posterior is least to be trusted.
 */
export const MIN_ODDS = 3;
/** Answers of at most this many words need MIN_ODDS (common practice). */
const SHORT_WORDS = 2;

export type Ranked = { language: string; probability: number }[];

/** One text's context: its first pass, encoded words and current label in the study model. */
export interface TextCase {
  readonly text: string;
  readonly doc: Int32Array;
  readonly pass: FirstPass;
  readonly label: string | undefined;
  /** The text's evidence alone (posterior under a uniform prior), when already computed. */
  readonly evidence?: Ranked;
}

const UNDETERMINED: LanguageDecision = { language: null, source: 'undetermined', confidence: 0 };

/** The language of a text by the text alone (with the study's language mix as prior). */
export function decideByText(study: readonly string[], c: TextCase, model: AdaptiveLanguageModel): LanguageDecision {
  const { pass } = c;
  if (pass.candidates.length === 0) return UNDETERMINED;
  if (pass.candidates.length === 1) return { language: pass.candidates[0], source: 'detected', confidence: pass.confidence };
  const ranked = judge(c, model);
  if (ranked === undefined) {
    // No study model to ask: the trigram step (skipped for short texts) decides alone.
    const first = pass.deferred === true ? firstPass(c.text, study) : pass;
    if (first.language === null || (!first.confident && first.letters < MIN_LETTERS_ALONE)) return UNDETERMINED;
    return { language: first.language, source: 'detected', confidence: first.confidence };
  }
  const [best, second] = ranked;
  if (best.language === pass.language && pass.confident) {
    return { language: pass.language, source: 'detected', confidence: round(Math.max(pass.confidence, best.probability)) };
  }
  const short = c.doc.length <= SHORT_WORDS && c.text.trim().split(/\s+/u).length <= SHORT_WORDS;
  const tooLittle = short ? second !== undefined && best.probability < MIN_ODDS * second.probability : best.probability < MIN_POSTERIOR;
  if (tooLittle) return { language: null, source: 'undetermined', confidence: round(best.probability) };
  return { language: best.language, source: 'adapted', confidence: round(best.probability) };
}

/**
 * The language of a text with a declared language `declared` weighing as a prior of mass
 * `mass`; `byText` is the text-alone decision, reported as `written`.
 */
export function decideWithDeclared(
  study: readonly string[],
  c: TextCase,
  model: AdaptiveLanguageModel,
  declared: string,
  mass: number,
  byText: LanguageDecision,
): LanguageDecision {
  const { pass } = c;
  const written = byText.language;
  const kept: LanguageDecision = { language: declared, source: 'declared', confidence: round(mass), declaredCheck: 'kept', written };
  // No letters, or only neutral ones: the declaration stands.
  if (pass.candidates.length === 0) return kept;
  // The text is written in a script of other study languages than the declared one (a Japanese
  // answer declared French): the script is decisive evidence.
  if (!pass.candidates.includes(declared)) {
    return written === null ? kept : { ...byText, declaredCheck: 'overruled', written };
  }
  if (pass.candidates.length === 1) return { language: declared, source: 'declared', confidence: pass.confidence, declaredCheck: 'confirmed', written };
  const prior = declaredPrior(pass.candidates, declared, mass);
  let ranked = judge(c, model, prior);
  let source: LanguageDecision['source'] = 'adapted';
  if (ranked === undefined) {
    // No study model: a trigram guess counts against the declaration only when confident.
    const first = pass.deferred === true ? firstPass(c.text, study) : pass;
    if (first.language === null || (!first.confident && first.language !== declared)) return kept;
    ranked = combineGuess(pass.candidates, first.language, first.confidence, prior);
    source = 'detected';
  }
  const best = ranked[0];
  if (best.language === declared) {
    return { language: declared, source: 'declared', confidence: round(best.probability), declaredCheck: written === declared ? 'confirmed' : 'kept', written };
  }
  if (byText.language === best.language && byText.source !== 'undetermined') source = byText.source;
  return { language: best.language, source, confidence: round(best.probability), declaredCheck: 'overruled', written };
}

/**
 * The study model's posterior for a document under `prior` (default: the study's language
 * mix), leaving the document's own contribution out; undefined while the model has learned too
 * little about at least two of the candidates.
 */
export function judge(c: TextCase, model: AdaptiveLanguageModel, prior?: readonly number[]): Ranked | undefined {
  const evidence = c.evidence ?? textEvidence(c, model);
  if (evidence === undefined) return undefined;
  return reweight(evidence, c.pass.candidates, prior ?? model.mixPrior(c.pass.candidates));
}

/** The posterior under a uniform prior: the text's evidence alone, reweighted by any prior later. */
export function textEvidence(c: TextCase, model: AdaptiveLanguageModel): Ranked | undefined {
  let trained = 0;
  for (const l of c.pass.candidates) if (model.wordsLearned(l) - (l === c.label ? c.doc.length : 0) >= MIN_LEARNED_WORDS) trained++;
  if (trained < 2) return undefined;
  const n = c.pass.candidates.length;
  return model.posterior(c.doc, c.pass.candidates, c.label, c.pass.candidates.map(() => 1 / n));
}

/** Bayes' rule again: p(ℓ | text) under `prior` ∝ p(ℓ | text, uniform prior) · prior(ℓ). */
function reweight(evidence: Ranked, candidates: readonly string[], prior: readonly number[]): Ranked {
  const weight = new Map(candidates.map((l, j) => [l, prior[j]]));
  const scores = evidence.map((e) => e.probability * (weight.get(e.language) ?? 0));
  const sum = scores.reduce((s, x) => s + x, 0);
  if (!(sum > 0)) return evidence;
  return evidence.map((e, j) => ({ language: e.language, probability: scores[j] / sum })).sort((a, b) => b.probability - a.probability);
}
