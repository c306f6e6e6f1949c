import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { checkPassword, openStore } from '../../src/store/index.js';
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
});
