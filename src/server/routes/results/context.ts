// What every results route needs: the study, the finished run and its cached data, who may edit
// labels, and a page cache for results that only change when a label does.
import type { Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { loadJsonResult, studyRole, type Run, type Study } from '../../../store/index.js';
import type { RunChecks } from '../../../services/index.js';
import { finishedRunFor, studyFor } from '../../access.js';
import type { RunData, RunDataCache } from '../../results/run-data.js';
import type { AppEnv } from '../../types.js';

export interface LoadedRun {
  readonly study: Study;
  readonly run: Run;
  readonly data: RunData;
  /** Address of the run's pages, /studies/S/runs/R. */
  readonly base: string;
}

export type Handler = (c: Context<AppEnv>) => Promise<Response>;

export interface ResultContext {
  readonly cache: RunDataCache;
  load(c: Context<AppEnv>, need?: 'read' | 'write'): LoadedRun;
  /**
   * Results of a finished run do not change except their labels, so a rendered page is kept per
   * run, address, user and CSRF token (the page carries the token) until a label changes.
   */
  cached(handler: Handler): Handler;
}

export function canEdit(c: Context<AppEnv>, study: Study): boolean {
  const user = c.get('user');
  if (user.id === null) return true;
  const role = studyRole(c.get('deps').store, study.id, user.id);
  return role === 'owner' || role === 'editor';
}

export function storedChecks(c: Context<AppEnv>, run: Run): RunChecks | undefined {
  return loadJsonResult<RunChecks>(c.get('deps').store, run.id, 'checks');
}

export function resultContext(cache: RunDataCache): ResultContext {
  function load(c: Context<AppEnv>, need: 'read' | 'write' = 'read'): LoadedRun {
    const study = studyFor(c, need);
    const run = finishedRunFor(c, study);
    const data = cache.get(run.id);
    if (!data) throw new HTTPException(409, { message: 'This run finished without saved results. Start it again from the Runs page.' });
    return { study, run, data, base: `/studies/${study.id}/runs/${run.id}` };
  }
  function cached(handler: Handler): Handler {
    return async (c) => {
      const { run, data } = load(c);
      const url = new URL(c.req.url);
      const key = `${c.get('user').id ?? 'local'}|${c.get('csrf')}|${url.pathname}${url.search}`;
      const hit = data.pages.get(key);
      if (hit !== undefined) return c.html(hit);
      const res = await handler(c);
      if (res.status === 200) cache.remember(run.id, key, await res.clone().text());
      return res;
    };
  }
  return { cache, load, cached };
}
