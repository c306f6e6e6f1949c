// Checks of a finished run (docs/design.md §6, issue 6): held-out document-completion perplexity,
// coherence per theme and language, cross-language alignment on held-out link groups, stability
// against other runs of the study with the same K, and the fitted hyperparameters. The figures
// come from src/eval; this file only gathers the run's documents and mixtures for it.
// Per theme and language pair, alignment is also judged on matched pairs (issue 12): the
// members of held-out link groups, each folded in on its own, and the terms of glossary rows
// (whose documents are fitted, so that figure says how well the glossary held, not a test on
// unseen text). Glossary documents are kept out of coherence and of the held-out answers.
import { buildCorpus } from '../model/index.js';
import { Xoshiro128 } from '../model/index.js';
import {
  coherenceByLanguage,
  crossLanguageAlignment,
  documentCompletionPerplexity,
  meanCoherence,
  stabilityAcrossRuns,
  themeAlignment,
  wordThemeMixture,
  type AlignmentResult,
  type MatchedPair,
  type ThemeAlignmentResult,
  type PerplexityResult,
  type ThemeCoherence,
} from '../eval/index.js';
import { glossaryDocumentIds, listDocumentTokens, listRuns, loadVocabulary, type Store } from '../store/index.js';
import { alphaForCovariates, foldInDocuments, foldInGroup, DEFAULT_FOLD_IN } from './fold-in.js';
import { loadRunModel, type RunModel } from './run-model.js';

/** Bumped when the checks gain figures, so stored checks of an older version are computed again. */
export const CHECKS_VERSION = 2;

export interface RunChecks {
  readonly version?: number;
  readonly run: string;
  readonly K: number;
  readonly logLikelihoodPerToken: { first: number; last: number; sweeps: number };
  readonly perplexity: PerplexityResult | null;
  readonly coherence: { themes: (ThemeCoherence & { languageName: string; label: string })[]; meanNpmi: number; meanLogConditional: number };
  readonly alignment: AlignmentResult | null;
  /** Per theme and language pair: held-out translations, and glossary rows (null when there are none). */
  readonly themeAlignment?: { heldOut: ThemeAlignmentResult | null; glossary: ThemeAlignmentResult | null };
  readonly stability: { runs: string[]; overall: number; perTheme: number[] } | null;
  readonly hyperparameters: { beta: Record<string, number>; alphaSum: { min: number; max: number }; features: string[] };
  readonly notes: string[];
}

interface MappedDoc {
  id: number;
  glossary: boolean;
  language: number;
  linkKey: string | null;
  covariates: Record<string, string | number | null>;
  tokens: Int32Array;
}

/** The study's included answers with tokens mapped to the run's vocabulary (by stem). */
function runDocuments(store: Store, model: RunModel): MappedDoc[] {
  const runIds = model.vocabularies.map((v) => new Map(v.stems.map((s, i) => [s, i])));
  // Per language, the study's word id → the run's (−1 when the run has no such word), or null
  // when the study's vocabulary is still the run's: then the stored tokens are used as they are,
  // without a lookup per word (seconds at a million answers).
  const mappings = new Map<string, Int32Array | null>();
  const mappingOf = (language: string, l: number): Int32Array | null => {
    if (mappings.has(language)) return mappings.get(language)!;
    const stems = loadVocabulary(store, model.run.studyId, language).stems;
    const runStems = model.vocabularies[l].stems;
    const same = stems.length === runStems.length && stems.every((s, i) => s === runStems[i]);
    const mapping = same ? null : Int32Array.from(stems, (s) => runIds[l].get(s) ?? -1);
    mappings.set(language, mapping);
    return mapping;
  };
  const out: MappedDoc[] = [];
  const glossary = glossaryDocumentIds(store, model.run.studyId);
  for (const d of listDocumentTokens(store, model.run.studyId)) {
    const l = model.languages.indexOf(d.language);
    if (l < 0) continue;
    const mapping = mappingOf(d.language, l);
    const tokens = mapping ? Int32Array.from(d.tokens, (w) => (w >= 0 && w < mapping.length ? mapping[w] : -1)) : d.tokens;
    out.push({ id: d.id, glossary: glossary.has(d.id), language: l, linkKey: d.linkKey, covariates: d.covariates, tokens });
  }
  return out;
}

export function runChecks(store: Store, model: RunModel): RunChecks {
  const { K } = model;
  const notes: string[] = [];
  const all = runDocuments(store, model);
  const docs = all.filter((d) => !d.glossary);
  const lambda = model.lambda ?? new Float64Array(K).fill(Math.log(0.1));
  const encoding = model.features.encoding;
  const rng = Xoshiro128.fromSeed(model.run.settings.seed, 31337);

  // Coherence over every answer the run knows (document co-occurrence, top 10 words).
  const known = docs.map((d) => d.tokens.filter((w) => w >= 0));
  const offsets = new Int32Array(docs.length + 1);
  known.forEach((t, i) => (offsets[i + 1] = offsets[i] + t.length));
  const words = new Int32Array(offsets[docs.length]);
  known.forEach((t, i) => words.set(t, offsets[i]));
  const coherenceRows = coherenceByLanguage({ docOffsets: offsets, words, docLanguage: Uint8Array.from(docs, (d) => d.language) }, model.phi, K, 10);
  const coherence = coherenceRows.map((r) => ({ ...r, languageName: model.languages[r.language], label: model.labels[r.theme] }));
  const mc = meanCoherence(coherenceRows);

  // Held-out answers: perplexity by document completion, alignment of linked partners.
  const heldSet = new Set(model.heldOutIds);
  const held = docs.filter((d) => heldSet.has(d.id));
  let perplexity: PerplexityResult | null = null;
  let alignment: AlignmentResult | null = null;
  let heldOutThemes: ThemeAlignmentResult | null = null;
  if (held.length === 0) notes.push('No answers were held out: fit with --holdout 0.1 to get perplexity and alignment.');
  else {
    const built = buildCorpus({
      languages: model.languages,
      vocabSizes: model.vocabularies.map((v) => v.stems.length),
      documents: held.map((d) => ({ language: d.language, tokens: d.tokens.map((w) => (w < 0 ? 0 : w)), linkKey: d.linkKey })),
    });
    // Unknown words were replaced by id 0 above only to build the arrays; mark them again.
    const c = built.corpus;
    for (let d = 0; d < c.docOffsets.length - 1; d++) {
      const src = held[built.docOrder[d]].tokens;
      c.words.set(src, c.docOffsets[d]);
    }
    const groups = Int32Array.from({ length: c.numGroups }, (_, g) => g);
    perplexity = documentCompletionPerplexity(c, groups, model.phi, K, (g, observed) =>
      foldInOut(model.phi, K, observed, alphaForCovariates(lambda, encoding, K, held[built.groupFirstInput[g]].covariates), rng),
    );
    const linked = held.filter((d) => d.linkKey !== null);
    const languagesPerKey = new Map<string, Set<number>>();
    for (const d of linked) (languagesPerKey.get(d.linkKey!) ?? languagesPerKey.set(d.linkKey!, new Set()).get(d.linkKey!)!).add(d.language);
    const pairs = linked.filter((d) => languagesPerKey.get(d.linkKey!)!.size >= 2);
    if (pairs.length >= 2) {
      const fold = foldInDocuments(model.phi, K, pairs.map((d) => ({ language: d.language, tokens: d.tokens, alpha: alphaForCovariates(lambda, encoding, K, d.covariates) })), { ...DEFAULT_FOLD_IN, seed: model.run.settings.seed });
      const keyIndex = new Map<string, number>();
      alignment = crossLanguageAlignment({
        K,
        mixtures: fold.theta,
        docLanguage: pairs.map((d) => d.language),
        docGroup: pairs.map((d) => keyIndex.get(d.linkKey!) ?? keyIndex.set(d.linkKey!, keyIndex.size).get(d.linkKey!)!),
        languages: model.languages,
      });
      heldOutThemes = themeAlignment(K, model.languages, partnerPairs(pairs, fold.theta, K));
    } else notes.push('No held-out linked answers in two languages: alignment needs translations among the held-out answers.');
  }

  const glossaryThemes = glossaryAlignment(all.filter((d) => d.glossary), model);

  // Stability: other finished runs of this study with the same K and vocabulary sizes.
  let stability: RunChecks['stability'] = null;
  const peers = listRuns(store, model.run.studyId)
    .filter((r) => r.id !== model.run.id && r.status === 'finished' && r.settings.themes === K)
    .map((r) => loadRunModel(store, r.id))
    .filter((m): m is RunModel => !!m && m.languages.join() === model.languages.join() && m.phi.every((p, l) => p.length === model.phi[l].length));
  if (peers.length > 0) {
    const res = stabilityAcrossRuns([model.phi, ...peers.map((p) => p.phi)], K);
    stability = { runs: peers.map((p) => p.run.name), overall: res.overall, perTheme: Array.from(res.perTheme) };
  } else notes.push(`Stability needs another finished run with ${K} themes and a different seed.`);

  const P = model.alpha.length / K;
  let min = Infinity;
  let max = -Infinity;
  for (let p = 0; p < P; p++) {
    let s = 0;
    for (let k = 0; k < K; k++) s += model.alpha[p * K + k];
    min = Math.min(min, s);
    max = Math.max(max, s);
  }
  const trace = model.diagnostics.trace;
  return {
    version: CHECKS_VERSION,
    run: model.run.name,
    K,
    logLikelihoodPerToken: { first: trace[0], last: trace[trace.length - 1], sweeps: trace.length },
    perplexity,
    coherence: { themes: coherence, meanNpmi: mc.npmi, meanLogConditional: mc.logConditional },
    alignment,
    themeAlignment: { heldOut: heldOutThemes, glossary: glossaryThemes },
    stability,
    hyperparameters: { beta: Object.fromEntries(model.languages.map((l, i) => [l, model.beta[i]])), alphaSum: { min, max }, features: model.features.names },
    notes,
  };
}

function foldInOut(phi: readonly Float64Array[], K: number, observed: readonly { language: number; words: Int32Array }[], alpha: Float64Array, rng: Xoshiro128): Float64Array {
  const out = new Float64Array(K);
  foldInGroup(phi, K, observed.map((o) => ({ language: o.language, tokens: o.words })), alpha, DEFAULT_FOLD_IN, rng, out);
  return out;
}

/** Every two members of one held-out link group in different languages, with their own mixtures. */
function partnerPairs(docs: readonly MappedDoc[], theta: Float64Array, K: number): MatchedPair[] {
  const byKey = new Map<string, number[]>();
  docs.forEach((d, i) => (byKey.get(d.linkKey!) ?? byKey.set(d.linkKey!, []).get(d.linkKey!)!).push(i));
  const out: MatchedPair[] = [];
  for (const members of byKey.values()) {
    for (let x = 0; x < members.length; x++) {
      for (let y = x + 1; y < members.length; y++) {
        const a = members[x];
        const b = members[y];
        if (docs[a].language === docs[b].language) continue;
        out.push({ languageA: docs[a].language, languageB: docs[b].language, mixtureA: theta.subarray(a * K, (a + 1) * K), mixtureB: theta.subarray(b * K, (b + 1) * K) });
      }
    }
  }
  return out;
}

/**
 * Glossary rows: the terms of one row in two languages, each read as p(theme | its words) with
 * the themes' overall weights; null when the study has no glossary rows with known words.
 */
function glossaryAlignment(docs: readonly MappedDoc[], model: RunModel): ThemeAlignmentResult | null {
  const { K } = model;
  if (docs.length === 0) return null;
  const weights = new Float64Array(K);
  for (let g = 0; g < model.thetaGroups.length / K; g++) for (let k = 0; k < K; k++) weights[k] += model.thetaGroups[g * K + k];
  const rows = new Map<string, { language: number; mixture: Float64Array }[]>();
  for (const d of docs) {
    if (d.linkKey === null) continue;
    const mixture = wordThemeMixture(model.phi[d.language], K, d.tokens, weights);
    if (mixture) (rows.get(d.linkKey) ?? rows.set(d.linkKey, []).get(d.linkKey)!).push({ language: d.language, mixture });
  }
  const pairs: MatchedPair[] = [];
  for (const terms of rows.values()) {
    for (let x = 0; x < terms.length; x++) {
      for (let y = x + 1; y < terms.length; y++) {
        if (terms[x].language !== terms[y].language) pairs.push({ languageA: terms[x].language, languageB: terms[y].language, mixtureA: terms[x].mixture, mixtureB: terms[y].mixture });
      }
    }
  }
  return pairs.length > 0 ? themeAlignment(K, model.languages, pairs) : null;
}
