// The composition root of the workbench: security and no-store headers, the Host check, static
// assets, sign-in, session, request rate and CSRF checks, then the pages. Routes are thin: parse → call store/services → render a view.
import { Hono } from 'hono';
import { bodyLimit } from 'hono/body-limit';
import { HTTPException } from 'hono/http-exception';
import { ErrorPage } from '../../views/pages/login.js';
import { InputError } from '../text/index.js';
import { assetRoutes, faviconRoute } from './assets.js';
import { csrfMiddleware, sessionMiddleware } from './auth.js';
import { renderPage } from './render.js';
import { dataRoutes } from './routes/data.js';
import { languageRoutes } from './routes/languages.js';
import { loginRoutes } from './routes/login.js';
import { accountRoutes } from './routes/account.js';
import { resultRoutes } from './routes/results.js';
import { runRoutes } from './routes/runs.js';
import { studyRoutes } from './routes/studies.js';
import { vocabularyRoutes } from './routes/vocabulary.js';
import { exportRoutes } from './routes/export.js';
import { RunDataCache } from './results/run-data.js';
import { hostGuard } from './hosts.js';
import { describeUnexpectedError, noStore, securityHeaders } from './security.js';
import { RequestRateLimiter, requestRateLimit, SignInThrottle } from './throttle.js';
import type { AppDeps, AppEnv } from './types.js';

export const DEFAULT_UPLOAD_LIMIT = 100 * 1024 * 1024;

export function createApp(given: AppDeps): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  const deps: AppDeps = {
    ...given,
    signInThrottle: given.signInThrottle ?? new SignInThrottle(),
    requestLimiter: given.requestLimiter ?? new RequestRateLimiter(),
  };
  const limit = deps.uploadLimitBytes ?? DEFAULT_UPLOAD_LIMIT;
  app.use('*', securityHeaders());
  app.use('*', noStore());
  app.use('*', async (c, next) => {
    c.set('deps', deps);
    await next();
  });
  app.use('*', hostGuard());
  app.use(
    '*',
    bodyLimit({
      maxSize: limit + 64 * 1024,
      onError: (c) => c.text(`The upload is larger than the limit of ${Math.round(limit / 1048576)} MB. Split the file and import the parts one by one.`, 413),
    }),
  );
  app.route('/assets', assetRoutes());
  app.route('/', faviconRoute());
  app.use('*', sessionMiddleware());
  app.use('*', requestRateLimit());
  app.use('*', csrfMiddleware());
  app.route('/', loginRoutes());
  app.route('/', accountRoutes());
  app.route('/', studyRoutes());
  app.route('/', dataRoutes());
  app.route('/', languageRoutes());
  app.route('/', vocabularyRoutes());
  app.route('/', runRoutes());
  const runData = new RunDataCache(deps.store);
  // Load a run's results as soon as it finishes, so the first visit to its pages is quick.
  deps.queue.subscribe(null, (e) => {
    if (e.kind === 'status' && e.status === 'finished') setTimeout(() => {
      try {
        runData.get(e.runId);
      } catch {
        // The store may be closing; the page loads the results when it is opened.
      }
    }, 0).unref();
  });
  app.route('/', resultRoutes(runData));
  app.route('/', exportRoutes(runData));

  app.notFound((c) => renderPage(c, <ErrorPage status={404} message="There is no such page." />, 404));
  app.onError((error, c) => {
    if (error instanceof HTTPException) {
      const status = error.status;
      if (c.req.header('HX-Request') === 'true') return c.text(error.message, status);
      return renderPage(c, <ErrorPage status={status} message={error.message || 'That did not work.'} />, status as 400);
    }
    if (error instanceof InputError) {
      return renderPage(c, <ErrorPage status={400} message={error.message} />, 400);
    }
    console.error(describeUnexpectedError(error));
    return renderPage(c, <ErrorPage status={500} message="Themata hit an unexpected problem. Nothing you uploaded was lost; try again, and if it keeps happening, report the steps that led here." />, 500);
  });
  return app;
}
