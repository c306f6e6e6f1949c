// Password hashing and its cost: new hashes at N = 2^17, r = 8, p = 1 (OWASP Password Storage
// Cheat Sheet; ASVS 4.0.3 V2.4.6 asks for at least 2^16), old hashes still verifying and upgraded
// at the next successful sign-in, and a lower cost only when a caller passes one explicitly.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { changePassword, checkPassword, createAccount, createSession, getSession, hashPassword, needsRehash, PASSWORD_COST, setPassword, verifyPassword, type ScryptCost, type Store } from '../../src/store/index.js';
import { withTempStore } from './helpers.js';

const FAST: ScryptCost = { N: 1 << 10, r: 8, p: 1 }; // tests only
const OLD: ScryptCost = { N: 1 << 15, r: 8, p: 1 }; // what Themata wrote before

let ctx: { store: Store; cleanup: () => void };
beforeEach(() => {
  ctx = withTempStore();
});
afterEach(() => ctx.cleanup());

function storedHash(store: Store, name: string): string {
  return (store.db.prepare('SELECT password_hash AS h FROM accounts WHERE name = ?').get(name) as { h: string }).h;
}

describe('password hashes', () => {
  it('hashes new passwords at N = 2^17, r = 8, p = 1 unless a lower cost is passed explicitly', () => {
    expect(PASSWORD_COST).toEqual({ N: 131072, r: 8, p: 1 });
    createAccount(ctx.store, 'ana', 'a real cost password');
    // Node's default maxmem (32 MiB) would refuse this cost: hashing and checking it proves maxmem is set.
    expect(storedHash(ctx.store, 'ana')).toMatch(/^scrypt\$131072\$8\$1\$[A-Za-z0-9+/]{22}==\$[A-Za-z0-9+/]{43}=$/);
    expect(checkPassword(ctx.store, 'ana', 'a real cost password')?.name).toBe('ana');
    createAccount(ctx.store, 'bo', 'a quick test password', { cost: FAST });
    expect(storedHash(ctx.store, 'bo')).toMatch(/^scrypt\$1024\$8\$1\$/);
  });

  it('still verifies a hash made at the old cost and upgrades it at the next successful sign-in', () => {
    createAccount(ctx.store, 'cy', 'placeholder password', { cost: FAST });
    ctx.store.db.prepare('UPDATE accounts SET password_hash = ? WHERE name = ?').run(hashPassword('an old account password', OLD), 'cy');
    const before = storedHash(ctx.store, 'cy');
    expect(before).toMatch(/^scrypt\$32768\$8\$1\$/);
    expect(needsRehash(before)).toBe(true);
    // A wrong password changes nothing.
    expect(checkPassword(ctx.store, 'cy', 'not the password')).toBeUndefined();
    expect(storedHash(ctx.store, 'cy')).toBe(before);
    expect(checkPassword(ctx.store, 'cy', 'an old account password')?.name).toBe('cy');
    const after = storedHash(ctx.store, 'cy');
    expect(after).toMatch(/^scrypt\$131072\$8\$1\$/);
    expect(needsRehash(after)).toBe(false);
    expect(verifyPassword('an old account password', after)).toBe(true);
    expect(checkPassword(ctx.store, 'cy', 'an old account password')?.name).toBe('cy');
  });

  it('upgrades only to the cost asked for, and never lowers a stronger hash', () => {
    const medium: ScryptCost = { N: 1 << 11, r: 8, p: 1 };
    createAccount(ctx.store, 'dee', 'the medium password', { cost: medium });
    expect(checkPassword(ctx.store, 'dee', 'the medium password', { cost: FAST })).toBeDefined();
    expect(storedHash(ctx.store, 'dee')).toMatch(/^scrypt\$2048\$/);
    expect(checkPassword(ctx.store, 'dee', 'the medium password', { cost: { N: 1 << 12, r: 8, p: 1 } })).toBeDefined();
    expect(storedHash(ctx.store, 'dee')).toMatch(/^scrypt\$4096\$/);
  });

  it('refuses stored hashes it did not write: bad format, cost not a power of two, or a cost that would exhaust memory', () => {
    const good = hashPassword('some long password', FAST);
    expect(verifyPassword('some long password', good)).toBe(true);
    const [, , r, p, salt, hash] = good.split('$');
    for (const n of ['1000', String(1 << 24), '0', '-1024', 'x']) {
      expect(verifyPassword('some long password', ['scrypt', n, r, p, salt, hash].join('$')), n).toBe(false);
    }
    expect(verifyPassword('some long password', `bcrypt$${good.slice(7)}`)).toBe(false);
    expect(verifyPassword('some long password', 'scrypt$1024$8$1$only-five-parts')).toBe(false);
    expect(needsRehash('not a hash')).toBe(true);
  });
});

describe('setting and changing passwords', () => {
  it('setPassword ends every session of the account and says how many', () => {
    const acc = createAccount(ctx.store, 'eve', 'first long password', { cost: FAST });
    const a = createSession(ctx.store, acc.id);
    const b = createSession(ctx.store, acc.id);
    expect(setPassword(ctx.store, acc.id, 'second long password', { cost: FAST })).toBe(2);
    expect(getSession(ctx.store, a.token)).toBeUndefined();
    expect(getSession(ctx.store, b.token)).toBeUndefined();
    expect(checkPassword(ctx.store, 'eve', 'second long password', { cost: FAST })).toBeDefined();
  });

  it('changePassword needs the current password, keeps the session it is told to keep and ends the others', () => {
    const acc = createAccount(ctx.store, 'fay', 'first long password', { cost: FAST });
    const other = createAccount(ctx.store, 'gus', 'another long password', { cost: FAST });
    const here = createSession(ctx.store, acc.id);
    const elsewhere = createSession(ctx.store, acc.id);
    const notMine = createSession(ctx.store, other.id);
    expect(changePassword(ctx.store, acc.id, 'wrong current password', 'second long password', { cost: FAST })).toEqual({ changed: false });
    expect(getSession(ctx.store, elsewhere.token)).toBeDefined();
    expect(() => changePassword(ctx.store, acc.id, 'first long password', 'password1234', { cost: FAST })).toThrow(/public list of common passwords/);
    expect(checkPassword(ctx.store, 'fay', 'first long password', { cost: FAST })).toBeDefined();
    const done = changePassword(ctx.store, acc.id, 'first long password', 'second long password', { cost: FAST, keepSessionToken: here.token });
    expect(done).toEqual({ changed: true, endedSessions: 1 });
    expect(getSession(ctx.store, here.token)).toBeDefined();
    expect(getSession(ctx.store, elsewhere.token)).toBeUndefined();
    expect(getSession(ctx.store, notMine.token)).toBeDefined();
    expect(checkPassword(ctx.store, 'fay', 'first long password', { cost: FAST })).toBeUndefined();
    expect(checkPassword(ctx.store, 'fay', 'second long password', { cost: FAST })).toBeDefined();
  });
});
