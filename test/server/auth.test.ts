import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isLoopback, startServer } from '../../src/server/index.js';
import { addStudyMember, createAccount, createStudy } from '../../src/store/index.js';
import { HTML, makeApp, postForm, type TestApp } from './helpers.js';

// One app for the file: password hashing (scrypt) is deliberately slow, so accounts are made once.
let t: TestApp;
beforeAll(() => {
  t = makeApp({ loopbackOnly: false });
  createAccount(t.store, 'ana', 'correct horse battery');
  createAccount(t.store, 'ben', 'another long password');
});
afterAll(() => t.close());

async function login(name: string, password: string) {
  const res = await postForm(t, '/login', { name, password, next: '/' });
  const cookie = res.headers.get('Set-Cookie') ?? '';
  const token = cookie.match(/themata_session=([^;]+)/)?.[1] ?? '';
  const page = await t.app.request('/', { headers: { ...HTML, Cookie: `themata_session=${token}` } });
  const csrf = (await page.text()).match(/name="_csrf" value="([^"]+)"/)?.[1] ?? '';
  return { res, cookie, headers: { Cookie: `themata_session=${token}` }, csrf };
}

describe('accounts and sessions', () => {
  it('sends people without a session to the login page, and answers 401 to other requests', async () => {
    const page = await t.app.request('/', { headers: HTML });
    expect(page.status).toBe(303);
    expect(page.headers.get('Location')).toBe('/login?next=%2F');
    expect((await t.app.request('/studies/1/data')).status).toBe(401);
    expect((await postForm(t, '/studies', { name: 'x' })).status).toBe(401);
    expect((await t.app.request('/login')).status).toBe(200);
  });

  it('every route but login and assets refuses a request without a session (route table)', async () => {
    const routes = t.app.routes.filter((r) => r.method !== 'ALL');
    expect(routes.length).toBeGreaterThan(20);
    for (const r of routes) {
      if (r.path === '/login' || r.path === '/favicon.ico' || r.path.startsWith('/assets')) continue;
      const path = r.path.replace(/:[a-z]+/g, '1');
      const res = await t.app.request(path, { method: r.method });
      expect([401, 303], `${r.method} ${r.path}`).toContain(res.status);
    }
  });

  it('sets an HttpOnly, SameSite=Strict session cookie that expires, and refuses a wrong password', async () => {
    const bad = await postForm(t, '/login', { name: 'ana', password: 'wrong password' });
    expect(bad.status).toBe(401);
    expect(bad.headers.get('Set-Cookie')).toBeNull();
    const { res, cookie } = await login('ana', 'correct horse battery');
    expect(res.status).toBe(303);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Strict/i);
    expect(cookie).toMatch(/Expires=/i);
  });

  it('shows a study only to its members: another account gets 404, a viewer cannot change it', async () => {
    const ana = await login('ana', 'correct horse battery');
    const created = await postForm(t, '/studies', { name: 'Ana study', _csrf: ana.csrf }, ana.headers);
    expect(created.status).toBe(303);
    const path = created.headers.get('Location')!;
    expect((await t.app.request(path, { headers: { ...HTML, ...ana.headers } })).status).toBe(200);

    const ben = await login('ben', 'another long password');
    expect((await t.app.request(path, { headers: { ...HTML, ...ben.headers } })).status).toBe(404);
    const list = await (await t.app.request('/', { headers: { ...HTML, ...ben.headers } })).text();
    expect(list).not.toContain('Ana study');

    const studyId = Number(path.match(/\/studies\/(\d+)/)![1]);
    const benId = (t.store.db.prepare("SELECT id FROM accounts WHERE name = 'ben'").get() as { id: number }).id;
    addStudyMember(t.store, studyId, benId, 'viewer');
    expect((await t.app.request(path, { headers: { ...HTML, ...ben.headers } })).status).toBe(200);
    const change = await postForm(t, `/studies/${studyId}/vocabulary/words`, { language: 'en', words: 'x', wordsAll: '', _csrf: ben.csrf }, ben.headers);
    expect(change.status).toBe(403);
  });

  it("every study route answers 404 (or 403) for another account's study (route table)", async () => {
    const ana = await login('ana', 'correct horse battery');
    const created = await postForm(t, '/studies', { name: 'Private to Ana', _csrf: ana.csrf }, ana.headers);
    const sid = Number(created.headers.get('Location')!.match(/\/studies\/(\d+)/)![1]);
    const ben = await login('ben', 'another long password');
    const routes = t.app.routes.filter((r) => r.method !== 'ALL' && r.path.includes(':sid'));
    expect(routes.length).toBeGreaterThan(15);
    for (const r of routes) {
      const path = r.path.replace(':sid', String(sid)).replace(/:[a-z]+/g, '1');
      const init = r.method === 'GET' ? { headers: { ...HTML, ...ben.headers } } : { method: r.method, headers: { ...ben.headers, 'X-CSRF-Token': ben.csrf } };
      const res = await t.app.request(path, init);
      expect([403, 404], `${r.method} ${r.path}`).toContain(res.status);
    }
  });

  it('lets the owner share a study, and only the owner', async () => {
    const ana = await login('ana', 'correct horse battery');
    const created = await postForm(t, '/studies', { name: 'Shared by Ana', _csrf: ana.csrf }, ana.headers);
    const path = created.headers.get('Location')!;
    const sid = Number(path.match(/\/studies\/(\d+)/)![1]);
    const shared = await postForm(t, `/studies/${sid}/members`, { name: 'ben', role: 'editor', _csrf: ana.csrf }, ana.headers);
    expect(shared.status).toBe(303);
    const ben = await login('ben', 'another long password');
    expect((await t.app.request(path, { headers: { ...HTML, ...ben.headers } })).status).toBe(200);
    const reshare = await postForm(t, `/studies/${sid}/members`, { name: 'ana', role: 'viewer', _csrf: ben.csrf }, ben.headers);
    expect(reshare.status).toBe(403);
  });

  it("refuses one session's CSRF token in another session", async () => {
    const ana = await login('ana', 'correct horse battery');
    const ben = await login('ben', 'another long password');
    expect((await postForm(t, '/studies', { name: 'Mixed', _csrf: ana.csrf }, ben.headers)).status).toBe(403);
  });

  it('signs out by deleting the session', async () => {
    const ana = await login('ana', 'correct horse battery');
    const out = await postForm(t, '/logout', { _csrf: ana.csrf }, ana.headers);
    expect(out.status).toBe(303);
    expect((await t.app.request('/', { headers: { ...HTML, ...ana.headers } })).status).toBe(303);
  });

  it('a study created by the command line (no member) stays hidden from accounts', async () => {
    createStudy(t.store, { name: 'Unowned' });
    const ana = await login('ana', 'correct horse battery');
    expect(await (await t.app.request('/', { headers: { ...HTML, ...ana.headers } })).text()).not.toContain('Unowned');
  });
});

describe('starting the server', () => {
  it('knows loopback addresses', () => {
    expect(['127.0.0.1', '::1', 'localhost', '127.1.2.3'].map(isLoopback)).toEqual([true, true, true, true]);
    expect(['0.0.0.0', '192.168.1.4', '::', 'example.org'].map(isLoopback)).toEqual([false, false, false, false]);
  });

  it('refuses to listen beyond loopback before an account exists', async () => {
    const empty = makeApp();
    try {
      await expect(startServer({ host: '0.0.0.0', port: 0, dataDir: empty.dir })).rejects.toThrow(/before an account exists/);
    } finally {
      await empty.close();
    }
  });
});
