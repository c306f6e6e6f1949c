import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { JobQueue, type JobEvent } from '../../src/jobs/index.js';
import { createRun, createStudy, getRun, openStore, setRunStatus, type Store } from '../../src/store/index.js';

const standIn = new URL('./fixtures/stand-in-fit-worker.ts', import.meta.url);
const settings = { themes: 3, sweeps: 5, burnIn: 1, seed: 1, threads: 1, covariates: [], holdout: 0 };

let dir: string;
let store: Store;
let queue: JobQueue | undefined;

beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'themata-jobs-'));
  store = openStore(dir);
});
afterEach(async () => {
  await queue?.close();
  queue = undefined;
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

function newRun(name: string) {
  const study = createStudy(store, { name: `study ${name}` });
  return createRun(store, { studyId: study.id, name, settings });
}

describe('job queue', () => {
  it('runs a queued fit in a worker thread, relays progress and marks it finished', async () => {
    queue = new JobQueue({ store, workerUrl: standIn, workerOptions: { steps: 4, delayMs: 2 }, progressWriteMs: 0 });
    const run = newRun('a');
    const events: JobEvent[] = [];
    queue.subscribe(run.id, (e) => events.push(e));
    queue.start();
    await queue.idle();
    const after = getRun(store, run.id)!;
    expect(after.status).toBe('finished');
    const sweeps = events.filter((e) => e.kind === 'progress').map((e) => (e.kind === 'progress' ? e.progress.sweep : 0));
    expect(sweeps).toEqual([1, 2, 3, 4]);
    expect(after.progress.trace).toHaveLength(4);
    expect(events.at(-1)).toMatchObject({ kind: 'status', status: 'finished' });
  });

  it('never runs more fits at once than its concurrency', async () => {
    queue = new JobQueue({ store, concurrency: 1, workerUrl: standIn, workerOptions: { steps: 3, delayMs: 5 } });
    const runs = [newRun('a'), newRun('b'), newRun('c')];
    let running = 0;
    let peak = 0;
    queue.subscribe(null, (e) => {
      if (e.kind !== 'status') return;
      if (e.status === 'running') peak = Math.max(peak, ++running);
      if (e.status === 'finished') running--;
    });
    queue.start();
    await queue.idle();
    expect(peak).toBe(1);
    expect(runs.map((r) => getRun(store, r.id)!.status)).toEqual(['finished', 'finished', 'finished']);
  });

  it('cancels a running fit and a queued one', async () => {
    queue = new JobQueue({ store, workerUrl: standIn, workerOptions: { steps: 10_000, delayMs: 5 } });
    const first = newRun('a');
    const second = newRun('b');
    const started = new Promise<void>((resolve) => queue!.subscribe(first.id, (e) => e.kind === 'progress' && resolve()));
    queue.start();
    await started;
    expect(queue.cancel(second.id)).toBe(true);
    expect(queue.cancel(first.id)).toBe(true);
    await queue.idle();
    expect(getRun(store, first.id)!.status).toBe('cancelled');
    expect(getRun(store, second.id)!.status).toBe('cancelled');
  });

  it('records a failing fit with its message', async () => {
    queue = new JobQueue({ store, workerUrl: standIn, workerOptions: { fail: true } });
    const run = newRun('a');
    queue.start();
    await queue.idle();
    const after = getRun(store, run.id)!;
    expect(after.status).toBe('failed');
    expect(after.error).toContain('could not converge');
  });

  it('after a restart shows runs left running as interrupted, and resumes them on request', async () => {
    const run = newRun('a');
    setRunStatus(store, run.id, 'running'); // as a killed process would leave it
    queue = new JobQueue({ store, workerUrl: standIn, workerOptions: { steps: 2, delayMs: 1 } });
    expect(queue.start()).toBe(1);
    expect(getRun(store, run.id)!.status).toBe('interrupted');
    expect(queue.resume(run.id)).toBe(true);
    await queue.idle();
    expect(getRun(store, run.id)!.status).toBe('finished');
    expect(queue.resume(run.id)).toBe(false);
  });
});
