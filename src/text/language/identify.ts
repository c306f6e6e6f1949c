// Language identification for a study (DESIGN §5): script first, then trigram detection
// restricted to the study's languages (first-pass.ts), then a study-adaptive pass: a naive Bayes
// model learned from the study's own confident documents (adaptive.ts) re-decides the short and
// uncertain ones, and overrules the trigram profile where the study's usage is clearly against it.
// A declared language wins unless the caller asks for the text to decide.
import type { LanguageDecision } from '../types.js';
import { openStopWords } from '../tokens/stop-word-lists.js';
import { AdaptiveLanguageModel } from './adaptive.js';
import { firstPass, round, type FirstPass } from './first-pass.js';
import { languageKey } from './languages.js';

export interface IdentifyOptions {
  /** The study's languages, in any common tag spelling (`en`, `eng`, `en-GB`). */
  languages: string[];
  /** Declared language per text (from a language column), if any. */
  declared?: (string | undefined)[];
  /** Default true: a declared language wins. False: the text decides where it disagrees. */
  trustDeclared?: boolean;
  /**
   * Which documents the adaptive pass may learn from (default: all). Lets a caller hold
   * documents out, e.g. to measure accuracy on texts the model has never seen.
   */
  learnFrom?: boolean[];
  /**
   * Trigram detection runs on an even sample of at most this many documents (default 20,000);
   * the study model trained on them decides the rest. Keeps large imports fast.
   */
  maxTrigramDocuments?: number;
}

/** Trigram detection runs on at most about this many documents of a study (common practice). */
const MAX_TRIGRAM_DOCUMENTS = 20_000;
/** Weak labels (studies of short answers only) come from texts with at least this many letters (common practice). */
const WEAK_LABEL_LETTERS = 12;
/** Below this posterior the adaptive pass leaves a text undetermined (common practice). */
const MIN_POSTERIOR = 0.3;
/** The study model relabels a document only when this sure (common practice). */
const RELABEL_POSTERIOR = 0.9;
/** Pseudo-count of each open stop-word list entry in the adaptive model (common practice). */
const SEED_WEIGHT = 1;
/** Rounds of self-training (common practice; the UDHR check converges in two). */
const SELF_TRAINING_ROUNDS = 3;
/** Without a study model, a trigram guess on fewer letters than this is no decision (common practice). */
const MIN_LETTERS_ALONE = 8;
/** The model must have learned this many words of two candidates to speak (common practice). */
const MIN_LEARNED_WORDS = 50;

/** Decide the language of every text of a study. */
export function identifyLanguages(texts: string[], options: IdentifyOptions): LanguageDecision[] {
  const study = [...new Set(options.languages.map(languageKey))];
  const trustDeclared = options.trustDeclared !== false;
  const declared = texts.map((_, i) => {
    const tag = options.declared?.[i];
    return tag === undefined || tag.trim() === '' ? undefined : languageKey(tag);
  });
  const learnable = (i: number): boolean => options.learnFrom === undefined || options.learnFrom[i] === true;
  // Large studies: trigram detection on an even sample of documents trains the study model,
  // which then decides the rest (their source is 'adapted').
  const stride = Math.max(1, Math.ceil(texts.length / Math.max(1, options.maxTrigramDocuments ?? MAX_TRIGRAM_DOCUMENTS)));
  const first = texts.map((text, i) => firstPass(text, study, i % stride === 0 ? 'short' : 'always'));

  // Learn the study's own usage from what is already certain: trusted declarations and confident
  // detections, on top of the open stop-word lists as prior knowledge.
  const model = new AdaptiveLanguageModel(study);
  for (const language of study) model.seed(language, openStopWords(language), SEED_WEIGHT);
  // Only texts with a choice to make between languages need the model's view of them.
  const empty = new Int32Array(0);
  const encoded = texts.map((text, i) => (first[i].candidates.length >= 2 ? model.encode(text) : empty));
  const learned: (string | undefined)[] = new Array(texts.length).fill(undefined);
  const fixed = texts.map((_, i) => trustDeclared && declared[i] !== undefined && learnable(i));
  const mix = new Map<string, number>();
  for (let i = 0; i < texts.length; i++) {
    const label = fixed[i] ? declared[i] : first[i].confident ? (first[i].language ?? undefined) : undefined;
    if (label === undefined || !learnable(i)) continue;
    // The prior is the study's language mix as the sure documents show it.
    mix.set(label, (mix.get(label) ?? 0) + 1);
    if (first[i].candidates.length >= 2) model.learn(encoded[i], label);
    learned[i] = label;
  }
  // A study of short answers only has no confident document to learn from: start instead from
  // the trigram guesses on its longer short answers (weak labels that self-training revises).
  if (study.filter((language) => model.wordsLearned(language) >= MIN_LEARNED_WORDS).length < 2) {
    for (let i = 0; i < texts.length; i++) {
      if (learned[i] !== undefined || fixed[i] || !learnable(i) || first[i].candidates.length < 2 || first[i].letters < WEAK_LABEL_LETTERS) continue;
      const guess = first[i].deferred === true ? firstPass(texts[i], study) : first[i];
      if (guess.language === null) continue;
      model.learn(encoded[i], guess.language);
      learned[i] = guess.language;
      mix.set(guess.language, (mix.get(guess.language) ?? 0) + 1);
    }
  }
  model.setLanguageMix(mix);

  // Self-training with hard labels (Nigam, McCallum, Thrun & Mitchell 2000, "Text classification
  // from labeled and unlabeled documents using EM", Machine Learning 39): judge every learnable
  // document by all the others (leave-one-out) and (re)label it where the study model is sure.
  // Trigram profiles err between close languages (Spanish/Portuguese); the study's words less so.
  // The last round's judgement of each document, reused for its final decision once the
  // rounds have converged (the model has then moved by under a thousandth of its documents).
  let lastJudged: ({ language: string; probability: number } | undefined)[] | undefined;
  for (let round = 0; round < SELF_TRAINING_ROUNDS; round++) {
    const changes: [number, string | undefined, string][] = [];
    const judged: ({ language: string; probability: number } | undefined)[] = new Array(texts.length).fill(undefined);
    for (let i = 0; i < texts.length; i++) {
      if (fixed[i] || !learnable(i) || first[i].candidates.length < 2) continue;
      const best = judge(encoded[i], first[i].candidates, learned[i], model)?.[0];
      judged[i] = best;
      if (best !== undefined && best.language !== learned[i] && best.probability >= RELABEL_POSTERIOR) {
        changes.push([i, learned[i], best.language]);
      }
    }
    for (const [i, from, to] of changes) {
      if (from !== undefined) model.forget(encoded[i], from);
      model.learn(encoded[i], to);
      learned[i] = to;
    }
    // Converged: fewer than one document in a thousand still moving (common practice).
    if (changes.length * 1000 < texts.length) {
      lastJudged = judged;
      for (const [i] of changes) lastJudged[i] = undefined;
      break;
    }
  }

  return texts.map((text, i): LanguageDecision => {
    const d = declared[i];
    if (d !== undefined && trustDeclared) return { language: d, source: 'declared', confidence: 1 };
    const known = lastJudged?.[i];
    const decided = decide(text, study, encoded[i], first[i], learned[i], model, known);
    // Text with no evidence keeps its declared language, even when asked to review.
    if (decided.language === null && d !== undefined) return { language: d, source: 'declared', confidence: 1 };
    return decided;
  });
}

export interface LanguageDisagreement {
  /** Index of the text in the input. */
  readonly index: number;
  readonly declared: string;
  /** The language the text is written in, by the text alone. */
  readonly written: string;
  readonly confidence: number;
}

/** Documents whose declared language differs from the one the text is written in. */
export function languageDisagreements(
  texts: string[],
  options: Omit<IdentifyOptions, 'trustDeclared'> & { declared: (string | undefined)[] },
): LanguageDisagreement[] {
  const decisions = identifyLanguages(texts, { ...options, trustDeclared: false });
  const out: LanguageDisagreement[] = [];
  decisions.forEach((decision, index) => {
    const tag = options.declared[index];
    if (tag === undefined || tag.trim() === '' || decision.source === 'declared' || decision.language === null) return;
    const declared = languageKey(tag);
    if (declared !== decision.language) out.push({ index, declared, written: decision.language, confidence: decision.confidence });
  });
  return out;
}

function decide(
  text: string,
  study: readonly string[],
  doc: Int32Array,
  pass: FirstPass,
  label: string | undefined,
  model: AdaptiveLanguageModel,
  judged?: { language: string; probability: number },
): LanguageDecision {
  if (pass.candidates.length === 0) return { language: null, source: 'undetermined', confidence: 0 };
  if (pass.candidates.length === 1) return { language: pass.candidates[0], source: 'detected', confidence: pass.confidence };
  const best = judged ?? judge(doc, pass.candidates, label, model)?.[0];
  if (best === undefined) {
    // No study model to ask: the trigram step (skipped for short texts) decides alone.
    const first = pass.deferred === true ? firstPass(text, study) : pass;
    if (first.language === null || (!first.confident && first.letters < MIN_LETTERS_ALONE)) {
      return { language: null, source: 'undetermined', confidence: 0 };
    }
    return { language: first.language, source: 'detected', confidence: first.confidence };
  }
  if (best.language === pass.language && pass.confident) {
    return { language: pass.language, source: 'detected', confidence: round(Math.max(pass.confidence, best.probability)) };
  }
  if (best.probability < MIN_POSTERIOR) return { language: null, source: 'undetermined', confidence: round(best.probability) };
  return { language: best.language, source: 'adapted', confidence: round(best.probability) };
}

/**
 * The study model's posterior for a document, leaving the document's own contribution out;
 * undefined while the model has learned too little about at least two of the candidates.
 */
function judge(doc: Int32Array, candidates: string[], label: string | undefined, model: AdaptiveLanguageModel) {
  let trained = 0;
  for (const c of candidates) if (model.wordsLearned(c) - (c === label ? doc.length : 0) >= MIN_LEARNED_WORDS) trained++;
  if (trained < 2) return undefined;
  return model.posterior(doc, candidates, label);
}
