// Issue 8, item 1 (route table, study ownership): every route of the workbench that names a
// study, asked by an account that is not a member, answers 404 (the study's existence is not
// revealed); every state-changing one, asked by a viewer, answers 403; and a run of another study
// is not reachable through your own study's path. OWASP ASVS 4.0.3 V4.1.1, V4.1.3, V4.2.1 (IDOR),
// V13.2.1 and V14.5.1 (only the methods in use are answered).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFitRun, runFitJob } from '../../src/services/index.js';
import { addStudyMember, createAccount, setRunStatus, type Store } from '../../src/store/index.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { HTML, makeApp, postForm, type TestApp } from '../server/helpers.js';

let t: TestApp;
let own: { studyId: number; runId: number };
let other: { studyId: number; runId: number };
const users: Record<string, { headers: Record<string, string>; csrf: string }> = {};

async function finishedRun(store: Store, studyId: number, name: string): Promise<number> {
  const run = createFitRun(store, studyId, { themes: 2, sweeps: 6, burnIn: 2, sampler: 'reference', name });
  await runFitJob({ store, runId: run.id });
  setRunStatus(store, run.id, 'finished');
  return run.id;
}

async function login(name: string): Promise<{ headers: Record<string, string>; csrf: string }> {
  const res = await postForm(t, '/login', { name, password: `${name} has a long password`, next: '/' });
  expect(res.status).toBe(303);
  const token = /themata_session=([^;]+)/.exec(res.headers.get('Set-Cookie') ?? '')![1];
  const headers = { Cookie: `themata_session=${token}` };
  const page = await (await t.app.request('/', { headers: { ...HTML, ...headers } })).text();
  return { headers, csrf: /name="_csrf" value="([^"]+)"/.exec(page)![1] };
}

beforeAll(async () => {
  t = makeApp({ loopbackOnly: false });
  const ids: Record<string, number> = {};
  for (const name of ['ana', 'ben', 'cara']) ids[name] = createAccount(t.store, name, `${name} has a long password`).id;
  const a = syntheticStudy(t.store, { documents: 60 });
  addStudyMember(t.store, a, ids.ana, 'owner');
  addStudyMember(t.store, a, ids.cara, 'viewer');
  own = { studyId: a, runId: await finishedRun(t.store, a, 'ana run') };
  t.store.db.prepare("UPDATE studies SET name = 'Ana' WHERE id = ?").run(a);
  const b = syntheticStudy(t.store, { documents: 60, seed: 9 });
  addStudyMember(t.store, b, ids.ben, 'owner');
  other = { studyId: b, runId: await finishedRun(t.store, b, 'ben run') };
  for (const name of ['ana', 'ben', 'cara']) users[name] = await login(name);
});
afterAll(() => t.close());

/** Every study route of the app, with its parameters filled from `ids`. */
function studyRoutes(ids: { studyId: number; runId: number }) {
  const seen = new Set<string>();
  return t.app.routes
    .filter((r) => (r.method === 'GET' || r.method === 'POST') && r.path.includes(':sid'))
    .filter((r) => !seen.has(`${r.method} ${r.path}`) && seen.add(`${r.method} ${r.path}`))
    .map((r) => ({
      method: r.method,
      route: r.path,
      path: r.path.replace(':sid', String(ids.studyId)).replace(':rid', String(ids.runId)).replace(':k', '0').replace(':fid', '1'),
    }));
}

function send(user: string, method: string, path: string): Promise<Response> {
  const u = users[user];
  if (method === 'GET') return Promise.resolve(t.app.request(path, { headers: { ...HTML, ...u.headers } }));
  return Promise.resolve(postForm(t, path, { _csrf: u.csrf, name: 'x', label: 'x', themes: '2' }, u.headers));
}

describe('who may reach which study (route table)', () => {
  it('covers every study route the workbench has', () => {
    const routes = studyRoutes(own);
    expect(routes.length).toBeGreaterThanOrEqual(20);
    expect(routes.filter((r) => r.method === 'POST').length).toBeGreaterThanOrEqual(10);
  });

  it('answers the owner on every study page, so the refusals below are about access, not missing pages', async () => {
    for (const r of studyRoutes(own).filter((x) => x.method === 'GET' && !x.route.includes(':fid'))) {
      const res = await send('ana', 'GET', r.path);
      expect([200, 303], `${r.method} ${r.route}`).toContain(res.status);
      await res.body?.cancel();
    }
  });

  it('answers 404 to an account that is not a member, on every study route, GET and POST', async () => {
    for (const r of studyRoutes(own)) {
      let res = await send('ben', r.method, r.path);
      // A bare /studies/N only redirects to /studies/N/data (for any N), which must then refuse.
      if (r.route === '/studies/:sid' && res.status === 303) res = await send('ben', 'GET', res.headers.get('Location')!);
      expect(res.status, `${r.method} ${r.route}`).toBe(404);
      expect(await res.text(), `${r.method} ${r.route}`).not.toContain('Ana');
    }
  });

  // Searches are posted so their words stay out of addresses (ASVS V8.3.1); they change nothing,
  // so a viewer may use them.
  const SEARCHES = ['/studies/:sid/vocabulary/search', '/studies/:sid/runs/:rid/answers'];

  it('answers 403 to a viewer on every state-changing study route', async () => {
    for (const r of studyRoutes(own).filter((x) => x.method === 'POST' && !SEARCHES.includes(x.route))) {
      const res = await send('cara', 'POST', r.path);
      expect(res.status, `POST ${r.route}`).toBe(403);
    }
  });

  it('lets a viewer search by POST, which changes nothing', async () => {
    const posts = studyRoutes(own).filter((x) => x.method === 'POST' && SEARCHES.includes(x.route));
    expect(posts).toHaveLength(SEARCHES.length);
    for (const r of posts) {
      const res = await send('cara', 'POST', r.path);
      expect(res.status, `POST ${r.route}`).toBe(200);
      await res.body?.cancel();
    }
  });

  it("does not reach another study's run through your own study's path (IDOR)", async () => {
    const crossed = studyRoutes({ studyId: own.studyId, runId: other.runId }).filter((r) => r.route.includes(':rid'));
    expect(crossed.length).toBeGreaterThan(5);
    for (const r of crossed) {
      const res = await send('ana', r.method, r.path);
      expect(res.status, `${r.method} ${r.route}`).toBe(404);
      await res.body?.cancel();
    }
  });

  it('answers 404 to methods the workbench does not use (PUT, DELETE, PATCH)', async () => {
    for (const r of studyRoutes(own)) {
      for (const method of ['PUT', 'DELETE', 'PATCH']) {
        const res = await t.app.request(r.path, { method, headers: { ...users.ana.headers, 'X-CSRF-Token': users.ana.csrf } });
        expect(res.status, `${method} ${r.route}`).toBe(404);
      }
    }
  });
});
