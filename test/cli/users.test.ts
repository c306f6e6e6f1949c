import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { checkPassword, createStudy, getAccountByName, getStudyByName, listStudyMembers, openStore } from '../../src/store/index.js';
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
});
