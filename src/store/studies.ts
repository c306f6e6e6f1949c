// Studies: a name, declared languages and settings (pipeline settings and anything else the
// workbench keeps per study), with sizes and last activity for the studies list.
import { inTransaction, now, type Store } from './database.js';

export interface Study {
  readonly id: number;
  readonly name: string;
  /** Declared languages (BCP 47 subtags), may be empty = any supported language. */
  readonly languages: string[];
  readonly settings: Record<string, unknown>;
  readonly createdAt: string;
  readonly updatedAt: string;
}

export interface StudyListItem extends Study {
  readonly documents: number;
  readonly imports: number;
  readonly runs: number;
  readonly languagesFound: string[];
  /** Latest of: study update, import, run created/finished. */
  readonly lastActivity: string;
}

interface StudyRow {
  id: number;
  name: string;
  languages: string;
  settings: string;
  created_at: string;
  updated_at: string;
}

function toStudy(row: StudyRow): Study {
  return {
    id: row.id,
    name: row.name,
    languages: JSON.parse(row.languages) as string[],
    settings: JSON.parse(row.settings) as Record<string, unknown>,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

export function createStudy(store: Store, input: { name: string; languages?: string[]; settings?: Record<string, unknown> }): Study {
  const t = now();
  const info = store.db
    .prepare('INSERT INTO studies (name, languages, settings, created_at, updated_at) VALUES (?, ?, ?, ?, ?)')
    .run(input.name, JSON.stringify(input.languages ?? []), JSON.stringify(input.settings ?? {}), t, t);
  return getStudy(store, Number(info.lastInsertRowid))!;
}

export function getStudy(store: Store, id: number): Study | undefined {
  const row = store.db.prepare('SELECT * FROM studies WHERE id = ?').get(id) as StudyRow | undefined;
  return row ? toStudy(row) : undefined;
}

export function getStudyByName(store: Store, name: string): Study | undefined {
  const row = store.db.prepare('SELECT * FROM studies WHERE name = ?').get(name) as StudyRow | undefined;
  return row ? toStudy(row) : undefined;
}

/** Studies with their sizes, newest activity first. `accountId` limits to that account's studies. */
export function listStudies(store: Store, options: { accountId?: number } = {}): StudyListItem[] {
  const filter = options.accountId === undefined ? '' : 'WHERE s.id IN (SELECT study_id FROM study_members WHERE account_id = @account)';
  const rows = store.db
    .prepare(
      `SELECT s.*,
        (SELECT COUNT(*) FROM documents d WHERE d.study_id = s.id AND d.import_id NOT IN (SELECT id FROM imports WHERE kind = 'glossary')) AS documents,
        (SELECT COUNT(*) FROM imports i WHERE i.study_id = s.id) AS imports,
        (SELECT COUNT(*) FROM runs r WHERE r.study_id = s.id) AS runs,
        (SELECT json_group_array(language) FROM (SELECT DISTINCT language FROM documents d
            WHERE d.study_id = s.id AND language IS NOT NULL ORDER BY language)) AS languages_found,
        MAX(s.updated_at,
            COALESCE((SELECT MAX(created_at) FROM imports i WHERE i.study_id = s.id), ''),
            COALESCE((SELECT MAX(MAX(created_at, COALESCE(finished_at, ''))) FROM runs r WHERE r.study_id = s.id), '')) AS last_activity
       FROM studies s ${filter} ORDER BY last_activity DESC, s.id DESC`,
    )
    .all(options.accountId === undefined ? {} : { account: options.accountId }) as (StudyRow & {
    documents: number;
    imports: number;
    runs: number;
    languages_found: string;
    last_activity: string;
  })[];
  return rows.map((row) => ({
    ...toStudy(row),
    documents: row.documents,
    imports: row.imports,
    runs: row.runs,
    languagesFound: JSON.parse(row.languages_found) as string[],
    lastActivity: row.last_activity,
  }));
}

export function updateStudy(store: Store, id: number, patch: { name?: string; languages?: string[]; settings?: Record<string, unknown> }): Study {
  const current = getStudy(store, id);
  if (!current) throw new Error(`No study with id ${id}.`);
  store.db
    .prepare('UPDATE studies SET name = ?, languages = ?, settings = ?, updated_at = ? WHERE id = ?')
    .run(patch.name ?? current.name, JSON.stringify(patch.languages ?? current.languages), JSON.stringify(patch.settings ?? current.settings), now(), id);
  return getStudy(store, id)!;
}

/** Mark the study as changed now (imports, overrides). */
export function touchStudy(store: Store, id: number): void {
  store.db.prepare('UPDATE studies SET updated_at = ? WHERE id = ?').run(now(), id);
}

/** Delete a study and everything in it (imports, documents, runs…) in one transaction. */
export function deleteStudy(store: Store, id: number): void {
  inTransaction(store, () => {
    store.db.prepare('DELETE FROM studies WHERE id = ?').run(id);
  });
}

/** What deleting a study removes, counted per kind. */
export interface StudyContents {
  readonly imports: number;
  /** Bytes of the original files kept with the imports. */
  readonly originalBytes: number;
  readonly answers: number;
  readonly vocabularyWords: number;
  readonly ownWords: number;
  readonly runs: number;
  readonly checkpoints: number;
  readonly results: number;
  readonly labels: number;
  readonly exports: number;
  readonly members: number;
}

export function studyContents(store: Store, studyId: number): StudyContents {
  const row = store.db
    .prepare(
      `SELECT
        (SELECT COUNT(*) FROM imports WHERE study_id = @id) AS imports,
        (SELECT COALESCE(SUM(size), 0) FROM imports WHERE study_id = @id) AS originalBytes,
        (SELECT COUNT(*) FROM documents WHERE study_id = @id AND import_id NOT IN (SELECT id FROM imports WHERE kind = 'glossary')) AS answers,
        (SELECT COUNT(*) FROM vocabularies WHERE study_id = @id) AS vocabularyWords,
        (SELECT COUNT(*) FROM study_word_lists WHERE study_id = @id) AS ownWords,
        (SELECT COUNT(*) FROM runs WHERE study_id = @id) AS runs,
        (SELECT COUNT(*) FROM run_checkpoints WHERE run_id IN (SELECT id FROM runs WHERE study_id = @id)) AS checkpoints,
        (SELECT COUNT(*) FROM run_results WHERE run_id IN (SELECT id FROM runs WHERE study_id = @id)) AS results,
        (SELECT COUNT(*) FROM theme_labels WHERE run_id IN (SELECT id FROM runs WHERE study_id = @id)) AS labels,
        (SELECT COUNT(*) FROM run_exports WHERE run_id IN (SELECT id FROM runs WHERE study_id = @id)) AS exports,
        (SELECT COUNT(*) FROM study_members WHERE study_id = @id) AS members`,
    )
    .get({ id: studyId }) as StudyContents;
  return { ...row };
}
