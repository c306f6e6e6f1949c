// Export of a finished run (DESIGN §8): the files people take away, built in memory.
import { documentTokensByIds, getStudy, getStudyWordLists, iterateDocuments, listImports, loadVocabulary, type Store } from '../store/index.js';
import { answersTable, type AnswerRow } from './answers-table.js';
import { BUNDLE_EXTENSION, BUNDLE_VERSION, encodeBundle, type RunBundle } from './bundle.js';
import { installationKey } from './bundle-key.js';
import { SHARES_HEADER, contrastCovariates, runContrasts } from './contrasts.js';
import { csvBytes, round6, type CsvCell } from './csv.js';
import { alphaForCovariates, foldInDocuments } from './fold-in.js';
import { documentMixtures, overallShares, themeWords, type RunModel } from './run-model.js';
import { pipelineSettings } from './text-pipeline.js';

export interface ExportedFile {
  readonly name: string;
  readonly mediaType: string;
  readonly bytes: Uint8Array;
}

export interface ExportOptions {
  /** Words per theme and language in theme-words.csv and the codebook (default 20). */
  topWords?: number;
  /** Bootstrap draws for the group shares (default 1000). */
  draws?: number;
}

/** Ordered covariate names of a study (from the imports' mappings). */
export function studyCovariates(store: Store, studyId: number): string[] {
  const names: string[] = [];
  for (const imp of listImports(store, studyId)) for (const c of imp.mapping.covariates) if (!names.includes(c.column)) names.push(c.column);
  return names;
}

/**
 * Name of the id column in the study's imported files ('id' when none was mapped); the names of
 * several imports that differ are joined with " / ".
 */
export function studyIdColumn(store: Store, studyId: number): string {
  const names: string[] = [];
  for (const imp of listImports(store, studyId)) if (imp.mapping.id && !names.includes(imp.mapping.id)) names.push(imp.mapping.id);
  return names.length ? names.join(' / ') : 'id';
}

/**
 * Mixture of every study answer under this run: the fitted mixture where the answer was fitted,
 * otherwise fold-in on its words (held-out answers, answers imported after the fit), matched to
 * the run's vocabulary by stem.
 */
export function studyAnswerRows(store: Store, model: RunModel): AnswerRow[] {
  const fitted = documentMixtures(model);
  const K = model.K;
  const current = new Map<string, string[]>();
  const runIds = model.vocabularies.map((v) => new Map(v.stems.map((s, i) => [s, i])));
  const pending: { row: number; language: number; tokens: Int32Array; covariates: Record<string, string | number | null> }[] = [];
  const rows: AnswerRow[] = [];
  const docs = [...iterateDocuments(store, model.run.studyId)];
  // Tokens only of the answers the fit did not see (they need fold-in).
  const tokenRows = documentTokensByIds(store, docs.filter((d) => !fitted.has(d.id) && !d.excluded).map((d) => d.id));
  for (const doc of docs) {
    let mixture: ArrayLike<number> | null = fitted.get(doc.id) ?? null;
    const tokens = tokenRows.get(doc.id);
    if (!mixture && tokens && doc.vocabularyLanguage && !doc.excluded) {
      const l = model.languages.indexOf(doc.vocabularyLanguage);
      if (l >= 0) {
        let stems = current.get(doc.vocabularyLanguage);
        if (!stems) current.set(doc.vocabularyLanguage, (stems = loadVocabulary(store, model.run.studyId, doc.vocabularyLanguage).stems));
        pending.push({ row: rows.length, language: l, tokens: Int32Array.from(tokens, (w) => runIds[l].get(stems![w]) ?? -1), covariates: doc.covariates });
      }
    }
    rows.push({ rowId: doc.rowId, question: doc.question, covariates: doc.covariates, language: doc.language, linkKey: doc.linkKey, weight: doc.weight, mixture });
  }
  if (pending.length) {
    const lambda = model.lambda ?? new Float64Array(K).fill(Math.log(0.1));
    const res = foldInDocuments(model.phi, K, pending.map((p) => ({ language: p.language, tokens: p.tokens, alpha: alphaForCovariates(lambda, model.features.encoding, K, p.covariates) })), { sweeps: 50, burnIn: 20, seed: model.run.settings.seed });
    pending.forEach((p, i) => {
      if (res.unknownWords[i] < p.tokens.length) rows[p.row] = { ...rows[p.row], mixture: res.theta.subarray(i * K, (i + 1) * K) };
    });
  }
  return rows;
}

export function themeWordsRows(model: RunModel, n: number): CsvCell[][] {
  const rows: CsvCell[][] = [];
  for (let k = 0; k < model.K; k++) {
    for (const lang of model.languages) {
      for (const w of themeWords(model, k, lang, n)) rows.push([model.labels[k], lang, w.rank, w.word, w.stem, round6(w.probability), round6(w.exclusivity)]);
    }
  }
  return rows;
}

export function buildBundle(store: Store, model: RunModel): RunBundle {
  const study = getStudy(store, model.run.studyId)!;
  const first = listImports(store, study.id)[0];
  return {
    format: 'themata-run',
    version: BUNDLE_VERSION,
    createdAt: new Date().toISOString(),
    study: study.name,
    run: model.run.name,
    K: model.K,
    labels: model.labels,
    languages: model.languages,
    vocabularies: model.vocabularies,
    phi: model.phi,
    lambda: model.lambda ?? new Float64Array(model.K).fill(Math.log(0.1)),
    encoding: model.features.encoding,
    beta: model.beta,
    pipeline: pipelineSettings(study.settings.pipeline, getStudyWordLists(store, study.id)),
    mapping: first?.mapping ?? null,
    settings: model.run.settings,
  };
}

function safeFileStem(name: string): string {
  return name.replace(/[^\p{L}\p{N}._-]+/gu, '-').replace(/^-+|-+$/g, '') || 'run';
}

/** Every file of DESIGN §8 for one run (the HTML report is the workbench's). */
export function exportRun(store: Store, model: RunModel, options: ExportOptions = {}): ExportedFile[] {
  const n = options.topWords ?? 20;
  const covariates = studyCovariates(store, model.run.studyId);
  const answers = answersTable(studyAnswerRows(store, model), covariates, model.labels, studyIdColumn(store, model.run.studyId));
  const shareRows: CsvCell[][] = [];
  for (const by of contrastCovariates(store, model.run.studyId)) {
    const res = runContrasts(store, model, { by, draws: options.draws ?? 1000, fdr: null });
    for (const r of res.shares) shareRows.push([r.covariate, r.level, r.themeLabel, round6(r.share), round6(r.low), round6(r.high), r.n, Math.round(r.effectiveN * 10) / 10]);
  }
  const weights = new Map<number, number>();
  for (const d of iterateDocuments(store, model.run.studyId, { excluded: false })) weights.set(d.id, d.weight);
  const shares = overallShares(model, weights);
  const study = getStudy(store, model.run.studyId)!;
  const codebook = {
    generator: 'Themata',
    study: study.name,
    run: model.run.name,
    createdAt: new Date().toISOString(),
    settings: model.run.settings,
    languages: model.languages,
    diagnostics: { ...model.diagnostics, trace: undefined },
    themes: model.labels.map((label, k) => ({
      theme: k + 1,
      label,
      share: round6(shares[k]),
      words: Object.fromEntries(model.languages.map((lang) => [lang, themeWords(model, k, lang, n).map((w) => ({ word: w.word, stem: w.stem, probability: round6(w.probability), exclusivity: round6(w.exclusivity) }))])),
    })),
    imports: listImports(store, study.id).map((i) => ({ file: i.fileName, sha256: i.sha256, mapping: i.mapping })),
  };
  return [
    { name: 'answers-by-theme.csv', mediaType: 'text/csv; charset=utf-8', bytes: csvBytes(answers.header, answers.rows) },
    { name: 'theme-words.csv', mediaType: 'text/csv; charset=utf-8', bytes: csvBytes(['theme', 'language', 'rank', 'word', 'stem', 'probability', 'exclusivity'], themeWordsRows(model, n)) },
    { name: 'theme-shares-by-group.csv', mediaType: 'text/csv; charset=utf-8', bytes: csvBytes(SHARES_HEADER, shareRows) },
    { name: 'codebook.json', mediaType: 'application/json', bytes: new TextEncoder().encode(JSON.stringify(codebook, null, 2) + '\n') },
    { name: `${safeFileStem(model.run.name)}${BUNDLE_EXTENSION}`, mediaType: 'application/octet-stream', bytes: encodeBundle(buildBundle(store, model), installationKey(store.dataDir)) },
  ];
}
