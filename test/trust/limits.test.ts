// OWASP ASVS 4.0.3 items that the workbench met without a test: repeated and extra form fields
// (V5.1.1, V5.1.2), length limits on names (V5.2.2), nothing sensitive on the server's console
// (V7.1.1, V7.1.2), steps in order (V11.1.1) and no demo study unless asked (V14.2.2).
// Invented data only (test/server/helpers.ts, test/services/synthetic-study.ts).
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { startServer } from '../../src/server/index.js';
import { describeUnexpectedError } from '../../src/server/security.js';
import {
  addStudyMember,
  createAccount,
  getStudyByName,
  listImports,
  listRuns,
  listStudies,
  listStudyMembers,
  openStore,
} from '../../src/store/index.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { HTML, idFrom, inventedSurvey, LOCAL_CSRF, makeApp, postFile, postForm, type TestApp } from '../server/helpers.js';

const ROLES = { 'role-0': 'id', 'role-1': 'text', 'role-2': 'language', 'role-3': 'categorical', 'role-4': 'weight' };

async function signIn(t: TestApp, name: string, password: string): Promise<{ headers: Record<string, string>; csrf: string; token: string }> {
  const res = await postForm(t, '/login', { name, password, next: '/' });
  expect(res.status).toBe(303);
  const token = /themata_session=([^;]+)/.exec(res.headers.get('Set-Cookie') ?? '')![1];
  const headers = { Cookie: `themata_session=${token}` };
  const page = await (await t.app.request('/', { headers: { ...HTML, ...headers } })).text();
  return { headers, csrf: /name="_csrf" value="([^"]+)"/.exec(page)![1], token };
}

describe('form fields (V5.1.1, V5.1.2)', () => {
  let t: TestApp;
  beforeEach(() => {
    t = makeApp({ loopbackOnly: false });
  });
  afterEach(() => t.close());

  it('V5.1.1: a repeated form field gives one of its values, never a mix or a crash', async () => {
    const ana = createAccount(t.store, 'ana', 'ana has a long password');
    const s = await signIn(t, 'ana', 'ana has a long password');
    // The CSRF check reads one value too: a forged token sent beside the right one is not let
    // through by an "any of them matches" reading (hono's form parser keeps the last value).
    const forged = await postForm(t, '/studies', { _csrf: [s.csrf, 'forged'], name: 'Forged' }, s.headers);
    expect(forged.status).toBe(403);
    expect(getStudyByName(t.store, 'Forged')).toBeUndefined();
    const res = await postForm(t, '/studies', { _csrf: s.csrf, name: ['Park survey', 'Other name'], languages: ['xx-not-a-language', 'en'] }, s.headers);
    expect(res.status).toBe(303);
    const mine = listStudies(t.store, { accountId: ana.id }).map((x) => x.name);
    expect(mine).toHaveLength(1);
    expect(['Park survey', 'Other name']).toContain(mine[0]);
    const studyId = idFrom(res.headers.get('Location'));
    // A repeated number on the run form: one value is read and checked like any other.
    await t.queue.close(); // nothing is fitted
    const run = await postForm(t, `/studies/${studyId}/runs`, { _csrf: s.csrf, themes: ['3', '5000'], sweeps: ['10', 'x'], name: ['one', 'two'] }, s.headers);
    expect([303, 400]).toContain(run.status);
    if (run.status === 303) {
      const runs = listRuns(t.store, studyId);
      expect(runs).toHaveLength(1);
      expect(['one', 'two']).toContain(runs[0].name);
      expect([3, 5000]).toContain(runs[0].settings.themes);
      expect(runs[0].settings.themes).toBeLessThanOrEqual(200);
    } else {
      // A study without answers is refused before its settings are read (issue 14).
      expect(await run.text()).toMatch(/must be a whole number|has no answers to fit/);
    }
  });

  it('V5.1.2: extra fields such as role, owner, id or account are ignored, not stored', async () => {
    const ana = createAccount(t.store, 'ana', 'ana has a long password');
    const ben = createAccount(t.store, 'ben', 'ben has a long password');
    const s = await signIn(t, 'ana', 'ana has a long password');
    const res = await postForm(
      t,
      '/studies',
      { _csrf: s.csrf, name: 'Extra fields', id: '999', owner: 'ben', role: 'viewer', accountId: String(ben.id), account_id: String(ben.id), members: 'ben', settings: '{"pipeline":{"minCount":1000}}' },
      s.headers,
    );
    expect(res.status).toBe(303);
    const study = getStudyByName(t.store, 'Extra fields')!;
    expect(study.id).not.toBe(999);
    expect(listStudyMembers(t.store, study.id)).toEqual([{ accountId: ana.id, name: 'ana', role: 'owner' }]);
    expect(JSON.stringify(study.settings)).not.toContain('1000');
    // Signing in with extra fields gives the named account, nothing more.
    const login = await postForm(t, '/login', { name: 'ben', password: 'ben has a long password', next: '/', role: 'owner', id: String(ana.id), accountId: String(ana.id) });
    const token = /themata_session=([^;]+)/.exec(login.headers.get('Set-Cookie') ?? '')![1];
    const page = await (await t.app.request(`/studies/${study.id}/data`, { headers: { ...HTML, Cookie: `themata_session=${token}` } })).text();
    expect(page).not.toContain('Extra fields');
  });
});

describe('length limits (V5.2.2)', () => {
  it('refuses a study name over 200 characters and a run name over 100, and cuts file names to 200', async () => {
    const t = makeApp();
    try {
      const long = await postForm(t, '/studies', { _csrf: LOCAL_CSRF, name: 'n'.repeat(201) });
      expect(long.status).toBe(400);
      expect(await long.text()).toContain('Keep the name under 200 characters.');
      expect(listStudies(t.store)).toHaveLength(0);
      const ok = await postForm(t, '/studies', { _csrf: LOCAL_CSRF, name: 'n'.repeat(200) });
      expect(ok.status).toBe(303);
      const studyId = idFrom(ok.headers.get('Location'));
      const up = await postFile(t, `/studies/${studyId}/data/upload`, { _csrf: LOCAL_CSRF }, { name: `${'f'.repeat(300)}.csv`, bytes: inventedSurvey(8) });
      expect(up.status).toBe(200);
      const key = /name="upload" value="([^"]+)"/.exec(await up.text())![1];
      expect((await postForm(t, `/studies/${studyId}/data/import`, { upload: key, ...ROLES, _csrf: LOCAL_CSRF })).status).toBe(303);
      expect(listImports(t.store, studyId)[0].fileName).toBe('f'.repeat(200));
      await t.queue.close(); // nothing is fitted
      const long2 = await postForm(t, `/studies/${studyId}/runs`, { _csrf: LOCAL_CSRF, themes: '2', sweeps: '10', name: 'r'.repeat(150) });
      expect(long2.status).toBe(400);
      expect(await long2.text()).toMatch(/at most 100 characters \(got 150\)/);
      const run = await postForm(t, `/studies/${studyId}/runs`, { _csrf: LOCAL_CSRF, themes: '2', sweeps: '10', name: 'r'.repeat(100) });
      expect(run.status).toBe(303);
      expect(listRuns(t.store, studyId)[0].name).toBe('r'.repeat(100));
    } finally {
      await t.close();
    }
  });
});

describe('the server console (V7.1.1, V7.1.2)', () => {
  it('V7.1.1, V7.1.2: writes no password, session token or answer text while people sign in, fail to, and hit an unexpected error', async () => {
    const said: string[] = [];
    const spies = (['log', 'info', 'warn', 'error', 'debug', 'trace'] as const).map((m) =>
      vi.spyOn(console, m).mockImplementation((...args: unknown[]) => void said.push(args.map((a) => (a instanceof Error ? `${a.stack}` : typeof a === 'string' ? a : JSON.stringify(a))).join(' '))),
    );
    const t = makeApp({ loopbackOnly: false });
    const answer = 'My neighbour Ingrid Halvorsen waits at the bus stop every evening';
    const debug = process.env.THEMATA_DEBUG;
    delete process.env.THEMATA_DEBUG;
    try {
      const password = 'ana has a long password';
      const ana = createAccount(t.store, 'ana', password);
      const wrong = await postForm(t, '/login', { name: 'ana', password: 'a wrong but long password' });
      expect(wrong.status).toBe(401);
      const s = await signIn(t, 'ana', password);
      // A study whose stored settings were damaged to hold an answer: reading them fails inside a
      // request, and the parser's message quotes the text it choked on.
      const studyId = syntheticStudy(t.store, { documents: 20 });
      addStudyMember(t.store, studyId, ana.id, 'owner');
      t.store.db.prepare('UPDATE studies SET settings = ? WHERE id = ?').run(answer, studyId);
      const broken = await t.app.request(`/studies/${studyId}/data`, { headers: { ...HTML, ...s.headers } });
      expect(broken.status).toBe(500);
      expect(await broken.text()).not.toContain('Ingrid');
      expect(said.length).toBeGreaterThan(0); // the failure was reported to the operator…
      const logged = said.join('\n');
      expect(logged).toMatch(/Unexpected SyntaxError; its message is not shown/);
      // …without the answer, the passwords or the session token.
      for (const secret of ['Ingrid', 'bus stop', password, 'a wrong but long password', s.token, s.csrf]) expect(logged).not.toContain(secret);
    } finally {
      if (debug !== undefined) process.env.THEMATA_DEBUG = debug;
      for (const spy of spies) spy.mockRestore();
      await t.close();
    }
  });

  it('prints the whole error only when the operator sets THEMATA_DEBUG', () => {
    const error = new SyntaxError('Unexpected token \'M\', "My neighbour"... is not valid JSON');
    expect(describeUnexpectedError(error, {})).not.toContain('neighbour');
    expect(describeUnexpectedError(error, {})).toMatch(/^Unexpected SyntaxError; its message is not shown[^\n]*\n\s+at /);
    expect(describeUnexpectedError(error, { THEMATA_DEBUG: '1' })).toContain('My neighbour');
    expect(describeUnexpectedError('a thrown answer text', {})).not.toContain('answer text');
  });
});

describe('steps in order (V11.1.1)', () => {
  it("refuses a column mapping posted for someone else's upload, or with no upload, and keeps the owner's upload", async () => {
    const t = makeApp({ loopbackOnly: false });
    try {
      const ana = createAccount(t.store, 'ana', 'ana has a long password');
      const ben = createAccount(t.store, 'ben', 'ben has a long password');
      const studyId = syntheticStudy(t.store, { documents: 20 });
      addStudyMember(t.store, studyId, ana.id, 'owner');
      addStudyMember(t.store, studyId, ben.id, 'editor');
      const a = await signIn(t, 'ana', 'ana has a long password');
      const b = await signIn(t, 'ben', 'ben has a long password');
      const before = listImports(t.store, studyId).length;
      const up = await postFile(t, `/studies/${studyId}/data/upload`, { _csrf: a.csrf }, { name: 'wave2.csv', bytes: inventedSurvey(8) }, a.headers);
      const key = /name="upload" value="([^"]+)"/.exec(await up.text())![1];
      const stolen = await postForm(t, `/studies/${studyId}/data/import`, { upload: key, ...ROLES, _csrf: b.csrf }, b.headers);
      expect(stolen.status).toBe(400);
      expect(await stolen.text()).toContain('That upload has expired');
      const skipped = await postForm(t, `/studies/${studyId}/data/import`, { upload: 'never-uploaded', ...ROLES, _csrf: a.csrf }, a.headers);
      expect(skipped.status).toBe(400);
      expect(listImports(t.store, studyId)).toHaveLength(before);
      const own = await postForm(t, `/studies/${studyId}/data/import`, { upload: key, ...ROLES, _csrf: a.csrf }, a.headers);
      expect(own.status).toBe(303);
      expect(listImports(t.store, studyId)).toHaveLength(before + 1);
    } finally {
      await t.close();
    }
  });
});

describe('no unneeded features (V14.2.2)', () => {
  it('imports no demo study and queues no run when started without --demo', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'themata-no-demo-'));
    try {
      const server = await startServer({ host: '127.0.0.1', port: 0, dataDir: dir });
      const page = await (await fetch(server.url, { headers: HTML })).text();
      await server.close();
      expect(page).not.toContain('Library survey');
      const store = openStore(dir);
      try {
        expect(listStudies(store)).toEqual([]);
        expect(store.db.prepare('SELECT COUNT(*) AS n FROM runs').get()).toEqual({ n: 0 });
      } finally {
        store.close();
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
