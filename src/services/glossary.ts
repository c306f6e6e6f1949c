// Importing a researcher's glossary into a study as link groups (docs/design.md §3, issue 12): each row
// (one concept) becomes one link group, with one tiny document per language holding that
// language's terms. The tiny documents go through the study's token step exactly as answers do,
// so a glossary term gets the same stem id as the same word in an answer, and the fit (which
// reads every document with tokens) ties the languages together through them. They belong to an
// import of kind 'glossary', which the store leaves out of everything that counts answers.
// Glossary rows as extra bilingual "documents" follow "Polylingual Topic Models" (EMNLP 2009),
// whose tuples may be any comparable texts; a dictionary row is the shortest such tuple.
import { getStudy, getStudyByName, glossaryCounts, inTransaction, insertDocuments, insertImport, languageSummary, listImports, setImportSummary, type Store } from '../store/index.js';
import { readGlossaryTable } from '../text/index.js';
import { InputError, type TableFormat } from '../text/index.js';
import { readInputTable } from './text-pipeline.js';
import { applyVocabulary, planVocabulary, rebuildVocabulary, studyStamp } from './vocabulary.js';

export interface GlossaryOptions {
  /** Study name or id; the study must exist (its languages decide which columns are valid). */
  study: string | number;
  bytes: Uint8Array;
  fileName: string;
  sheet?: string;
}

export interface GlossarySummary {
  readonly studyId: number;
  readonly studyName: string;
  readonly importId: number;
  readonly fileName: string;
  readonly format: TableFormat;
  readonly encoding: string;
  readonly delimiter?: string;
  readonly sheet?: string;
  /** Data rows read from the file. */
  readonly rows: number;
  /** Rows with terms in at least two languages: one link group each. */
  readonly linkGroups: number;
  /** Data rows left out because they have terms in one language only. */
  readonly singleLanguageRows: number[];
  /** Header → language, in column order. */
  readonly columns: { column: string; language: string }[];
  /** Terms (synonyms counted one by one) per language. */
  readonly termsPerLanguage: Record<string, number>;
  /** Tiny documents (cells) per language, and those whose words reached the vocabulary. */
  readonly documentsPerLanguage: Record<string, number>;
  readonly withWordsPerLanguage: Record<string, number>;
  /** Link groups with words in at least two languages after the token step. */
  readonly linkingRows: number;
}

/** The link key of glossary row `row` of import `importId`. */
export function glossaryLinkKey(importId: number, row: number): string {
  return `glossary:${importId}:${row}`;
}

/** Text of a tiny document: the cell's synonyms, one phrase each (punctuation is dropped by the tokenizer). */
function tinyText(terms: readonly string[]): string {
  return terms.join('; ');
}

function requireGlossaryStudy(store: Store, study: string | number) {
  const found = typeof study === 'number' ? getStudy(store, study) : getStudyByName(store, study.trim());
  if (!found) {
    throw new InputError(
      typeof study === 'number' ? `There is no study with id ${study}.` : `There is no study called "${study}". Import its answers first (themata import FILE --study "${study}"), then the glossary.`,
    );
  }
  return found;
}

/** Import a glossary file into an existing study; one transaction, nothing written on an InputError. */
export async function importGlossary(store: Store, options: GlossaryOptions): Promise<GlossarySummary> {
  const study = requireGlossaryStudy(store, options.study);
  const table = await readInputTable(options.bytes, options.fileName, options.sheet);
  const found = languageSummary(store, study.id).map((r) => r.language).filter((l): l is string => l !== null);
  const languages = [...new Set([...study.languages, ...found])];
  if (languages.length === 0) throw new InputError(`Study "${study.name}" has no languages yet: import its answers first, then the glossary.`, options.fileName);
  const glossary = readGlossaryTable(table, languages);

  const termsPerLanguage: Record<string, number> = {};
  const docs = glossary.rows.flatMap((r) =>
    r.terms.map((t) => {
      termsPerLanguage[t.language] = (termsPerLanguage[t.language] ?? 0) + t.terms.length;
      return { row: r.row, language: t.language, text: tinyText(t.terms), reference: true };
    }),
  );
  // The token step over the whole study runs before the write lock, as for answers (import-file.ts).
  const plan = planVocabulary(store, study.id, docs);
  return inTransaction(store, () => {
    const stampBefore = studyStamp(store, study.id);
    const importId = insertImport(store, {
      studyId: study.id,
      kind: 'glossary',
      fileName: options.fileName,
      format: table.format,
      bytes: options.bytes,
      encoding: table.assumed.encoding,
      mapping: { text: [], covariates: [] },
    });
    const ids = insertDocuments(
      store,
      study.id,
      importId,
      docs.map((d) => ({
        rowId: String(d.row),
        question: 'glossary',
        text: d.text,
        language: d.language,
        languageSource: 'declared' as const,
        confidence: 1,
        declaredLanguage: d.language,
        writtenLanguage: null,
        linkKey: glossaryLinkKey(importId, d.row),
        covariates: {},
        weight: 1,
        excluded: null,
      })),
    );
    if (stampBefore !== plan.stamp) rebuildVocabulary(store, study.id);
    else applyVocabulary(store, study.id, plan, ids);
    const counts = glossaryCounts(store, study.id).find((g) => g.importId === importId);
    const summary: GlossarySummary = {
      studyId: study.id,
      studyName: study.name,
      importId,
      fileName: options.fileName,
      format: table.format,
      encoding: table.assumed.encoding,
      ...(table.assumed.delimiter !== undefined ? { delimiter: table.assumed.delimiter } : {}),
      ...(table.assumed.sheet !== undefined ? { sheet: table.assumed.sheet } : {}),
      rows: table.rows.length,
      linkGroups: glossary.rows.length,
      singleLanguageRows: glossary.singleLanguageRows,
      columns: glossary.columns.map((c) => ({ column: c.column, language: c.language })),
      termsPerLanguage,
      documentsPerLanguage: counts?.documents ?? {},
      withWordsPerLanguage: counts?.withWords ?? {},
      linkingRows: counts?.linkingRows ?? 0,
    };
    setImportSummary(store, importId, summary);
    return summary;
  });
}

/** One glossary import as the Data page and the CLI show it. */
export interface GlossaryListing {
  readonly importId: number;
  readonly fileName: string;
  readonly format: string;
  readonly size: number;
  readonly createdAt: string;
  readonly rows: number;
  readonly linkGroups: number;
  readonly linkingRows: number;
  readonly columns: { column: string; language: string }[];
  readonly termsPerLanguage: Record<string, number>;
  /** Current counts (the vocabulary may have changed since the import). */
  readonly documentsPerLanguage: Record<string, number>;
  readonly withWordsPerLanguage: Record<string, number>;
}

/** Every glossary import of the study, oldest first, with today's counts. */
export function listGlossaries(store: Store, studyId: number): GlossaryListing[] {
  const counts = new Map(glossaryCounts(store, studyId).map((g) => [g.importId, g]));
  return listImports(store, studyId, 'glossary').map((i) => {
    const s = i.summary as Partial<GlossarySummary>;
    const c = counts.get(i.id);
    return {
      importId: i.id,
      fileName: i.fileName,
      format: i.format,
      size: i.size,
      createdAt: i.createdAt,
      rows: s.rows ?? 0,
      linkGroups: s.linkGroups ?? 0,
      linkingRows: c?.linkingRows ?? 0,
      columns: s.columns ?? [],
      termsPerLanguage: s.termsPerLanguage ?? {},
      documentsPerLanguage: c?.documents ?? {},
      withWordsPerLanguage: c?.withWords ?? {},
    };
  });
}

/** Per language, over all glossaries of the study: terms, tiny documents, and those with words. */
export function glossaryTermsByLanguage(store: Store, studyId: number): Record<string, { terms: number; documents: number; withWords: number }> {
  const out: Record<string, { terms: number; documents: number; withWords: number }> = {};
  for (const g of listGlossaries(store, studyId)) {
    for (const [language, n] of Object.entries(g.termsPerLanguage)) (out[language] ??= { terms: 0, documents: 0, withWords: 0 }).terms += n;
    for (const [language, n] of Object.entries(g.documentsPerLanguage)) (out[language] ??= { terms: 0, documents: 0, withWords: 0 }).documents += n;
    for (const [language, n] of Object.entries(g.withWordsPerLanguage)) (out[language] ??= { terms: 0, documents: 0, withWords: 0 }).withWords += n;
  }
  return out;
}
