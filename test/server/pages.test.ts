// The whole job through the routes, in process: create a study, upload and map a file, review
// languages and vocabulary, run a small fit in a real worker thread, and use every results page.
// Data: an invented bilingual survey (helpers.ts).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HTML, idFrom, inventedSurvey, LOCAL_CSRF, makeApp, postFile, postForm, type TestApp } from './helpers.js';

let t: TestApp;
let studyId = 0;
let runId = 0;
const csrf = { _csrf: LOCAL_CSRF };
const get = (path: string) => t.app.request(path, { headers: HTML });

beforeAll(() => {
  t = makeApp();
});
afterAll(() => t.close());

describe('the workbench, route by route', () => {
  it('creates a study and refuses a duplicate name with a message', async () => {
    const res = await postForm(t, '/studies', { name: 'Park survey <2026>', languages: 'en, es', ...csrf });
    expect(res.status).toBe(303);
    studyId = idFrom(res.headers.get('Location'));
    const dup = await postForm(t, '/studies', { name: 'Park survey <2026>', ...csrf });
    expect(dup.status).toBe(400);
    expect(await dup.text()).toContain('already exists');
    const list = await (await get('/')).text();
    expect(list).toContain('Park survey &lt;2026&gt;');
  });

  it('uploads a file, shows the encoding and suggested columns, and imports with the chosen mapping', async () => {
    const up = await postFile(t, `/studies/${studyId}/data/upload`, csrf, { name: 'park.csv', bytes: inventedSurvey(80) });
    expect(up.status).toBe(200);
    const html = await up.text();
    expect(html).toContain('encoding UTF-8');
    expect(html).toMatch(/<option value="text" selected="">Answer text<\/option>/);
    const key = html.match(/name="upload" value="([^"]+)"/)![1];
    const roles = { 'role-0': 'id', 'role-1': 'text', 'role-2': 'language', 'role-3': 'categorical', 'role-4': 'weight' };
    const missing = await postForm(t, `/studies/${studyId}/data/import`, { upload: key, 'role-0': 'id', ...csrf });
    expect(missing.status).toBe(400);
    expect(await missing.text()).toContain('Answer text');
    const imp = await postForm(t, `/studies/${studyId}/data/import`, { upload: key, ...roles, ...csrf });
    expect(imp.status).toBe(303);
    const data = await (await get(imp.headers.get('Location')!)).text();
    expect(data).toContain('Imported park.csv');
    expect(data).toMatch(/80 answers/);
  });

  it('explains an unreadable upload instead of failing', async () => {
    const res = await postFile(t, `/studies/${studyId}/data/upload`, csrf, { name: 'empty.csv', bytes: '' });
    expect(res.status).toBe(400);
    expect(await res.text()).toMatch(/missing or empty/);
  });

  it('shows languages with a confidence chart and overrides one answer', async () => {
    const page = await (await get(`/studies/${studyId}/languages?show=all`)).text();
    expect(page).toContain('<svg class="histogram"');
    expect(page).toMatch(/<th scope="row">es<\/th>/);
    const id = page.match(/name="ids" value="(\d+)"/)![1];
    const res = await postForm(t, `/studies/${studyId}/languages/override`, { one: id, [`lang-${id}`]: 'en', back: `/studies/${studyId}/languages?show=all`, ...csrf });
    expect(res.status).toBe(303);
    expect(res.headers.get('Location')).toContain('changed=1');
  });

  it('shows the vocabulary per language and saves the study word list', async () => {
    const page = await (await get(`/studies/${studyId}/vocabulary?language=en`)).text();
    expect(page).toContain('<td dir="auto">swings</td>');
    const res = await postForm(t, `/studies/${studyId}/vocabulary/words`, { language: 'en', words: 'please', wordsAll: '', ...csrf });
    expect(res.status).toBe(303);
    const after = await (await get(`/studies/${studyId}/vocabulary?language=en`)).text();
    expect(after).toMatch(/<textarea name="words"[^>]*>please<\/textarea>/);
  });

  it('starts a run from the form; it runs in a worker thread and finishes', async () => {
    const bad = await postForm(t, `/studies/${studyId}/runs`, { themes: '1', ...csrf });
    expect(bad.status).toBe(400);
    expect(await bad.text()).toContain('Number of themes must be a whole number from 2 to 200');
    const res = await postForm(t, `/studies/${studyId}/runs`, { themes: '4', sweeps: '40', burnIn: '10', seed: '3', threads: '1', holdout: '0.1', covariates: 'district', ...csrf });
    expect(res.status).toBe(303);
    runId = idFrom(res.headers.get('Location'), /\/runs\/(\d+)/);
    const live = await (await get(`/studies/${studyId}/runs/${runId}`)).text();
    expect(live).toMatch(/sse-connect="\/studies\/\d+\/runs\/\d+\/events"|The run has finished/);
    await t.queue.idle();
    const done = await get(`/studies/${studyId}/runs/${runId}`);
    expect(done.status).toBe(303);
    expect(done.headers.get('Location')).toBe(`/studies/${studyId}/runs/${runId}/themes`);
  });

  it('streams progress as server-sent events and ends with a done event', async () => {
    const res = await t.app.request(`/studies/${studyId}/runs/${runId}/events`);
    expect(res.headers.get('Content-Type')).toContain('text/event-stream');
    const body = await res.text();
    expect(body).toMatch(/event: progress\ndata: <div id="run-progress" data-status="finished">/);
    expect(body).toContain('event: done');
  });

  it('lists themes with words per language side by side, and renames a theme (escaped)', async () => {
    const page = await (await get(`/studies/${studyId}/runs/${runId}/themes`)).text();
    expect(page).toContain('Top words · en, es');
    expect(page).toMatch(/<span class="lang">es<\/span>/);
    expect(page).toContain('Themes describe which words occur together');
    const res = await postForm(t, `/studies/${studyId}/runs/${runId}/themes/0/label`, { label: 'Play <script>alert(1)</script>', ...csrf }, { 'HX-Request': 'true' });
    expect(res.status).toBe(200);
    const fragment = await res.text();
    expect(fragment).toContain('Saved');
    expect(fragment).not.toContain('<script>');
    expect(fragment).toContain('Play &lt;script&gt;');
    expect(await (await get(`/studies/${studyId}/runs/${runId}/themes`)).text()).toContain('value="Play &lt;script&gt;alert(1)&lt;/script&gt;"');
  });

  it('shows a theme page with marked words, examples per language and shares by group', async () => {
    const page = await (await get(`/studies/${studyId}/runs/${runId}/themes/0`)).text();
    expect(page).toContain('<mark>');
    expect(page).toContain('Share by group');
    expect(page).toMatch(/Share of theme 1 by district/);
    expect((await get(`/studies/${studyId}/runs/${runId}/themes/99`)).status).toBe(404);
  });

  it('shows contrasts: a levels × themes grid, n, effective n and a difference between two levels', async () => {
    const page = await (await get(`/studies/${studyId}/runs/${runId}/contrasts?by=district&a=North&b=South`)).text();
    expect(page).toContain('id="contrast-grid"');
    expect(page).toContain('Effective n');
    expect(page).toMatch(/Share in North minus share in South/);
    expect(page).toContain('Benjamini');
  });

  it('filters answers by language and shows each with its theme mix', async () => {
    const page = await (await get(`/studies/${studyId}/runs/${runId}/answers?language=es`)).text();
    expect(page).toContain('parque');
    expect(page).not.toContain('playground');
    expect(page).toContain('class="strip"');
  });

  it('shows checks: trace, perplexity and hyperparameters', async () => {
    const page = await (await get(`/studies/${studyId}/runs/${runId}/checks`)).text();
    expect(page).toContain('Held-out perplexity');
    expect(page).toContain('Log-likelihood per word after each sweep');
    expect(page).toContain('β (word smoothing)');
  });

  it('prepares every export file and downloads answers-by-theme.csv with a BOM and the labelled columns', async () => {
    const res = await postForm(t, `/studies/${studyId}/runs/${runId}/export`, csrf);
    expect(res.status).toBe(303);
    const page = await (await get(`/studies/${studyId}/runs/${runId}/export`)).text();
    for (const name of ['answers-by-theme.csv', 'theme-words.csv', 'theme-shares-by-group.csv', 'codebook.json', 'report.html']) expect(page).toContain(name);
    const href = page.match(/href="([^"]+)" download="answers-by-theme.csv"/)![1];
    const file = await t.app.request(href);
    expect(file.headers.get('Content-Disposition')).toContain('attachment');
    const bytes = new Uint8Array(await file.arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const header = new TextDecoder().decode(bytes.slice(3)).split(/\r?\n/)[0];
    expect(header).toContain('district');
    expect(header).toContain('Play');
    const report = page.match(/href="([^"]+)" download="report.html"/)![1];
    const html = await (await t.app.request(report)).text();
    expect(html).toContain('<svg');
    expect(html).not.toMatch(/<script/);
  });

  it('does not serve another run’s files through this run', async () => {
    const other = await t.app.request(`/studies/${studyId}/runs/${runId}/export/files/999999`);
    expect(other.status).toBe(404);
  });

  it('codes a new file with the run and offers the result for download', async () => {
    const fresh = 'respondent_id,comment,lang,district,weight\nN1,"the swings in the playground are broken",en,North,1\nN2,"los baños están sucios",es,South,1\n';
    const res = await postFile(t, `/studies/${studyId}/runs/${runId}/apply`, csrf, { name: 'wave2.csv', bytes: fresh });
    expect(res.status).toBe(200);
    const page = await res.text();
    expect(page).toMatch(/Coded 2 of 2 answers/);
    const href = page.match(/href="([^"]+)" id="applied-download"/)![1];
    const csv = new TextDecoder().decode(new Uint8Array(await (await t.app.request(href)).arrayBuffer()));
    expect(csv).toContain('N2');
  });

  it('compares finished runs on the Runs page', async () => {
    const res = await postForm(t, `/studies/${studyId}/runs`, { themes: '4', sweeps: '20', burnIn: '5', seed: '9', ...csrf });
    expect(res.status).toBe(303);
    await t.queue.idle();
    const page = await (await get(`/studies/${studyId}/runs`)).text();
    expect(page).toContain('id="k-comparison"');
  });
});
