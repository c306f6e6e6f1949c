// Glossaries through the workbench, in process: upload on the Data page (CSRF-checked), the
// Glossaries section and the Languages page's terms, an error message on the page, and a fit
// whose Answers page and contrasts do not count the glossary's term lists as answers.
// Outside check: real five-language text from the `emojibase-data` package (MIT licence;
// messages.json `subgroups` and data.json `label`, see test/services/emojibase-glossary.ts).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importFile, loadRunModel, runContrasts, studyAnswerRows } from '../../src/services/index.js';
import * as S from '../../src/store/index.js';
import { emojiAnswersCsv, subgroupGlossaryCsv, subgroupNames } from '../services/emojibase-glossary.js';
import { HTML, idFrom, LOCAL_CSRF, makeApp, postFile, postForm, type TestApp } from './helpers.js';

let t: TestApp;
let studyId = 0;
const csrf = { _csrf: LOCAL_CSRF };
const get = (path: string) => t.app.request(path, { headers: HTML });

beforeAll(async () => {
  t = makeApp();
  const s = await importFile(t.store, { study: 'Emoji', bytes: new TextEncoder().encode(emojiAnswersCsv(60)), fileName: 'emoji-answers.csv', mapping: { id: 'id', text: ['text'], language: 'lang', covariates: [] } });
  studyId = s.studyId;
});
afterAll(() => t.close());

describe('glossaries in the workbench', () => {
  it('offers the upload form on the Data page and refuses an upload without the CSRF token', async () => {
    const page = await (await get(`/studies/${studyId}/data`)).text();
    expect(page).toContain('<h2>Glossaries</h2>');
    expect(page).toContain('No glossary yet.');
    expect(page).toMatch(/<form method="post" action="\/studies\/\d+\/glossary" enctype="multipart\/form-data"[^>]*id="glossary-form">\s*<input type="hidden" name="_csrf"/);
    const forged = await postFile(t, `/studies/${studyId}/glossary`, {}, { name: 'subgroups.csv', bytes: subgroupGlossaryCsv() });
    expect(forged.status).toBe(403);
    expect(S.listImports(t.store, studyId, 'glossary')).toHaveLength(0);
  });

  it('shows the error on the Data page for columns that are not languages of the study', async () => {
    const res = await postFile(t, `/studies/${studyId}/glossary`, csrf, { name: 'bad.csv', bytes: 'English,italiano,notes\napple,mela,fruit\n' });
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain('&quot;notes&quot; is not a language');
    expect(html).toContain('&quot;italiano (it)&quot; is not a language of this study');
    expect(html).toMatch(/study&#39;s languages \((en|es|fr|de|ja)(, (en|es|fr|de|ja)){4}\)/);
    expect(S.listImports(t.store, studyId, 'glossary')).toHaveLength(0);
  });

  it('imports a glossary and lists it on the Data page with its terms per language, apart from the answers', async () => {
    const res = await postFile(t, `/studies/${studyId}/glossary`, csrf, { name: 'subgroups.csv', bytes: subgroupGlossaryCsv() });
    expect(res.status).toBe(303);
    const location = res.headers.get('Location')!;
    expect(location).toMatch(/\/data\?glossary=\d+#glossaries$/);
    const page = await (await get(location.replace(/#.*$/, ''))).text();
    const rows = subgroupNames().length;
    expect(page).toContain(`Imported glossary subgroups.csv: ${rows} rows linking en, es, fr, de, ja`);
    const list = page.slice(page.indexOf('id="glossary-list"'));
    expect(list).toContain('<td>subgroups.csv</td>');
    expect(list).toMatch(/en \d+, es \d+, fr \d+, de \d+, ja \d+/);
    // The answers table lists the answers file only.
    const answers = page.slice(page.indexOf('id="imports"'), page.indexOf('id="glossaries"'));
    expect(answers).toContain('emoji-answers.csv');
    expect(answers).not.toContain('subgroups.csv');
  });

  it('shows glossary terms per language on the Languages page, and no term among the answers', async () => {
    const page = await (await get(`/studies/${studyId}/languages?show=all`)).text();
    const section = page.slice(page.indexOf('id="glossary-terms"'));
    const terms = S.listImports(t.store, studyId, 'glossary')[0].summary.termsPerLanguage as Record<string, number>;
    for (const l of ['en', 'es', 'fr', 'de', 'ja']) expect(section).toContain(`<th scope="row">${l}</th><td class="num">${terms[l]}</td>`);
    expect(page).not.toContain('neutral; skeptical');
  });

  it('fits with the glossary rows as link groups, but shows and counts only answers', async () => {
    const res = await postForm(t, `/studies/${studyId}/runs`, { themes: '3', sweeps: '20', burnIn: '5', seed: '2', threads: '1', holdout: '0', ...csrf });
    expect(res.status).toBe(303);
    const runId = idFrom(res.headers.get('Location'), /\/runs\/(\d+)/);
    await t.queue.idle();
    const fitted = S.loadResult(t.store, runId, 'documentIds')!.value as Int32Array;
    const glossaryIds = new Set([...S.iterateDocuments(t.store, studyId, { kind: 'glossary' })].map((d) => d.id));
    const answers = S.listDocuments(t.store, studyId, { excluded: false }).total;
    expect([...fitted].filter((id) => glossaryIds.has(id)).length).toBeGreaterThan(100);
    const page = await (await get(`/studies/${studyId}/runs/${runId}/answers`)).text();
    expect(page).toContain(`${answers.toLocaleString('en')} answers match.`);
    // No row of the glossary (its tiny documents join synonyms with "; ") is listed as an answer.
    expect(page).not.toContain('neutral; skeptical');
    // Contrasts and overall shares count answers only: no glossary document is "left out".
    const model = loadRunModel(t.store, runId)!;
    const byLanguage = runContrasts(t.store, model, { by: 'language', draws: 20 });
    expect(byLanguage.excludedDocuments).toBe(0);
    expect(byLanguage.notes.join(' ')).not.toMatch(/left out/);
    expect(byLanguage.shares.filter((r) => r.theme === 0).reduce((n, r) => n + r.n, 0)).toBe(answers);
    // answers-by-theme.csv has one row per answer, none per glossary cell.
    const rows = studyAnswerRows(t.store, model);
    expect(rows).toHaveLength(S.listDocuments(t.store, studyId).total);
    expect(rows.some((r) => r.question === 'glossary' || r.linkKey?.startsWith('glossary:'))).toBe(false);
  });

  it('deletes a glossary from its Delete link, and refuses while a run was fitted on it', async () => {
    const fitted = S.listImports(t.store, studyId, 'glossary')[0];
    const refused = await (await get(`/studies/${studyId}/imports/${fitted.id}/delete`)).text();
    expect(refused).toMatch(/fitted on answers of subgroups\.csv/);
    const up = await postFile(t, `/studies/${studyId}/glossary`, csrf, { name: 'apples.csv', bytes: 'en,es\nred apple,manzana roja\ngreen apple,manzana verde\n' });
    expect(up.status).toBe(303);
    const id = idFrom(up.headers.get('Location'), /glossary=(\d+)/);
    const confirm = await (await get(`/studies/${studyId}/imports/${id}/delete`)).text();
    expect(confirm).toContain('its 4 glossary term documents');
    const done = await postForm(t, `/studies/${studyId}/imports/${id}/delete`, csrf);
    expect(done.status).toBeLessThan(400);
    expect(S.listImports(t.store, studyId, 'glossary').map((i) => i.fileName)).toEqual(['subgroups.csv']);
  });
});
