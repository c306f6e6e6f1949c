// What a fit leaves behind: its diagnostics, the run model the pages read (built here from the
// fitted arrays, before anything is stored, so the summaries can be computed first), and the one
// transaction that stores results, summaries, final progress and status 'finished' together.
import {
  clearCheckpoints,
  inTransaction,
  markRunFinished,
  saveResults,
  withBusyRetry,
  type ResultValue,
  type Run,
  type Store,
  type StoredResult,
} from '../store/index.js';
import type { FitOutput } from './fit-engine.js';
import type { PreparedCorpus } from './fit-job.js';
import { themeLabel, type RunModel } from './run-model.js';

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

function diagnosticsOf(run: Run, p: PreparedCorpus, out: FitOutput): FitDiagnostics {
  return {
    run: run.name,
    themes: out.K,
    sweeps: out.sweepsDone,
    sampler: out.sampler,
    documents: p.documentIds.length,
    groups: p.corpus.numGroups,
    tokens: out.tokens,
    heldOutDocuments: p.heldOutIds.length,
    languages: p.languages,
    seconds: Math.round(out.seconds * 1000) / 1000,
    tokensPerSecond: Math.round(out.tokensPerSecond),
    logLikelihoodPerToken: out.trace.length ? out.trace[out.trace.length - 1] : NaN,
    trace: out.trace,
  };
}

/** The run model of a fit not stored yet: the same values loadRunModel reads back once it is. */
export function fittedRunModel(run: Run, p: PreparedCorpus, out: FitOutput): RunModel {
  const K = out.K;
  return {
    run,
    K,
    languages: p.languages,
    vocabularies: p.vocabularies,
    phi: out.phi,
    documentIds: p.documentIds,
    fitted: { language: p.corpus.docLanguage, weight: p.weights, isAnswer: p.isAnswer },
    docGroup: p.corpus.docGroup,
    heldOutIds: p.heldOutIds,
    thetaGroups: out.thetaGroups,
    thetaSamples: out.thetaSamples,
    alpha: out.alpha,
    beta: out.beta,
    lambda: out.lambda,
    features: { names: out.featureNames, encoding: out.encoding },
    diagnostics: diagnosticsOf(run, p, out),
    labels: Array.from({ length: K }, (_, k) => themeLabel(new Map(), k)),
  };
}

/**
 * Results, summaries, status and final progress in one transaction: a kill between them would
 * leave a run that is not finished but has no checkpoint left to resume from.
 */
export function storeFittedRun(store: Store, run: Run, p: PreparedCorpus, out: FitOutput, diagnostics: FitDiagnostics, summaries: Record<string, ResultValue | StoredResult>): void {
  const K = out.K;
  const G = p.corpus.numGroups;
  const samples = new Float32Array(out.thetaSamples.length * G * K);
  out.thetaSamples.forEach((s, i) => samples.set(s, i * G * K));
  const entries: Record<string, ResultValue | StoredResult> = {
    layout: { json: { K, languages: p.languages, vocabSizes: p.vocabularies.map((v) => v.stems.length), groups: G, documents: p.documentIds.length, covariates: run.settings.covariates } },
    documentIds: p.documentIds,
    heldOutIds: p.heldOutIds,
    docGroup: p.corpus.docGroup,
    // What the results pages need of every answer, stored so they need not read every answer.
    docLanguage: p.corpus.docLanguage,
    docWeight: p.weights,
    docIsAnswer: p.isAnswer,
    thetaGroups: { value: out.thetaGroups, shape: [G, K] },
    thetaSamples: { value: samples, shape: [out.thetaSamples.length, G, K] },
    alpha: { value: out.alpha, shape: [out.alpha.length / K, K] },
    groupPattern: out.groupPattern,
    beta: out.beta,
    diagnostics: { json: diagnostics },
    lambda: { value: out.lambda, shape: [K, out.lambda.length / K] },
    features: { json: { names: out.featureNames, encoding: out.encoding } },
  };
  p.languages.forEach((lang, l) => {
    entries[`phi:${lang}`] = { value: out.phi[l], shape: [K, p.vocabularies[l].stems.length] };
    entries[`vocabulary:${lang}`] = { json: p.vocabularies[l] };
  });
  withBusyRetry(() =>
    inTransaction(store, () => {
      saveResults(store, run.id, { ...entries, ...summaries });
      clearCheckpoints(store, run.id);
      markRunFinished(store, run.id, { phase: 'finished', sweep: out.sweepsDone, sweeps: run.settings.sweeps, logLikelihoodPerToken: diagnostics.logLikelihoodPerToken, secondsLeft: 0, trace: out.trace });
    }),
  );
}
