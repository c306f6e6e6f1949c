// OWASP Application Security Verification Standard 4.0.3, level 1: V2.2.3 ("notify users of
// changes to their credentials") and V2.5.5 ("notify when an authentication factor changes").
// Themata has no e-mail or other channel to its users, so the workbench itself tells the account:
// the first page after signing in says when and how its password was changed since the previous
// sign-in, once; the Account page says when the account last signed in. Proved from outside:
// requests in, pages out, with the password changed on the Account page and by `themata users
// password` on the command line. The workbench hashes at a low scrypt cost passed explicitly
// (AppDeps.passwordCost) so the tests run quickly; the command line hashes at the real cost.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterEach, describe, expect, it } from 'vitest';
import { createAccount, DATABASE_FILE, hashPassword, migrate, MIGRATIONS, setPassword, takePasswordNotice, type ScryptCost } from '../../src/store/index.js';
import { cli } from '../cli/cli-harness.js';
import { HTML, makeApp as makeTestApp, postForm, type TestApp } from '../server/helpers.js';

const FAST: ScryptCost = { N: 1 << 10, r: 8, p: 1 }; // tests only
const FIRST = 'gannet tarmac quorum lilac sextant';
const SECOND = 'heron gravel sonnet walnut lantern';
const NOTICE = /<div id="password-notice">([\s\S]*?)<\/div>\s*<\/div>/;

function makeApp(dir?: string): TestApp {
  return makeTestApp({ loopbackOnly: false, passwordCost: FAST, ...(dir ? { dir } : {}) });
}

const open: TestApp[] = [];
afterEach(async () => {
  for (const t of open.splice(0)) await t.close();
});

function started(t: TestApp): TestApp {
  open.push(t);
  return t;
}

/** Sign in and return the session cookie header and the session token. */
async function signIn(t: TestApp, name: string, password: string): Promise<{ headers: Record<string, string>; token: string }> {
  const res = await postForm(t, '/login', { name, password, next: '/' });
  expect(res.status, `sign-in of ${name}`).toBe(303);
  const token = /themata_session=([^;]+)/.exec(res.headers.get('Set-Cookie') ?? '')?.[1] ?? '';
  expect(token).not.toBe('');
  return { headers: { ...HTML, Cookie: `themata_session=${token}` }, token };
}

async function page(t: TestApp, path: string, headers: Record<string, string>): Promise<string> {
  const res = await t.app.request(path, { headers });
  expect(res.status, path).toBe(200);
  return res.text();
}

function noticeIn(html: string): string | undefined {
  return NOTICE.exec(html)?.[1];
}

function csrfIn(html: string): string {
  return /name="_csrf" value="([^"]+)"/.exec(html)![1];
}

describe('telling an account that its password changed (ASVS V2.2.3, V2.5.5)', () => {
  it('V2.2.3, V2.5.5: a change on the Account page is shown at the next sign-in, once, and not to the session that made it', async () => {
    const t = started(makeApp());
    createAccount(t.store, 'ines', FIRST, { cost: FAST });
    const first = await signIn(t, 'ines', FIRST);
    const account = await page(t, '/account', first.headers);
    expect(noticeIn(account)).toBeUndefined();
    const changed = await postForm(t, '/account/password', { _csrf: csrfIn(account), current: FIRST, password: SECOND, repeat: SECOND }, first.headers);
    expect(changed.status).toBe(200);
    const confirmation = await changed.text();
    expect(confirmation).toContain('Your password was changed.');
    // The session that changed it has just been told so; no second notice for it.
    expect(noticeIn(confirmation)).toBeUndefined();
    expect(noticeIn(await page(t, '/', first.headers))).toBeUndefined();

    await postForm(t, '/logout', { _csrf: csrfIn(account) }, first.headers);
    const next = await signIn(t, 'ines', SECOND);
    const shown = noticeIn(await page(t, '/', next.headers));
    expect(shown).toBeDefined();
    expect(shown).toMatch(/role="alert"/);
    expect(shown).toMatch(
      /Your password was changed on \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC on the Account page\. If this was not you, tell the server&#39;s operator at once\./,
    );
    // Shown once: the next page, and the Account page, no longer carry it.
    expect(noticeIn(await page(t, '/', next.headers))).toBeUndefined();
    expect(noticeIn(await page(t, '/account', next.headers))).toBeUndefined();
    // Nor does a later sign-in: the account has been told.
    const later = await signIn(t, 'ines', SECOND);
    expect(noticeIn(await page(t, '/', later.headers))).toBeUndefined();
  });

  it("V2.2.3, V2.5.5: a change by the server's operator (themata users password) is shown at the next sign-in, once", async () => {
    const t = started(makeApp());
    const ana = createAccount(t.store, 'ana', FIRST, { cost: FAST });
    const before = await signIn(t, 'ana', FIRST);
    expect(noticeIn(await page(t, '/', before.headers))).toBeUndefined();

    const r = await cli(['--data', t.dir, 'users', 'password', 'ana'], `${SECOND}\n`);
    expect(r).toMatchObject({ code: 0, stderr: '' });
    expect(r.stdout).toMatch(/Changed the password of "ana"; 1 session was signed out\./);
    expect(r.stdout).toMatch(/will be told of this change, made by the server's operator, when it next signs in/);
    // The operator's change ended the session.
    expect((await t.app.request('/', { headers: before.headers })).status).toBe(303);

    const next = await signIn(t, 'ana', SECOND);
    const shown = noticeIn(await page(t, '/', next.headers));
    expect(shown).toMatch(
      /Your password was changed on \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC by the server&#39;s operator with the command line\. If this was not you, tell the server&#39;s operator at once\./,
    );
    expect(noticeIn(await page(t, '/', next.headers))).toBeUndefined();

    // setPassword is what the command line calls: twice before a sign-in, the notice says so.
    setPassword(t.store, ana.id, FIRST, { cost: FAST });
    setPassword(t.store, ana.id, SECOND, { cost: FAST });
    const again = await signIn(t, 'ana', SECOND);
    expect(noticeIn(await page(t, '/account', again.headers))).toMatch(/changed 2 times, most recently on .* by the server&#39;s operator with the command line/);
    expect(takePasswordNotice(t.store, again.token)).toBeUndefined();
  });

  it('V2.2.3, V2.5.5: no notice when the password did not change, and the Account page says when the account last signed in', async () => {
    const t = started(makeApp());
    createAccount(t.store, 'bo', FIRST, { cost: FAST });
    const first = await signIn(t, 'bo', FIRST);
    expect(noticeIn(await page(t, '/', first.headers))).toBeUndefined();
    const firstAccount = await page(t, '/account', first.headers);
    expect(noticeIn(firstAccount)).toBeUndefined();
    expect(firstAccount).toMatch(/Last signed in: \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC \(this session\)\./);
    expect(firstAccount).toContain('No earlier sign-in is recorded.');
    expect(firstAccount).toContain('Password last changed: no change is recorded.');

    const second = await signIn(t, 'bo', FIRST);
    expect(noticeIn(await page(t, '/', second.headers))).toBeUndefined();
    const account = await page(t, '/account', second.headers);
    expect(account).toMatch(/Last signed in: [^<]+ UTC \(this session\)\./);
    expect(account).toMatch(/Signed in before that: \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC\./);
    // The first session sees that someone signed in after it began.
    expect(await page(t, '/account', first.headers)).toMatch(
      /Last signed in: [^<]+ UTC, in another session that began after this one\. If that was not you, change your password and tell the server&#39;s operator\./,
    );
  });

  it('V2.2.3, V2.5.5: the notice is escaped and carries no secret (no password, hash, session token or CSRF token)', async () => {
    const t = started(makeApp());
    const cy = createAccount(t.store, 'cy', FIRST, { cost: FAST });
    setPassword(t.store, cy.id, SECOND, { cost: FAST });
    // A tampered timestamp must come out as text, never as markup.
    t.store.db.prepare('UPDATE accounts SET password_changed_at = ? WHERE id = ?').run('<img src=x onerror=alert(1)>', cy.id);
    const s = await signIn(t, 'cy', SECOND);
    const html = await page(t, '/', s.headers);
    const shown = noticeIn(html)!;
    expect(shown).toBeDefined();
    expect(shown).not.toContain('<img');
    expect(shown).toContain('&lt;img src=x onerr');
    const hash = (t.store.db.prepare('SELECT password_hash AS h FROM accounts WHERE id = ?').get(cy.id) as { h: string }).h;
    for (const secret of [FIRST, SECOND, hash, hash.split('$')[4], s.token, csrfIn(html)]) expect(shown).not.toContain(secret);
    expect(shown).not.toMatch(/scrypt/);
  });

  it('V2.2.3, V2.5.5: an account from a data folder made before the notices signs in with no notice and no recorded change', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'themata-password-notice-old-'));
    const db = new Database(join(dir, DATABASE_FILE));
    // Schema 4 is the last one without the columns that record password changes and sign-ins.
    migrate(db, MIGRATIONS.filter((m) => m.version <= 4));
    db.prepare("INSERT INTO accounts (name, password_hash, created_at) VALUES ('dee', ?, '2026-01-01T00:00:00.000Z')").run(hashPassword(FIRST, FAST));
    db.close();
    const t = started(makeApp(dir));
    const s = await signIn(t, 'dee', FIRST);
    expect(noticeIn(await page(t, '/', s.headers))).toBeUndefined();
    const account = await page(t, '/account', s.headers);
    expect(account).toContain('No earlier sign-in is recorded.');
    expect(account).toContain('Password last changed: no change is recorded.');
  });
});
