// What a researcher reads after a fit (issue 14 "Themes and reading", issue 12 "say when the
// languages are not tied together"), through the routes in process: suggested labels and their
// one-click acceptance, a Themes table that fits the window, coherence explained and flagged,
// Checks with counted pairs, perplexity beside the study's other runs and per-theme alignment,
// Contrasts shaded by difference with plain notes, and the tie warning on Runs, Themes, Checks.
// Data: invented bilingual park surveys (helpers.ts), and one whose answers come with their
// translation under one link key (written for this test).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HTML, idFrom, inventedSurvey, LOCAL_CSRF, makeApp, postFile, postForm, type TestApp } from './helpers.js';

const csrf = { _csrf: LOCAL_CSRF };
let t: TestApp;
const get = (path: string) => t.app.request(path, { headers: HTML });

/** Sentences of the invented park survey (helpers.ts) and their Spanish translations. */
const EN = [
  'the playground needs new swings and a safer fence',
  'dogs off lead scare the children near the pond',
  'toilets are closed too often and need cleaning',
  'night lighting on the paths would make walking safer',
];
const ES = [
  'el parque infantil necesita columpios nuevos y una valla segura',
  'los perros sueltos asustan a los niños cerca del estanque',
  'los baños están cerrados muy a menudo y necesitan limpieza',
  'luces nocturnas en los caminos harían más seguro caminar',
];

/** Each English answer and its Spanish translation share one link key. */
function linkedSurvey(pairs = 60): string {
  const out = ['respondent_id,comment,lang,district,weight,link_key'];
  for (let j = 0; j < pairs; j++) {
    const a = j % 4;
    const b = Math.floor(j / 4) % 4;
    const district = ['North', 'South', 'East'][j % 3];
    const weight = (0.5 + (j % 4) * 0.25).toFixed(2);
    out.push(`E${j},"${EN[a]}; ${EN[b]}",en,${district},${weight},P${j}`, `S${j},"${ES[a]}; ${ES[b]}",es,${district},${weight},P${j}`);
  }
  return out.join('\n') + '\n';
}

async function studyWithRun(name: string, csv: string, roles: Record<string, string>, holdout: string) {
  const res = await postForm(t, '/studies', { name, languages: 'en, es', ...csrf });
  const sid = idFrom(res.headers.get('Location'));
  const up = await postFile(t, `/studies/${sid}/data/upload`, csrf, { name: `${name}.csv`, bytes: csv });
  const key = (await up.text()).match(/name="upload" value="([^"]+)"/)![1];
  const imp = await postForm(t, `/studies/${sid}/data/import`, { upload: key, ...roles, ...csrf });
  expect(imp.status).toBe(303);
  const run = await postForm(t, `/studies/${sid}/runs`, { themes: '4', sweeps: '60', burnIn: '10', seed: '5', threads: '1', holdout, covariates: 'district', ...csrf });
  expect(run.status).toBe(303);
  return { sid, rid: idFrom(run.headers.get('Location'), /\/runs\/(\d+)/) };
}

let linked: { sid: number; rid: number };
let unlinked: { sid: number; rid: number };
let glossed: { sid: number; rid: number };

/** A researcher's term list for the park survey: one row per concept, one column per language. */
const GLOSSARY = ['en,es', 'playground,parque infantil', 'swings,columpios', 'fence,valla', 'dogs,perros', 'pond,estanque', 'ducks,patos', 'toilets,baños',
  'cleaning,limpieza', 'lighting,luces', 'paths,caminos', 'drainage,drenaje', 'rain,lluvia', 'benches,bancos', 'shade,sombra', 'trees,árboles'].join('\n') + '\n';
let second = 0;

beforeAll(async () => {
  t = makeApp();
  const roles = { 'role-0': 'id', 'role-1': 'text', 'role-2': 'language', 'role-3': 'categorical', 'role-4': 'weight' };
  linked = await studyWithRun('Linked park', linkedSurvey(60), { ...roles, 'role-5': 'link' }, '0.3');
  unlinked = await studyWithRun('Unlinked park', inventedSurvey(80), roles, '0.1');
  {
    const res = await postForm(t, '/studies', { name: 'Glossed park', languages: 'en, es', ...csrf });
    const sid = idFrom(res.headers.get('Location'));
    const up = await postFile(t, `/studies/${sid}/data/upload`, csrf, { name: 'park.csv', bytes: inventedSurvey(80) });
    const key = (await up.text()).match(/name="upload" value="([^"]+)"/)![1];
    await postForm(t, `/studies/${sid}/data/import`, { upload: key, ...roles, ...csrf });
    const { importGlossary } = await import('../../src/services/index.js');
    await importGlossary(t.store, { study: sid, bytes: new TextEncoder().encode(GLOSSARY), fileName: 'park-terms.csv' });
    const run = await postForm(t, `/studies/${sid}/runs`, { themes: '4', sweeps: '60', burnIn: '10', seed: '5', threads: '1', holdout: '0', ...csrf });
    glossed = { sid, rid: idFrom(run.headers.get('Location'), /\/runs\/(\d+)/) };
  }
  const r2 = await postForm(t, `/studies/${linked.sid}/runs`, { name: 'second seed', themes: '4', sweeps: '60', burnIn: '10', seed: '9', threads: '1', holdout: '0.3', covariates: 'district', ...csrf });
  second = idFrom(r2.headers.get('Location'), /\/runs\/(\d+)/);
  await t.queue.idle();
}, 120_000);
afterAll(() => t.close());

const base = (s: { sid: number; rid: number }) => `/studies/${s.sid}/runs/${s.rid}`;

describe('theme labels: suggested, accepted, edited', () => {
  it('shows a suggested label from distinctive words, never "Theme 1: Theme 1"', async () => {
    const page = await (await get(`${base(linked)}/themes`)).text();
    expect(page).toContain('<span class="tag">suggested</span>');
    expect(page).toMatch(/Accept all 4 suggested labels/);
    // The suggestion is also the input's placeholder; the input itself stays empty until saved.
    const suggestion = page.match(/name="label" value="" placeholder="([^"]+)"/)![1];
    expect(suggestion).not.toMatch(/^Theme \d/);
    expect(suggestion.split(', ').length).toBe(3);
    // Spanish words beside the English suggestion.
    expect(page).toMatch(/· es: /);
    const theme = await (await get(`${base(linked)}/themes/0`)).text();
    expect(theme).not.toMatch(/Theme 1: Theme 1/);
    expect(theme).toMatch(/<h1>Theme 1: [^<]+<span class="tag"[^>]*>suggested<\/span><\/h1>/);
  });

  it('accepts one suggestion with one click (htmx), and the theme page then shows it as a label', async () => {
    const page = await (await get(`${base(linked)}/themes`)).text();
    const suggestion = page.match(/id="label-1">.*?placeholder="([^"]+)"/s)![1];
    const res = await postForm(t, `${base(linked)}/themes/1/label`, { label: suggestion, ...csrf }, { 'HX-Request': 'true' });
    expect(res.status).toBe(200);
    const fragment = await res.text();
    expect(fragment).toContain('Saved');
    expect(fragment).toContain(`value="${suggestion}"`);
    expect(fragment).not.toContain('class="tag">suggested');
    const theme = await (await get(`${base(linked)}/themes/1`)).text();
    expect(theme).toContain(`<h1>Theme 2: ${suggestion}</h1>`);
  });

  it('accepts all remaining suggestions at once and keeps a label the researcher wrote', async () => {
    await postForm(t, `${base(linked)}/themes/0/label`, { label: 'Play areas', ...csrf });
    const res = await postForm(t, `${base(linked)}/themes/labels/accept`, csrf);
    expect(res.status).toBe(303);
    const page = await (await get(`${base(linked)}/themes`)).text();
    expect(page).not.toContain('<span class="tag">suggested</span>');
    expect(page).not.toContain('Accept all');
    expect(page).toContain('value="Play areas"');
    expect((page.match(/name="label" value="[^"]+"/g) ?? []).length).toBe(4);
  });

  it('refuses to accept suggestions without the CSRF token', async () => {
    const res = await postForm(t, `${base(linked)}/themes/labels/accept`, {});
    expect(res.status).toBe(403);
  });
});

describe('the Themes table fits the window and explains its figures', () => {
  it('uses a fixed layout without a side scroll, languages in reading order, the rest collapsible', async () => {
    const page = await (await get(`${base(unlinked)}/themes`)).text();
    const start = page.indexOf('<table class="list themes fit" id="themes"');
    expect(start).toBeGreaterThan(0);
    const table = page.slice(start, page.indexOf('</table>', start));
    expect(page).not.toMatch(/<div class="scroll">\s*<table class="list themes/);
    expect(page).toContain('Top words · en, es');
    // Seven columns whatever the number of languages: one words column, each language a line.
    expect(table.match(/<th scope="col"/g)!.length).toBe(7);
    expect(table).toMatch(/<div class="lang-words first"><span class="lang">en<\/span>/);
    expect(page).toContain('id="coherence-help"');
    expect(page).toMatch(/from −1 \(the words never share an answer\)/);
  });

  it('flags negative coherence on the Themes page once the checks exist', async () => {
    await get(`${base(unlinked)}/checks`);
    const page = await (await get(`${base(unlinked)}/themes`)).text();
    const values = [...page.matchAll(/<td class="num">(−?-?\d\.\d\d)(<span class="flag"[^>]*>negative<\/span>)?<\/td>/g)];
    expect(values.length).toBeGreaterThan(0);
    for (const v of values) expect(Number(v[1]) < 0).toBe(Boolean(v[2]));
  });
});

describe('Checks', () => {
  it('names each alignment column, counts the answers behind each figure, and explains perplexity beside the other runs', async () => {
    const page = await (await get(`${base(linked)}/checks`)).text();
    expect(page).not.toMatch(/<th scope="col" class="num">By chance<\/th>/);
    expect(page).toContain('Ranked first by chance');
    expect(page).toContain('Mean reciprocal rank by chance');
    expect(page).toMatch(/<th scope="col" class="num"[^>]*>Answers compared<\/th>/);
    expect(page).toMatch(/<tr><td>en → es<\/td><td class="num">\d+<\/td>/);
    expect(page).toContain('document completion');
    const runs = page.slice(page.indexOf('id="perplexity-runs"'), page.indexOf('</table>', page.indexOf('id="perplexity-runs"')));
    expect(runs).toContain('this run');
    expect(runs).toContain(`<a href="/studies/${linked.sid}/runs/${second}/checks">second seed</a>`);
    // Both runs' figures side by side (the other run's checks computed when its page is opened, if not before).
    await get(`/studies/${linked.sid}/runs/${second}/checks`);
    const again = await (await get(`${base(linked)}/checks`)).text();
    const table = again.slice(again.indexOf('id="perplexity-runs"'), again.indexOf('</table>', again.indexOf('id="perplexity-runs"')));
    expect(table.match(/<td class="num">\d+\.\d<\/td>/g)!.length).toBe(2);
    expect(runs.match(/<tr/g)!.length).toBe(3); // header + two runs
  });

  it('shows per theme and language pair how well themes line up, with pair counts and the rule', async () => {
    const page = await (await get(`${base(linked)}/checks`)).text();
    expect(page).toContain('id="theme-alignment"');
    expect(page).toContain('Per theme, from held-out translations');
    expect(page).toMatch(/<tr><td>en – es<\/td><td class="num">\d+<\/td><td class="num">\d+%<\/td><td class="num">\d+%<\/td><\/tr>/);
    expect(page).toContain('Pairs led by it');
    expect(page).toMatch(/Rule: a theme is aligned for a pair of languages when the lower end of the 95% interval/);
    expect(page).toMatch(/<td>(aligned|not aligned|too few pairs)<\/td>/);
  });

  it('recomputes checks stored by an older version so they gain the new figures', async () => {
    const { saveResults, loadJsonResult } = await import('../../src/store/index.js');
    const old = loadJsonResult<Record<string, unknown>>(t.store, linked.rid, 'checks')!;
    const { version: _v, themeAlignment: _a, ...older } = old;
    saveResults(t.store, linked.rid, { checks: { json: older } });
    await get(`${base(linked)}/checks`);
    expect(loadJsonResult<Record<string, unknown>>(t.store, linked.rid, 'checks')!.themeAlignment).toBeDefined();
  });
});

describe('languages not tied together', () => {
  it('warns on Runs before a fit, and on Themes and Checks after it, when nothing links the languages', async () => {
    const runs = await (await get(`/studies/${unlinked.sid}/runs`)).text();
    expect(runs).toContain(`hx-get="/studies/${unlinked.sid}/ties-notice"`);
    const notice = await (await get(`/studies/${unlinked.sid}/ties-notice`)).text();
    expect(notice).toContain('The languages of this study are not tied together');
    expect(notice).toContain('glossary');
    expect(await (await get(`${base(unlinked)}/themes`)).text()).toContain('not tied together');
    expect(await (await get(`${base(unlinked)}/checks`)).text()).toContain('not tied together');
  });

  it('counts glossary rows as ties, and judges each theme on them on Checks', async () => {
    expect(await (await get(`/studies/${glossed.sid}/ties-notice`)).text()).not.toContain('not tied together');
    const page = await (await get(`${base(glossed)}/checks`)).text();
    expect(page).not.toContain('not tied together');
    expect(page).toContain('Per theme, from the glossary');
    const section = page.slice(page.indexOf('id="glossary-alignment"'));
    // 15 rows, each one en–es pair of terms the vocabulary knows.
    const pairs = Number(section.match(/<tr><td>en – es<\/td><td class="num">(\d+)<\/td>/)![1]);
    expect(pairs).toBeGreaterThan(5);
    expect(pairs).toBeLessThanOrEqual(15);
    expect(page).not.toContain('id="theme-alignment"'); // nothing held out
  });

  it('lists only answers on the Answers page, not the glossary terms the fit also read', async () => {
    const page = await (await get(`${base(glossed)}/answers`)).text();
    expect(page).toMatch(/1–30 of 80\b/);
  });

  it('stays quiet for a study whose answers are linked across languages', async () => {
    expect(await (await get(`/studies/${linked.sid}/ties-notice`)).text()).not.toContain('not tied together');
    expect(await (await get(`${base(linked)}/themes`)).text()).not.toContain('not tied together');
  });
});

describe('Contrasts', () => {
  it('shades by difference from the overall share by default, with a legend, and by share on request', async () => {
    const page = await (await get(`${base(linked)}/contrasts?by=district`)).text();
    expect(page).toContain('id="shading-legend"');
    expect(page).toMatch(/below the theme(&#39;|')s overall share/);
    expect(page).toMatch(/class="num diff-(0|[pm][1-4])( clear)?"/);
    expect(page).toContain('<th scope="row">All answers</th>');
    const byShare = await (await get(`${base(linked)}/contrasts?by=district&shade=share`)).text();
    expect(byShare).toMatch(/class="num shade-\d"/);
    expect(byShare).not.toMatch(/class="num diff-/);
    expect(byShare).toContain('<input type="hidden" name="shade" value="share"/>');
  });

  it('says in plain words how linked answers were treated', async () => {
    const page = await (await get(`${base(linked)}/contrasts?by=district`)).text();
    expect(page).not.toContain('resampled together');
    expect(page).not.toContain('cluster bootstrap');
    expect(page).toContain('Translations of the same answer were counted as one answer when computing intervals.');
  });
});

describe('the HTML report', () => {
  async function report(s: { sid: number; rid: number }): Promise<string> {
    const res = await postForm(t, `${base(s)}/export`, csrf);
    expect(res.status).toBe(303);
    const { listRunExports, getRunExportBytes } = await import('../../src/store/index.js');
    const file = listRunExports(t.store, s.rid).find((f) => f.fileName === 'report.html')!;
    return new TextDecoder().decode(getRunExportBytes(t.store, file.id)!.bytes);
  }

  it('opens with a summary (labelled themes, shares, clearest differences with intervals), then the detail, with print styles', async () => {
    const html = await report(linked);
    const summary = html.indexOf('id="summary"');
    const detail = html.indexOf('id="themes-detail"');
    expect(summary).toBeGreaterThan(0);
    expect(detail).toBeGreaterThan(summary);
    expect(html.indexOf('By district')).toBeGreaterThan(detail);
    // Labels accepted above, never "Theme 4 (Theme 4)".
    expect(html).toContain('1. Play areas');
    expect(html).not.toMatch(/Theme (\d+) \(Theme \1\)/);
    expect(html).toContain('Clearest differences between groups');
    expect(html).toMatch(/id="main-differences"|No difference between groups is clear at the 95% level/);
    // Groups as one table each, not one chart per theme and group.
    expect((html.match(/<figure class="chart"/g) ?? []).length).toBeLessThanOrEqual(2);
    expect(html).toMatch(/<table class="list shares">/);
    expect(html).toMatch(/\d+\.\d%<span class="interval"> \d+\.\d%–\d+\.\d%<\/span>/);
    expect(html).toContain('@media print');
    expect(html).toContain('break-before: page');
    // docs/design.md §10 cautions, in the summary.
    const cautions = html.slice(summary, detail);
    expect(cautions).toContain('they are not causes');
    expect(cautions).toContain('only as good as the survey weights');
    expect(cautions).toContain('intervals assume answers are independent');
    expect(cautions).toContain('personal data');
    expect(html).not.toContain('<script');
  });

  it('marks suggested labels and warns when the languages were not tied together', async () => {
    const html = await report(unlinked);
    expect(html).toContain('are suggested from each theme');
    expect(html).toMatch(/<td>1\. [^<]+ \*<\/td>/);
    expect(html).toContain('were not tied together');
  });
});

describe('theme names', () => {
  it('calls a theme with almost no answers so rather than inventing words for it', async () => {
    const { themeNames } = await import('../../src/server/results/theme-names.js');
    const { RunDataCache } = await import('../../src/server/results/run-data.js');
    const { getStudy } = await import('../../src/store/index.js');
    const data = new RunDataCache(t.store).get(unlinked.rid)!;
    const shares = data.shares as Float64Array;
    const kept = Float64Array.from(shares);
    shares.fill(0);
    shares[0] = 1;
    try {
      const names = themeNames(t.store, getStudy(t.store, unlinked.sid)!, data);
      expect(names.slice(1).map((n) => n.suggestion)).toEqual(['almost no answers', 'almost no answers', 'almost no answers']);
      expect(names[0].suggestion).not.toBe('almost no answers');
    } finally {
      shares.set(kept);
    }
  });
});
