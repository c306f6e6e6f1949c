// Checks of a finished run (DESIGN §6, issue 6): held-out document-completion perplexity,
// coherence per theme and language, cross-language alignment on held-out link groups, stability
// against other runs of the study with the same K, and the fitted hyperparameters. The figures
// come from src/eval; this file only gathers the run's documents and mixtures for it.
import { buildCorpus } from '../model/corpus.js';
import { Xoshiro128 } from '../model/rng.js';
import {
  coherenceByLanguage,
  crossLanguageAlignment,
  documentCompletionPerplexity,
  meanCoherence,
  stabilityAcrossRuns,
  type AlignmentResult,
  type PerplexityResult,
  type ThemeCoherence,
} from '../eval/index.js';
import { listDocumentTokens, listRuns, loadVocabulary, type Store } from '../store/index.js';
import { alphaForCovariates, foldInDocuments, foldInGroup, DEFAULT_FOLD_IN } from './fold-in.js';
import { loadRunModel, type RunModel } from './run-model.js';

export interface RunChecks {
  readonly run: string;
  readonly K: number;
  readonly logLikelihoodPerToken: { first: number; last: number; sweeps: number };
  readonly perplexity: PerplexityResult | null;
  readonly coherence: { themes: (ThemeCoherence & { languageName: string; label: string })[]; meanNpmi: number; meanLogConditional: number };
  readonly alignment: AlignmentResult | null;
  readonly stability: { runs: string[]; overall: number; perTheme: number[] } | null;
  readonly hyperparameters: { beta: Record<string, number>; alphaSum: { min: number; max: number }; features: string[] };
  readonly notes: string[];
}

interface MappedDoc {
  id: number;
  language: number;
  linkKey: string | null;
  covariates: Record<string, string | number | null>;
  tokens: Int32Array;
}

/** The study's included answers with tokens mapped to the run's vocabulary (by stem). */
function runDocuments(store: Store, model: RunModel): MappedDoc[] {
  const runIds = model.vocabularies.map((v) => new Map(v.stems.map((s, i) => [s, i])));
  const current = new Map<string, string[]>();
  const out: MappedDoc[] = [];
  for (const d of listDocumentTokens(store, model.run.studyId)) {
    const l = model.languages.indexOf(d.language);
    if (l < 0) continue;
    let stems = current.get(d.language);
    if (!stems) current.set(d.language, (stems = loadVocabulary(store, model.run.studyId, d.language).stems));
    out.push({ id: d.id, language: l, linkKey: d.linkKey, covariates: d.covariates, tokens: Int32Array.from(d.tokens, (w) => runIds[l].get(stems![w]) ?? -1) });
  }
  return out;
}

export function runChecks(store: Store, model: RunModel): RunChecks {
  const { K } = model;
  const notes: string[] = [];
  const docs = runDocuments(store, model);
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
    } else notes.push('No held-out linked answers in two languages: alignment needs translations among the held-out answers.');
  }

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
    run: model.run.name,
    K,
    logLikelihoodPerToken: { first: trace[0], last: trace[trace.length - 1], sweeps: trace.length },
    perplexity,
    coherence: { themes: coherence, meanNpmi: mc.npmi, meanLogConditional: mc.logConditional },
    alignment,
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
