// Issue 14, files and input, through the routes in process: the Export page says which files it
// makes before they are prepared, offers the answer text and the workbook; Apply needs only the
// text column and says what it did with what the run has not seen; uploads that could hurt the
// server are refused with short messages. Data: the invented bilingual survey (helpers.ts).
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HTML, idFrom, inventedSurvey, LOCAL_CSRF, makeApp, postFile, postForm, type TestApp } from './helpers.js';

let t: TestApp;
let studyId = 0;
let runId = 0;
const csrf = { _csrf: LOCAL_CSRF };
const get = (path: string) => t.app.request(path, { headers: HTML });
const base = () => `/studies/${studyId}/runs/${runId}`;

async function download(page: string, name: string): Promise<Uint8Array> {
  const href = page.match(new RegExp(`href="([^"]+)" download="${name.replace(/[.]/g, '\\.')}"`))![1];
  return new Uint8Array(await (await t.app.request(href)).arrayBuffer());
}
const csvHeader = (bytes: Uint8Array) => new TextDecoder().decode(bytes.slice(3)).split(/\r?\n/)[0].split(',');

beforeAll(async () => {
  t = makeApp();
  const made = await postForm(t, '/studies', { name: 'Park files', languages: 'en, es', ...csrf });
  studyId = idFrom(made.headers.get('Location'));
  const up = await postFile(t, `/studies/${studyId}/data/upload`, csrf, { name: 'park.csv', bytes: inventedSurvey(80) });
  const key = (await up.text()).match(/name="upload" value="([^"]+)"/)![1];
  const imp = await postForm(t, `/studies/${studyId}/data/import`, { upload: key, 'role-0': 'id', 'role-1': 'text', 'role-2': 'language', 'role-3': 'categorical', 'role-4': 'weight', ...csrf });
  expect(imp.status).toBe(303);
  const run = await postForm(t, `/studies/${studyId}/runs`, { themes: '3', sweeps: '30', burnIn: '10', seed: '5', threads: '1', covariates: 'district', ...csrf });
  expect(run.status).toBe(303);
  runId = idFrom(run.headers.get('Location'), /\/runs\/(\d+)/);
  await t.queue.idle();
}, 120_000);
afterAll(() => t.close());

describe('Export page', () => {
  it('lists the files it will make, each with what it holds, before anything is prepared', async () => {
    const page = await (await get(`${base()}/export`)).text();
    const plan = page.slice(page.indexOf('id="export-plan"'), page.indexOf('</section>', page.indexOf('id="export-plan"')));
    for (const name of ['answers-by-theme.csv', 'theme-words.csv', 'theme-shares-by-group.csv', 'theme-tables.xlsx', 'codebook.json', 'report.html', '.themata-run']) expect(plan).toContain(name);
    expect(plan).toContain('one share column per theme');
    expect(plan).toContain('name="answerText" value="1" checked');
    expect(page).toContain('No files prepared yet.');
  });

  it('prepares the workbook and leaves the answer text out when the box is cleared', async () => {
    const res = await postForm(t, `${base()}/export`, { choices: '1', workbook: '1', ...csrf });
    expect(res.status).toBe(303);
    const page = await (await get(`${base()}/export`)).text();
    const header = csvHeader(await download(page, 'answers-by-theme.csv'));
    expect(header.slice(0, 2)).toEqual(['respondent_id', 'district']);
    expect(header).toContain('left out because');
    const xlsx = await download(page, 'theme-tables.xlsx');
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(Buffer.from(xlsx) as unknown as ArrayBuffer);
    expect(wb.worksheets.map((w) => w.name)).toEqual(['themes', 'answers by theme', 'theme words', 'shares by group']);
    expect(wb.getWorksheet('answers by theme')!.rowCount).toBe(81);
  });

  it('writes the answer text by default, and no workbook when it is not asked for', async () => {
    await postForm(t, `${base()}/export`, { choices: '1', answerText: '1', ...csrf });
    const page = await (await get(`${base()}/export`)).text();
    const bytes = await download(page, 'answers-by-theme.csv');
    expect(csvHeader(bytes).slice(0, 3)).toEqual(['respondent_id', 'answer', 'district']);
    expect(new TextDecoder().decode(bytes)).toContain('the playground needs new swings');
    // One text column: no question group among the shares.
    const shares = new TextDecoder().decode(await download(page, 'theme-shares-by-group.csv'));
    expect(shares).not.toMatch(/\r\nquestion,/);
  });
});

describe('Apply page', () => {
  it('says only the answer text is needed', async () => {
    const page = await (await get(`${base()}/apply`)).text();
    expect(page).toContain('Only the answer text is needed, in a column named as in the original file (comment)');
  });

  it('codes a file with only the text column and a new district, saying what was done', async () => {
    const fresh = 'comment,district\n"the swings in the playground are broken",Harbour\nn/a,North\n"los baños están sucios",Harbour\n';
    const res = await postFile(t, `${base()}/apply`, { ...csrf, choices: '1', answerText: '1' }, { name: 'wave2.csv', bytes: fresh });
    expect(res.status).toBe(200);
    const page = await res.text();
    expect(page).toMatch(/Coded 2 of 3 answers/);
    expect(page).toContain('Left out: 1 non-answer.');
    expect(page).toContain('Not in the file, so not used: &quot;respondent_id&quot; (id), &quot;lang&quot; (language), &quot;weight&quot; (weight).');
    expect(page).toMatch(/district: level &quot;Harbour&quot; never seen in the fit; 2 answers coded with the prior of the reference level &quot;East&quot;/);
    const href = page.match(/href="([^"]+)" id="applied-download"/)![1];
    const csv = new TextDecoder().decode(new Uint8Array(await (await t.app.request(href)).arrayBuffer()));
    const [header, first, second] = csv.slice(1).split(/\r\n/).map((l) => l.split(','));
    expect(header.slice(-2)).toEqual(['left out because', 'coding note']);
    expect(first.at(-1)).toBe('district "Harbour" not seen in the fit: prior of the reference level "East"'.replace(/"/g, '""').replace(/^|$/g, '"'));
    expect(second.at(-2)).toBe('non-answer');
  });

  it('refuses a file without the text column with one message naming it and the file\'s columns', async () => {
    const res = await postFile(t, `${base()}/apply`, csrf, { name: 'wrong.csv', bytes: 'id,text,lang\n1,hello,en\n' });
    expect(res.status).toBe(400);
    expect(await res.text()).toContain('wrong.csv: the answers must be in a column &quot;comment&quot;');
  });
});

describe('uploads that could hurt the server', () => {
  it('refuses a header of 200,000 columns with a short message on the Data page', async () => {
    const cols = Array.from({ length: 200_000 }, (_, i) => `c${i}`);
    const res = await postFile(t, `/studies/${studyId}/data/upload`, csrf, { name: 'wide.csv', bytes: `${cols.join(',')}\n${cols.map(() => 'x').join(',')}\n` });
    expect(res.status).toBe(400);
    const page = await res.text();
    expect(page).toContain('over the limit of 1,000 columns for one import');
    expect(page.length).toBeLessThan(100_000);
  });

  it('keeps the mapping page of a 1,000-column file under 1.5 MB, with a preview of 30 columns', async () => {
    const cols = Array.from({ length: 1_000 }, (_, i) => `column_name_${i}`);
    const rows = Array.from({ length: 20 }, (_, r) => cols.map((_, j) => `value ${r}-${j} with some words`).join(','));
    const res = await postFile(t, `/studies/${studyId}/data/upload`, csrf, { name: 'wide-ok.csv', bytes: [cols.join(','), ...rows].join('\n') + '\n' });
    expect(res.status).toBe(200);
    const page = await res.text();
    expect(page).toContain('The first 30 of 1,000 columns');
    expect(page.length).toBeLessThan(1_500_000);
  });

  it('refuses a JSON Lines answer that is a nested object, naming the line and field', async () => {
    const res = await postFile(t, `/studies/${studyId}/data/upload`, csrf, { name: 'nested.jsonl', bytes: '{"id":1,"comment":"fine"}\n{"id":2,"comment":{"text":"hidden"}}\n' });
    expect(res.status).toBe(400);
    expect(await res.text()).toContain('nested.jsonl: line 2, field &quot;comment&quot; holds a nested object');
  });
});
