// Results of a finished run: Themes (with labels and their suggestions), a page per theme,
// Contrasts, Answers and Checks, each in its own module under results/; this file only joins
// them. Routes gather plain props from the cached run data and render.
import { Hono } from 'hono';
import type { RunDataCache } from '../results/run-data.js';
import type { AppEnv } from '../types.js';
import { answersRoutes } from './results/answers.js';
import { checkRoutes } from './results/checks.js';
import { resultContext } from './results/context.js';
import { contrastRoutes } from './results/contrasts.js';
import { themeRoutes } from './results/themes.js';
import { tiesRoutes } from './results/ties.js';

export function resultRoutes(cache: RunDataCache): Hono<AppEnv> {
  const ctx = resultContext(cache);
  const app = new Hono<AppEnv>();
  app.route('/', themeRoutes(ctx));
  app.route('/', contrastRoutes(ctx));
  app.route('/', answersRoutes(ctx));
  app.route('/', checkRoutes(ctx));
  app.route('/', tiesRoutes());
  return app;
}
