// How a study's languages are tied together (docs/design.md §3, issue 12): link groups of answers (a
// shared link key across languages: translations, paired texts) and rows of an imported
// glossary. Without either, nothing in the fit makes a theme mean the same in every language.
import type { Store } from './database.js';

export interface LinkSummary {
  /** Languages with included answers that have words. */
  readonly languages: number;
  /** Included answers that carry a link key. */
  readonly linkedAnswers: number;
  /** Link groups of answers whose members with words are in at least two languages. */
  readonly answerGroupsAcrossLanguages: number;
  /** Glossary rows with words in at least two languages. */
  readonly glossaryRowsAcrossLanguages: number;
}

/** Glossary imports exist once the store has the imports.kind column (migration 6). */
function hasImportKinds(store: Store): boolean {
  const cols = store.db.prepare('PRAGMA table_info(imports)').all() as { name: string }[];
  return cols.some((c) => c.name === 'kind');
}

export function linkSummary(store: Store, studyId: number): LinkSummary {
  const kinds = hasImportKinds(store);
  const glossary = kinds ? "import_id IN (SELECT id FROM imports WHERE kind = 'glossary')" : '0';
  const answers = `NOT (${glossary})`;
  const usable = 'excluded IS NULL AND tokens IS NOT NULL AND vocabulary_language IS NOT NULL';
  const one = (sql: string) => (store.db.prepare(sql).pluck().get(studyId) as number | null) ?? 0;
  return {
    languages: one(`SELECT COUNT(DISTINCT vocabulary_language) FROM documents WHERE study_id = ? AND ${usable} AND ${answers}`),
    linkedAnswers: one(`SELECT COUNT(*) FROM documents WHERE study_id = ? AND ${usable} AND ${answers} AND link_key IS NOT NULL`),
    answerGroupsAcrossLanguages: one(
      `SELECT COUNT(*) FROM (SELECT link_key FROM documents WHERE study_id = ? AND ${usable} AND ${answers} AND link_key IS NOT NULL
         GROUP BY link_key HAVING COUNT(DISTINCT vocabulary_language) >= 2)`,
    ),
    glossaryRowsAcrossLanguages: kinds
      ? one(
          `SELECT COUNT(*) FROM (SELECT import_id, link_key FROM documents WHERE study_id = ? AND ${usable} AND ${glossary}
             GROUP BY import_id, link_key HAVING COUNT(DISTINCT vocabulary_language) >= 2)`,
        )
      : 0,
  };
}

/** Ids of the study's glossary documents (tiny documents of glossary rows); empty without glossaries. */
export function glossaryDocumentIds(store: Store, studyId: number): Set<number> {
  if (!hasImportKinds(store)) return new Set();
  const ids = store.db
    .prepare("SELECT id FROM documents WHERE study_id = ? AND import_id IN (SELECT id FROM imports WHERE kind = 'glossary')")
    .pluck()
    .all(studyId) as number[];
  return new Set(ids);
}
