// Glossary imports (docs/design.md §3): each row of a researcher's term list is a link group of tiny
// documents, one per language. These counts say how much of each glossary reached the fit: a
// cell whose words are all stop words or pruned away has no tokens and links nothing.
import type { Store } from './database.js';

export interface GlossaryCounts {
  readonly importId: number;
  /** Tiny documents (non-empty cells) per language. */
  readonly documents: Record<string, number>;
  /** Of those, the ones with words in the study's vocabulary (what the fit sees). */
  readonly withWords: Record<string, number>;
  /** Rows with words in at least two languages: the link groups that tie languages together. */
  readonly linkingRows: number;
}

const GLOSSARY = "import_id IN (SELECT id FROM imports WHERE kind = 'glossary')";

/** Per glossary import of the study: documents and documents with words per language, linking rows. */
export function glossaryCounts(store: Store, studyId: number): GlossaryCounts[] {
  const perLanguage = store.db
    .prepare(
      `SELECT import_id AS importId, language, COUNT(*) AS n, SUM(excluded IS NULL AND tokens IS NOT NULL) AS words
       FROM documents WHERE study_id = ? AND ${GLOSSARY} GROUP BY import_id, language ORDER BY import_id, language`,
    )
    .all(studyId) as { importId: number; language: string | null; n: number; words: number }[];
  const linking = store.db
    .prepare(
      `SELECT import_id AS importId, COUNT(*) AS n FROM (
         SELECT import_id, link_key FROM documents WHERE study_id = ? AND ${GLOSSARY} AND excluded IS NULL AND tokens IS NOT NULL
         GROUP BY import_id, link_key HAVING COUNT(DISTINCT vocabulary_language) >= 2)
       GROUP BY import_id`,
    )
    .all(studyId) as { importId: number; n: number }[];
  const out = new Map<number, { importId: number; documents: Record<string, number>; withWords: Record<string, number>; linkingRows: number }>();
  const entry = (importId: number) => {
    let e = out.get(importId);
    if (!e) out.set(importId, (e = { importId, documents: {}, withWords: {}, linkingRows: 0 }));
    return e;
  };
  for (const r of perLanguage) {
    const e = entry(r.importId);
    const language = r.language ?? 'undetermined';
    e.documents[language] = r.n;
    e.withWords[language] = r.words;
  }
  for (const r of linking) entry(r.importId).linkingRows = r.n;
  return [...out.values()];
}
