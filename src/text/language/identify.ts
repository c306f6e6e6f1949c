// Language identification for a study (docs/design.md §5): script first, then trigram detection
// restricted to the study's languages (first-pass.ts), then a study-adaptive pass: a naive Bayes
// model learned from the study's own confident documents (adaptive.ts) re-decides the short and
// uncertain ones, and overrules the trigram profile where the study's usage is clearly against it.
// A declared language is trusted, taken as a prior (declared-prior.ts), or only kept where the
// text cannot tell, as the caller asks. Answers written in two languages go by their majority
// language and say so (mixed.ts).
import type { LanguageDecision } from '../types.js';
import { openStopWords } from '../tokens/stop-word-lists.js';
import { AdaptiveLanguageModel } from './adaptive.js';
import { decideByText, decideWithDeclared, judge, MIN_LEARNED_WORDS, textEvidence, type Ranked, type TextCase } from './decide.js';
import { declaredPrior } from './declared-prior.js';
import { firstPass, round } from './first-pass.js';
import { languageKey } from './languages.js';
import { mixedLanguages } from './mixed.js';

export interface IdentifyOptions {
  /** The study's languages, in any common tag spelling (`en`, `eng`, `en-GB`). */
  languages: string[];
  /** Declared language per text (from a language column), if any. */
  declared?: (string | undefined)[];
  /** Default true: a declared language wins. False: the text decides where it disagrees. */
  trustDeclared?: boolean;
  /**
   * A declared language as a prior with this mass (0 < m < 1; DECLARED_PRIOR is the usual
   * choice) instead of trusting it: confident detection wins, too little evidence keeps it.
   * Takes precedence over trustDeclared.
   */
  declaredPrior?: number;
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
/** The study model relabels a document only when this sure (common practice). */
const RELABEL_POSTERIOR = 0.9;
/** Pseudo-count of each open stop-word list entry in the adaptive model (common practice). */
const SEED_WEIGHT = 1;
/** Rounds of self-training (common practice; the UDHR check converges in two). */
const SELF_TRAINING_ROUNDS = 3;

/** Decide the language of every text of a study. */
export function identifyLanguages(texts: string[], options: IdentifyOptions): LanguageDecision[] {
  const study = [...new Set(options.languages.map(languageKey))];
  const mass = options.declaredPrior;
  if (mass !== undefined && !(mass > 0 && mass < 1)) throw new RangeError(`declaredPrior must lie strictly between 0 and 1, not ${mass}`);
  const trustDeclared = mass === undefined && options.trustDeclared !== false;
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
  // detections, on top of the open stop-word lists as prior knowledge. With declarations as a
  // prior, a declared answer the trigram step is not sure of starts under its declared language;
  // self-training below moves it if its text says otherwise.
  const model = new AdaptiveLanguageModel(study);
  for (const language of study) model.seed(language, openStopWords(language), SEED_WEIGHT);
  // Only texts with a choice to make between languages need the model's view of them.
  const empty = new Int32Array(0);
  const encoded = texts.map((text, i) => (first[i].candidates.length >= 2 ? model.encode(text) : empty));
  const learned: (string | undefined)[] = new Array(texts.length).fill(undefined);
  const fixed = texts.map((_, i) => trustDeclared && declared[i] !== undefined && learnable(i));
  const priorOf = (i: number): number[] | undefined => {
    const d = declared[i];
    return mass === undefined || d === undefined ? undefined : declaredPrior(first[i].candidates, d, mass);
  };
  const mix = new Map<string, number>();
  for (let i = 0; i < texts.length; i++) {
    const d = declared[i];
    const fromDeclared = mass !== undefined && d !== undefined && first[i].candidates.includes(d) ? d : undefined;
    const label = fixed[i] ? d : first[i].confident ? (first[i].language ?? undefined) : fromDeclared;
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
  const caseOf = (i: number, evidence?: Ranked): TextCase => ({ text: texts[i], doc: encoded[i], pass: first[i], label: learned[i], evidence });

  // Self-training with hard labels (Nigam, McCallum, Thrun & Mitchell 2000, "Text classification
  // from labeled and unlabeled documents using EM", Machine Learning 39): judge every learnable
  // document by all the others (leave-one-out) and (re)label it where the study model is sure.
  // Trigram profiles err between close languages (Spanish/Portuguese); the study's words less so.
  // A declared answer is judged with its declaration as prior. The last round's evidence of
  // each document, reused for its final decision once the rounds have converged (the model
  // has then moved by under a thousandth of its documents).
  let lastJudged: (Ranked | undefined)[] | undefined;
  for (let pass = 0; pass < SELF_TRAINING_ROUNDS; pass++) {
    const changes: [number, string | undefined, string][] = [];
    const judged: (Ranked | undefined)[] = new Array(texts.length).fill(undefined);
    for (let i = 0; i < texts.length; i++) {
      if (fixed[i] || !learnable(i) || first[i].candidates.length < 2) continue;
      const evidence = textEvidence(caseOf(i), model);
      judged[i] = evidence;
      const best = evidence === undefined ? undefined : judge(caseOf(i, evidence), model, priorOf(i))?.[0];
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

  const trained = (candidates: readonly string[]): boolean => candidates.filter((l) => model.wordsLearned(l) >= MIN_LEARNED_WORDS).length >= 2;
  return texts.map((text, i): LanguageDecision => {
    const d = declared[i];
    if (d !== undefined && trustDeclared) return { language: d, source: 'declared', confidence: 1 };
    const c = caseOf(i, lastJudged?.[i]);
    const byText = decideByText(study, c, model);
    let decided: LanguageDecision;
    if (mass !== undefined && d !== undefined) decided = decideWithDeclared(study, c, model, d, mass, byText);
    // Text with no evidence keeps its declared language, even when asked to review.
    else if (byText.language === null && d !== undefined) return { language: d, source: 'declared', confidence: 1 };
    else decided = byText;
    const mixed = mixedLanguages(text, study, model, learned[i], trained);
    if (mixed === undefined) return decided;
    return goByMajority(decided, mixed, d);
  });
}

/** A mixed answer goes by its majority language, and carries the other one. */
function goByMajority(decided: LanguageDecision, mixed: ReturnType<typeof mixedLanguages> & object, declared: string | undefined): LanguageDecision {
  const note = { language: mixed.minority, share: round(mixed.minorityShare) };
  if (decided.language === mixed.majority) return { ...decided, mixed: note };
  const out: LanguageDecision = { language: mixed.majority, source: 'detected', confidence: round(mixed.majorityShare), mixed: note };
  if (decided.declaredCheck === undefined || declared === undefined) return out;
  return { ...out, declaredCheck: declared === mixed.majority ? 'confirmed' : 'overruled', written: mixed.majority };
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
