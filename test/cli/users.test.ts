import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { checkPassword, createAccount, createSession, createStudy, getAccountByName, getSession, getStudyByName, listStudyMembers, openStore } from '../../src/store/index.js';
import { tempDir } from '../store/helpers.js';
import { cli } from './cli-harness.js';

const t = tempDir('themata-users-');
afterAll(() => t.cleanup());

describe('themata users add', () => {
  it('adds an account whose password (read from standard input) then checks out', async () => {
    const data = join(t.dir, 'data');
    const r = await cli(['--data', data, 'users', 'add', 'ana', '--password-stdin'], 'long enough secret\n');
    expect(r).toMatchObject({ code: 0, stderr: '' });
    expect(r.stdout).toMatch(/Added account "ana"/);
    const store = openStore(data);
    try {
      expect(checkPassword(store, 'ana', 'long enough secret')).toBeDefined();
      expect(checkPassword(store, 'ana', 'long enough secret\n')).toBeUndefined();
    } finally {
      store.close();
    }
  });

  it('refuses a short password and a second account of the same name with exit code 2', async () => {
    const data = join(t.dir, 'data');
    expect((await cli(['--data', data, 'users', 'add', 'bo'], 'short\n')).code).toBe(2);
    const again = await cli(['--data', data, 'users', 'add', 'ana'], 'another long secret\n');
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/already exists/);
  });

  it('requires 12 characters (OWASP ASVS 4.0.3, requirement 2.1.1), counted as characters', async () => {
    const data = join(t.dir, 'length');
    const short = await cli(['--data', data, 'users', 'add', 'cy'], '11 chars ok\n');
    expect(short.code).toBe(2);
    expect(short.stderr).toMatch(/at least 12 characters/);
    // Eleven characters but twelve UTF-16 units: one is outside the Basic Multilingual Plane.
    expect('ten chars!🐴'.length).toBe(12);
    expect((await cli(['--data', data, 'users', 'add', 'cy'], 'ten chars!🐴\n')).code).toBe(2);
    expect((await cli(['--data', data, 'users', 'add', 'cy'], 'twelve chars\n')).code).toBe(0);
  });

  it('gives studies without an owner (command line, demo) to the first account, and says so', async () => {
    const data = join(t.dir, 'owners');
    let store = openStore(data);
    createStudy(store, { name: 'Made by the CLI' });
    createStudy(store, { name: 'Demo' });
    store.close();
    const first = await cli(['--data', data, 'users', 'add', 'dee'], 'a long enough secret\n');
    expect(first.code).toBe(0);
    expect(first.stdout).toMatch(/Gave 2 studies without an owner to "dee", the first account: "Made by the CLI", "Demo"\./);
    store = openStore(data);
    createStudy(store, { name: 'Imported later' });
    store.close();
    // A later account does not take them: the first account does, and the line says so.
    const second = await cli(['--data', data, 'users', 'add', 'eve'], 'another long secret\n');
    expect(second.stdout).toMatch(/Gave 1 study without an owner to "dee", the first account: "Imported later"\./);
    const third = await cli(['--data', data, 'users', 'add', 'fay'], 'yet another long secret\n');
    expect(third.stdout).not.toMatch(/Gave/);
    store = openStore(data);
    try {
      const dee = getAccountByName(store, 'dee')!;
      for (const name of ['Made by the CLI', 'Demo', 'Imported later']) {
        expect(listStudyMembers(store, getStudyByName(store, name)!.id)).toEqual([{ accountId: dee.id, name: 'dee', role: 'owner' }]);
      }
    } finally {
      store.close();
    }
  });

  it('refuses passwords over 128 characters (ASVS 4.0.3, 2.1.2) and common ones (2.1.7) with exit code 2', async () => {
    const data = join(t.dir, 'rules');
    const long = await cli(['--data', data, 'users', 'add', 'gil'], `${'🐴'.repeat(129)}\n`);
    expect(long.code).toBe(2);
    expect(long.stderr).toMatch(/at most 128 characters \(this one has 129\)/);
    const common = await cli(['--data', data, 'users', 'add', 'gil'], 'Password1234\n');
    expect(common.code).toBe(2);
    expect(common.stderr).toMatch(/public list of common passwords/);
    expect((await cli(['--data', data, 'users', 'add', 'gil'], `${'🐴'.repeat(128)}\n`)).code).toBe(0);
  });
});

describe('themata users password', () => {
  it("sets an account's new password from standard input and signs the account out everywhere", async () => {
    const data = join(t.dir, 'password');
    let store = openStore(data);
    const hal = createAccount(store, 'hal', 'the first password', { cost: { N: 1 << 10, r: 8, p: 1 } });
    const a = createSession(store, hal.id);
    const b = createSession(store, hal.id);
    store.close();
    const r = await cli(['--data', data, 'users', 'password', 'hal'], 'the second password\n');
    expect(r).toMatchObject({ code: 0, stderr: '' });
    expect(r.stdout).toMatch(/Changed the password of "hal"; 2 sessions were signed out\./);
    store = openStore(data);
    try {
      expect(getSession(store, a.token)).toBeUndefined();
      expect(getSession(store, b.token)).toBeUndefined();
      expect(checkPassword(store, 'hal', 'the first password')).toBeUndefined();
      expect(checkPassword(store, 'hal', 'the second password')?.name).toBe('hal');
      // Set by the command line, so at the full cost (OWASP Password Storage Cheat Sheet: N = 2^17).
      expect((store.db.prepare("SELECT password_hash AS h FROM accounts WHERE name = 'hal'").get() as { h: string }).h).toMatch(/^scrypt\$131072\$8\$1\$/);
    } finally {
      store.close();
    }
  });

  it('refuses an unknown account and a password that breaks the rules, changing nothing', async () => {
    const data = join(t.dir, 'password-refused');
    const store = openStore(data);
    createAccount(store, 'ida', 'the first password', { cost: { N: 1 << 10, r: 8, p: 1 } });
    store.close();
    const unknown = await cli(['--data', data, 'users', 'password', 'nobody'], 'a fine new password\n');
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/There is no account named "nobody"/);
    for (const [input, message] of [
      ['short pw\n', /at least 12 characters/],
      [`${'x'.repeat(129)}\n`, /at most 128 characters/],
      ['123456789012\n', /public list of common passwords/],
      ['', /Give the password on standard input/],
    ] as const) {
      const r = await cli(['--data', data, 'users', 'password', 'ida'], input);
      expect(r.code, input).toBe(2);
      expect(r.stderr, input).toMatch(message);
    }
    const again = openStore(data);
    try {
      expect(checkPassword(again, 'ida', 'the first password', { cost: { N: 1 << 10, r: 8, p: 1 } })?.name).toBe('ida');
    } finally {
      again.close();
    }
  });
});
