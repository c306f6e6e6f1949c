// Running a fit for a stored run: build the corpus from the study's documents, hold out a share
// of link groups for the checks, fit, and store the results in one transaction. Takes a data
// folder (or an open store) and plain settings so the same function runs in the CLI process and
// in a worker thread (src/jobs), reporting progress through a callback.
import { buildCorpus } from '../model/corpus.js';
import { buildGroupFeatures, type GroupFeatures } from '../model/features.js';
import { Xoshiro128 } from '../model/rng.js';
import {
  clearCheckpoints,
  covariateLevels,
  createRun,
  getRun,
  getStudy,
  getStudyByName,
  inTransaction,
  isBusyError,
  latestCheckpoint,
  listDocumentTokens,
  loadVocabulary,
  markRunFinished,
  openStore,
  saveCheckpoint,
  saveResults,
  uniqueRunName,
  withBusyRetry,
  type ResultValue,
  type Run,
  type RunProgress,
  type RunSettings,
  type Store,
  type StoredResult,
} from '../store/index.js';
import { InputError } from '../text/types.js';
import { fitCorpus, type FitOutput } from './fit-engine.js';

export interface FitRequest {
  themes: number;
  sweeps?: number;
  burnIn?: number;
  seed?: number;
  threads?: number;
  covariates?: string[];
  holdout?: number;
  name?: string;
  /** Checkpoint every this many sweeps (default 50). */
  checkpointEvery?: number;
  /** 'fast' (default) or 'reference' (the plain O(K) sampler) on one thread. */
  sampler?: 'fast' | 'reference';
}

/** Settings with defaults filled in: 500 sweeps, a fifth of them burn-in (common practice). */
export function fitSettings(request: FitRequest): RunSettings {
  const sweeps = Math.floor(request.sweeps ?? 500);
  const burnIn = Math.floor(request.burnIn ?? Math.min(Math.floor(sweeps / 5), 200));
  return {
    themes: Math.floor(request.themes),
    sweeps,
    burnIn,
    seed: Math.floor(request.seed ?? 1) >>> 0,
    threads: Math.max(1, Math.floor(request.threads ?? 1)),
    covariates: request.covariates ?? [],
    holdout: request.holdout ?? 0,
    // About 50 saved samples over the run, at least every 10th sweep (common practice).
    sampleEvery: Math.max(1, Math.min(10, Math.floor((sweeps - burnIn) / 50))),
    maxSamples: 20,
    checkpointEvery: Math.max(0, Math.floor(request.checkpointEvery ?? 50)),
    sampler: request.sampler ?? 'fast',
  };
}

/** Check a fit request against the study; throws an InputError a researcher can act on. */
export function validateFit(store: Store, studyId: number, settings: RunSettings): void {
  const K = settings.themes;
  if (!Number.isInteger(K) || K < 2 || K > 1000) throw new InputError(`--themes must be a whole number from 2 to 1000 (got ${settings.themes}).`);
  if (!(settings.sweeps >= 1)) throw new InputError(`--sweeps must be at least 1 (got ${settings.sweeps}).`);
  if (!(settings.burnIn >= 0 && settings.burnIn < settings.sweeps)) throw new InputError(`--burn-in must be at least 0 and below --sweeps (${settings.sweeps}); got ${settings.burnIn}.`);
  if (!(settings.holdout >= 0 && settings.holdout < 0.9)) throw new InputError(`--holdout is a share of answers from 0 to 0.9 (got ${settings.holdout}).`);
  const levels = covariateLevels(store, studyId, 1);
  for (const c of settings.covariates) {
    if (!(c in levels)) {
      const known = Object.keys(levels);
      throw new InputError(`The study has no covariate "${c}". ${known.length ? `Known covariates: ${known.join(', ')}.` : 'Import the file with --covariate COL first.'}`);
    }
  }
}

/** Resolve a study by name or id; InputError when missing. */
export function requireStudy(store: Store, study: string | number) {
  const found = typeof study === 'number' ? getStudy(store, study) : getStudyByName(store, study);
  if (!found) throw new InputError(`There is no study called "${study}". Import a file with --study "${study}" first.`);
  return found;
}

/** Create a queued run for a study after checking the request. */
export function createFitRun(store: Store, study: string | number, request: FitRequest): Run {
  const s = requireStudy(store, study);
  const settings = fitSettings(request);
  validateFit(store, s.id, settings);
  const name = request.name?.trim() || uniqueRunName(store, s.id, `k${settings.themes}-seed${settings.seed}`);
  return createRun(store, { studyId: s.id, name, settings });
}

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

export interface FitDiagnostics {
  run: string;
  themes: number;
  sweeps: number;
  sampler: string;
  documents: number;
  groups: number;
  tokens: number;
  heldOutDocuments: number;
  languages: string[];
  seconds: number;
  tokensPerSecond: number;
  logLikelihoodPerToken: number;
  trace: number[];
}

/**
 * Run the fit of a stored run to the end (or until shouldStop) and store its results; the run
 * becomes 'finished' in the same transaction as its results.
 */
export async function runFitJob(options: FitJobOptions): Promise<FitJobOutcome> {
  const store = options.store ?? openStore(options.dataDir ?? './data');
  try {
    const run = getRun(store, options.runId);
    if (!run) throw new Error(`No run with id ${options.runId}.`);
    const checkpoint = latestCheckpoint(store, run.id);
    options.onStart?.(checkpoint ? checkpoint.sweep : null);
    options.onProgress?.({ phase: 'preparing', sweep: checkpoint?.sweep ?? 0, sweeps: run.settings.sweeps });
    const prepared = prepareCorpus(store, run);
    const s = run.settings;
    const out = await fitCorpus(
      prepared.corpus,
      prepared.features,
      {
        K: s.themes,
        sweeps: s.sweeps,
        burnIn: s.burnIn,
        seed: s.seed,
        threads: s.threads,
        sampleEvery: Number(s.sampleEvery ?? 5),
        maxSamples: Number(s.maxSamples ?? 20),
        checkpointEvery: Number(s.checkpointEvery ?? 50),
        sampler: s.sampler === 'reference' ? 'reference' : 'fast',
      },
      {
        onSweep: (r) => options.onProgress?.({ phase: 'sampling', ...r }),
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
    const diagnostics = storeFit(store, run, prepared, out);
    options.onProgress?.({ phase: 'finished', sweep: out.sweepsDone, sweeps: s.sweeps, logLikelihoodPerToken: diagnostics.logLikelihoodPerToken, secondsLeft: 0 });
    return { stopped: false, diagnostics };
  } finally {
    if (!options.store) store.close();
  }
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
}

/** The study's included documents as a corpus, minus a seeded held-out share of link groups. */
export function prepareCorpus(store: Store, run: Run): PreparedCorpus {
  const docs = listDocumentTokens(store, run.studyId).filter((d) => d.tokens.length > 0);
  if (docs.length === 0) throw new InputError('The study has no answers with words to fit. Import a file first, or check the Languages and Vocabulary pages for exclusions.');
  const languages = [...new Set(docs.map((d) => d.language))].sort();
  const vocabularies = languages.map((l) => loadVocabulary(store, run.studyId, l));
  // Hold out whole link groups so a held-out answer's translation is not in the training data.
  const groupKey = (d: (typeof docs)[number]) => d.linkKey ?? `#${d.id}`;
  const heldOut = new Set<string>();
  if (run.settings.holdout > 0) {
    const rng = Xoshiro128.fromSeed(run.settings.seed, 7919);
    for (const key of new Set(docs.map(groupKey))) if (rng.nextDouble() < run.settings.holdout) heldOut.add(key);
  }
  const train = docs.filter((d) => !heldOut.has(groupKey(d)));
  if (train.length === 0) throw new InputError('Every answer was held out; lower --holdout.');
  const langIndex = new Map(languages.map((l, i) => [l, i]));
  const built = buildCorpus({
    languages,
    vocabSizes: vocabularies.map((v) => v.stems.length),
    documents: train.map((d) => ({ language: langIndex.get(d.language)!, tokens: d.tokens, linkKey: d.linkKey })),
  });
  const documentIds = Int32Array.from(built.docOrder, (i) => train[i].id);
  const heldOutIds = Int32Array.from(docs.filter((d) => heldOut.has(groupKey(d))).map((d) => d.id));
  const specs = covariateSpecs(store, run);
  const features = specs.length ? buildGroupFeatures(Array.from(built.groupFirstInput, (i) => train[i].covariates), specs) : null;
  return { corpus: built.corpus, languages, documentIds, heldOutIds, vocabularies: vocabularies.map((v) => ({ stems: v.stems, surfaces: v.surfaces })), features };
}

/** Covariates of the run with their types (numeric when every observed value is a number). */
function covariateSpecs(store: Store, run: Run): { column: string; type: 'categorical' | 'numeric' }[] {
  if (run.settings.covariates.length === 0) return [];
  const levels = covariateLevels(store, run.studyId, 1);
  return run.settings.covariates.map((column) => ({ column, type: levels[column]?.numeric ? 'numeric' : 'categorical' }));
}

function storeFit(store: Store, run: Run, p: PreparedCorpus, out: FitOutput): FitDiagnostics {
  const K = out.K;
  const G = p.corpus.numGroups;
  const last = out.trace.length ? out.trace[out.trace.length - 1] : NaN;
  const diagnostics: FitDiagnostics = {
    run: run.name,
    themes: K,
    sweeps: out.sweepsDone,
    sampler: out.sampler,
    documents: p.documentIds.length,
    groups: G,
    tokens: out.tokens,
    heldOutDocuments: p.heldOutIds.length,
    languages: p.languages,
    seconds: Math.round(out.seconds * 1000) / 1000,
    tokensPerSecond: Math.round(out.tokensPerSecond),
    logLikelihoodPerToken: last,
    trace: out.trace,
  };
  const samples = new Float32Array(out.thetaSamples.length * G * K);
  out.thetaSamples.forEach((s, i) => samples.set(s, i * G * K));
  const entries: Record<string, ResultValue | StoredResult> = {
    layout: { json: { K, languages: p.languages, vocabSizes: p.vocabularies.map((v) => v.stems.length), groups: G, documents: p.documentIds.length, covariates: run.settings.covariates } },
    documentIds: p.documentIds,
    heldOutIds: p.heldOutIds,
    docGroup: p.corpus.docGroup,
    thetaGroups: { value: out.thetaGroups, shape: [G, K] },
    thetaSamples: { value: samples, shape: [out.thetaSamples.length, G, K] },
    alpha: { value: out.alpha, shape: [out.alpha.length / K, K] },
    groupPattern: out.groupPattern,
    beta: out.beta,
    diagnostics: { json: diagnostics },
  };
  entries.lambda = { value: out.lambda, shape: [K, out.lambda.length / K] };
  entries.features = { json: { names: out.featureNames, encoding: out.encoding } };
  p.languages.forEach((lang, l) => {
    entries[`phi:${lang}`] = { value: out.phi[l], shape: [K, p.vocabularies[l].stems.length] };
    entries[`vocabulary:${lang}`] = { json: p.vocabularies[l] };
  });
  // Results, status and final progress in one transaction: a kill between them would leave a run
  // that is not finished but has no checkpoint left to resume from.
  withBusyRetry(() =>
    inTransaction(store, () => {
      saveResults(store, run.id, entries);
      clearCheckpoints(store, run.id);
      markRunFinished(store, run.id, { phase: 'finished', sweep: out.sweepsDone, sweeps: run.settings.sweeps, logLikelihoodPerToken: last, secondsLeft: 0, trace: out.trace });
    }),
  );
  return diagnostics;
}
