// The Languages page as a reviewer uses it (issue 12): declared beside written for answers whose
// text disagrees with their questionnaire language and for answers written in two languages,
// with one action to accept the written language for one answer and one for all of them.
// Data: the invented bilingual park survey of helpers.ts, with answers made to disagree.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importFile } from '../../src/services/import-file.js';
import { listDocuments } from '../../src/store/index.js';
import { HTML, inventedSurvey, LOCAL_CSRF, makeApp, postForm, type TestApp } from './helpers.js';

let t: TestApp;
const csrf = { _csrf: LOCAL_CSRF };
const get = (path: string) => t.app.request(path, { headers: HTML });
const MAPPING = { id: 'respondent_id', text: ['comment'], language: 'lang', covariates: [] };
const MIXED = 'the playground needs new swings and a safer fence. los perros sueltos asustan a los niños cerca del estanque y los patos necesitan agua limpia. the pond smells and the ducks need cleaner water, please open the toilets earlier.';

/** The park survey with two English answers declared Spanish, and one answer in both languages. */
function survey(): Uint8Array {
  const lines = inventedSurvey(80).trimEnd().split('\n');
  lines[1] = lines[1].replace(/,en,/, ',es,');
  lines[3] = lines[3].replace(/,en,/, ',es,');
  lines.push(`R9001,"${MIXED}",en,North,1`);
  return new TextEncoder().encode(lines.join('\n') + '\n');
}

async function study(name: string, trustDeclared: boolean): Promise<number> {
  const s = await importFile(t.store, { study: name, bytes: survey(), fileName: 'park.csv', mapping: MAPPING, languages: ['en', 'es'], trustDeclared });
  return s.studyId;
}

beforeAll(() => {
  t = makeApp();
});
afterAll(() => t.close());

describe('reviewing declared against written languages', () => {
  it('lets the written language win by default, and shows declared beside written', async () => {
    const id = await study('Park', false);
    const page = await (await get(`/studies/${id}/languages?show=disagreements`)).text();
    expect(page).toContain('Written</th>');
    // R0001 and R0003: declared es, written en, decided en because the text overruled it.
    for (const row of ['R0001', 'R0003']) {
      const cells = page.match(new RegExp(`<td>${row}</td>[\\s\\S]*?</tr>`))![0];
      expect(cells).toMatch(/<td>es<\/td>/);
      expect(cells).toMatch(/en <span class="hint">\((detected|adapted); declared overruled\)/);
    }
    expect(page).not.toContain('Accept the written language for all');
  });

  it('lists an answer written in two languages with its second language', async () => {
    const id = await study('Park mixed', false);
    const page = await (await get(`/studies/${id}/languages?show=mixed`)).text();
    expect(page).toMatch(/<td>R9001<\/td>/);
    expect(page).toMatch(/mixed with es \(\d+%\)/);
    expect(page).not.toMatch(/<td>R0002<\/td>/);
  });

  it('accepts the written language for one answer, then for all, keeping the declared one stored', async () => {
    const id = await study('Park trusted', true);
    const page = await (await get(`/studies/${id}/languages?show=disagreements`)).text();
    expect(page).toContain('Accept the written language for all 2');
    const docId = page.match(/<button type="submit" name="one" value="(\d+)" formaction="[^"]*accept-written"/)![1];
    const one = await postForm(t, `/studies/${id}/languages/accept-written`, { one: docId, back: `/studies/${id}/languages?show=disagreements`, ...csrf });
    expect(one.status).toBe(303);
    expect(one.headers.get('Location')).toContain('changed=1');
    const all = await postForm(t, `/studies/${id}/languages/accept-written`, { all: '1', ...csrf });
    expect(all.headers.get('Location')).toContain('changed=1');
    const docs = listDocuments(t.store, id, { disagreements: true }).rows;
    expect(docs.map((d) => [d.rowId, d.declaredLanguage, d.language, d.languageSource])).toEqual([
      ['R0001', 'es', 'en', 'overridden'],
      ['R0003', 'es', 'en', 'overridden'],
    ]);
    const after = await (await get(`/studies/${id}/languages?show=disagreements`)).text();
    expect(after).not.toContain('Accept the written language for all');
  });

  it('refuses the action without the form token', async () => {
    const id = await study('Park csrf', true);
    const res = await postForm(t, `/studies/${id}/languages/accept-written`, { all: '1' });
    expect(res.status).toBe(403);
    expect(listDocuments(t.store, id, { writtenDiffers: true }).total).toBe(2);
  });
});
