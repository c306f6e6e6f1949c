// Checks of a finished run, computed on the first visit and kept with the run's results (again
// when the stored checks are of an older version, so older runs gain the newer figures).
import { Hono } from 'hono';
import { ChecksPage } from '../../../../views/pages/checks.js';
import { CHECKS_VERSION, runChecks, runTies } from '../../../services/index.js';
import { listRuns, saveResults } from '../../../store/index.js';
import { frame } from '../../access.js';
import { renderPage } from '../../render.js';
import { checksProps } from '../../results/checks-view.js';
import { runSummaries } from '../../results/summaries.js';
import { themeNames } from '../../results/theme-names.js';
import type { AppEnv } from '../../types.js';
import { storedChecks, type ResultContext } from './context.js';

export function checkRoutes(ctx: ResultContext): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  app.get('/studies/:sid/runs/:rid/checks', (c) => {
    const { study, run, data } = ctx.load(c);
    const { store } = c.get('deps');
    let checks = storedChecks(c, run);
    if (!checks || checks.version !== CHECKS_VERSION) {
      checks = runChecks(store, data.model);
      saveResults(store, run.id, { checks: { json: checks } });
      // The Themes page shows coherence, stability and alignment from these checks.
      ctx.cache.refreshLabels(run.id);
    }
    const runs = listRuns(store, study.id).filter((r) => r.status === 'finished');
    const summaries = runSummaries(store, runs);
    const props = checksProps(data, checks, themeNames(store, study, data), runs.map((r) => ({ run: r, summary: summaries.get(r.id) })));
    return renderPage(c, <ChecksPage frame={frame(c, `Checks · ${run.name}`, { study, run, active: 'checks' })} links={runTies(store, run)} {...props} />);
  });

  return app;
}
