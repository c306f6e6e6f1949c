import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { importFile } from '../../src/services/index.js';
import * as S from '../../src/store/index.js';
import { InputError } from '../../src/text/types.js';
import { withTempStore } from '../store/helpers.js';
import { FIXTURE_MAPPING, surveyCsv, surveyJsonl, surveyRows } from './survey-fixture.js';

let ctx: ReturnType<typeof withTempStore>;
beforeEach(() => (ctx = withTempStore()));
afterEach(() => ctx.cleanup());

const enc = (s: string) => new TextEncoder().encode(s);

function counts(store: S.Store): Record<string, number> {
  const out: Record<string, number> = {};
  for (const t of ['studies', 'imports', 'documents', 'vocabularies']) out[t] = (store.db.prepare(`SELECT COUNT(*) AS n FROM ${t}`).get() as { n: number }).n;
  return out;
}

describe('importFile', () => {
  it('creates a study, keeps the original bytes and builds per-language vocabularies', async () => {
    const bytes = enc(surveyCsv(surveyRows(60)));
    const s = await importFile(ctx.store, { study: 'Survey', bytes, fileName: 'survey.csv', mapping: FIXTURE_MAPPING, languages: ['en', 'es'] });
    expect(s).toMatchObject({ studyName: 'Survey', studyCreated: true, rows: 60, documents: 60, format: 'csv', encoding: 'UTF-8' });
    expect(s.documentsPerLanguage.en + s.documentsPerLanguage.es).toBe(60);
    expect(s.vocabularySizes.en).toBeGreaterThan(5);
    expect(s.vocabularySizes.es).toBeGreaterThan(5);
    const imp = S.listImports(ctx.store, s.studyId)[0];
    expect(imp.sha256).toBe(S.sha256Hex(bytes));
    expect(S.getImportBytes(ctx.store, imp.id)).toEqual(bytes);
    expect(imp.summary).toMatchObject({ documents: 60 });
    const doc = S.listDocuments(ctx.store, s.studyId, { search: 'r0' }).rows[0];
    expect(doc).toMatchObject({ rowId: 'r0', question: 'answer', linkKey: 'L0', languageSource: 'declared' });
    expect(typeof doc.covariates.age).toBe('number');
  });

  it('lets the written language win over a wrong declaration, keeping the declared one beside it', async () => {
    const rows = surveyRows(40);
    const i = rows.findIndex((r) => r.lang === 'es' && !r.link);
    rows[i] = { ...rows[i], lang: 'en' }; // a Spanish answer declared as English
    const s = await importFile(ctx.store, { study: 'Survey', bytes: enc(surveyCsv(rows)), fileName: 'survey.csv', mapping: FIXTURE_MAPPING, languages: ['en', 'es'] });
    const found = S.listDocuments(ctx.store, s.studyId, { disagreements: true }).rows;
    expect(found.map((d) => [d.rowId, d.language, d.declaredLanguage, d.writtenLanguage, d.declaredCheck])).toEqual([[rows[i].id, 'es', 'en', 'es', 'overruled']]);
    expect(s.declaredChecks.overruled).toBe(1);
    expect((s.declaredChecks.confirmed ?? 0) + (s.declaredChecks.kept ?? 0)).toBe(s.documents - 1);
    // Every other answer's declaration is confirmed by its text (or kept where the text is too short to say).
    const others = S.listDocuments(ctx.store, s.studyId, {}, { limit: 1000 }).rows.filter((d) => d.rowId !== rows[i].id && d.declaredLanguage !== null);
    expect(others.every((d) => d.language === d.declaredLanguage && d.declaredCheck !== 'overruled')).toBe(true);
  });

  it('keeps a trusted declared language but records the language written, so disagreements can be reviewed', async () => {
    const rows = surveyRows(40);
    const i = rows.findIndex((r) => r.lang === 'es' && !r.link);
    rows[i] = { ...rows[i], lang: 'en' }; // a Spanish answer declared as English
    const s = await importFile(ctx.store, { study: 'Survey', bytes: enc(surveyCsv(rows)), fileName: 'survey.csv', mapping: FIXTURE_MAPPING, languages: ['en', 'es'], trustDeclared: true });
    const found = S.listDocuments(ctx.store, s.studyId, { disagreements: true }).rows;
    expect(found.map((d) => [d.rowId, d.language, d.languageSource, d.writtenLanguage])).toEqual([[rows[i].id, 'en', 'declared', 'es']]);
    expect(S.languageSummary(ctx.store, s.studyId).find((r) => r.language === 'en')!.disagreements).toBe(1);
  });

  it('extends an existing study and re-runs the vocabulary over all of it', async () => {
    const first = await importFile(ctx.store, { study: 'Survey', bytes: enc(surveyCsv(surveyRows(30))), fileName: 'a.csv', mapping: FIXTURE_MAPPING, languages: ['en', 'es'] });
    const rows = surveyRows(30).map((r) => ({ ...r, id: `b-${r.id}`, link: '' }));
    const second = await importFile(ctx.store, { study: 'Survey', bytes: enc(surveyJsonl(rows)), fileName: 'b.jsonl', mapping: FIXTURE_MAPPING });
    expect(second).toMatchObject({ studyId: first.studyId, studyCreated: false, format: 'jsonl', documents: 30 });
    const tokens = S.vocabularySizes(ctx.store, first.studyId).reduce((a, v) => a + v.tokens, 0);
    const included = S.listDocumentTokens(ctx.store, first.studyId).reduce((a, d) => a + d.tokens.length, 0);
    expect(tokens).toBe(included);
    expect(S.listDocuments(ctx.store, first.studyId).total).toBe(60);
  });

  it('leaves nothing written when the file is bad half-way (ragged row 40)', async () => {
    await importFile(ctx.store, { study: 'Survey', bytes: enc(surveyCsv(surveyRows(20))), fileName: 'ok.csv', mapping: FIXTURE_MAPPING, languages: ['en', 'es'] });
    const before = counts(ctx.store);
    const lines = surveyCsv(surveyRows(60)).split('\n');
    lines[40] += ',extra,cells';
    const err = await importFile(ctx.store, { study: 'Survey', bytes: enc(lines.join('\n')), fileName: 'bad.csv', mapping: FIXTURE_MAPPING }).catch((e) => e);
    expect(err).toBeInstanceOf(InputError);
    expect(err.file).toBe('bad.csv');
    expect(counts(ctx.store)).toEqual(before);
  });

  it('leaves nothing written when mapping fails (no such column, weights not positive)', async () => {
    const e1 = await importFile(ctx.store, { study: 'New', bytes: enc(surveyCsv(surveyRows(10))), fileName: 'x.csv', mapping: { ...FIXTURE_MAPPING, text: ['missing'] } }).catch((e) => e);
    expect(e1).toBeInstanceOf(InputError);
    const rows = surveyRows(10);
    rows[6].weight = '-1';
    const e2 = await importFile(ctx.store, { study: 'New', bytes: enc(surveyCsv(rows)), fileName: 'w.csv', mapping: FIXTURE_MAPPING }).catch((e) => e);
    expect(e2).toBeInstanceOf(InputError);
    expect(counts(ctx.store)).toEqual({ studies: 0, imports: 0, documents: 0, vocabularies: 0 });
  });

  it('rolls back everything when a write fails inside the transaction', async () => {
    // A trigger makes the vocabulary write fail after the import and documents were inserted.
    ctx.store.db.exec("CREATE TRIGGER fail_vocab BEFORE INSERT ON vocabularies BEGIN SELECT RAISE(ABORT, 'disk full (simulated)'); END;");
    const err = await importFile(ctx.store, { study: 'Survey', bytes: enc(surveyCsv(surveyRows(20))), fileName: 'a.csv', mapping: FIXTURE_MAPPING, languages: ['en', 'es'] }).catch((e) => e);
    expect(String(err)).toMatch(/disk full/);
    expect(counts(ctx.store)).toEqual({ studies: 0, imports: 0, documents: 0, vocabularies: 0 });
  });

  it('refuses an unknown language tag with an InputError naming it', async () => {
    const err = await importFile(ctx.store, { study: 'S', bytes: enc(surveyCsv(surveyRows(5))), fileName: 'a.csv', mapping: FIXTURE_MAPPING, languages: ['en', 'klingonish'] }).catch((e) => e);
    expect(err).toBeInstanceOf(InputError);
    expect(err.message).toMatch(/klingonish/);
  });
});
