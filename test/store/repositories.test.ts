import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import * as S from '../../src/store/index.js';
import { withTempStore } from './helpers.js';

let ctx: ReturnType<typeof withTempStore>;
beforeEach(() => (ctx = withTempStore()));
afterEach(() => ctx.cleanup());

const mapping = { text: ['answer'], covariates: [{ column: 'region', type: 'categorical' as const }] };

function doc(rowId: string, language: string | null, extra: Partial<S.NewDocument> = {}): S.NewDocument {
  return { rowId, question: 'answer', text: `text ${rowId}`, language, languageSource: language ? 'detected' : 'undetermined', confidence: language ? 0.95 : 0.1, covariates: { region: 'North', age: 31 }, weight: 1, ...extra };
}

describe('studies, imports and documents', () => {
  it('lists studies with sizes, languages found and last activity', () => {
    const a = S.createStudy(ctx.store, { name: 'Alpha', languages: ['en', 'es'] });
    const beta = S.createStudy(ctx.store, { name: 'Beta' });
    ctx.store.db.prepare("UPDATE studies SET updated_at = '2020-01-01T00:00:00.000Z' WHERE id = ?").run(beta.id);
    const imp = S.insertImport(ctx.store, { studyId: a.id, fileName: 'a.csv', format: 'csv', bytes: new TextEncoder().encode('id,answer\n1,hi\n'), encoding: 'UTF-8', mapping });
    S.insertDocuments(ctx.store, a.id, imp, [doc('1', 'en'), doc('2', 'es'), doc('3', null)]);
    const list = S.listStudies(ctx.store);
    const alpha = list.find((s) => s.name === 'Alpha')!;
    expect(alpha).toMatchObject({ documents: 3, imports: 1, runs: 0, languages: ['en', 'es'], languagesFound: ['en', 'es'] });
    expect(list[0].name).toBe('Alpha'); // the import is its newest activity
    expect(() => S.createStudy(ctx.store, { name: 'Alpha' })).toThrow(/UNIQUE/);
  });

  it('keeps the original bytes and their SHA-256 (FIPS 180-4 test vector "abc")', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    const bytes = new TextEncoder().encode('abc');
    const id = S.insertImport(ctx.store, { studyId: st.id, fileName: 'abc.csv', format: 'csv', bytes, encoding: 'UTF-8', mapping });
    // NIST FIPS 180-4 example: SHA-256("abc").
    expect(S.getImport(ctx.store, id)!.sha256).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect([...S.getImportBytes(ctx.store, id)!]).toEqual([...bytes]);
  });

  it('filters documents by language, undetermined, search, covariate and disagreement', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    const imp = S.insertImport(ctx.store, { studyId: st.id, fileName: 'a.csv', format: 'csv', bytes: new Uint8Array([1]), encoding: 'UTF-8', mapping });
    S.insertDocuments(ctx.store, st.id, imp, [
      doc('1', 'en', { text: 'More BOOKS please, ÉTÉ', covariates: { region: 'South' } }),
      doc('2', 'es', { declaredLanguage: 'en' }),
      doc('3', null, { excluded: 'undetermined' }),
      doc('4', 'de', { declaredLanguage: 'de', writtenLanguage: 'de', languageSource: 'declared' }),
      doc('5', 'de', { declaredLanguage: 'de', writtenLanguage: 'nl', languageSource: 'declared' }),
    ]);
    expect(S.listDocuments(ctx.store, st.id, { language: 'en' }).total).toBe(1);
    expect(S.listDocuments(ctx.store, st.id, { language: null }).rows[0].rowId).toBe('3');
    expect(S.listDocuments(ctx.store, st.id, { search: 'books' }).rows[0].rowId).toBe('1');
    expect(S.listDocuments(ctx.store, st.id, { search: 'été' }).rows.map((d) => d.rowId)).toEqual(['1']); // Unicode case folding
    expect(S.listDocuments(ctx.store, st.id, { covariate: { name: 'region', value: 'South' } }).total).toBe(1);
    // Declared "en" but decided "es"; declared "de" but written in Dutch although the declaration was kept.
    expect(S.listDocuments(ctx.store, st.id, { disagreements: true }).rows.map((d) => d.rowId)).toEqual(['2', '5']);
    expect(S.listDocuments(ctx.store, st.id, { excluded: false }).total).toBe(4);
    const page = S.listDocuments(ctx.store, st.id, {}, { offset: 1, limit: 1 });
    expect(page.total).toBe(5);
    expect(page.rows.map((d) => d.rowId)).toEqual(['2']);
    expect(S.exclusionSummary(ctx.store, st.id)).toEqual({ undetermined: 1 });
    // Deciding by the text where it disagrees with the declaration: only document 5 has a written language that differs.
    expect(S.adoptWrittenLanguages(ctx.store, st.id)).toBe(1);
    expect(S.listDocuments(ctx.store, st.id, { source: 'overridden' }).rows.map((d) => [d.rowId, d.language])).toEqual([['5', 'nl']]);
  });

  it('summarises languages with sources, confidence bins and disagreements, and records overrides', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    const imp = S.insertImport(ctx.store, { studyId: st.id, fileName: 'a.csv', format: 'csv', bytes: new Uint8Array([1]), encoding: 'UTF-8', mapping });
    const ids = S.insertDocuments(ctx.store, st.id, imp, [doc('1', 'en'), doc('2', 'en', { declaredLanguage: 'de' }), doc('3', null)]);
    let summary = S.languageSummary(ctx.store, st.id);
    expect(summary[0]).toMatchObject({ language: 'en', documents: 2, disagreements: 1, bySource: { detected: 2 } });
    expect(summary[0].confidenceBins[9]).toBe(2);
    expect(summary[summary.length - 1].language).toBeNull();
    expect(S.overrideLanguages(ctx.store, st.id, [ids[2]], 'fr')).toBe(1);
    summary = S.languageSummary(ctx.store, st.id);
    expect(summary.find((r) => r.language === 'fr')).toMatchObject({ documents: 1, bySource: { overridden: 1 } });
  });

  it('stores tokens as Int32Array bytes and returns only included documents for a fit', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    const imp = S.insertImport(ctx.store, { studyId: st.id, fileName: 'a.csv', format: 'csv', bytes: new Uint8Array([1]), encoding: 'UTF-8', mapping });
    const ids = S.insertDocuments(ctx.store, st.id, imp, [doc('1', 'en'), doc('2', 'en')]);
    S.setDocumentTokens(ctx.store, [
      { id: ids[0], vocabularyLanguage: 'en', tokens: new Int32Array([0, 5, 2147483647]), excluded: null },
      { id: ids[1], vocabularyLanguage: 'en', tokens: new Int32Array([]), excluded: 'too short' },
    ]);
    const docs = S.listDocumentTokens(ctx.store, st.id);
    expect(docs).toHaveLength(1);
    expect([...docs[0].tokens]).toEqual([0, 5, 2147483647]);
    expect(docs[0].covariates).toEqual({ region: 'North', age: 31 });
    const levels = S.covariateLevels(ctx.store, st.id);
    expect(levels.region).toMatchObject({ values: ['North'], numeric: false });
    expect(levels.age.numeric).toBe(true);
  });

  it('deleting a study removes everything that belongs to it (foreign keys cascade)', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    const imp = S.insertImport(ctx.store, { studyId: st.id, fileName: 'a.csv', format: 'csv', bytes: new Uint8Array([1]), encoding: 'UTF-8', mapping });
    S.insertDocuments(ctx.store, st.id, imp, [doc('1', 'en')]);
    const run = S.createRun(ctx.store, { studyId: st.id, name: 'r', settings: { themes: 2, sweeps: 1, burnIn: 0, seed: 1, threads: 1, covariates: [], holdout: 0 } });
    S.saveResults(ctx.store, run.id, { alpha: new Float64Array([1, 2]) });
    S.deleteStudy(ctx.store, st.id);
    for (const table of ['imports', 'documents', 'runs', 'run_results']) {
      expect((ctx.store.db.prepare(`SELECT COUNT(*) AS n FROM ${table}`).get() as { n: number }).n, table).toBe(0);
    }
  });
});

describe('vocabularies and word lists', () => {
  it('replaces vocabularies and returns top words by count', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    S.replaceVocabularies(ctx.store, st.id, [
      { language: 'en', stems: ['book', 'hour', 'wifi'], surfaces: ['books', 'hours', 'wifi'], counts: new Int32Array([5, 9, 1]), docCounts: new Int32Array([4, 7, 1]) },
      { language: 'es', stems: ['libr'], surfaces: ['libros'], counts: new Int32Array([3]), docCounts: new Int32Array([3]) },
    ]);
    expect(S.topWords(ctx.store, st.id, 'en', { limit: 2 }).map((w) => w.surface)).toEqual(['hours', 'books']);
    expect(S.vocabularySizes(ctx.store, st.id)).toEqual([{ language: 'en', words: 3, tokens: 15 }, { language: 'es', words: 1, tokens: 3 }]);
    const v = S.loadVocabulary(ctx.store, st.id, 'en');
    expect(v.stems).toEqual(['book', 'hour', 'wifi']);
    S.replaceVocabularies(ctx.store, st.id, []);
    expect(S.vocabularySizes(ctx.store, st.id)).toEqual([]);
    S.setStudyWordList(ctx.store, st.id, '*', ['library', ' ', 'library', 'branch']);
    expect(S.getStudyWordLists(ctx.store, st.id)).toEqual({ '*': ['branch', 'library'] });
  });
});

describe('runs, checkpoints, results and labels', () => {
  const settings = { themes: 3, sweeps: 10, burnIn: 2, seed: 7, threads: 1, covariates: ['region'], holdout: 0.1 };

  it('moves a run through its statuses with timestamps and marks running runs interrupted on restart', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    const run = S.createRun(ctx.store, { studyId: st.id, name: 'k3', settings });
    expect(run.status).toBe('queued');
    expect(S.uniqueRunName(ctx.store, st.id, 'k3')).toBe('k3-2');
    S.setRunStatus(ctx.store, run.id, 'running');
    S.setRunProgress(ctx.store, run.id, { sweep: 4, sweeps: 10, logLikelihoodPerToken: -7.1 });
    expect(S.getRun(ctx.store, run.id)).toMatchObject({ status: 'running', progress: { sweep: 4 }, finishedAt: null });
    expect(S.markRunningAsInterrupted(ctx.store)).toBe(1);
    expect(S.listRunsByStatus(ctx.store, ['interrupted']).map((r) => r.id)).toEqual([run.id]);
    S.setRunStatus(ctx.store, run.id, 'failed', 'out of memory');
    const failed = S.getRun(ctx.store, run.id)!;
    expect(failed.error).toBe('out of memory');
    expect(failed.finishedAt).not.toBeNull();
    expect(() => S.setRunStatus(ctx.store, run.id, 'bogus' as S.RunStatus)).toThrow(/CHECK/);
  });

  it('keeps only the newest checkpoints', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    const run = S.createRun(ctx.store, { studyId: st.id, name: 'k3', settings });
    for (const sweep of [10, 20, 30]) S.saveCheckpoint(ctx.store, run.id, sweep, new Uint8Array([sweep]), 2);
    expect(S.latestCheckpoint(ctx.store, run.id)).toEqual({ sweep: 30, bytes: new Uint8Array([30]) });
    expect((ctx.store.db.prepare('SELECT COUNT(*) AS n FROM run_checkpoints').get() as { n: number }).n).toBe(2);
  });

  it('stores a checkpoint larger than one part in several parts, reads it back whole, and drops old parts with old checkpoints', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    const run = S.createRun(ctx.store, { studyId: st.id, name: 'k3', settings });
    const parts = (): number => (ctx.store.db.prepare('SELECT COUNT(*) AS n FROM run_checkpoint_parts').get() as { n: number }).n;
    const bytes = Uint8Array.from({ length: 1000 }, (_, i) => (i * 37) & 255);
    // 1000 bytes in parts of 300: part 0 in run_checkpoints, parts 1–3 beside it.
    S.saveCheckpoint(ctx.store, run.id, 10, bytes, 2, 300);
    expect(parts()).toBe(3);
    expect(S.latestCheckpoint(ctx.store, run.id)).toEqual({ sweep: 10, bytes });
    // Saving the same sweep again replaces it and its parts.
    S.saveCheckpoint(ctx.store, run.id, 10, bytes.subarray(0, 500), 2, 300);
    expect(parts()).toBe(1);
    expect(S.latestCheckpoint(ctx.store, run.id)?.bytes).toEqual(bytes.subarray(0, 500));
    for (const sweep of [20, 30]) S.saveCheckpoint(ctx.store, run.id, sweep, new Uint8Array([sweep]), 2, 300);
    expect(parts(), 'the parts of the dropped checkpoint of sweep 10 are gone').toBe(0);
    expect(ctx.store.db.prepare('PRAGMA foreign_key_check').all()).toEqual([]);
  });

  it('round-trips typed arrays and JSON results exactly', () => {
    const st = S.createStudy(ctx.store, { name: 'S' });
    const run = S.createRun(ctx.store, { studyId: st.id, name: 'k3', settings });
    const phi = new Float64Array([0.1, Math.PI, -0, 1e-300]);
    S.saveResults(ctx.store, run.id, {
      phi: { value: phi, shape: [2, 2] },
      z: new Uint16Array([0, 65535]),
      counts: new Int32Array([-1, 7]),
      diagnostics: { json: { logLikelihood: [-8, -7.5] } },
    });
    const r = S.loadResults(ctx.store, run.id);
    expect(r.phi.shape).toEqual([2, 2]);
    expect(Object.is((r.phi.value as Float64Array)[2], -0)).toBe(true);
    expect([...(r.phi.value as Float64Array)]).toEqual([...phi]);
    expect([...(r.z.value as Uint16Array)]).toEqual([0, 65535]);
    expect(S.loadJsonResult(ctx.store, run.id, 'diagnostics')).toEqual({ logLikelihood: [-8, -7.5] });
    expect(S.listResultKeys(ctx.store, run.id)).toEqual(['counts', 'diagnostics', 'phi', 'z']);
    S.setThemeLabels(ctx.store, run.id, { 0: ' Opening hours ', 2: 'Wifi' });
    S.setThemeLabel(ctx.store, run.id, 2, '');
    expect([...S.getThemeLabels(ctx.store, run.id)]).toEqual([[0, 'Opening hours']]);
    const ex = S.saveRunExport(ctx.store, run.id, 'codebook.json', 'application/json', new TextEncoder().encode('{}'));
    expect(S.listRunExports(ctx.store, run.id)[0]).toMatchObject({ fileName: 'codebook.json', size: 2 });
    expect(S.getRunExportBytes(ctx.store, ex)!.bytes).toEqual(new Uint8Array([123, 125]));
  });
});

describe('accounts and sessions', () => {
  it('hashes passwords with scrypt, checks them, and stores only the hash of session tokens', () => {
    const acc = S.createAccount(ctx.store, 'ana', 'correct horse');
    const stored = (ctx.store.db.prepare('SELECT password_hash AS h FROM accounts').get() as { h: string }).h;
    expect(stored.startsWith('scrypt$')).toBe(true);
    expect(stored).not.toContain('correct horse');
    expect(S.checkPassword(ctx.store, 'ana', 'correct horse')?.id).toBe(acc.id);
    expect(S.checkPassword(ctx.store, 'ana', 'wrong horse')).toBeUndefined();
    expect(S.checkPassword(ctx.store, 'nobody', 'correct horse')).toBeUndefined();
    expect(() => S.createAccount(ctx.store, 'ana', 'another pass')).toThrow(/already exists/);
    const s = S.createSession(ctx.store, acc.id);
    expect((ctx.store.db.prepare('SELECT id FROM sessions').get() as { id: string }).id).not.toBe(s.token);
    expect(S.getSession(ctx.store, s.token)).toMatchObject({ accountName: 'ana', csrf: s.csrf });
    const old = S.createSession(ctx.store, acc.id, -1000);
    expect(S.getSession(ctx.store, old.token)).toBeUndefined();
    const st = S.createStudy(ctx.store, { name: 'Mine' });
    S.createStudy(ctx.store, { name: 'Theirs' });
    S.addStudyMember(ctx.store, st.id, acc.id, 'owner');
    expect(S.studyRole(ctx.store, st.id, acc.id)).toBe('owner');
    expect(S.listStudies(ctx.store, { accountId: acc.id }).map((x) => x.name)).toEqual(['Mine']);
  });

  it('verifies the RFC 7914 scrypt test vector through node:crypto', async () => {
    // RFC 7914 §12, second vector: P="password", S="NaCl", N=1024, r=8, p=16, dkLen=64.
    const { scryptSync } = await import('node:crypto');
    const dk = scryptSync('password', 'NaCl', 64, { N: 1024, r: 8, p: 16 }).toString('hex');
    expect(dk.slice(0, 32)).toBe('fdbabe1c9d3472007856e7190d01e9fe');
    expect(S.verifyPassword('x', 'not-a-hash')).toBe(false);
  });
});
