// Themes of a finished run: the table of themes, a theme's label (save, accept the suggestion,
// accept every suggestion at once), and a page per theme.
import { Hono, type Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { LabelCell, ThemePage, ThemesPage } from '../../../../views/pages/themes.js';
import { getThemeLabels, setThemeLabel, setThemeLabels } from '../../../store/index.js';
import { runTies } from '../../../services/index.js';
import { frame } from '../../access.js';
import { renderFragment, renderPage } from '../../render.js';
import { markWords } from '../../results/mark.js';
import { languageOrder, themeNames, themeSuggestions } from '../../results/theme-names.js';
import { themeRows } from '../../results/themes-view.js';
import type { AppEnv } from '../../types.js';
import { text } from '../forms.js';
import { canEdit, storedChecks, type ResultContext } from './context.js';

const WORDS_ON_PAGE = 15;
const EXAMPLES = 4;

/** A label is one plain line: control characters and bidirectional overrides are dropped. */
export function cleanLabel(raw: string): string {
  return raw.replace(/[\u0000-\u001f\u007f\u202a-\u202e\u2066-\u2069]/g, '').trim().slice(0, 80);
}

export function themeRoutes(ctx: ResultContext): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  function back(c: Context<AppEnv>, base: string) {
    const referer = c.req.header('Referer');
    return c.redirect(referer && new URL(referer).pathname.startsWith(base) ? new URL(referer).pathname : `${base}/themes`, 303);
  }

  app.get('/studies/:sid/runs/:rid/themes', ctx.cached(async (c) => {
    const { study, run, data, base } = ctx.load(c);
    const { store } = c.get('deps');
    const checks = storedChecks(c, run);
    const stabilityNote = checks
      ? checks.stability
        ? `Stability compares with ${checks.stability.runs.join(', ')}.`
        : 'Stability needs another finished run with the same number of themes and a different seed.'
      : 'Coherence, stability and alignment across languages appear once the Checks page has been opened for this run.';
    return renderPage(
      c,
      <ThemesPage
        frame={frame(c, `Themes · ${run.name}`, { study, run, active: 'themes' })}
        base={base}
        languages={languageOrder(study, data)}
        rows={themeRows(data, themeNames(store, study, data), checks)}
        canEdit={canEdit(c, study)}
        stabilityNote={stabilityNote}
        sort={c.req.query('sort') ?? ''}
        links={runTies(store, run)}
      />,
    );
  }));

  app.post('/studies/:sid/runs/:rid/themes/:k/label', async (c) => {
    const { study, run, data, base } = ctx.load(c, 'write');
    const k = Number(c.req.param('k'));
    if (!Number.isInteger(k) || k < 0 || k >= data.model.K) throw new HTTPException(404, { message: 'There is no such theme.' });
    const body = await c.req.parseBody();
    const { store } = c.get('deps');
    setThemeLabel(store, run.id, k, cleanLabel(text(body.label)));
    ctx.cache.refreshLabels(run.id);
    if (c.req.header('HX-Request') === 'true') {
      const name = themeNames(store, study, data)[k];
      return renderFragment(c, <LabelCell base={base} name={name} csrf={c.get('csrf')} saved canEdit />);
    }
    return back(c, base);
  });

  // One click accepts every suggestion for themes that have no label yet; saved labels stay.
  app.post('/studies/:sid/runs/:rid/themes/labels/accept', async (c) => {
    const { study, run, data, base } = ctx.load(c, 'write');
    const { store } = c.get('deps');
    const saved = getThemeLabels(store, run.id);
    const fresh = new Map<number, string>();
    for (const s of themeSuggestions(study, data)) if (!saved.has(s.theme)) fresh.set(s.theme, cleanLabel(s.label));
    setThemeLabels(store, run.id, fresh);
    ctx.cache.refreshLabels(run.id);
    return back(c, base);
  });

  app.get('/studies/:sid/runs/:rid/themes/:k', ctx.cached(async (c) => {
    const { study, run, data, base } = ctx.load(c);
    const { model } = data;
    const k = Number(c.req.param('k'));
    if (!/^\d+$/.test(c.req.param('k') ?? '') || k >= model.K) throw new HTTPException(404, { message: 'There is no such theme.' });
    const K = model.K;
    const order = languageOrder(study, data);
    const name = themeNames(c.get('deps').store, study, data)[k];
    const words = order.map((language) => ({
      language,
      rows: data.topWords(k, language, WORDS_ON_PAGE).map((w) => ({ word: w.word, stem: w.stem, probability: w.probability, exclusivity: w.exclusivity })),
    }));
    const examples = order.map((language) => {
      const l = model.languages.indexOf(language);
      const best: { d: number; share: number }[] = [];
      const seenGroups = new Set<number>();
      for (let d = 0; d < model.documentIds.length; d++) {
        if (data.docLanguage[d] !== l || !data.isAnswer[d]) continue;
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
        answers: picked.map((b) => {
          const a = data.answer(b.d);
          return { rowId: a.rowId, share: b.share, text: { parts: markWords(a.text, language, themeWords) } };
        }),
      };
    });
    const groups = data.covariateNames
      .filter((n) => n !== 'question' || data.questions() > 1)
      .map((covariate) => {
        const res = data.contrast(covariate);
        return { covariate, rows: res.shares.filter((r) => r.theme === k).map((r) => ({ level: r.level, share: r.share, low: r.low, high: r.high, n: r.n, effectiveN: r.effectiveN })) };
      });
    return renderPage(
      c,
      <ThemePage
        frame={frame(c, `${name.text} · ${run.name}`, { study, run, active: 'themes' })}
        base={base}
        k={k}
        K={K}
        name={name}
        share={data.shares[k]}
        canEdit={canEdit(c, study)}
        words={words}
        examples={examples}
        groups={groups}
      />,
    );
  }));

  return app;
}
