// The "languages not tied together" notice as a fragment, for pages that load it after
// themselves (the Runs page, before a fit).
import { Hono } from 'hono';
import { TiesNotice } from '../../../../views/ties-notice.js';
import { linkSummary } from '../../../store/index.js';
import { studyFor } from '../../access.js';
import { renderFragment } from '../../render.js';
import type { AppEnv } from '../../types.js';

export function tiesRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  app.get('/studies/:sid/ties-notice', (c) => {
    const study = studyFor(c);
    return renderFragment(c, <TiesNotice links={linkSummary(c.get('deps').store, study.id)} studyId={study.id} when="before" />);
  });
  return app;
}
