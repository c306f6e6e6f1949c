// Deleting a study, an import or a run removes every row that hangs on it, leaves the database
// sound, and leaves no copy of the deleted answers in the data file (OWASP ASVS 4.0.3 V8.3.2).
// "Every row that hangs on it" is found from the schema itself: every table whose foreign key
// points at the deleted table, followed transitively, so a table added later is covered too.
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type BetterSqlite3 from 'better-sqlite3';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createFitRun, importFile, planImportRemoval, removeImport, removeRun, removeStudy, runFitJob } from '../../src/services/index.js';
import {
  addStudyMember,
  createAccount,
  getStudyByName,
  listImports,
  openStore,
  saveCheckpoint,
  saveRunExport,
  setStudyWordList,
  setThemeLabel,
  type Store,
} from '../../src/store/index.js';
import { InputError } from '../../src/text/types.js';
import { tempDir } from '../store/helpers.js';

const STUDY_MARK = 'zqxstudyonly';
const IMPORT_MARK = 'qzvimportonly';

let t: ReturnType<typeof tempDir>;
let store: Store;
beforeEach(() => {
  t = tempDir('themata-deletion-');
  store = openStore(t.dir);
});
afterEach(() => {
  store.close();
  t.cleanup();
});

function csv(rows: number, mark: string, prefix: string): Uint8Array {
  const lines = ['id,answer,region'];
  const topics = ['the opening hours are too short', 'the staff were kind and helpful', 'more books for children please', 'the wifi keeps dropping out'];
  for (let i = 0; i < rows; i++) lines.push(`${prefix}${i},"${topics[i % 4]} ${mark}${i % 5} and ${topics[(i + 1) % 4]}",${['north', 'south'][i % 2]}`);
  return new TextEncoder().encode(lines.join('\n') + '\n');
}

const mapping = { text: ['answer'], id: 'id', covariates: [{ column: 'region', type: 'categorical' as const }] };

async function importInto(study: string, rows: number, mark: string, fileName: string): Promise<number> {
  await importFile(store, { study, bytes: csv(rows, mark, fileName), fileName, mapping });
  const s = getStudyByName(store, study)!;
  return s.id;
}

/** A finished run with a label, an exported file and a checkpoint kept beside its results. */
async function fullRun(studyId: number, name: string, mark = 'exportedwords'): Promise<number> {
  const run = createFitRun(store, studyId, { themes: 3, sweeps: 8, burnIn: 2, seed: 3, sampler: 'reference', covariates: ['region'], holdout: 0.1, name });
  await runFitJob({ store, runId: run.id });
  setThemeLabel(store, run.id, 0, 'Opening hours');
  saveRunExport(store, run.id, 'answers-by-theme.csv', 'text/csv', new TextEncoder().encode(`id,text\n1,${mark}\n`));
  saveCheckpoint(store, run.id, 4, new Uint8Array([1, 2, 3, 4]));
  return run.id;
}

/** Where rows pointing at a deleted row could be: a table, its foreign-key columns, and the key values. */
interface Probe {
  readonly table: string;
  readonly columns: string[];
  readonly keys: unknown[][];
}

function tablesOf(db: BetterSqlite3.Database): string[] {
  return (db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%'").all() as { name: string }[]).map((r) => r.name);
}

/** A table's foreign keys, one entry per key (composite keys keep their column order). */
function foreignKeys(db: BetterSqlite3.Database, table: string): { parent: string; from: string[]; to: string[] }[] {
  const rows = db.prepare(`PRAGMA foreign_key_list("${table}")`).all() as { id: number; seq: number; table: string; from: string; to: string | null }[];
  const byId = new Map<number, typeof rows>();
  for (const r of rows) byId.set(r.id, [...(byId.get(r.id) ?? []), r]);
  return [...byId.values()].map((group) => {
    group.sort((a, b) => a.seq - b.seq);
    const parent = group[0].table;
    const pk = (db.prepare(`PRAGMA table_info("${parent}")`).all() as { name: string; pk: number }[]).filter((c) => c.pk > 0).sort((a, b) => a.pk - b.pk).map((c) => c.name);
    return { parent, from: group.map((g) => g.from), to: group.map((g, i) => g.to ?? pk[i]) };
  });
}

function matching(db: BetterSqlite3.Database, probe: Probe, what: string): unknown[] {
  const where = probe.columns.map((c, i) => `t."${c}" = json_extract(j.value, '$[${i}]')`).join(' AND ');
  return db.prepare(`SELECT ${what} FROM "${probe.table}" t WHERE EXISTS (SELECT 1 FROM json_each(?) j WHERE ${where})`).all(JSON.stringify(probe.keys));
}

/**
 * Every table whose rows point (through a foreign key, transitively) at `table`'s rows `ids`,
 * found from the schema itself, so a table added later is covered without changing this test.
 */
function references(db: BetterSqlite3.Database, table: string, ids: readonly number[]): Probe[] {
  const probes: Probe[] = [];
  const visit = (parent: string, parentRows: Record<string, unknown>[], depth: number) => {
    if (depth > 6) return;
    for (const child of tablesOf(db)) {
      for (const fk of foreignKeys(db, child).filter((k) => k.parent === parent)) {
        const probe = { table: child, columns: fk.from, keys: parentRows.map((r) => fk.to.map((c) => r[c])) };
        probes.push(probe);
        visit(child, matching(db, probe, 't.*') as Record<string, unknown>[], depth + 1);
      }
    }
  };
  visit(table, db.prepare(`SELECT * FROM "${table}" WHERE id IN (SELECT value FROM json_each(?))`).all(JSON.stringify(ids)) as Record<string, unknown>[], 0);
  return probes;
}

/** Rows found by each probe, keyed "table.column[,column]". */
function referencingRows(db: BetterSqlite3.Database, probes: readonly Probe[]): Record<string, number> {
  const out: Record<string, number> = {};
  for (const p of probes) {
    const key = `${p.table}.${p.columns.join(',')}`;
    out[key] = (out[key] ?? 0) + (p.keys.length ? (matching(db, p, 'COUNT(*) AS n')[0] as { n: number }).n : 0);
  }
  return out;
}

function total(counts: Record<string, number>): number {
  return Object.values(counts).reduce((a, b) => a + b, 0);
}

function foreignKeyProblems(db: BetterSqlite3.Database): unknown[] {
  return db.prepare('PRAGMA foreign_key_check').all();
}

/** Whether the data file (and its WAL, if any) holds `text` anywhere, in any page, free or not. */
function fileHolds(text: string): boolean {
  const file = join(t.dir, 'themata.sqlite');
  const parts = [readFileSync(file)];
  if (existsSync(`${file}-wal`)) parts.push(readFileSync(`${file}-wal`));
  return parts.some((b) => b.includes(text));
}

describe('deleting data for good (ASVS V8.3.2)', () => {
  it('deletes a study with every row that references it, keeps another study whole, and leaves no trace of its answers in the file', { timeout: 60_000 }, async () => {
    const doomed = await importInto('Doomed', 60, STUDY_MARK, 'doomed.csv');
    await importInto('Doomed', 20, STUDY_MARK, 'doomed-2.csv');
    setStudyWordList(store, doomed, 'en', ['library']);
    const ana = createAccount(store, 'ana', 'ana has a long password');
    addStudyMember(store, doomed, ana.id, 'owner');
    await fullRun(doomed, 'k3', STUDY_MARK);
    const kept = await importInto('Kept', 40, 'keptwords', 'kept.csv');
    addStudyMember(store, kept, ana.id, 'owner');
    const keptRun = await fullRun(kept, 'k3');
    const keptProbes = references(store.db, 'studies', [kept]);
    const keptBefore = referencingRows(store.db, keptProbes);
    const probes = references(store.db, 'studies', [doomed]);
    const before = referencingRows(store.db, probes);
    // Every table with a foreign key is reached from studies (directly or through another table),
    // except those that hang on accounts only (sessions).
    const probed = new Set(probes.map((p) => p.table));
    const study = tablesOf(store.db).filter((x) => foreignKeys(store.db, x).some((k) => k.parent !== 'accounts'));
    expect(study).toContain('run_results');
    for (const table of study) expect(probed.has(table), table).toBe(true);
    // The fixture reaches every kind of row a study can own.
    for (const key of ['imports.study_id', 'documents.study_id', 'vocabularies.study_id', 'study_word_lists.study_id', 'runs.study_id', 'run_results.run_id', 'run_checkpoints.run_id', 'theme_labels.run_id', 'run_exports.run_id', 'study_members.study_id']) {
      expect(before[key], key).toBeGreaterThan(0);
    }
    expect(fileHolds(STUDY_MARK)).toBe(true);

    const outcome = await removeStudy(store, doomed);
    expect(outcome.message).toMatch(/^Deleted study "Doomed": 2 imported files .*, 80 answers, .*1 run with \d+ stored results, 1 checkpoint, 1 theme label and 1 exported file, 1 membership\.$/);

    expect(getStudyByName(store, 'Doomed')).toBeUndefined();
    const after = referencingRows(store.db, probes);
    expect(total(after), JSON.stringify(after)).toBe(0);
    expect(referencingRows(store.db, keptProbes)).toEqual(keptBefore);
    expect(foreignKeyProblems(store.db)).toEqual([]);
    expect(store.db.pragma('integrity_check', { simple: true })).toBe('ok');
    expect(outcome.walTruncated).toBe(true);
    expect(fileHolds(STUDY_MARK)).toBe(false);
    expect(fileHolds('keptwords')).toBe(true);
    expect(keptRun).toBeGreaterThan(0);
  });

  it('deletes a run with its checkpoints, results, labels and exports, and nothing of its study', { timeout: 60_000 }, async () => {
    const study = await importInto('S', 50, 'somewords', 's.csv');
    const gone = await fullRun(study, 'gone');
    const stays = await fullRun(study, 'stays');
    const staysProbes = references(store.db, 'runs', [stays]);
    const staysBefore = referencingRows(store.db, staysProbes);
    const goneProbes = references(store.db, 'runs', [gone]);
    const documents = listImports(store, study)[0].documents;
    expect(total(referencingRows(store.db, goneProbes))).toBeGreaterThan(0);
    const outcome = await removeRun(store, gone);
    expect(outcome.message).toMatch(/^Deleted run "gone" of study "S": \d+ stored results, 1 checkpoint, 1 theme label and 1 exported file\.$/);
    expect(total(referencingRows(store.db, goneProbes))).toBe(0);
    expect(store.db.prepare('SELECT COUNT(*) AS n FROM runs WHERE id = ?').get(gone)).toEqual({ n: 0 });
    expect(referencingRows(store.db, staysProbes)).toEqual(staysBefore);
    expect(listImports(store, study)[0].documents).toBe(documents);
    expect(foreignKeyProblems(store.db)).toEqual([]);
  });

  it('refuses to delete an import a run was fitted on, naming the run; once the run is gone it deletes the import and its answers for good', { timeout: 60_000 }, async () => {
    const study = await importInto('S', 50, 'firstwords', 'first.csv');
    await importInto('S', 30, IMPORT_MARK, 'second.csv');
    const second = listImports(store, study).find((i) => i.fileName === 'second.csv')!;
    const run = await fullRun(study, 'on both');
    const plan = planImportRemoval(store, second.id);
    expect(plan.usedBy).toEqual(['on both']);
    await expect(removeImport(store, second.id)).rejects.toThrow(InputError);
    await expect(removeImport(store, second.id)).rejects.toThrow(/Run "on both" was fitted on answers of second\.csv\. Delete that run first/);
    expect(listImports(store, study)).toHaveLength(2);

    await removeRun(store, run);
    const importProbes = references(store.db, 'imports', [second.id]);
    expect(total(referencingRows(store.db, importProbes))).toBe(30);
    const outcome = await removeImport(store, second.id);
    expect(outcome.message).toBe('Deleted second.csv from study "S": the original file and 30 answers; the study\'s vocabulary was rebuilt without them.');
    expect(total(referencingRows(store.db, importProbes))).toBe(0);
    expect(listImports(store, study).map((i) => [i.fileName, i.documents])).toEqual([['first.csv', 50]]);
    // The vocabulary no longer counts the deleted answers' words.
    expect(store.db.prepare("SELECT COUNT(*) AS n FROM vocabularies WHERE study_id = ? AND surface LIKE ?").get(study, `${IMPORT_MARK}%`)).toEqual({ n: 0 });
    expect(foreignKeyProblems(store.db)).toEqual([]);
    expect(fileHolds(IMPORT_MARK)).toBe(false);
    expect(fileHolds('firstwords')).toBe(true);
  });

  it('allows deleting an import that only a run fitted before it was made knows nothing of', { timeout: 60_000 }, async () => {
    const study = await importInto('S', 50, 'firstwords', 'first.csv');
    await fullRun(study, 'before');
    await importInto('S', 20, 'laterwords', 'later.csv');
    const later = listImports(store, study).find((i) => i.fileName === 'later.csv')!;
    expect(planImportRemoval(store, later.id).refusal).toBeNull();
    await removeImport(store, later.id);
    expect(listImports(store, study)).toHaveLength(1);
  });
});
