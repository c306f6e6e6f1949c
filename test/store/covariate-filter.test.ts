// A covariate filter must find documents whatever characters the covariate's name holds:
// metadata column names come from researchers' files and may contain quotes, dots, dollar signs,
// spaces or non-Latin letters (invented names below).
import { afterEach, describe, expect, it } from 'vitest';
import * as S from '../../src/store/index.js';
import { withTempStore } from './helpers.js';

const NAMES = ['say "yes"', "respondent's group", 'region.name', '$ income', 'a\\b', '地域 区分', 'Région (FR)', 'x"."y'];

let ctx: ReturnType<typeof withTempStore> | undefined;
afterEach(() => ctx?.cleanup());

describe('covariate filter', () => {
  it.each(NAMES)('finds documents by the value of a covariate named %j', (name) => {
    ctx = withTempStore();
    const st = S.createStudy(ctx.store, { name: 'Names', languages: ['en'] });
    const imp = S.insertImport(ctx.store, { studyId: st.id, fileName: 'f.csv', format: 'csv', bytes: new Uint8Array([1]), encoding: 'UTF-8', mapping: { text: ['answer'], covariates: [{ column: name, type: 'categorical' }] } });
    const doc = (rowId: string, value: string | number): S.NewDocument => ({ rowId, question: 'answer', text: `t ${rowId}`, language: 'en', languageSource: 'declared', confidence: 1, covariates: { [name]: value, other: 'A' }, weight: 1 });
    S.insertDocuments(ctx.store, st.id, imp, [doc('1', 'A'), doc('2', 'B'), doc('3', 'A'), doc('4', 7)]);
    const rows = S.listDocuments(ctx.store, st.id, { covariate: { name, value: 'A' } }).rows;
    expect(rows.map((r) => r.rowId)).toEqual(['1', '3']);
    expect(S.listDocuments(ctx.store, st.id, { covariate: { name, value: '7' } }).rows.map((r) => r.rowId)).toEqual(['4']);
    // Another key with the same value is not matched through the name.
    expect(S.listDocuments(ctx.store, st.id, { covariate: { name, value: 'missing' } }).total).toBe(0);
    expect([...S.iterateDocuments(ctx.store, st.id, { covariate: { name, value: 'B' } })].map((r) => r.rowId)).toEqual(['2']);
  });
});
