// Importing a file into a study (docs/design.md §3, issue 2): read and map the file, decide each answer's
// language, keep the original bytes, then re-run the vocabulary over the whole study. Reading
// and checking happen before anything is written; every write is one transaction, so bad input
// (an InputError) or a failure half-way leaves the study exactly as it was.
import { createStudy, exclusionSummary, getStudy, getStudyByName, inTransaction, insertDocuments, insertImport, setImportSummary, updateStudy, type NewDocument, type Store } from '../store/index.js';
import type { ColumnMapping, EncodingNote, MappedDocument, TableFormat } from '../text/index.js';
import { DEFAULT_LANGUAGES, InputError, decideLanguages, mapInputColumns, normalizeLanguages, readInputTable, type LanguageOutcome } from './text-pipeline.js';
import { applyVocabulary, planVocabulary, rebuildVocabulary, studyStamp } from './vocabulary.js';

export interface ImportProgress {
  readonly phase: 'reading' | 'languages' | 'saving' | 'vocabulary' | 'done';
  readonly done: number;
  readonly total: number;
}

export interface ImportOptions {
  /** Study name (created when missing) or id (must exist). */
  study: string | number;
  bytes: Uint8Array;
  fileName: string;
  mapping: ColumnMapping;
  /** Declared languages of the study (any common tag spelling); added to the study's own. */
  languages?: string[];
  sheet?: string;
  /**
   * Default false: a declared language column is a strong prior and confident detection of the
   * written language wins; true: the declared language always wins.
   */
  trustDeclared?: boolean;
  onProgress?: (progress: ImportProgress) => void;
}

export interface ImportSummary {
  readonly studyId: number;
  readonly studyName: string;
  readonly studyCreated: boolean;
  readonly importId: number;
  readonly fileName: string;
  readonly format: TableFormat;
  readonly encoding: string;
  readonly encodingConfidence?: number;
  /** Mixed encodings, damaged UTF-8, mojibake: what the reader noticed and did, naming rows. */
  readonly encodingNotes: readonly EncodingNote[];
  readonly delimiter?: string;
  readonly sheet?: string;
  readonly rows: number;
  /** Answers this import added (one per non-empty text cell). */
  readonly documents: number;
  /** Empty or blank text cells, kept as documents left out with the reason 'empty'. */
  readonly emptyAnswers: number;
  /** Documents of this import per decided language. */
  readonly documentsPerLanguage: Record<string, number>;
  /** How languages were decided in this import: declared, detected, adapted, undetermined. */
  readonly languageSources: Record<string, number>;
  /** What the texts said about their declared language: confirmed, kept (too little text), overruled. */
  readonly declaredChecks: Record<string, number>;
  /** Answers written in two languages (they go by the language of most of their words). */
  readonly mixedAnswers: number;
  readonly undetermined: number;
  /** Excluded documents of this import per reason. */
  readonly excluded: Record<string, number>;
  /** Vocabulary size per language over the whole study after this import. */
  readonly vocabularySizes: Record<string, number>;
  readonly studyLanguages: string[];
}

export async function importFile(store: Store, options: ImportOptions): Promise<ImportSummary> {
  const progress = options.onProgress ?? (() => {});
  const existing = typeof options.study === 'number' ? getStudy(store, options.study) : getStudyByName(store, options.study.trim());
  if (typeof options.study === 'number' && !existing) throw new InputError(`There is no study with id ${options.study}.`);
  if (typeof options.study === 'string' && !options.study.trim()) throw new InputError('Give the study a name (--study NAME).');
  if (options.mapping.text.length === 0) throw new InputError('Choose at least one text column (--text COL).', options.fileName);

  progress({ phase: 'reading', done: 0, total: options.bytes.byteLength });
  const table = await readInputTable(options.bytes, options.fileName, options.sheet);
  progress({ phase: 'reading', done: options.bytes.byteLength, total: options.bytes.byteLength });

  let languages = normalizeLanguages([...(existing?.languages ?? []), ...(options.languages ?? [])]);
  const mapped = mapInputColumns(table, options.mapping, languages, true);
  // Empty cells are stored too (left out as 'empty', so the Data page lists them); only the
  // answers with text go through language identification.
  const docs = mapped.filter((d) => d.text !== '');
  if (docs.length === 0) {
    throw new InputError(`No answers to import: every cell of ${options.mapping.text.map((c) => `"${c}"`).join(', ')} is empty.`, options.fileName, undefined, options.mapping.text[0]);
  }
  const explicit = languages.length > 0;
  if (!explicit) {
    const declared = [...new Set(docs.map((d) => d.declaredLanguage).filter((x): x is string => !!x))];
    languages = declared.length > 0 ? declared : [...DEFAULT_LANGUAGES];
  }

  progress({ phase: 'languages', done: 0, total: docs.length });
  const outcomes = decideLanguages(docs.map((d) => d.text), languages, docs.map((d) => d.declaredLanguage), options.trustDeclared === true);
  const decisions = outcomes.map((o) => o.decision);
  progress({ phase: 'languages', done: docs.length, total: docs.length });
  const stored = storedDocuments(mapped, docs, outcomes);
  const found = [...new Set(decisions.map((d) => d.language).filter((x): x is string => !!x))];
  // Declared languages stay; without any, the study's languages are the ones actually found.
  const studyLanguages = explicit ? [...languages, ...found.filter((l) => !languages.includes(l))] : found.sort();

  // The token step over the whole study runs before the write transaction (it is the long part);
  // the transaction checks that the study did not change meanwhile, else redoes it inside.
  progress({ phase: 'vocabulary', done: 0, total: docs.length });
  const plan = planVocabulary(
    store,
    existing?.id ?? null,
    stored.map((d) => ({ language: d.language, text: d.text })),
    (done, total) => progress({ phase: 'vocabulary', done, total }),
  );
  progress({ phase: 'saving', done: 0, total: stored.length });
  return inTransaction(store, () => {
    const study = existing ?? createStudy(store, { name: (options.study as string).trim(), languages: studyLanguages });
    const stampBefore = existing ? studyStamp(store, existing.id) : null;
    if (existing) updateStudy(store, study.id, { languages: studyLanguages });
    const importId = insertImport(store, {
      studyId: study.id,
      fileName: options.fileName,
      format: table.format,
      bytes: options.bytes,
      encoding: table.assumed.encoding,
      mapping: options.mapping,
    });
    const ids = insertDocuments(store, study.id, importId, stored);
    const vocab =
      existing && stampBefore !== plan.stamp
        ? rebuildVocabulary(store, study.id)
        : applyVocabulary(store, study.id, plan, ids);
    const excluded = exclusionSummary(store, study.id, importId);
    const perLanguage: Record<string, number> = {};
    const sources: Record<string, number> = {};
    const checks: Record<string, number> = {};
    let mixedAnswers = 0;
    let undetermined = 0;
    decisions.forEach((d) => {
      if (d.language === null) undetermined++;
      else perLanguage[d.language] = (perLanguage[d.language] ?? 0) + 1;
      sources[d.source] = (sources[d.source] ?? 0) + 1;
      if (d.declaredCheck !== undefined) checks[d.declaredCheck] = (checks[d.declaredCheck] ?? 0) + 1;
      if (d.mixed !== undefined) mixedAnswers++;
    });
    const summary: ImportSummary = {
      studyId: study.id,
      studyName: study.name,
      studyCreated: !existing,
      importId,
      fileName: options.fileName,
      format: table.format,
      encoding: table.assumed.encoding,
      ...(table.assumed.encodingConfidence !== undefined ? { encodingConfidence: table.assumed.encodingConfidence } : {}),
      encodingNotes: table.assumed.encodingNotes ?? [],
      ...(table.assumed.delimiter !== undefined ? { delimiter: table.assumed.delimiter } : {}),
      ...(table.assumed.sheet !== undefined ? { sheet: table.assumed.sheet } : {}),
      rows: table.rows.length,
      documents: docs.length,
      emptyAnswers: stored.length - docs.length,
      documentsPerLanguage: perLanguage,
      languageSources: sources,
      declaredChecks: checks,
      mixedAnswers,
      undetermined,
      excluded,
      vocabularySizes: vocab.vocabularySizes,
      studyLanguages,
    };
    setImportSummary(store, importId, summary);
    progress({ phase: 'done', done: ids.length, total: ids.length });
    return summary;
  });
}

/**
 * The rows to store, in file order: each answer with its language decision, each empty cell as
 * a document left out with the reason 'empty' (its declared language kept, nothing detected).
 */
function storedDocuments(mapped: readonly MappedDocument[], answers: readonly MappedDocument[], outcomes: readonly LanguageOutcome[]): NewDocument[] {
  let next = 0;
  return mapped.map((d) => {
    const common = {
      rowId: d.rowId,
      question: d.question,
      text: d.text,
      declaredLanguage: d.declaredLanguage ?? null,
      linkKey: d.linkKey ?? null,
      covariates: d.covariates,
      weight: d.weight,
    };
    if (d.text === '') {
      const declared = d.declaredLanguage ?? null;
      return { ...common, language: declared, languageSource: declared ? 'declared' : 'undetermined', confidence: declared ? 1 : 0, writtenLanguage: null, excluded: 'empty' };
    }
    if (answers[next] !== d) throw new Error('The answers and their language decisions are out of step.');
    const { decision, written } = outcomes[next++];
    return {
      ...common,
      language: decision.language,
      languageSource: decision.source,
      confidence: decision.confidence,
      writtenLanguage: written,
      declaredCheck: decision.declaredCheck ?? null,
      mixedLanguage: decision.mixed?.language ?? null,
      mixedShare: decision.mixed?.share ?? null,
      excluded: decision.language === null ? 'undetermined' : null,
    };
  });
}
