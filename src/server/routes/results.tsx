// Results of a finished run: Themes (with label editing), a page per theme, Contrasts, Answers
// and Checks. Routes only gather plain props from the cached run data and render.
import { Hono, type Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { AnswersPage } from '../../../views/pages/answers.js';
import { ChecksPage } from '../../../views/pages/checks.js';
import { ContrastsPage } from '../../../views/pages/contrasts.js';
import { LabelForm, ThemePage, ThemesPage } from '../../../views/pages/themes.js';
import { runChecks, type RunChecks } from '../../services/index.js';
import { checksProps } from '../results/checks-view.js';
import { loadJsonResult, saveResults, setThemeLabel, studyRole, type Run, type Study } from '../../store/index.js';
import { finishedRunFor, frame, studyFor } from '../access.js';
import { renderFragment, renderPage } from '../render.js';
import { markWords } from '../results/mark.js';
import type { RunDataCache } from '../results/run-data.js';
import type { AppEnv } from '../types.js';
import { queryInt, text } from './forms.js';

const WORDS_IN_TABLE = 8;
const WORDS_ON_PAGE = 15;
const EXAMPLES = 4;
const ANSWERS_PAGE = 30;

function canEdit(c: Context<AppEnv>, study: Study): boolean {
  const user = c.get('user');
  if (user.id === null) return true;
  const role = studyRole(c.get('deps').store, study.id, user.id);
  return role === 'owner' || role === 'editor';
}

export function storedChecks(c: Context<AppEnv>, run: Run): RunChecks | undefined {
  return loadJsonResult<RunChecks>(c.get('deps').store, run.id, 'checks');
}

export function resultRoutes(cache: RunDataCache): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  function load(c: Context<AppEnv>, need: 'read' | 'write' = 'read') {
    const study = studyFor(c, need);
    const run = finishedRunFor(c, study);
    const data = cache.get(run.id);
    if (!data) throw new HTTPException(409, { message: 'This run finished without saved results. Start it again from the Runs page.' });
    return { study, run, data, base: `/studies/${study.id}/runs/${run.id}` };
  }

  /**
   * Results of a finished run do not change except their labels, so a rendered page is kept per
   * run, address, user and CSRF token (the page carries the token) until a label changes.
   */
  function cached(handler: (c: Context<AppEnv>) => Promise<Response>) {
    return async (c: Context<AppEnv>) => {
      const { run, data } = load(c);
      const url = new URL(c.req.url);
      const key = `${c.get('user').id ?? 'local'}|${c.get('csrf')}|${url.pathname}${url.search}`;
      const hit = data.pages.get(key);
      if (hit !== undefined) return c.html(hit);
      const res = await handler(c);
      if (res.status === 200) {
        const html = await res.clone().text();
        cache.remember(run.id, key, html);
      }
      return res;
    };
  }

  app.get('/studies/:sid/runs/:rid/themes', cached(async (c) => {
    const { study, run, data, base } = load(c);
    const { model } = data;
    const L = model.languages.length;
    const checks = storedChecks(c, run);
    const coherence = new Map<number, number[]>();
    for (const t of checks?.coherence.themes ?? []) if (Number.isFinite(t.npmi)) (coherence.get(t.theme) ?? coherence.set(t.theme, []).get(t.theme)!).push(t.npmi);
    const rows = model.labels.map((label, k) => ({
      k,
      label,
      share: data.shares[k],
      words: Object.fromEntries(model.languages.map((l) => [l, data.topWords(k, l, WORDS_IN_TABLE).map((w) => w.word)])),
      balance: model.languages.map((language, l) => ({ language, share: data.balance[k * L + l] })),
      coherence: coherence.has(k) ? coherence.get(k)!.reduce((a, b) => a + b, 0) / coherence.get(k)!.length : undefined,
      stability: checks?.stability?.perTheme[k],
    }));
    const stabilityNote = checks
      ? checks.stability
        ? `Stability compares with ${checks.stability.runs.join(', ')}.`
        : 'Stability needs another finished run with the same number of themes and a different seed.'
      : 'Coherence and stability appear once the Checks page has been opened for this run.';
    return renderPage(
      c,
      <ThemesPage frame={frame(c, `Themes · ${run.name}`, { study, run, active: 'themes' })} base={base} languages={model.languages} rows={rows} canEdit={canEdit(c, study)} stabilityNote={stabilityNote} sort={c.req.query('sort') ?? ''} />,
    );
  }));

  app.post('/studies/:sid/runs/:rid/themes/:k/label', async (c) => {
    const { run, data, base } = load(c, 'write');
    const k = Number(c.req.param('k'));
    if (!Number.isInteger(k) || k < 0 || k >= data.model.K) throw new HTTPException(404, { message: 'There is no such theme.' });
    const body = await c.req.parseBody();
    // Control characters and bidirectional overrides are dropped: a label is one plain line.
    const label = text(body.label).replace(/[\u0000-\u001f\u007f\u202a-\u202e\u2066-\u2069]/g, '').trim().slice(0, 80);
    setThemeLabel(c.get('deps').store, run.id, k, label);
    cache.refreshLabels(run.id);
    if (c.req.header('HX-Request') === 'true') {
      return renderFragment(c, <LabelForm base={base} k={k} label={data.model.labels[k]} csrf={c.get('csrf')} saved canEdit />);
    }
    const back = c.req.header('Referer');
    return c.redirect(back && new URL(back).pathname.startsWith(base) ? new URL(back).pathname : `${base}/themes`, 303);
  });

  app.get('/studies/:sid/runs/:rid/themes/:k', cached(async (c) => {
    const { study, run, data, base } = load(c);
    const { model } = data;
    const k = Number(c.req.param('k'));
    if (!/^\d+$/.test(c.req.param('k') ?? '') || k >= model.K) throw new HTTPException(404, { message: 'There is no such theme.' });
    const K = model.K;
    const words = model.languages.map((language) => ({
      language,
      rows: data.topWords(k, language, WORDS_ON_PAGE).map((w) => ({ word: w.word, stem: w.stem, probability: w.probability, exclusivity: w.exclusivity })),
    }));
    const examples = model.languages.map((language, l) => {
      const best: { d: number; share: number }[] = [];
      const seenGroups = new Set<number>();
      for (let d = 0; d < data.answers.length; d++) {
        if (data.docLanguage[d] !== l) continue;
        const share = model.thetaGroups[model.docGroup[d] * K + k];
        if (best.length < EXAMPLES * 3 || share > best[best.length - 1].share) {
          best.push({ d, share });
          best.sort((a, b) => b.share - a.share);
          if (best.length > EXAMPLES * 3) best.pop();
        }
      }
      const picked = best.filter((b) => (seenGroups.has(model.docGroup[b.d]) ? false : (seenGroups.add(model.docGroup[b.d]), true))).slice(0, EXAMPLES);
      const themeWords = data.topWords(k, language, 30);
      return {
        language,
        answers: picked.map((b) => ({ rowId: data.answers[b.d].rowId, share: b.share, text: { parts: markWords(data.answers[b.d].text, language, themeWords) } })),
      };
    });
    const groups = data.covariateNames
      .filter((n) => n !== 'question' || new Set(data.answers.filter((_, d) => data.isAnswer[d]).map((a) => a.question)).size > 1)
      .map((covariate) => {
        const res = data.contrast(covariate);
        return { covariate, rows: res.shares.filter((r) => r.theme === k).map((r) => ({ level: r.level, share: r.share, low: r.low, high: r.high, n: r.n, effectiveN: r.effectiveN })) };
      });
    return renderPage(
      c,
      <ThemePage
        frame={frame(c, `${model.labels[k]} · ${run.name}`, { study, run, active: 'themes' })}
        base={base}
        k={k}
        K={K}
        label={model.labels[k]}
        share={data.shares[k]}
        canEdit={canEdit(c, study)}
        words={words}
        examples={examples}
        groups={groups}
      />,
    );
  }));

  app.get('/studies/:sid/runs/:rid/contrasts', cached(async (c) => {
    const { study, run, data, base } = load(c);
    const covariates = data.covariateNames;
    const preferred = run.settings.covariates.find((n) => covariates.includes(n)) ?? covariates.find((n) => n !== 'language' && n !== 'question') ?? covariates[0];
    const by = covariates.includes(c.req.query('by') ?? '') ? c.req.query('by')! : preferred;
    const res = data.contrast(by);
    const K = data.model.K;
    const levels = res.levels.map((level) => {
      const first = res.shares.find((r) => r.level === level);
      return { level, n: first?.n ?? 0, effectiveN: first?.effectiveN ?? 0 };
    });
    const grid = res.levels.map((level) => {
      const row = new Array(K).fill(null).map(() => ({ share: NaN, low: NaN, high: NaN }));
      for (const r of res.shares) if (r.level === level) row[r.theme] = { share: r.share, low: r.low, high: r.high };
      return row;
    });
    const a = res.levels.includes(c.req.query('a') ?? '') ? c.req.query('a')! : (res.levels[0] ?? '');
    let b = res.levels.includes(c.req.query('b') ?? '') ? c.req.query('b')! : (res.levels[1] ?? '');
    if (b === a) b = res.levels.find((l) => l !== a) ?? '';
    const differences = res.differences
      .filter((d) => (d.levelA === a && d.levelB === b) || (d.levelA === b && d.levelB === a))
      .map((d) => {
        const flip = d.levelA !== a;
        return {
          theme: `${d.theme + 1}. ${data.model.labels[d.theme]}`,
          difference: flip ? -d.difference : d.difference,
          low: flip ? -d.high : d.low,
          high: flip ? -d.low : d.high,
          p: d.p,
          pAdjusted: d.pAdjusted,
          discovery: d.discovery,
        };
      });
    return renderPage(
      c,
      <ContrastsPage
        frame={frame(c, `Contrasts · ${run.name}`, { study, run, active: 'contrasts' })}
        base={base}
        covariates={covariates}
        by={by}
        labels={data.model.labels}
        levels={levels}
        grid={grid}
        a={a}
        b={b}
        differences={differences}
        notes={res.notes}
        excluded={res.excludedDocuments}
        draws={res.draws}
      />,
    );
  }));

  // Filters without free text may be links (GET); search words arrive only in a POST body, so
  // they never land in an address, the browser's history or a proxy's log (OWASP ASVS 4.0.3
  // V8.3.1). A `q` in the address is ignored. Searches are not kept in the page cache.
  app.get('/studies/:sid/runs/:rid/answers', cached((c) =>
    answersPage(c, { language: c.req.query('language') ?? '', theme: c.req.query('theme') ?? '', group: c.req.query('group') ?? '', q: '', offset: queryInt(c.req.query('offset'), 0) }),
  ));

  app.post('/studies/:sid/runs/:rid/answers', async (c) => {
    const body = await c.req.parseBody();
    return answersPage(c, { language: text(body.language), theme: text(body.theme), group: text(body.group), q: text(body.q), offset: queryInt(text(body.offset), 0) });
  });

  async function answersPage(c: Context<AppEnv>, query: { language: string; theme: string; group: string; q: string; offset: number }) {
    const { study, run, data, base } = load(c);
    const { model } = data;
    const K = model.K;
    const { language, theme, group } = query;
    const q = query.q.trim().slice(0, 200);
    const eq = group.indexOf('=');
    const by = eq > 0 ? group.slice(0, eq) : '';
    const level = eq > 0 ? group.slice(eq + 1) : '';
    const themeIndex = theme === '' ? -1 : Number(theme);
    const needle = q.toLocaleLowerCase();
    const matches: number[] = [];
    for (let d = 0; d < data.answers.length; d++) {
      const a = data.answers[d];
      if (!data.isAnswer[d]) continue; // a glossary's term list was fitted but is no answer
      if (language && a.language !== language) continue;
      if (themeIndex >= 0 && data.dominant[d] !== themeIndex) continue;
      if (by && String(by === 'question' ? a.question : (a.covariates[by] ?? '')) !== level) continue;
      if (needle && !a.text.toLocaleLowerCase().includes(needle) && a.rowId !== q) continue;
      matches.push(d);
    }
    if (themeIndex >= 0) matches.sort((x, y) => model.thetaGroups[model.docGroup[y] * K + themeIndex] - model.thetaGroups[model.docGroup[x] * K + themeIndex]);
    const offset = query.offset;
    const answers = matches.slice(offset, offset + ANSWERS_PAGE).map((d) => {
      const a = data.answers[d];
      const g = model.docGroup[d];
      return {
        rowId: a.rowId,
        language: a.language,
        question: a.question,
        text: a.text,
        covariates: Object.entries(a.covariates).filter(([, v]) => v !== null && v !== '').map(([k2, v]) => `${k2}: ${v}`).join(' · '),
        mix: Array.from({ length: K }, (_, k) => ({ k, label: model.labels[k], share: model.thetaGroups[g * K + k] })).sort((x, y) => y.share - x.share),
      };
    });
    return renderPage(
      c,
      <AnswersPage
        frame={frame(c, `Answers · ${run.name}`, { study, run, active: 'answers' })}
        base={base}
        languages={model.languages}
        labels={model.labels}
        covariates={data.levels()}
        filter={{ language, by, level, theme, q }}
        answers={answers}
        total={matches.length}
        offset={offset}
        limit={ANSWERS_PAGE}
      />,
    );
  }

  app.get('/studies/:sid/runs/:rid/checks', (c) => {
    const { study, run, data } = load(c);
    const { store } = c.get('deps');
    let checks = storedChecks(c, run);
    if (!checks) {
      checks = runChecks(store, data.model);
      saveResults(store, run.id, { checks: { json: checks } });
    }
    return renderPage(c, <ChecksPage frame={frame(c, `Checks · ${run.name}`, { study, run, active: 'checks' })} {...checksProps(data, checks)} />);
  });

  return app;
}
