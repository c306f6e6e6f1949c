// Every study belongs to accounts; a study that is not yours is answered as not found, so its
// existence is not revealed (OWASP ASVS 4.0.3, V4.1 "General Access Control Design").
import type { Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { getRun, getStudy, studyRole, type Run, type Study } from '../store/index.js';
import { takePasswordNoticeFor } from './auth.js';
import type { AppEnv } from './types.js';

export type Need = 'read' | 'write';

function idParam(c: Context<AppEnv>, name: string): number {
  const raw = c.req.param(name) ?? '';
  if (!/^\d{1,12}$/.test(raw)) throw new HTTPException(404, { message: 'There is no such page.' });
  return Number(raw);
}

/** The study named in the path, if the current user may `need` it. */
export function studyFor(c: Context<AppEnv>, need: Need = 'read'): Study {
  const { store } = c.get('deps');
  const user = c.get('user');
  const study = getStudy(store, idParam(c, 'sid'));
  if (!study) throw new HTTPException(404, { message: 'There is no such study, or you have not been given access to it.' });
  if (user.id !== null) {
    const role = studyRole(store, study.id, user.id);
    if (!role) throw new HTTPException(404, { message: 'There is no such study, or you have not been given access to it.' });
    if (need === 'write' && role === 'viewer') throw new HTTPException(403, { message: 'You can look at this study but not change it. Ask its owner for editor access.' });
  }
  return study;
}

/** The run named in the path, which must belong to the study. */
export function runFor(c: Context<AppEnv>, study: Study): Run {
  const run = getRun(c.get('deps').store, idParam(c, 'rid'));
  if (!run || run.studyId !== study.id) throw new HTTPException(404, { message: 'There is no such run in this study.' });
  return run;
}

/** The run, which must have finished (results pages). */
export function finishedRunFor(c: Context<AppEnv>, study: Study): Run {
  const run = runFor(c, study);
  if (run.status !== 'finished') throw new HTTPException(409, { message: `This run has not finished (it is ${run.status}). Results appear when it finishes.` });
  return run;
}

/** The frame fields of a page. */
export function frame(c: Context<AppEnv>, title: string, extra: { study?: Study; run?: Run; active?: string } = {}) {
  return {
    title,
    user: { name: c.get('user').name, local: c.get('user').local },
    csrf: c.get('csrf'),
    study: extra.study ? { id: extra.study.id, name: extra.study.name } : undefined,
    run: extra.run ? { id: extra.run.id, name: extra.run.name, status: extra.run.status } : undefined,
    active: extra.active,
    passwordNotice: takePasswordNoticeFor(c),
  };
}
