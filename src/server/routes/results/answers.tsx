// Answers of a finished run: browse by language, theme and group, search, each with its theme mix.
// Filters without free text may be links (GET); search words arrive only in a POST body, so
// they never land in an address, the browser's history or a proxy's log (OWASP ASVS 4.0.3
// V8.3.1). A `q` in the address is ignored. Searches are not kept in the page cache.
import { Hono, type Context } from 'hono';
import { AnswersPage } from '../../../../views/pages/answers.js';
import { frame } from '../../access.js';
import { renderPage } from '../../render.js';
import { themeNames } from '../../results/theme-names.js';
import type { AppEnv } from '../../types.js';
import { queryInt, text } from '../forms.js';
import type { ResultContext } from './context.js';

const ANSWERS_PAGE = 30;

interface AnswersQuery {
  language: string;
  theme: string;
  group: string;
  q: string;
  offset: number;
}

export function answersRoutes(ctx: ResultContext): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  app.get('/studies/:sid/runs/:rid/answers', ctx.cached((c) =>
    answersPage(c, { language: c.req.query('language') ?? '', theme: c.req.query('theme') ?? '', group: c.req.query('group') ?? '', q: '', offset: queryInt(c.req.query('offset'), 0) }),
  ));

  app.post('/studies/:sid/runs/:rid/answers', async (c) => {
    const body = await c.req.parseBody();
    return answersPage(c, { language: text(body.language), theme: text(body.theme), group: text(body.group), q: text(body.q), offset: queryInt(text(body.offset), 0) });
  });

  async function answersPage(c: Context<AppEnv>, query: AnswersQuery) {
    const { study, run, data, base } = ctx.load(c);
    const { model } = data;
    const K = model.K;
    const names = themeNames(c.get('deps').store, study, data).map((n) => n.text);
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
        mix: Array.from({ length: K }, (_, k) => ({ k, label: names[k], share: model.thetaGroups[g * K + k] })).sort((x, y) => y.share - x.share),
      };
    });
    return renderPage(
      c,
      <AnswersPage
        frame={frame(c, `Answers · ${run.name}`, { study, run, active: 'answers' })}
        base={base}
        languages={model.languages}
        labels={names}
        covariates={data.levels()}
        filter={{ language, by, level, theme, q }}
        answers={answers}
        total={matches.length}
        offset={offset}
        limit={ANSWERS_PAGE}
      />,
    );
  }

  return app;
}
