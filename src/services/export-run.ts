// Export of a finished run (docs/design.md §8): the files people take away, built in memory.
import { documentTokensByIds, getStudy, getStudyWordLists, iterateDocuments, listImports, loadJsonResult, loadVocabulary, type Store } from '../store/index.js';
import { answersTable, blankReasonFor, type AnswerRow } from './answers-table.js';
import { BUNDLE_EXTENSION, BUNDLE_VERSION, encodeBundle, type RunBundle } from './bundle.js';
import { installationKey } from '../platform/index.js';
import type { ContrastResult } from '../stats/index.js';
import { SHARES_HEADER, contrastCovariates, contrastData, contrastsFromData, type ContrastData } from './contrasts.js';
import { CONTRAST_DRAWS, contrastKey } from './run-summaries.js';
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
  /** Write each answer's text in answers-by-theme (default true). */
  answerText?: boolean;
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
    // Why an answer may end without shares; cleared when fold-in gives it a mixture.
    let reason: string | null = null;
    if (!mixture) {
      if (doc.excluded) reason = blankReasonFor(doc.excluded);
      else if (!doc.vocabularyLanguage || !tokens || tokens.length === 0) reason = doc.language === null ? 'language undetermined' : 'no words after filtering';
      else if (!model.languages.includes(doc.vocabularyLanguage)) reason = 'language not in this run';
      else reason = 'no word the run knows';
    }
    if (!mixture && tokens && doc.vocabularyLanguage && !doc.excluded) {
      const l = model.languages.indexOf(doc.vocabularyLanguage);
      if (l >= 0) {
        let stems = current.get(doc.vocabularyLanguage);
        if (!stems) current.set(doc.vocabularyLanguage, (stems = loadVocabulary(store, model.run.studyId, doc.vocabularyLanguage).stems));
        pending.push({ row: rows.length, language: l, tokens: Int32Array.from(tokens, (w) => runIds[l].get(stems![w]) ?? -1), covariates: doc.covariates });
      }
    }
    rows.push({ rowId: doc.rowId, question: doc.question, text: doc.text, covariates: doc.covariates, language: doc.language, linkKey: doc.linkKey, weight: doc.weight, mixture, reason });
  }
  if (pending.length) {
    const lambda = model.lambda ?? new Float64Array(K).fill(Math.log(0.1));
    const res = foldInDocuments(model.phi, K, pending.map((p) => ({ language: p.language, tokens: p.tokens, alpha: alphaForCovariates(lambda, model.features.encoding, K, p.covariates) })), { sweeps: 50, burnIn: 20, seed: model.run.settings.seed });
    pending.forEach((p, i) => {
      if (res.unknownWords[i] < p.tokens.length) rows[p.row] = { ...rows[p.row], mixture: res.theta.subarray(i * K, (i + 1) * K), reason: null };
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

/** The saved-run bundle's file name for a run. */
export function bundleFileName(runName: string): string {
  return `${safeFileStem(runName)}${BUNDLE_EXTENSION}`;
}

/** Distinct questions (text columns) among the rows: with one, a question column says nothing. */
export function questionCount(rows: readonly AnswerRow[]): number {
  return new Set(rows.map((r) => r.question)).size;
}

/** The tables of an export, shared by the CSV files and the workbook. */
export interface ExportTables {
  readonly answers: { header: string[]; rows: CsvCell[][] };
  readonly words: { header: string[]; rows: CsvCell[][] };
  readonly shares: { header: string[]; rows: CsvCell[][] };
  /** One row per theme: number, label, overall share, top words in each language. */
  readonly themes: { header: string[]; rows: CsvCell[][] };
  readonly codebook: unknown;
}

export const WORDS_HEADER = ['theme', 'language', 'rank', 'word', 'stem', 'probability', 'exclusivity'];

export function exportTables(store: Store, model: RunModel, options: ExportOptions = {}): ExportTables {
  const n = options.topWords ?? 20;
  const covariates = studyCovariates(store, model.run.studyId);
  const answerRows = studyAnswerRows(store, model);
  const questions = questionCount(answerRows) > 1;
  const answers = answersTable(answerRows, covariates, model.labels, { idColumn: studyIdColumn(store, model.run.studyId), questions, text: options.answerText ?? true });
  const shareRows: CsvCell[][] = [];
  const draws = options.draws ?? CONTRAST_DRAWS;
  const names = contrastCovariates(store, model.run.studyId).filter((by) => by !== 'question' || questions);
  let data: ContrastData | null = null;
  for (const by of names) {
    // A study of one text column has one question level (left out above): its "group" is every
    // answer. The shares stored with the run were drawn with the same draws and seed (the false
    // discovery setting only touches differences), so they are used as they are; labels are
    // today's, since a theme may have been renamed since the fit.
    const stored = draws === CONTRAST_DRAWS ? loadJsonResult<ContrastResult>(store, model.run.id, contrastKey(by)) : undefined;
    const res = stored ?? contrastsFromData(model, (data ??= contrastData(store, model, names)), { by, draws, fdr: null });
    for (const r of res.shares) shareRows.push([r.covariate, r.level, model.labels[r.theme] ?? r.themeLabel, round6(r.share), round6(r.low), round6(r.high), r.n, Math.round(r.effectiveN * 10) / 10]);
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
  const themes = {
    header: ['theme', 'label', 'share', ...model.languages.map((l) => `words · ${l}`)],
    rows: model.labels.map((label, k) => [k + 1, label, round6(shares[k]), ...model.languages.map((l) => themeWords(model, k, l, 10).map((w) => w.word).join(', '))] as CsvCell[]),
  };
  return { answers, words: { header: WORDS_HEADER, rows: themeWordsRows(model, n) }, shares: { header: SHARES_HEADER, rows: shareRows }, themes, codebook };
}

/** Every file of docs/design.md §8 for one run (the HTML report is the workbench's), as CSV and JSON. */
export function exportRun(store: Store, model: RunModel, options: ExportOptions = {}): ExportedFile[] {
  return exportFiles(store, model, exportTables(store, model, options));
}

export function exportFiles(store: Store, model: RunModel, t: ExportTables): ExportedFile[] {
  return [
    { name: 'answers-by-theme.csv', mediaType: 'text/csv; charset=utf-8', bytes: csvBytes(t.answers.header, t.answers.rows) },
    { name: 'theme-words.csv', mediaType: 'text/csv; charset=utf-8', bytes: csvBytes(t.words.header, t.words.rows) },
    { name: 'theme-shares-by-group.csv', mediaType: 'text/csv; charset=utf-8', bytes: csvBytes(t.shares.header, t.shares.rows) },
    { name: 'codebook.json', mediaType: 'application/json', bytes: new TextEncoder().encode(JSON.stringify(t.codebook, null, 2) + '\n') },
    { name: bundleFileName(model.run.name), mediaType: 'application/octet-stream', bytes: encodeBundle(buildBundle(store, model), installationKey(store.dataDir)) },
  ];
}
