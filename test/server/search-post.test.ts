// Search words stay out of addresses (OWASP ASVS 4.0.3 V8.3.1): the Answers and Vocabulary
// searches are posted, their pages are posted too, and no page has a GET form with a field where
// free text can be typed (filters chosen from a list may stay in the address).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFitRun, runFitJob } from '../../src/services/index.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { HTML, LOCAL_CSRF, makeApp, postForm, type TestApp } from './helpers.js';

let t: TestApp;
let studyId: number;
let runId: number;

beforeAll(async () => {
  t = makeApp();
  studyId = syntheticStudy(t.store, { documents: 240 });
  const run = createFitRun(t.store, studyId, { themes: 3, sweeps: 6, burnIn: 2, sampler: 'reference', covariates: ['region'], name: 'k3' });
  await runFitJob({ store: t.store, runId: run.id });
  runId = run.id;
});
afterAll(() => t.close());

const page = async (path: string) => {
  const res = await t.app.request(path, { headers: HTML });
  expect(res.status, path).toBe(200);
  return res.text();
};

/** Forms of a page sent with GET that hold a field for free text. */
function getFormsWithFreeText(html: string): string[] {
  const found: string[] = [];
  for (const m of html.matchAll(/<form\b([^>]*)>([\s\S]*?)<\/form>/g)) {
    const method = /\bmethod="([a-z]+)"/i.exec(m[1])?.[1].toLowerCase() ?? 'get';
    if (method !== 'get') continue;
    const inputs = [...m[2].matchAll(/<input\b[^>]*>/g)].map((x) => x[0]);
    const free = inputs.filter((i) => {
      const type = /\btype="([a-z-]+)"/i.exec(i)?.[1].toLowerCase() ?? 'text';
      return ['text', 'search', 'email', 'url', 'tel', 'password'].includes(type);
    });
    if (free.length || /<textarea\b/.test(m[2])) found.push(m[0].slice(0, 200));
  }
  return found;
}

describe('search words travel in POST bodies only (ASVS V8.3.1)', () => {
  it('renders no form with method GET that carries a free-text field, on any page', async () => {
    const run = `/studies/${studyId}/runs/${runId}`;
    const paths = ['/', `/studies/${studyId}/data`, `/studies/${studyId}/languages`, `/studies/${studyId}/vocabulary?language=en`, `/studies/${studyId}/runs`, `${run}/themes`, `${run}/themes/0`, `${run}/contrasts`, `${run}/answers`, `${run}/checks`];
    for (const path of paths) expect(getFormsWithFreeText(await page(path)), path).toEqual([]);
    // The search forms themselves are there, and posted.
    expect(await page(`${run}/answers`)).toMatch(/<form method="post" action="[^"]*\/answers"[^>]*id="answer-filters"/);
    expect(await page(`/studies/${studyId}/vocabulary?language=en`)).toMatch(/<form method="post" action="[^"]*\/vocabulary\/search"[^>]*id="vocabulary-search"/);
  });

  it('returns the matching answers for a search posted with the CSRF token, and pages through them by POST', async () => {
    const path = `/studies/${studyId}/runs/${runId}/answers`;
    const res = await postForm(t, path, { _csrf: LOCAL_CSRF, q: 'doc 17', language: '', theme: '', group: '' });
    expect(res.status).toBe(200);
    const html = await res.text();
    const rows = [...html.matchAll(/<blockquote dir="auto">([^<]*)<\/blockquote>/g)].map((m) => m[1]);
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.every((r) => r.includes('doc 17'))).toBe(true);
    expect(html).not.toMatch(/[?&]q=/);

    // Many matches: the next page is a posted form carrying the words and the next offset.
    const many = await (await postForm(t, path, { _csrf: LOCAL_CSRF, q: 'doc 1' })).text();
    const total = Number(/([\d,]+) answers match/.exec(many)![1].replace(/,/g, ''));
    expect(total).toBeGreaterThan(30);
    expect(many).toContain('<input type="hidden" name="q" value="doc 1"/>');
    expect(many).toContain('<input type="hidden" name="offset" value="30"/>');
    expect(many).not.toMatch(/[?&]q=/);
    const second = await (await postForm(t, path, { _csrf: LOCAL_CSRF, q: 'doc 1', offset: '30' })).text();
    expect(second).toContain('<ol class="answer-list" start="31">');
    const secondRows = [...second.matchAll(/<blockquote dir="auto">([^<]*)<\/blockquote>/g)].map((m) => m[1]);
    expect(secondRows.length).toBeGreaterThan(0);
    expect(secondRows.every((r) => r.includes('doc 1'))).toBe(true);

    // Without the token the search is refused, and words in an address are ignored.
    expect((await postForm(t, path, { q: 'doc 1' })).status).toBe(403);
    const all = await page(`${path}?q=doc+17`);
    expect(Number(/([\d,]+) answers match/.exec(all)![1].replace(/,/g, ''))).toBeGreaterThan(total);
  });

  it('searches the vocabulary by POST and ignores words put in the address', async () => {
    const res = await postForm(t, `/studies/${studyId}/vocabulary/search`, { _csrf: LOCAL_CSRF, language: 'en', q: 'e1w3' });
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain('<td dir="auto">e1w3s</td>');
    expect(html).not.toContain('<td dir="auto">e1w4s</td>');
    expect(html).toContain('value="e1w3"');
    const viaAddress = await page(`/studies/${studyId}/vocabulary?language=en&q=e1w3`);
    expect(viaAddress).toContain('<td dir="auto">e1w4s</td>');
  });
});
