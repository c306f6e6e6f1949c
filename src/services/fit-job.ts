// Running the fit of a stored run, phase by phase, each one reported (issue 15: "never silent"):
//   preparing corpus → starting → sampling → summarising → storing results → finished.
// The corpus is built from the study's answers minus a seeded held-out share of link groups; the
// sweeps run in the model (fit-engine.ts); the summaries (contrasts, checks) are computed from the
// fitted arrays before anything is written; and results, summaries, final progress and status
// 'finished' are stored in one transaction, so a kill at any point leaves either a resumable run
// with its checkpoint or a finished run with everything. Takes a data folder (or an open store)
// so the same function runs in the command line's process and in a worker thread (src/jobs).
import { heldOutGroups } from '../eval/index.js';
import { buildCorpus, buildGroupFeatures, type GroupFeatures } from '../model/index.js';
import {
  covariateLevels,
  getRun,
  isBusyError,
  latestCheckpoint,
  listDocumentTokens,
  loadVocabulary,
  openStore,
  saveCheckpoint,
  type Run,
  type RunProgress,
  type Store,
} from '../store/index.js';
import { InputError, sharedSpellings } from '../text/index.js';
import { fitCorpus, withoutExtraGroups } from './fit-engine.js';
import { fittedRunModel, storeFittedRun, type FitDiagnostics } from './fit-results.js';
import { modelSettingsOf } from './run-settings-schema.js';
import { computeRunSummaries } from './run-summaries.js';
import { estimateAfterSampling, type AfterSamplingEstimate } from './fit-time.js';

export type { FitDiagnostics } from './fit-results.js';

/** The phases of a fit, in order, as reported in RunProgress.phase. */
export const FIT_PHASES = ['preparing corpus', 'starting', 'sampling', 'summarising', 'storing results', 'finished'] as const;
export type FitPhase = (typeof FIT_PHASES)[number];

export interface FitJobOptions {
  /** Open store, or a data folder to open (and close) here — what a worker thread passes. */
  store?: Store;
  dataDir?: string;
  runId: number;
  onStart?: (resumedFromSweep: number | null) => void;
  onProgress?: (progress: RunProgress) => void;
  shouldStop?: () => boolean;
}

export interface FitJobOutcome {
  stopped: boolean;
  diagnostics: FitDiagnostics | null;
}

/**
 * Run the fit of a stored run to the end (or until shouldStop) and store its results and
 * summaries; the run becomes 'finished' in the same transaction.
 */
export async function runFitJob(options: FitJobOptions): Promise<FitJobOutcome> {
  const store = options.store ?? openStore(options.dataDir ?? './data');
  const report = (p: RunProgress & { phase: FitPhase }) => options.onProgress?.(p);
  try {
    const run = getRun(store, options.runId);
    if (!run) throw new Error(`No run with id ${options.runId}.`);
    const m = modelSettingsOf(run.settings);
    const checkpoint = latestCheckpoint(store, run.id);
    const fromSweep = checkpoint?.sweep ?? 0;
    options.onStart?.(checkpoint ? checkpoint.sweep : null);
    report({ phase: 'preparing corpus', sweep: fromSweep, sweeps: m.sweeps });
    const prepared = prepareCorpus(store, run);
    const after = estimateAfterSampling(store, run, prepared);
    report({ phase: 'starting', sweep: fromSweep, sweeps: m.sweeps });
    const out = await fitCorpus(
      prepared.fitCorpus,
      prepared.fitFeatures,
      { K: m.K, sweeps: m.sweeps, burnIn: m.burnIn, seed: m.seed, threads: m.threads, sampleEvery: m.sampleEvery, maxSamples: m.keepThetaSamples, checkpointEvery: m.checkpointEvery, sampler: m.sampler, answerGroups: prepared.corpus.numGroups },
      {
        // Time left covers what follows the sweeps too, estimated from one sweep's time (fit-time.ts).
        onSweep: (r) => report({ phase: 'sampling', ...r, secondsLeft: r.secondsLeft + after.totalSeconds }),
        shouldStop: options.shouldStop,
        onCheckpoint: (sweep, bytes) => {
          try {
            saveCheckpoint(store, run.id, sweep, bytes);
          } catch (error) {
            // A busy database (a long import) must not stop the fit: the next checkpoint will do.
            if (!isBusyError(error)) throw error;
          }
        },
        ...(checkpoint ? { resumeFrom: checkpoint.bytes } : {}),
      },
    );
    if (out.stopped) return { stopped: true, diagnostics: null };
    const fitted = withoutExtraGroups(out, prepared.corpus.numGroups, prepared.corpus.words.length);
    const model = fittedRunModel(run, prepared, fitted);
    const summaries = summarise(store, model, after, out.sweepsDone, options, report);
    if (summaries.stopped) return { stopped: true, diagnostics: null };
    report({ phase: 'storing results', sweep: out.sweepsDone, sweeps: m.sweeps, secondsLeft: after.storingSeconds });
    storeFittedRun(store, run, prepared, fitted, model.diagnostics, summaries.entries);
    report({ phase: 'finished', sweep: out.sweepsDone, sweeps: m.sweeps, logLikelihoodPerToken: model.diagnostics.logLikelihoodPerToken, secondsLeft: 0 });
    return { stopped: false, diagnostics: model.diagnostics };
  } finally {
    if (!options.store) store.close();
  }
}

/** The summaries, with time left from the steps measured so far (after the first) or the estimate. */
function summarise(
  store: Store,
  model: ReturnType<typeof fittedRunModel>,
  after: AfterSamplingEstimate,
  sweep: number,
  options: FitJobOptions,
  report: (p: RunProgress & { phase: FitPhase }) => void,
) {
  const started = performance.now();
  return computeRunSummaries(store, model, {
    shouldStop: options.shouldStop,
    onStep: ({ label, index, count }) => {
      const spent = (performance.now() - started) / 1000;
      const left = index === 0 ? after.totalSeconds : (spent / index) * (count - index) + after.storingSeconds;
      report({ phase: 'summarising', step: `${label} (${index + 1} of ${count})`, sweep, sweeps: model.run.settings.sweeps, secondsLeft: left });
    },
  });
}

export interface PreparedCorpus {
  corpus: ReturnType<typeof buildCorpus>['corpus'];
  languages: string[];
  /** Corpus document index → document id. */
  documentIds: Int32Array;
  heldOutIds: Int32Array;
  vocabularies: { stems: string[]; surfaces: string[] }[];
  /** Covariate features per link group (first member's covariates), or null without covariates. */
  features: GroupFeatures | null;
  /**
   * What is fitted: the corpus above followed by the link groups of words spelled the same in
   * several languages (shared-spellings.ts in src/text/vocabulary), and their features. The first
   * documents and groups are those of `corpus`, so results keep only those.
   */
  fitCorpus: ReturnType<typeof buildCorpus>['corpus'];
  fitFeatures: GroupFeatures | null;
  /** Per corpus document: its survey weight, and 1 for an answer (0 for a glossary's term list). */
  weights: Float64Array;
  isAnswer: Uint8Array;
  /** Shared spellings linked, and the one-word documents made of them. */
  sharedSpellings: number;
  spellingDocuments: number;
}

/** The study's included documents as a corpus, minus a seeded held-out share of link groups. */
export function prepareCorpus(store: Store, run: Run): PreparedCorpus {
  const docs = listDocumentTokens(store, run.studyId).filter((d) => d.tokens.length > 0);
  if (docs.length === 0) throw new InputError('The study has no answers with words to fit. Import a file first, or check the Languages and Vocabulary pages for exclusions.');
  const languages = [...new Set(docs.map((d) => d.language))].sort();
  const vocabularies = languages.map((l) => loadVocabulary(store, run.studyId, l));
  const held = heldOutGroups(docs.map((d) => d.linkKey ?? `#${d.id}`), run.settings.holdout, run.settings.seed);
  // A glossary's rows are links, not answers to test on: always fitted (docs/design.md §3).
  docs.forEach((d, i) => d.glossary && (held[i] = 0));
  const train = docs.filter((_, i) => held[i] === 0);
  if (train.length === 0) throw new InputError('Every answer was held out; lower the held-out share.');
  const langIndex = new Map(languages.map((l, i) => [l, i]));
  const vocabSizes = vocabularies.map((v) => v.stems.length);
  const documents = train.map((d) => ({ language: langIndex.get(d.language)!, tokens: d.tokens, linkKey: d.linkKey }));
  const built = buildCorpus({ languages, vocabSizes, documents });
  const documentIds = Int32Array.from(built.docOrder, (i) => train[i].id);
  const heldOutIds = Int32Array.from(docs.filter((_, i) => held[i] === 1).map((d) => d.id));
  const specs = covariateSpecs(store, run);
  const answerGroup = (i: number) => i < train.length && !train[i].glossary;
  const features = specs.length ? buildGroupFeatures(Array.from(built.groupFirstInput, (i) => train[i].covariates), specs, Array.from(built.groupFirstInput, answerGroup)) : null;
  // Words spelled the same in several languages tie them (shared-spellings.ts); counted in the
  // training answers only (glossary terms are links already).
  const counts = vocabularies.map((v) => new Int32Array(v.stems.length));
  for (const d of train) if (!d.glossary) for (const t of d.tokens) counts[langIndex.get(d.language)!][t]++;
  const shared = sharedSpellings(vocabularies.map((v) => v.surfaces), counts);
  const extra = shared.flatMap((sp) =>
    Array.from({ length: sp.repeats }, (_, r) => sp.members.map((m) => ({ language: m.language, tokens: Int32Array.of(m.word), linkKey: `\u0000spelling:${sp.spelling}:${r}` }))).flat(),
  );
  const fit = extra.length > 0 ? buildCorpus({ languages, vocabSizes, documents: [...documents, ...extra] }) : built;
  const fitFeatures =
    extra.length > 0 && specs.length
      ? buildGroupFeatures(Array.from(fit.groupFirstInput, (i) => (i < train.length ? train[i].covariates : {})), specs, Array.from(fit.groupFirstInput, answerGroup))
      : features;
  return {
    corpus: built.corpus,
    languages,
    documentIds,
    heldOutIds,
    vocabularies: vocabularies.map((v) => ({ stems: v.stems, surfaces: v.surfaces })),
    features,
    fitCorpus: fit.corpus,
    fitFeatures,
    weights: Float64Array.from(built.docOrder, (i) => train[i].weight),
    isAnswer: Uint8Array.from(built.docOrder, (i) => (train[i].glossary ? 0 : 1)),
    sharedSpellings: shared.length,
    spellingDocuments: extra.length,
  };
}

/** Covariates of the run with their types (numeric when every observed value is a number). */
function covariateSpecs(store: Store, run: Run): { column: string; type: 'categorical' | 'numeric' }[] {
  if (run.settings.covariates.length === 0) return [];
  const levels = covariateLevels(store, run.studyId, 1);
  return run.settings.covariates.map((column) => ({ column, type: levels[column]?.numeric ? 'numeric' : 'categorical' }));
}
