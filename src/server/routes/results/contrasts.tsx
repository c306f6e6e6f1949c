// Contrasts of a finished run: shares per group of one covariate, shaded by their difference
// from the theme's overall share (or by the share itself), and the difference between two groups.
import { Hono } from 'hono';
import { ContrastsPage, type Shading } from '../../../../views/pages/contrasts.js';
import { frame } from '../../access.js';
import { renderPage } from '../../render.js';
import { plainNotes } from '../../results/plain-notes.js';
import { numbered, themeNames } from '../../results/theme-names.js';
import type { AppEnv } from '../../types.js';
import type { ResultContext } from './context.js';

export function contrastRoutes(ctx: ResultContext): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  app.get('/studies/:sid/runs/:rid/contrasts', ctx.cached(async (c) => {
    const { study, run, data, base } = ctx.load(c);
    const names = themeNames(c.get('deps').store, study, data);
    const covariates = data.covariateNames;
    const preferred = run.settings.covariates.find((n) => covariates.includes(n)) ?? covariates.find((n) => n !== 'language' && n !== 'question') ?? covariates[0];
    const by = covariates.includes(c.req.query('by') ?? '') ? c.req.query('by')! : preferred;
    const shading: Shading = c.req.query('shade') === 'share' ? 'share' : 'difference';
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
          theme: numbered(names[d.theme]),
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
        themes={names.map((n) => ({ text: n.text, suggested: n.suggested }))}
        overall={Array.from(data.shares)}
        shading={shading}
        levels={levels}
        grid={grid}
        a={a}
        b={b}
        differences={differences}
        notes={plainNotes(res.notes, by)}
        excluded={res.excludedDocuments}
        draws={res.draws}
      />,
    );
  }));

  return app;
}
