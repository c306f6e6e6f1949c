// OWASP Application Security Verification Standard 4.0.3, level 1, password items: the upper
// length limit (V2.1.2), the check against a public list of common passwords (V2.1.7), changing
// one's own password in the workbench (V2.1.5, V2.1.6) and the strength meter (V2.1.8). Proved
// from outside: requests in, responses out, the data folder looked at afterwards. The workbench is
// built with a low scrypt cost passed explicitly (AppDeps.passwordCost), so these tests run
// quickly; production never passes one (test/store/password.test.ts proves the real cost).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SignInThrottle } from '../../src/server/index.js';
import { checkPassword, createAccount, isCommonPassword, passwordProblem, setPassword, type ScryptCost } from '../../src/store/index.js';
import { HTML, LOCAL_CSRF, makeApp, postForm, type TestApp } from '../server/helpers.js';

const ROOT = join(import.meta.dirname, '..', '..');
const FAST: ScryptCost = { N: 1 << 10, r: 8, p: 1 }; // tests only
const PASSWORD = 'a long enough password';
// A random passphrase: five words drawn by hand from unrelated fields, not on any list.
const PASSPHRASE = 'gannet tarmac quorum lilac sextant';

function makeFastApp(signInThrottle?: SignInThrottle): TestApp {
  return makeApp({ loopbackOnly: false, passwordCost: FAST, signInThrottle });
}

function cookieToken(res: Response): string {
  return /themata_session=([^;]+)/.exec(res.headers.get('Set-Cookie') ?? '')?.[1] ?? '';
}

async function signIn(t: TestApp, name: string, password: string): Promise<{ cookie: { Cookie: string }; csrf: string }> {
  const res = await postForm(t, '/login', { name, password, next: '/' });
  expect(res.status, `sign-in of ${name}`).toBe(303);
  const cookie = { Cookie: `themata_session=${cookieToken(res)}` };
  const page = await (await t.app.request('/account', { headers: { ...HTML, ...cookie } })).text();
  return { cookie, csrf: /name="_csrf" value="([^"]+)"/.exec(page)![1] };
}

describe('password rules (ASVS V2.1.2, V2.1.7)', () => {
  let t: TestApp;
  beforeAll(() => {
    t = makeFastApp();
  });
  afterAll(() => t.close());

  it('V2.1.2: passwords over 128 characters are refused everywhere a password is set; 128 are accepted, counted as characters', () => {
    // 128 emoji are 256 UTF-16 units, but 128 characters.
    expect('🐴'.repeat(128).length).toBe(256);
    const ok = createAccount(t.store, 'max-len', '🐴'.repeat(128), { cost: FAST });
    expect(checkPassword(t.store, 'max-len', '🐴'.repeat(128), { cost: FAST })?.id).toBe(ok.id);
    expect(() => createAccount(t.store, 'too-long', '🐴'.repeat(129), { cost: FAST })).toThrow(/at most 128 characters \(this one has 129\)/);
    expect(() => createAccount(t.store, 'too-long', 'x'.repeat(129), { cost: FAST })).toThrow(/at most 128 characters/);
    expect(() => setPassword(t.store, ok.id, `${PASSPHRASE} ${'y'.repeat(100)}`, { cost: FAST })).toThrow(/at most 128 characters/);
    expect(passwordProblem('x'.repeat(128).replace(/^x{5}/, 'abcde'))).toBeUndefined();
  });

  it('V2.1.7: common passwords from the public list are refused, whatever their case or Unicode form; a random passphrase is accepted', () => {
    // Both are in @zxcvbn-ts/language-common 4.1.3's "passwords-common" list (from the 2015 Xato
    // "ten million passwords" set); checked by reading the package's own file below.
    const list = JSON.parse(readFileSync(join(ROOT, 'node_modules/@zxcvbn-ts/language-common/src/passwords.json'), 'utf8')) as string[];
    expect(list).toContain('password1234');
    expect(list).toContain('123456789012');
    expect(list.length).toBeGreaterThan(40_000);
    for (const common of ['password1234', 'PassWord1234', 'ＰＡＳＳＷＯＲＤ１２３４', '123456789012']) {
      expect(isCommonPassword(common), common).toBe(true);
      expect(() => createAccount(t.store, 'common', common, { cost: FAST }), common).toThrow(/public list of common passwords/);
    }
    expect(isCommonPassword(PASSPHRASE)).toBe(false);
    expect(createAccount(t.store, 'passphrase', PASSPHRASE, { cost: FAST }).name).toBe('passphrase');
  });
});

describe('changing your own password in the workbench (ASVS V2.1.5, V2.1.6)', () => {
  let minutes = 0;
  const throttle = new SignInThrottle({ now: () => Date.parse('2026-01-01T00:00:00Z') + minutes * 60_000 });
  let t: TestApp;
  beforeAll(() => {
    t = makeFastApp(throttle);
    createAccount(t.store, 'ana', PASSWORD, { cost: FAST });
    createAccount(t.store, 'cleo', PASSWORD, { cost: FAST });
  });
  afterAll(() => t.close());

  it('V2.1.5, V2.1.6: a signed-in user changes their password with the current one; other sessions end, this one stays', async () => {
    const here = await signIn(t, 'ana', PASSWORD);
    const elsewhere = await signIn(t, 'ana', PASSWORD);
    const home = await (await t.app.request('/', { headers: { ...HTML, ...here.cookie } })).text();
    expect(home).toMatch(/<a href="\/account">Account<\/a> <button type="submit" class="link">Sign out<\/button>/);
    const page = await (await t.app.request('/account', { headers: { ...HTML, ...here.cookie } })).text();
    expect(page).toContain('Change your password');
    expect(page).toMatch(/<input id="current-password" name="current" type="password" autocomplete="current-password" required/);
    expect(page).toMatch(/name="password" type="password" autocomplete="new-password"/);
    expect(page).toMatch(/name="repeat" type="password" autocomplete="new-password"/);

    const change = (fields: Record<string, string>, session = here) => postForm(t, '/account/password', { _csrf: session.csrf, ...fields }, session.cookie);
    const next = 'the new long password';
    // Without the form's CSRF token: refused before anything is looked at.
    expect((await postForm(t, '/account/password', { current: PASSWORD, password: next, repeat: next }, here.cookie)).status).toBe(403);
    const wrong = await change({ current: 'not my password at all', password: next, repeat: next });
    expect(wrong.status).toBe(403);
    expect(await wrong.text()).toContain('That is not your current password. Your password was not changed.');
    const differ = await change({ current: PASSWORD, password: next, repeat: `${next}!` });
    expect(differ.status).toBe(400);
    expect(await differ.text()).toContain('The new password and its repeat differ.');
    const common = await change({ current: PASSWORD, password: 'password1234', repeat: 'password1234' });
    expect(common.status).toBe(400);
    expect(await common.text()).toContain('That password is on a public list of common passwords');
    const long = 'z'.repeat(129);
    expect(await (await change({ current: PASSWORD, password: long, repeat: long })).text()).toContain('Choose a password of at most 128 characters');
    expect(checkPassword(t.store, 'ana', PASSWORD, { cost: FAST })).toBeDefined();
    expect((await t.app.request('/', { headers: { ...HTML, ...elsewhere.cookie } })).status).toBe(200);

    const done = await change({ current: PASSWORD, password: next, repeat: next });
    expect(done.status).toBe(200);
    const text = await done.text();
    expect(text).toContain('Your password was changed. One other session of this account was signed out.');
    expect(text).toContain('role="status"');
    // This browser stays signed in; the other is signed out; the old password no longer works.
    expect((await t.app.request('/', { headers: { ...HTML, ...here.cookie } })).status).toBe(200);
    const gone = await t.app.request('/', { headers: { ...HTML, ...elsewhere.cookie } });
    expect(gone.status).toBe(303);
    expect(gone.headers.get('Location')).toMatch(/^\/login/);
    expect((await postForm(t, '/login', { name: 'ana', password: PASSWORD })).status).toBe(401);
    expect((await postForm(t, '/login', { name: 'ana', password: next })).status).toBe(303);
  });

  it('V2.1.6, V2.2.1: wrong current passwords count like failed sign-ins; after five the change is refused for 15 minutes', async () => {
    const me = await signIn(t, 'cleo', PASSWORD);
    const next = 'cleo picks a new password';
    for (let i = 0; i < 5; i++) {
      expect((await postForm(t, '/account/password', { _csrf: me.csrf, current: `guess number ${i}`, password: next, repeat: next }, me.cookie)).status).toBe(403);
    }
    const locked = await postForm(t, '/account/password', { _csrf: me.csrf, current: PASSWORD, password: next, repeat: next }, me.cookie);
    expect(locked.status).toBe(429);
    expect(locked.headers.get('Retry-After')).toBe('900');
    expect(await locked.text()).toContain('Too many wrong passwords for this account or from this computer. Wait 15 minutes');
    expect(checkPassword(t.store, 'cleo', PASSWORD, { cost: FAST })).toBeDefined();
    minutes = 15;
    expect((await postForm(t, '/account/password', { _csrf: me.csrf, current: PASSWORD, password: next, repeat: next }, me.cookie)).status).toBe(200);
    expect(checkPassword(t.store, 'cleo', next, { cost: FAST })).toBeDefined();
  });

  it('in local use (no accounts) the Account page says there is no password to change, and the form is refused', async () => {
    const t = makeApp({ loopbackOnly: true, passwordCost: FAST });
    const { app } = t;
    try {
      const page = await (await app.request('/account', { headers: HTML })).text();
      expect(page).toContain('there is no password to change');
      expect(page).not.toContain('name="current"');
      expect(page).not.toContain('href="/account"'); // no link in the header without accounts
      const res = await app.request('/account/password', {
        method: 'POST',
        headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
        body: new URLSearchParams({ _csrf: LOCAL_CSRF, current: 'anything at all', password: PASSPHRASE, repeat: PASSPHRASE }),
      });
      expect(res.status).toBe(400);
      expect(await res.text()).toContain('so there is no password to change');
    } finally {
      await t.close();
    }
  });

  it('upgrades an account hashed at a lower cost when it signs in to a server with a higher one', async () => {
    createAccount(t.store, 'dee', PASSWORD, { cost: { N: 1 << 9, r: 8, p: 1 } });
    const hash = () => (t.store.db.prepare("SELECT password_hash AS h FROM accounts WHERE name = 'dee'").get() as { h: string }).h;
    expect(hash()).toMatch(/^scrypt\$512\$/);
    expect((await postForm(t, '/login', { name: 'dee', password: PASSWORD })).status).toBe(303);
    expect(hash()).toMatch(/^scrypt\$1024\$8\$1\$/);
  });
});

describe('the strength meter (ASVS V2.1.8)', () => {
  it('V2.1.8: the Account page loads a strength meter from this server that estimates as you type and only advises', async () => {
    const t = makeFastApp();
    try {
      createAccount(t.store, 'eve', PASSWORD, { cost: FAST });
      const me = await signIn(t, 'eve', PASSWORD);
      const page = await (await t.app.request('/account', { headers: { ...HTML, ...me.cookie } })).text();
      expect(page).toContain('<script type="module" src="/assets/password-meter.js"></script>');
      expect(page).toMatch(/<div class="password-meter" data-password-meter="new-password" data-min="12" data-max="128" hidden="">/);
      expect(page).toMatch(/<meter id="password-strength-meter"/);
      expect(page).toMatch(/<span id="password-strength" aria-live="polite">/);
      expect(page).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/); // no inline script
      const asset = await t.app.request('/assets/password-meter.js');
      expect(asset.status).toBe(200);
      expect(asset.headers.get('Content-Type')).toBe('text/javascript; charset=utf-8');
      expect(await asset.text()).toBe(readFileSync(join(ROOT, 'public/password-meter.js'), 'utf8'));
    } finally {
      await t.close();
    }
    // The estimate itself (the same module the browser loads).
    const meter = (await import(pathToFileURL(join(ROOT, 'public/password-meter.js')).href)) as {
      estimateBits(p: string): number;
      describePassword(p: string, min?: number, max?: number): { score: number; text: string };
    };
    expect(meter.estimateBits('')).toBe(0);
    expect(meter.estimateBits('aaaaaaaaaaaa')).toBeLessThan(meter.estimateBits('qzmxkwprtvbn'));
    expect(meter.estimateBits('abcdefghijkl')).toBeLessThan(30); // a run counts little
    expect(meter.estimateBits(PASSPHRASE)).toBeGreaterThan(meter.estimateBits('gannet tarmac'));
    expect(meter.describePassword('short one')).toEqual({ score: expect.any(Number), text: 'Too short: 9 of at least 12 characters.' });
    expect(meter.describePassword('x'.repeat(129)).text).toBe('Too long: 129 characters; at most 128.');
    expect(meter.describePassword('aaaaaaaaaaaa').text).toMatch(/^Weak: about \d+ bits to guess/);
    expect(meter.describePassword(PASSPHRASE).text).toMatch(/^Strong: about \d+ bits to guess \(an estimate; the server checks the rules\)\.$/);
    expect(meter.describePassword(PASSPHRASE).score).toBe(100);
  });
});
