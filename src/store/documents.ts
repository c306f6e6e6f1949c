// Documents: one text cell each, with its language decision, link key, covariates, weight,
// exclusion reason and token ids (Int32Array bytes into its language's vocabulary).
import type { DeclaredCheck, LanguageSource } from '../text/index.js';
import { int32FromBlob, toBlob } from './blobs.js';
import { inTransaction, type Store } from './database.js';

export interface NewDocument {
  readonly rowId: string;
  readonly question: string;
  readonly text: string;
  readonly language: string | null;
  readonly languageSource: LanguageSource;
  readonly confidence: number;
  readonly declaredLanguage?: string | null;
  /** Language of the text judged from the text alone (null: too little evidence or not judged). */
  readonly writtenLanguage?: string | null;
  /** What the text said about the declared language (null: none declared, or trusted). */
  readonly declaredCheck?: DeclaredCheck | null;
  /** Answers written in two languages: the minority language and its share of the words. */
  readonly mixedLanguage?: string | null;
  readonly mixedShare?: number | null;
  readonly linkKey?: string | null;
  readonly covariates: Record<string, string | number | null>;
  readonly weight: number;
  readonly excluded?: string | null;
}

export interface DocumentRecord extends NewDocument {
  readonly id: number;
  readonly studyId: number;
  readonly importId: number;
  readonly declaredLanguage: string | null;
  readonly writtenLanguage: string | null;
  readonly declaredCheck: DeclaredCheck | null;
  readonly mixedLanguage: string | null;
  readonly mixedShare: number | null;
  readonly linkKey: string | null;
  readonly excluded: string | null;
  readonly vocabularyLanguage: string | null;
}

/** A document with its tokens, for building a corpus. */
export interface DocumentTokens {
  readonly id: number;
  readonly language: string;
  readonly linkKey: string | null;
  readonly covariates: Record<string, string | number | null>;
  readonly weight: number;
  readonly tokens: Int32Array;
  /** A glossary's term list (docs/design.md §3): a link-group member for the fit, never an answer. */
  readonly glossary: boolean;
}

interface DocumentRow {
  id: number;
  study_id: number;
  import_id: number;
  row_id: string;
  question: string;
  text: string;
  language: string | null;
  language_source: LanguageSource;
  confidence: number;
  declared_language: string | null;
  written_language: string | null;
  declared_check: DeclaredCheck | null;
  mixed_language: string | null;
  mixed_share: number | null;
  link_key: string | null;
  covariates: string;
  weight: number;
  excluded: string | null;
  vocabulary_language: string | null;
}

const COLUMNS = 'id, study_id, import_id, row_id, question, text, language, language_source, confidence, declared_language, written_language, declared_check, mixed_language, mixed_share, link_key, covariates, weight, excluded, vocabulary_language';

function toDocument(row: DocumentRow): DocumentRecord {
  return {
    id: row.id,
    studyId: row.study_id,
    importId: row.import_id,
    rowId: row.row_id,
    question: row.question,
    text: row.text,
    language: row.language,
    languageSource: row.language_source,
    confidence: row.confidence,
    declaredLanguage: row.declared_language,
    writtenLanguage: row.written_language,
    declaredCheck: row.declared_check,
    mixedLanguage: row.mixed_language,
    mixedShare: row.mixed_share,
    linkKey: row.link_key,
    covariates: JSON.parse(row.covariates) as Record<string, string | number | null>,
    weight: row.weight,
    excluded: row.excluded,
    vocabularyLanguage: row.vocabulary_language,
  };
}

/** Insert documents of one import (one transaction); returns their ids in input order. */
export function insertDocuments(store: Store, studyId: number, importId: number, docs: readonly NewDocument[]): number[] {
  const stmt = store.db.prepare(
    `INSERT INTO documents (study_id, import_id, row_id, question, text, language, language_source, confidence, declared_language, written_language, declared_check, mixed_language, mixed_share, link_key, covariates, weight, excluded)
     VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
  );
  return inTransaction(store, () =>
    docs.map((d) =>
      Number(
        stmt.run(studyId, importId, d.rowId, d.question, d.text, d.language, d.languageSource, d.confidence, d.declaredLanguage ?? null, d.writtenLanguage ?? null, d.declaredCheck ?? null, d.mixedLanguage ?? null, d.mixedShare ?? null, d.linkKey ?? null, JSON.stringify(d.covariates), d.weight, d.excluded ?? null)
          .lastInsertRowid,
      ),
    ),
  );
}

/** Store token ids, vocabulary language and exclusion per document id (one transaction). */
export function setDocumentTokens(
  store: Store,
  updates: readonly { id: number; vocabularyLanguage: string | null; tokens: Int32Array | null; excluded: string | null }[],
): void {
  const stmt = store.db.prepare('UPDATE documents SET vocabulary_language = ?, tokens = ?, excluded = ? WHERE id = ?');
  inTransaction(store, () => {
    for (const u of updates) stmt.run(u.vocabularyLanguage, u.tokens ? toBlob(u.tokens) : null, u.excluded, u.id);
  });
}

/**
 * Documents that are answers: not the tiny documents of a glossary import (docs/design.md §3), which
 * the fit uses as link groups but no page, contrast, export or review counts as answers.
 */
const ANSWER_DOCUMENTS = "import_id NOT IN (SELECT id FROM imports WHERE kind = 'glossary')";
const GLOSSARY_DOCUMENTS = "import_id IN (SELECT id FROM imports WHERE kind = 'glossary')";

export interface DocumentFilter {
  /** Default 'answers': glossary documents are left out unless asked for. */
  kind?: 'answers' | 'glossary' | 'all';
  importId?: number;
  /** A language subtag, or null for undetermined documents. */
  language?: string | null;
  source?: LanguageSource;
  /** true: only excluded; false: only included. */
  excluded?: boolean;
  /** Only documents whose declared language differs from the written (or the decided) one. */
  disagreements?: boolean;
  /** Only answers written in two languages. */
  mixed?: boolean;
  /** Only documents where the text said this about their declared language. */
  declaredCheck?: DeclaredCheck;
  /** Only documents whose decided language differs from the one their text is written in. */
  writtenDiffers?: boolean;
  /** Case-insensitive substring of the text or row id. */
  search?: string;
  ids?: readonly number[];
  /** Equality on a covariate value. */
  covariate?: { name: string; value: string };
}

/** Declared language differs from what the text is written in, or from the decision kept. */
const DISAGREES = 'declared_language IS NOT NULL AND ((written_language IS NOT NULL AND written_language <> declared_language) OR (language IS NOT NULL AND language <> declared_language))';

/** The text is written in another language than the one decided (what "accept written" changes). */
const WRITTEN_DIFFERS = 'written_language IS NOT NULL AND (language IS NULL OR language <> written_language)';

function whereClause(studyId: number, f: DocumentFilter): { sql: string; params: unknown[] } {
  const parts = ['study_id = ?'];
  const params: unknown[] = [studyId];
  if ((f.kind ?? 'answers') === 'answers') parts.push(ANSWER_DOCUMENTS);
  else if (f.kind === 'glossary') parts.push(GLOSSARY_DOCUMENTS);
  if (f.importId !== undefined) (parts.push('import_id = ?'), params.push(f.importId));
  if (f.language === null) parts.push('language IS NULL');
  else if (f.language !== undefined) (parts.push('language = ?'), params.push(f.language));
  if (f.source !== undefined) (parts.push('language_source = ?'), params.push(f.source));
  if (f.excluded === true) parts.push('excluded IS NOT NULL');
  if (f.excluded === false) parts.push('excluded IS NULL');
  if (f.disagreements) parts.push(DISAGREES);
  if (f.mixed) parts.push('mixed_language IS NOT NULL');
  if (f.declaredCheck !== undefined) (parts.push('declared_check = ?'), params.push(f.declaredCheck));
  if (f.writtenDiffers) parts.push(WRITTEN_DIFFERS);
  if (f.search) {
    parts.push('(instr(unicode_lower(text), unicode_lower(?)) > 0 OR row_id = ?)');
    params.push(f.search, f.search);
  }
  if (f.ids) parts.push(`id IN (SELECT value FROM json_each(?))`), params.push(JSON.stringify(f.ids));
  // Match the key with json_each and a bound parameter instead of building a JSON path: a
  // covariate name may hold any character (`"`, `.`, `$`, quotes, spaces), and SQLite's JSON
  // path syntax has no escape that covers them all.
  if (f.covariate) {
    parts.push('EXISTS (SELECT 1 FROM json_each(covariates) c WHERE c.key = ? AND CAST(c.value AS TEXT) = ?)');
    params.push(f.covariate.name, f.covariate.value);
  }
  return { sql: parts.join(' AND '), params };
}

/** One page of documents matching `filter`, in import order, with the total count. */
export function listDocuments(
  store: Store,
  studyId: number,
  filter: DocumentFilter = {},
  page: { offset?: number; limit?: number } = {},
): { total: number; rows: DocumentRecord[] } {
  const { sql, params } = whereClause(studyId, filter);
  const total = (store.db.prepare(`SELECT COUNT(*) AS n FROM documents WHERE ${sql}`).get(...params) as { n: number }).n;
  const limit = Math.max(0, Math.min(page.limit ?? 50, 100_000));
  const rows = store.db
    .prepare(`SELECT ${COLUMNS} FROM documents WHERE ${sql} ORDER BY id LIMIT ? OFFSET ?`)
    .all(...params, limit, Math.max(0, page.offset ?? 0)) as DocumentRow[];
  return { total, rows: rows.map(toDocument) };
}

/**
 * Id, language (the vocabulary's, else the decided one) and weight of every document the filter
 * keeps, in id order: what a results page needs of every answer, read without the texts and
 * metadata (a first visit at a million answers must not wait for them).
 */
export function documentWeights(store: Store, studyId: number, filter: DocumentFilter = {}): { ids: Int32Array; languages: string[]; weights: Float64Array } {
  const { sql, params } = whereClause(studyId, filter);
  const rows = store.db.prepare(`SELECT id, COALESCE(vocabulary_language, language, ''), weight FROM documents WHERE ${sql} ORDER BY id`).raw(true).all(...params) as [number, string, number][];
  const ids = new Int32Array(rows.length);
  const languages = new Array<string>(rows.length);
  const weights = new Float64Array(rows.length);
  rows.forEach((r, i) => {
    ids[i] = r[0];
    languages[i] = r[1];
    weights[i] = r[2];
  });
  return { ids, languages, weights };
}

/** Ids of the documents the filter keeps (answers by default), in id order. */
export function documentIdsOf(store: Store, studyId: number, filter: DocumentFilter = {}): Int32Array {
  const { sql, params } = whereClause(studyId, filter);
  return Int32Array.from(store.db.prepare(`SELECT id FROM documents WHERE ${sql} ORDER BY id`).pluck().all(...params) as number[]);
}

/** How many different questions (text columns) the documents the filter keeps answer. */
export function questionCountOf(store: Store, studyId: number, filter: DocumentFilter = {}): number {
  const { sql, params } = whereClause(studyId, filter);
  return store.db.prepare(`SELECT COUNT(DISTINCT question) FROM documents WHERE ${sql}`).pluck().get(...params) as number;
}

/** Every document of a study (or of one import), in id order, streamed. */
export function* iterateDocuments(store: Store, studyId: number, filter: DocumentFilter = {}): Generator<DocumentRecord> {
  const { sql, params } = whereClause(studyId, filter);
  for (const row of store.db.prepare(`SELECT ${COLUMNS} FROM documents WHERE ${sql} ORDER BY id`).iterate(...params)) {
    yield toDocument(row as DocumentRow);
  }
}

export function getDocument(store: Store, id: number): DocumentRecord | undefined {
  const row = store.db.prepare(`SELECT ${COLUMNS} FROM documents WHERE id = ?`).get(id) as DocumentRow | undefined;
  return row ? toDocument(row) : undefined;
}

/**
 * Id, decided language and text of every document of a study, in id order (the token step's
 * input), and which are glossary documents (1: tokenized like answers, never counted as words).
 */
export function listDocumentTexts(store: Store, studyId: number): { ids: Int32Array; languages: (string | null)[]; texts: string[]; glossary: Uint8Array } {
  const rows = store.db.prepare(`SELECT id, language, text, ${GLOSSARY_DOCUMENTS} FROM documents WHERE study_id = ? ORDER BY id`).raw(true).all(studyId) as [number, string | null, string, number][];
  const ids = new Int32Array(rows.length);
  const languages: (string | null)[] = new Array(rows.length);
  const texts: string[] = new Array(rows.length);
  const glossary = new Uint8Array(rows.length);
  for (let i = 0; i < rows.length; i++) {
    ids[i] = rows[i][0];
    languages[i] = rows[i][1];
    texts[i] = rows[i][2];
    glossary[i] = rows[i][3] ? 1 : 0;
  }
  return { ids, languages, texts, glossary };
}

/** How much a fit of the study would read: included answers with words, and their words. */
export function fitInputSize(store: Store, studyId: number): { answers: number; words: number } {
  // length() of a BLOB reads its size from the record header, not its bytes.
  const row = store.db
    .prepare(`SELECT COUNT(*) AS n, COALESCE(SUM(length(tokens)), 0) / 4 AS w FROM documents WHERE study_id = ? AND excluded IS NULL AND vocabulary_language IS NOT NULL AND tokens IS NOT NULL AND length(tokens) > 0`)
    .get(studyId) as { n: number; w: number };
  return { answers: row.n, words: row.w };
}

/** Included documents with tokens, in id order: the input of a fit. */
export function listDocumentTokens(store: Store, studyId: number): DocumentTokens[] {
  const rows = store.db
    .prepare(
      `SELECT id, vocabulary_language, link_key, covariates, weight, tokens, ${GLOSSARY_DOCUMENTS} FROM documents
       WHERE study_id = ? AND excluded IS NULL AND vocabulary_language IS NOT NULL AND tokens IS NOT NULL ORDER BY id`,
    )
    .raw(true)
    .all(studyId) as [number, string, string | null, string, number, Buffer, number][];
  // Covariate rows repeat a handful of patterns: parse each distinct JSON text once.
  const parsed = new Map<string, Record<string, string | number | null>>();
  return rows.map((r) => {
    let covariates = parsed.get(r[3]);
    if (!covariates) parsed.set(r[3], (covariates = JSON.parse(r[3]) as Record<string, string | number | null>));
    return { id: r[0], language: r[1], linkKey: r[2], covariates, weight: r[4], tokens: int32FromBlob(r[5]), glossary: r[6] === 1 };
  });
}

/** Override the language of documents (source 'overridden', confidence 1); one transaction. */
export function overrideLanguages(store: Store, studyId: number, ids: readonly number[], language: string | null): number {
  const stmt = store.db.prepare(
    "UPDATE documents SET language = ?, language_source = ?, confidence = ? WHERE study_id = ? AND id = ?",
  );
  return inTransaction(store, () => {
    let n = 0;
    for (const id of ids) n += stmt.run(language, language === null ? 'undetermined' : 'overridden', language === null ? 0 : 1, studyId, id).changes;
    return n;
  });
}

/**
 * Where the declared language differs from the language written, decide by the text instead
 * (source 'overridden'); all such documents of the study, or only `ids`. Returns the count changed.
 */
export function adoptWrittenLanguages(store: Store, studyId: number, ids?: readonly number[]): number {
  // An empty id list (json_each of []) matches nothing; null means every document.
  return inTransaction(
    store,
    () =>
      store.db
        .prepare(
          `UPDATE documents SET language = written_language, language_source = 'overridden', confidence = 1,
             excluded = CASE WHEN excluded = 'undetermined' THEN NULL ELSE excluded END
           WHERE study_id = ? AND ${WRITTEN_DIFFERS} AND ${ANSWER_DOCUMENTS}
             AND (? IS NULL OR id IN (SELECT value FROM json_each(?)))`,
        )
        .run(studyId, ids ? 1 : null, JSON.stringify(ids ?? [])).changes,
  );
}

export interface LanguageSummaryRow {
  /** null = undetermined. */
  readonly language: string | null;
  readonly documents: number;
  readonly included: number;
  readonly bySource: Partial<Record<LanguageSource, number>>;
  readonly meanConfidence: number;
  /** Counts of confidence in ten bins [0,0.1) … [0.9,1]. */
  readonly confidenceBins: number[];
  /** Documents whose declared language differs from this decided one. */
  /** Documents with a declared language that differs from the language written (or decided). */
  readonly disagreements: number;
}

/** Per-language counts for the Languages page. */
export function languageSummary(store: Store, studyId: number): LanguageSummaryRow[] {
  const rows = store.db
    .prepare(
      `SELECT language, language_source AS source, MIN(CAST(confidence * 10 AS INTEGER), 9) AS bin, COUNT(*) AS n,
         SUM(excluded IS NULL) AS included, SUM(confidence) AS conf,
         SUM(${DISAGREES}) AS disagree
       FROM documents WHERE study_id = ? AND ${ANSWER_DOCUMENTS} GROUP BY language, source, bin`,
    )
    .all(studyId) as { language: string | null; source: LanguageSource; bin: number; n: number; included: number; conf: number; disagree: number }[];
  const byLang = new Map<string | null, { documents: number; included: number; bySource: Partial<Record<LanguageSource, number>>; conf: number; bins: number[]; disagreements: number }>();
  for (const r of rows) {
    let e = byLang.get(r.language);
    if (!e) byLang.set(r.language, (e = { documents: 0, included: 0, bySource: {}, conf: 0, bins: new Array(10).fill(0), disagreements: 0 }));
    e.documents += r.n;
    e.included += r.included;
    e.bySource[r.source] = (e.bySource[r.source] ?? 0) + r.n;
    e.conf += r.conf;
    e.bins[Math.max(0, r.bin)] += r.n;
    e.disagreements += r.disagree;
  }
  return [...byLang.entries()]
    .map(([language, e]) => ({
      language,
      documents: e.documents,
      included: e.included,
      bySource: e.bySource,
      meanConfidence: e.documents ? e.conf / e.documents : 0,
      confidenceBins: e.bins,
      disagreements: e.disagreements,
    }))
    .sort((a, b) => (a.language === null ? 1 : b.language === null ? -1 : b.documents - a.documents));
}

/** Counts of excluded documents per reason (of the study's answers, or of one import). */
export function exclusionSummary(store: Store, studyId: number, importId?: number): Record<string, number> {
  const rows = (
    importId === undefined
      ? store.db.prepare(`SELECT excluded, COUNT(*) AS n FROM documents WHERE study_id = ? AND ${ANSWER_DOCUMENTS} AND excluded IS NOT NULL GROUP BY excluded`).all(studyId)
      : store.db.prepare('SELECT excluded, COUNT(*) AS n FROM documents WHERE study_id = ? AND import_id = ? AND excluded IS NOT NULL GROUP BY excluded').all(studyId, importId)
  ) as { excluded: string; n: number }[];
  return Object.fromEntries(rows.map((r) => [r.excluded, r.n]));
}

/** Token ids of the given documents (those that have tokens), by document id. */
export function documentTokensByIds(store: Store, ids: readonly number[]): Map<number, Int32Array> {
  const out = new Map<number, Int32Array>();
  if (ids.length === 0) return out;
  const stmt = store.db.prepare('SELECT id, tokens FROM documents WHERE id IN (SELECT value FROM json_each(?)) AND tokens IS NOT NULL').raw(true);
  // Chunks keep each JSON list small (common practice).
  for (let i = 0; i < ids.length; i += 10_000) {
    for (const [id, tokens] of stmt.all(JSON.stringify(ids.slice(i, i + 10_000))) as [number, Buffer][]) out.set(id, int32FromBlob(tokens));
  }
  return out;
}

/** Changes whenever the study's documents or settings change: count, newest id, last update. */
export function studyChangeStamp(store: Store, studyId: number): string {
  const row = store.db
    .prepare('SELECT COUNT(d.id) AS n, COALESCE(MAX(d.id), 0) AS m, s.updated_at AS u FROM studies s LEFT JOIN documents d ON d.study_id = s.id WHERE s.id = ?')
    .get(studyId) as { n: number; m: number; u: string | null };
  return `${row.n}:${row.m}:${row.u}`;
}

type CovariateLevels = Record<string, { values: string[]; numeric: boolean; distinct: number }>;

/**
 * The last computed levels per store, study and maxLevels, with the study's change stamp:
 * the levels are an aggregate over every answer (seconds at a million answers) and are asked for
 * by every results page and by each summary of a fit, while they change only with an import or
 * a deletion — which the stamp sees (answer count, last id, study's update time).
 */
const levelsCache = new WeakMap<Store, Map<string, { stamp: string; levels: CovariateLevels }>>();

/** Distinct covariate names and their observed values (up to `maxLevels` per name). */
export function covariateLevels(store: Store, studyId: number, maxLevels = 200): CovariateLevels {
  const cache = levelsCache.get(store) ?? new Map<string, { stamp: string; levels: CovariateLevels }>();
  levelsCache.set(store, cache);
  const key = `${studyId}:${maxLevels}`;
  const stamp = studyChangeStamp(store, studyId);
  const hit = cache.get(key);
  if (hit && hit.stamp === stamp) return structuredClone(hit.levels);
  const levels = readCovariateLevels(store, studyId, maxLevels);
  cache.set(key, { stamp, levels: structuredClone(levels) });
  return levels;
}

function readCovariateLevels(store: Store, studyId: number, maxLevels: number): CovariateLevels {
  const rows = store.db
    .prepare(
      `SELECT j.key AS name, CAST(j.value AS TEXT) AS value, j.type AS type, COUNT(*) AS n FROM documents d, json_each(d.covariates) j
       WHERE d.study_id = ? AND j.value IS NOT NULL GROUP BY j.key, CAST(j.value AS TEXT) ORDER BY j.key, n DESC`,
    )
    .all(studyId) as { name: string; value: string; type: string; n: number }[];
  const out: CovariateLevels = {};
  for (const r of rows) {
    const e = (out[r.name] ??= { values: [], numeric: true, distinct: 0 });
    e.distinct++;
    if (r.type !== 'integer' && r.type !== 'real') e.numeric = false;
    if (e.values.length < maxLevels) e.values.push(r.value);
  }
  return out;
}
