import { afterEach, describe, expect, it } from 'vitest';
import { isBusyError, openStore, withBusyRetry } from '../../src/store/index.js';
import { tempDir } from './helpers.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((f) => f()));

describe('busy database', () => {
  it('recognises another connection\'s write lock and gives up after the allowed wait', () => {
    const t = tempDir();
    cleanups.push(t.cleanup);
    const a = openStore(t.dir);
    const b = openStore(t.dir, { busyTimeoutMs: 0 });
    cleanups.unshift(() => (a.close(), b.close()));
    a.db.exec('BEGIN IMMEDIATE');
    let calls = 0;
    const write = () => {
      calls++;
      b.db.prepare("INSERT INTO studies (name, created_at, updated_at) VALUES ('x', 'x', 'x')").run();
    };
    let caught: unknown;
    try {
      withBusyRetry(write, 250);
    } catch (e) {
      caught = e;
    }
    expect(isBusyError(caught)).toBe(true);
    expect(calls).toBeGreaterThan(1); // retried before giving up
    a.db.exec('COMMIT');
    withBusyRetry(write, 250);
    expect(() => withBusyRetry(() => { throw new Error('other'); })).toThrow('other');
  });
});
