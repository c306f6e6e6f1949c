// Per-account limits on work (OWASP ASVS 4.0.3 V11.1.3): one account may have at most three fits
// queued or running at once (common practice value), with a message that says what to do; other
// accounts and the single local user are not held back by it. Stand-in worker, no model.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { JobQueue, type JobEvent } from '../../src/jobs/index.js';
import { createRun, createStudy, getRun, openStore, type Store } from '../../src/store/index.js';
import { InputError } from '../../src/text/types.js';

const standIn = new URL('./fixtures/stand-in-fit-worker.ts', import.meta.url);
const settings = { themes: 3, sweeps: 5, burnIn: 1, seed: 1, threads: 1, covariates: [], holdout: 0 };

let dir: string;
let store: Store;
let queue: JobQueue;
let studyId: number;
let n = 0;

beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'themata-fit-limits-'));
  store = openStore(dir);
  studyId = createStudy(store, { name: 'Invented study' }).id;
  // Long stand-in fits (they are cancelled or closed, never waited for).
  queue = new JobQueue({ store, workerUrl: standIn, workerOptions: { steps: 100_000, delayMs: 20 }, cancelGraceMs: 2000 });
});
afterEach(async () => {
  await queue.close();
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

function newRun(): number {
  return createRun(store, { studyId, name: `run ${++n}`, settings }).id;
}

describe('fits per account', () => {
  it('refuses a fourth fit queued or running for one account, with a clear message, and not for others', () => {
    expect(queue.fitsPerAccount).toBe(3);
    const runs = [newRun(), newRun(), newRun()];
    for (const id of runs) queue.enqueue(id, 7);
    expect(queue.fitsOf(7)).toBe(3); // one running, two queued
    expect(() => queue.checkFitLimit(7)).toThrow(InputError);
    expect(() => queue.checkFitLimit(7)).toThrow(
      'You have 3 fits queued or running, the most one account may have at once (3). Wait for one to finish, or cancel one on its run page, then start this one.',
    );
    const fourth = newRun();
    expect(() => queue.enqueue(fourth, 7)).toThrow(InputError);
    expect(getRun(store, fourth)!.status).toBe('queued'); // as created: enqueue changed nothing
    expect(queue.fitsOf(7)).toBe(3);
    // Another account, and the local user of a server without accounts, may still queue.
    expect(() => queue.enqueue(newRun(), 8)).not.toThrow();
    expect(() => queue.checkFitLimit(null)).not.toThrow();
  });

  it('lets the account queue again once one of its fits is cancelled or has ended', async () => {
    const runs = [newRun(), newRun(), newRun()];
    for (const id of runs) queue.enqueue(id, 7);
    expect(() => queue.checkFitLimit(7)).toThrow(InputError);
    queue.cancel(runs[2]); // queued: cancelled at once
    expect(queue.fitsOf(7)).toBe(2);
    expect(() => queue.checkFitLimit(7)).not.toThrow();
    queue.enqueue(runs[2], 7);
    const ended = new Promise<void>((resolve) => queue.subscribe(runs[0], (e: JobEvent) => e.kind === 'status' && e.status === 'cancelled' && resolve()));
    queue.cancel(runs[0]); // running: the worker stops at its next step
    await ended;
    expect(queue.fitsOf(7)).toBe(2);
    expect(() => queue.resume(runs[0], 7)).not.toThrow();
    expect(() => queue.resume(newRun(), 7)).not.toThrow(); // a run that is not resumable: nothing happens
    expect(queue.fitsOf(7)).toBe(3);
  });
});
