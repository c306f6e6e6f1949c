// Per-language vocabularies of a study (stem id → stem, most frequent surface form, counts) and
// the study's own stop-word lists.
import type { LanguageVocabulary } from '../text/index.js';
import { inTransaction, type Store } from './database.js';

export interface VocabularyWord {
  readonly wordId: number;
  readonly stem: string;
  readonly surface: string;
  readonly count: number;
  readonly docCount: number;
}

/** Replace every vocabulary of the study (one transaction). */
export function replaceVocabularies(store: Store, studyId: number, vocabularies: readonly LanguageVocabulary[]): void {
  const del = store.db.prepare('DELETE FROM vocabularies WHERE study_id = ?');
  const ins = store.db.prepare('INSERT INTO vocabularies (study_id, language, word_id, stem, surface, count, doc_count) VALUES (?, ?, ?, ?, ?, ?, ?)');
  inTransaction(store, () => {
    del.run(studyId);
    for (const v of vocabularies) {
      for (let w = 0; w < v.stems.length; w++) ins.run(studyId, v.language, w, v.stems[w], v.surfaces[w] ?? v.stems[w], v.counts[w] ?? 0, v.docCounts[w] ?? 0);
    }
  });
}

/** Vocabulary sizes and token totals per language. */
export function vocabularySizes(store: Store, studyId: number): { language: string; words: number; tokens: number }[] {
  return store.db
    .prepare('SELECT language, COUNT(*) AS words, SUM(count) AS tokens FROM vocabularies WHERE study_id = ? GROUP BY language ORDER BY language')
    .all(studyId) as { language: string; words: number; tokens: number }[];
}

/** Most frequent words of one language (by token count). */
export function topWords(store: Store, studyId: number, language: string, page: { limit?: number; offset?: number; search?: string } = {}): VocabularyWord[] {
  const search = page.search ? 'AND (instr(unicode_lower(stem), unicode_lower(@search)) > 0 OR instr(unicode_lower(surface), unicode_lower(@search)) > 0)' : '';
  return store.db
    .prepare(
      `SELECT word_id AS wordId, stem, surface, count, doc_count AS docCount FROM vocabularies
       WHERE study_id = @study AND language = @language ${search} ORDER BY count DESC, word_id LIMIT @limit OFFSET @offset`,
    )
    .all({ study: studyId, language, limit: page.limit ?? 50, offset: page.offset ?? 0, ...(page.search ? { search: page.search } : {}) }) as VocabularyWord[];
}

/** The whole vocabulary of one language as arrays indexed by word id. */
export function loadVocabulary(store: Store, studyId: number, language: string): LanguageVocabulary {
  const rows = store.db
    .prepare('SELECT word_id, stem, surface, count, doc_count FROM vocabularies WHERE study_id = ? AND language = ? ORDER BY word_id')
    .all(studyId, language) as { word_id: number; stem: string; surface: string; count: number; doc_count: number }[];
  const n = rows.length ? rows[rows.length - 1].word_id + 1 : 0;
  const stems = new Array<string>(n).fill('');
  const surfaces = new Array<string>(n).fill('');
  const counts = new Int32Array(n);
  const docCounts = new Int32Array(n);
  for (const r of rows) {
    stems[r.word_id] = r.stem;
    surfaces[r.word_id] = r.surface;
    counts[r.word_id] = r.count;
    docCounts[r.word_id] = r.doc_count;
  }
  return { language, stems, surfaces, counts, docCounts };
}

/** The study's own stop words, per language ('*' = every language). */
export function getStudyWordLists(store: Store, studyId: number): Record<string, string[]> {
  const rows = store.db.prepare('SELECT language, word FROM study_word_lists WHERE study_id = ? ORDER BY language, word').all(studyId) as { language: string; word: string }[];
  const out: Record<string, string[]> = {};
  for (const r of rows) (out[r.language] ??= []).push(r.word);
  return out;
}

/** Replace the study's own stop words for one language (one transaction). */
export function setStudyWordList(store: Store, studyId: number, language: string, words: readonly string[]): void {
  inTransaction(store, () => {
    store.db.prepare('DELETE FROM study_word_lists WHERE study_id = ? AND language = ?').run(studyId, language);
    const ins = store.db.prepare('INSERT OR IGNORE INTO study_word_lists (study_id, language, word) VALUES (?, ?, ?)');
    for (const w of words) {
      const word = w.trim();
      if (word) ins.run(studyId, language, word);
    }
  });
}
