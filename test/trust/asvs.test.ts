// OWASP Application Security Verification Standard 4.0.3, level 1: the items SECURITY.md maps to
// this file, each proved from outside the workbench (requests in, responses out; the data folder
// looked at afterwards). Item numbers are those of ASVS 4.0.3 (OWASP, 2021).
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFitRun, runFitJob } from '../../src/services/index.js';
import { addStudyMember, checkPassword, countAccounts, createAccount, setPassword, insertDocuments, insertImport, listDocuments, setRunStatus, topWords } from '../../src/store/index.js';
import { SignInThrottle } from '../../src/server/index.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { HTML, inventedSurvey, LOCAL_CSRF, makeApp, postFile, postForm, type TestApp } from '../server/helpers.js';

const ROOT = join(import.meta.dirname, '..', '..');
const PASSWORD = 'a long enough password';

function cookieToken(res: Response): string {
  return /themata_session=([^;]+)/.exec(res.headers.get('Set-Cookie') ?? '')?.[1] ?? '';
}

describe('sessions (ASVS V3)', () => {
  let t: TestApp;
  beforeAll(() => {
    t = makeApp({ loopbackOnly: false });
    createAccount(t.store, 'ana', PASSWORD);
  });
  afterAll(() => t.close());

  it('V3.2.1, V3.2.2: every sign-in gets a new random token of at least 64 bits, never one the browser offered', async () => {
    const planted = 'attacker-chosen-session-token';
    const first = await postForm(t, '/login', { name: 'ana', password: PASSWORD }, { Cookie: `themata_session=${planted}` });
    const second = await postForm(t, '/login', { name: 'ana', password: PASSWORD });
    const [a, b] = [cookieToken(first), cookieToken(second)];
    expect(a).not.toBe(planted);
    expect(a).not.toBe(b);
    for (const token of [a, b]) expect(Buffer.from(token, 'base64url').length * 8).toBeGreaterThanOrEqual(64);
  });

  it('V3.1.1, V13.1.3: the session token never appears in a URL or a page', async () => {
    const res = await postForm(t, '/login', { name: 'ana', password: PASSWORD, next: '/' });
    const token = cookieToken(res);
    expect(res.headers.get('Location')).not.toContain(token);
    const page = await (await t.app.request('/', { headers: { ...HTML, Cookie: `themata_session=${token}` } })).text();
    expect(page).not.toContain(token);
  });

  it('V3.3.1: an expired session and a signed-out session are both refused', async () => {
    const token = cookieToken(await postForm(t, '/login', { name: 'ana', password: PASSWORD }));
    const cookie = { Cookie: `themata_session=${token}` };
    expect((await t.app.request('/', { headers: { ...HTML, ...cookie } })).status).toBe(200);
    t.store.db.prepare("UPDATE sessions SET expires_at = '2000-01-01T00:00:00.000Z'").run();
    const expired = await t.app.request('/', { headers: { ...HTML, ...cookie } });
    expect(expired.status).toBe(303);
    expect(expired.headers.get('Location')).toMatch(/^\/login/);

    const fresh = cookieToken(await postForm(t, '/login', { name: 'ana', password: PASSWORD }));
    const page = await (await t.app.request('/', { headers: { ...HTML, Cookie: `themata_session=${fresh}` } })).text();
    const csrf = /name="_csrf" value="([^"]+)"/.exec(page)![1];
    expect((await postForm(t, '/logout', { _csrf: csrf }, { Cookie: `themata_session=${fresh}` })).status).toBe(303);
    // The back button or a copied cookie cannot bring the session back.
    expect((await postForm(t, '/studies', { name: 'After logout', _csrf: csrf }, { Cookie: `themata_session=${fresh}` })).status).toBe(401);
  });

  it('V3.3.2: the session cookie expires well within the 30 days level 1 allows', async () => {
    const res = await postForm(t, '/login', { name: 'ana', password: PASSWORD });
    const expires = Date.parse(/Expires=([^;]+)/i.exec(res.headers.get('Set-Cookie') ?? '')![1]);
    expect(expires).toBeGreaterThan(Date.now());
    expect(expires - Date.now()).toBeLessThanOrEqual(30 * 24 * 3600_000);
  });

  it('V5.1.5: after sign-in it only ever redirects to a path on this server', async () => {
    for (const next of ['https://evil.example/', '//evil.example/', '/\\evil.example', 'javascript:alert(1)']) {
      const res = await postForm(t, '/login', { name: 'ana', password: PASSWORD, next });
      expect(res.headers.get('Location'), next).toBe('/');
    }
    const page = await (await t.app.request('/login?next=https%3A%2F%2Fevil.example')).text();
    expect(page).not.toContain('evil.example');
  });
});

describe('passwords and accounts (ASVS V2)', () => {
  let t: TestApp;
  beforeAll(() => {
    t = makeApp({ loopbackOnly: false });
  });
  afterAll(() => t.close());

  it('V2.1.11: the sign-in form lets password managers fill it and does not block pasting', async () => {
    const page = await (await t.app.request('/login')).text();
    expect(page).toMatch(/<input[^>]*type="password"[^>]*autocomplete="current-password"/);
    expect(page).toMatch(/autocomplete="username"/);
    expect(page).not.toMatch(/onpaste|autocomplete="off"|maxlength/i);
  });

  it('V2.5.4: a new data folder has no accounts at all (no default or shared account)', () => {
    expect(countAccounts(t.store)).toBe(0);
  });

  it('V2.1.3, V2.1.4, V2.1.9: long passwords with spaces, emoji and any script work, and are not truncated', () => {
    const password = `correct horse 🐴 battery staple 馬 ${'x'.repeat(80)}`;
    createAccount(t.store, 'ben', password);
    expect(checkPassword(t.store, 'ben', password)?.name).toBe('ben');
    expect(checkPassword(t.store, 'ben', password.slice(0, -1))).toBeUndefined();
    expect(checkPassword(t.store, 'ben', password.slice(0, 72))).toBeUndefined();
  });
});

describe('sign-in throttling and secure cookies (ASVS V2.2.1, V3.4.1, V3.4.4)', () => {
  let minutes = 0;
  const throttle = new SignInThrottle({ now: () => Date.parse('2026-01-01T00:00:00Z') + minutes * 60_000 });
  let t: TestApp;
  beforeAll(() => {
    t = makeApp({ loopbackOnly: false, signInThrottle: throttle });
    createAccount(t.store, 'cleo', PASSWORD);
  });
  afterAll(() => t.close());

  it('V2.2.1: after five wrong passwords an account is locked for 15 minutes with a clear message, even to the right password', async () => {
    for (let i = 0; i < 5; i++) expect((await postForm(t, '/login', { name: 'cleo', password: `guess number ${i}` })).status).toBe(401);
    const locked = await postForm(t, '/login', { name: 'cleo', password: PASSWORD });
    expect(locked.status).toBe(429);
    expect(locked.headers.get('Set-Cookie')).toBeNull();
    expect(locked.headers.get('Retry-After')).toBe('900');
    expect(await locked.text()).toContain('Too many failed sign-ins for this account or from this computer. Wait 15 minutes');
    minutes = 15;
    const later = await postForm(t, '/login', { name: 'cleo', password: PASSWORD });
    expect(later.status).toBe(303);
    expect(cookieToken(later)).not.toBe('');
  });

  it('V3.4.1, V3.4.4: behind HTTPS the session cookie is Secure and named with the __Host- prefix', async () => {
    const secure = makeApp({ loopbackOnly: false, secureCookies: true });
    try {
      createAccount(secure.store, 'dan', PASSWORD);
      const res = await postForm(secure, '/login', { name: 'dan', password: PASSWORD });
      const cookie = res.headers.get('Set-Cookie') ?? '';
      expect(cookie).toMatch(/^__Host-themata_session=[^;]+;/);
      expect(cookie).toMatch(/; Secure(;|$)/);
      expect(cookie).toMatch(/; Path=\/(;|$)/);
      expect(cookie).not.toMatch(/Domain=/i);
      const token = /__Host-themata_session=([^;]+)/.exec(cookie)![1];
      expect((await secure.app.request('/', { headers: { ...HTML, Cookie: `__Host-themata_session=${token}` } })).status).toBe(200);
      // Under the name without the prefix (which a sibling host could set) it is not accepted.
      expect((await secure.app.request('/', { headers: { ...HTML, Cookie: `themata_session=${token}` } })).status).toBe(303);
    } finally {
      await secure.close();
    }
  });

  it('V2.1.1: an account cannot be given a password shorter than 12 characters', () => {
    // Characters, not UTF-16 units: eleven emoji are eleven characters.
    expect(() => createAccount(t.store, 'short-pw', 'elevenchars')).toThrow(/at least 12 characters/);
    expect(() => createAccount(t.store, 'emoji-pw', '😀'.repeat(11))).toThrow(/at least 12 characters/);
    const account = createAccount(t.store, 'long-pw', 'twelve chars');
    expect(() => setPassword(t.store, account.id, 'elevenchars')).toThrow(/at least 12 characters/);
  });
});

describe('headers, errors and files (ASVS V4.3, V7, V12, V14)', () => {
  let t: TestApp;
  let studyId = 0;
  let runId = 0;
  beforeAll(async () => {
    t = makeApp();
    studyId = syntheticStudy(t.store, { documents: 60 });
    const run = createFitRun(t.store, studyId, { themes: 2, sweeps: 6, burnIn: 2, sampler: 'reference', covariates: ['region'] });
    await runFitJob({ store: t.store, runId: run.id });
    setRunStatus(t.store, run.id, 'finished');
    runId = run.id;
  });
  afterAll(() => t.close());

  it('V14.3.3, V14.4.1, V14.4.5, V14.4.6: pages name their charset, carry HSTS and a referrer policy, and no version banner', async () => {
    // HSTS goes on HTTPS responses only (RFC 6797 §7.2): the requests come as @hono/node-server
    // passes one that arrived over TLS (test/trust/tls.test.ts does it with a real server).
    const overTls = { incoming: { socket: { encrypted: true } } };
    for (const path of ['/', '/login', '/nowhere', `/studies/${studyId}/data`]) {
      const res = await t.app.request(path, { headers: HTML }, overTls);
      expect(res.headers.get('Content-Type'), path).toMatch(/^text\/html; charset=utf-8$/i);
      expect(res.headers.get('Strict-Transport-Security'), path).toMatch(/max-age=\d{7,}/);
      expect(res.headers.get('Referrer-Policy'), path).toBe('same-origin');
      expect(res.headers.get('Server'), path).toBeNull();
      expect(res.headers.get('X-Powered-By'), path).toBeNull();
    }
  });

  it('V14.5.3: no cross-origin access is granted, not even to a preflight', async () => {
    const origin = { Origin: 'https://evil.example' };
    const get = await t.app.request('/', { headers: { ...HTML, ...origin } });
    const preflight = await t.app.request('/studies', { method: 'OPTIONS', headers: { ...origin, 'Access-Control-Request-Method': 'POST' } });
    for (const res of [get, preflight]) {
      expect(res.headers.get('Access-Control-Allow-Origin')).toBeNull();
      expect(res.headers.get('Access-Control-Allow-Credentials')).toBeNull();
    }
    expect(preflight.status).toBe(404);
  });

  it('V4.2.2, V14.5.2: a loopback server without accounts answers only requests addressed to a loopback host name (DNS rebinding)', async () => {
    // A page on a name re-pointed to 127.0.0.1 is same-origin for the browser, so its Origin
    // matches; only the Host header still names it (Jackson et al., ACM CCS 2007).
    const rebound = { Host: 'rebound.evil.example:4180', Origin: 'http://rebound.evil.example:4180' };
    const read = await t.app.request(`/studies/${studyId}/runs/${runId}/answers`, { headers: { ...HTML, ...rebound } });
    expect(read.status).toBe(421);
    expect(await read.text()).not.toContain(LOCAL_CSRF);
    const before = (await (await t.app.request('/', { headers: HTML })).text()).length;
    expect((await postForm(t, '/studies', { name: 'Rebound', _csrf: LOCAL_CSRF }, rebound)).status).toBe(421);
    expect((await (await t.app.request('/', { headers: HTML })).text()).length).toBe(before);
    expect((await t.app.request(`/studies/${studyId}/data`, { headers: { ...HTML, Host: '127.0.0.1:4180' } })).status).toBe(200);
  });

  it('V8.2.1: every page and download is marked no-store; only static assets may be cached', async () => {
    expect((await postForm(t, `/studies/${studyId}/runs/${runId}/export`, { _csrf: LOCAL_CSRF })).status).toBe(303);
    const exportPage = await (await t.app.request(`/studies/${studyId}/runs/${runId}/export`, { headers: HTML })).text();
    const downloads = [...exportPage.matchAll(/href="([^"]+\/export\/files\/\d+)"/g)].map((m) => m[1]);
    expect(downloads.length).toBeGreaterThan(0);
    const run = `/studies/${studyId}/runs/${runId}`;
    const paths = ['/', '/login', '/nowhere', `/studies/${studyId}/data`, `/studies/${studyId}/languages`, `${run}/answers`, `${run}/answers?q=park`, `${run}/themes`, `${run}/themes/0`, `${run}/contrasts`, ...downloads];
    for (const path of paths) {
      const res = await t.app.request(path, { headers: HTML });
      expect(res.status, path).toBe(path === '/nowhere' ? 404 : 200);
      expect(res.headers.get('Cache-Control'), path).toMatch(/no-store/);
      await res.body?.cancel();
    }
    const asset = await t.app.request('/assets/app.css');
    expect(asset.headers.get('Cache-Control')).not.toMatch(/no-store/);
  });

  it('V4.3.2, V12.5.1: no files or folders of the installation are reachable', async () => {
    for (const path of ['/.git/config', '/package.json', '/themata.sqlite', '/assets/../package.json', '/assets/%2e%2e/src/cli.ts', '/public/', '/node_modules/htmx.org/package.json']) {
      expect((await t.app.request(path, { headers: HTML })).status, path).toBe(404);
    }
  });

  it('V7.4.1: an unexpected failure shows a plain message, no stack trace or internal detail', async () => {
    const broken = makeApp();
    broken.store.db.close(); // every query now fails inside the request
    const errors: unknown[] = [];
    const original = console.error;
    console.error = (...args: unknown[]) => errors.push(args);
    try {
      const res = await broken.app.request('/', { headers: HTML });
      const page = await res.text();
      expect(res.status).toBe(500);
      expect(page).toContain('unexpected problem');
      expect(page).not.toMatch(/database connection|TypeError|\bat [\w.]+ \(|node_modules|src\//);
    } finally {
      console.error = original;
      broken.store.db.close = () => broken.store.db;
      await broken.close().catch(() => undefined);
    }
    expect(errors.length).toBeGreaterThan(0); // kept for the operator, on the server's console
  });

  it('V12.3.1, V12.3.2, V5.3.9: an uploaded file name is only shown, never used as a path', async () => {
    const before = readdirSync(t.dir).sort();
    for (const name of ['../../../../tmp/evil.csv', 'C:\\Windows\\system32\\evil.csv', '..\\..\\evil.csv', '/etc/passwd']) {
      const up = await postFile(t, `/studies/${studyId}/data/upload`, { _csrf: LOCAL_CSRF }, { name, bytes: inventedSurvey(6) });
      const page = await up.text();
      expect(up.status, name).toBe(200);
      const key = /name="upload" value="([^"]+)"/.exec(page)![1];
      const roles = { 'role-0': 'id', 'role-1': 'text', 'role-2': 'language', 'role-3': 'categorical', 'role-4': 'weight' };
      const imp = await postForm(t, `/studies/${studyId}/data/import`, { upload: key, ...roles, _csrf: LOCAL_CSRF });
      expect(imp.status, name).toBe(303);
    }
    const names = (t.store.db.prepare('SELECT file_name FROM imports WHERE study_id = ? ORDER BY id').pluck().all(studyId) as string[]).slice(-4);
    expect(names).toEqual(['evil.csv', 'evil.csv', 'evil.csv', 'passwd']);
    expect(readdirSync(t.dir).sort()).toEqual(before);
  });

  it('V5.3.4: search words and filters full of SQL are matched as text, and change nothing', async () => {
    const hostile = [`O'Hara said "hi"; DROP TABLE documents; --`, "' OR '1'='1", '%_\\', ')) UNION SELECT password_hash FROM accounts --', '$."x"', '\u0000'];
    const imp = insertImport(t.store, { studyId, fileName: 'h.csv', format: 'csv', bytes: new Uint8Array([1]), encoding: 'UTF-8', mapping: { text: ['answer'], covariates: [] } });
    insertDocuments(t.store, studyId, imp, [{ rowId: 'h1', question: 'answer', text: hostile[0], language: 'en', languageSource: 'declared', confidence: 1, covariates: { region: hostile[1] }, weight: 1 }]);
    const count = () => t.store.db.prepare('SELECT (SELECT COUNT(*) FROM documents) + (SELECT COUNT(*) FROM accounts) + (SELECT COUNT(*) FROM studies)').pluck().get();
    const before = count();
    expect(listDocuments(t.store, studyId, { search: `O'Hara said "hi"; DROP` }).total).toBe(1);
    expect(listDocuments(t.store, studyId, { covariate: { name: 'region', value: hostile[1] } }).total).toBe(1);
    for (const h of hostile) {
      expect(listDocuments(t.store, studyId, { search: h, language: h }).total).toBe(0);
      expect(topWords(t.store, studyId, 'en', { search: h })).toEqual([]);
      for (const path of [`/studies/${studyId}/vocabulary?language=en&q=`, `/studies/${studyId}/languages?show=all&language=`, `/studies/${studyId}/runs/${runId}/answers?q=`]) {
        const res = await t.app.request(path + encodeURIComponent(h), { headers: HTML });
        expect(res.status, path + h).toBe(200);
        await res.body?.cancel();
      }
    }
    expect(count()).toBe(before);
  });

  it('V8.3.3, V8.3.4 (in part): the pages that show or hand out answers say that answers can identify people', async () => {
    for (const path of [`/studies/${studyId}/data`, `/studies/${studyId}/runs/${runId}/answers`, `/studies/${studyId}/runs/${runId}/export`]) {
      const page = await (await t.app.request(path, { headers: HTML })).text();
      expect(page, path).toContain('Answers can identify people');
    }
  });

  it('V12.5.2, V14.4.2: every exported file downloads as an attachment that the browser may not sniff', async () => {
    expect((await postForm(t, `/studies/${studyId}/runs/${runId}/export`, { _csrf: LOCAL_CSRF })).status).toBe(303);
    const page = await (await t.app.request(`/studies/${studyId}/runs/${runId}/export`, { headers: HTML })).text();
    const links = [...page.matchAll(/href="([^"]+\/export\/files\/\d+)"/g)].map((m) => m[1]);
    expect(links.length).toBeGreaterThanOrEqual(5);
    for (const href of links) {
      const res = await t.app.request(href);
      expect(res.status, href).toBe(200);
      expect(res.headers.get('Content-Disposition'), href).toMatch(/^attachment; filename="[^"/\\]+"/);
      expect(res.headers.get('X-Content-Type-Options'), href).toBe('nosniff');
      expect(res.headers.get('Content-Security-Policy'), href).toContain("script-src 'self'");
      await res.body?.cancel();
    }
  });
});

describe('the source itself (ASVS V5.2.4, V5.2.6, V5.3.8, V8.2.2, V14.2)', () => {
  const files = (dir: string): string[] =>
    readdirSync(dir).flatMap((name) => {
      const path = join(dir, name);
      return statSync(path).isDirectory() ? files(path) : /\.(ts|tsx|js|mjs)$/.test(name) ? [path] : [];
    });
  const sources = [...files(join(ROOT, 'src')), ...files(join(ROOT, 'views')), ...files(join(ROOT, 'public'))].map((f) => ({ f, text: readFileSync(f, 'utf8') }));

  it('V5.2.4, V5.3.8: no eval, no Function constructor, no shell, and a child process only for the virus scanner the operator configures', () => {
    expect(sources.length).toBeGreaterThan(50);
    const offences = sources.filter(({ text }) => /\beval\s*\(|new\s+Function\s*\(|node:vm['"]|shell:\s*true/.test(text)).map(({ f }) => f);
    expect(offences).toEqual([]);
    // The one child process runs the scanner command the server's operator configured (V12.4.2),
    // as an argument array without a shell; nothing a user sends becomes an argument.
    const processes = sources.filter(({ text }) => /node:child_process|['"]child_process['"]/.test(text)).map(({ f }) => f.replace(/\\/g, '/'));
    expect(processes.map((f) => f.slice(f.indexOf('src/')))).toEqual(['src/platform/scan-upload.ts']);
    const scanner = sources.find(({ f }) => f.replace(/\\/g, '/').endsWith('src/platform/scan-upload.ts'))!.text;
    expect(scanner).toMatch(/spawn\(.*shell: false/);
    expect(scanner).not.toMatch(/\bexec(Sync|File|FileSync)?\s*\(/);
  });

  it('V5.2.6, V12.6.1, V8.2.2: the program makes no outbound requests and keeps nothing in browser storage', () => {
    // node:https is allowed in the server's start module only, and there only its createServer,
    // to serve HTTPS (V9.1); no module may use it, node:http or anything else to make requests.
    const isStart = (f: string) => f.replace(/\\/g, '/').endsWith('src/server/start.ts');
    const outbound = sources
      .filter(({ f, text }) => /\bfetch\s*\(|node:http['"]|from\s+['"]https?['"]|\bundici\b|XMLHttpRequest|WebSocket\(/.test(text) || (!isStart(f) && /node:https['"]/.test(text)))
      .map(({ f }) => f);
    expect(outbound).toEqual([]);
    const start = sources.find(({ f }) => isStart(f))!.text;
    expect(start.match(/^.*node:https['"].*$/gm)).toEqual(["import { createServer as createHttpsServer } from 'node:https';"]);
    const storage = sources.filter(({ text }) => /localStorage|sessionStorage|indexedDB|document\.cookie/.test(text)).map(({ f }) => f);
    expect(storage).toEqual([]);
  });

  it('V14.2.1 (in part): every dependency is pinned to one exact version, and a lock file exists', () => {
    const pkg = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as Record<string, Record<string, string>>;
    const ranges = Object.entries({ ...pkg.dependencies, ...pkg.devDependencies }).filter(([, v]) => !/^\d+\.\d+\.\d+$/.test(v));
    expect(ranges).toEqual([]);
    expect(statSync(join(ROOT, 'package-lock.json')).isFile()).toBe(true);
  });
});

describe('studies shared between accounts (ASVS V4.1.2)', () => {
  let t: TestApp;
  beforeAll(() => {
    t = makeApp({ loopbackOnly: false });
  });
  afterAll(() => t.close());

  it('V4.1.2: an editor cannot make anyone an owner or share the study: only owners can', async () => {
    const owner = createAccount(t.store, 'owner', PASSWORD);
    createAccount(t.store, 'editor', PASSWORD);
    createAccount(t.store, 'outsider', PASSWORD);
    const studyId = syntheticStudy(t.store, { documents: 20 });
    addStudyMember(t.store, studyId, owner.id, 'owner');
    addStudyMember(t.store, studyId, t.store.db.prepare("SELECT id FROM accounts WHERE name = 'editor'").pluck().get() as number, 'editor');
    const token = cookieToken(await postForm(t, '/login', { name: 'editor', password: PASSWORD }));
    const headers = { Cookie: `themata_session=${token}` };
    const csrf = /name="_csrf" value="([^"]+)"/.exec(await (await t.app.request('/', { headers: { ...HTML, ...headers } })).text())![1];
    const res = await postForm(t, `/studies/${studyId}/members`, { name: 'outsider', role: 'owner', _csrf: csrf }, headers);
    expect(res.status).toBe(403);
    expect(t.store.db.prepare('SELECT COUNT(*) FROM study_members WHERE study_id = ?').pluck().get(studyId)).toBe(2);
  });
});
