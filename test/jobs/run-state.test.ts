// Run states that two parties may change at once: the queue starting up while a `themata fit`
// runs in another process, a cancel that arrives after the fit has finished, and a deletion of a
// run whose fit is running here.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { JobQueue, type JobEvent } from '../../src/jobs/index.js';
import { removeRun, removeStudy } from '../../src/services/index.js';
import { createRun, createStudy, getRun, openStore, setRunStatus, type Store } from '../../src/store/index.js';
import { InputError } from '../../src/text/types.js';

const standIn = new URL('./fixtures/stand-in-fit-worker.ts', import.meta.url);
const settings = { themes: 3, sweeps: 5, burnIn: 1, seed: 1, threads: 1, covariates: [], holdout: 0 };

let dir: string;
let store: Store;
let queue: JobQueue | undefined;
let child: ChildProcess | undefined;

beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'themata-run-state-'));
  store = openStore(dir);
});
afterEach(async () => {
  await queue?.close();
  queue = undefined;
  child?.kill();
  child = undefined;
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

function newRun(name: string, studyId = createStudy(store, { name: `study ${name}` }).id) {
  return createRun(store, { studyId, name, settings });
}

/** A run left 'running' by process `pid` on `host`, last heard of at `heartbeat`. */
function runningAs(name: string, pid: number, host?: string, heartbeat?: string) {
  const run = newRun(name);
  setRunStatus(store, run.id, 'running');
  store.db.prepare('UPDATE runs SET owner_pid = ?, owner_host = COALESCE(?, owner_host), heartbeat_at = COALESCE(?, heartbeat_at) WHERE id = ?').run(pid, host ?? null, heartbeat ?? null, run.id);
  return run;
}

function livePid(): number {
  child = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 60000)'], { stdio: 'ignore' });
  return child.pid!;
}

function deadPid(): number {
  return spawnSync(process.execPath, ['-e', '0']).pid!;
}

describe('run states changed by two parties', () => {
  it('on start, interrupts only runs whose process has ended or whose heartbeat is stale, and leaves a live fit of another process running', () => {
    const live = runningAs('live', livePid());
    const ended = runningAs('ended', deadPid());
    const silent = runningAs('silent', 4242, 'another-host', '2000-01-01T00:00:00.000Z');
    const elsewhere = runningAs('elsewhere', 4242, 'another-host');
    queue = new JobQueue({ store, workerUrl: standIn });
    expect(queue.start()).toBe(2);
    expect(getRun(store, live.id)!.status).toBe('running');
    expect(getRun(store, elsewhere.id)!.status).toBe('running');
    expect(getRun(store, ended.id)!.status).toBe('interrupted');
    expect(getRun(store, silent.id)!.status).toBe('interrupted');
    expect(queue.isActive(live.id)).toBe(false);
  });

  it('keeps a finished run finished when a cancel arrives in the summary window after the fit', async () => {
    queue = new JobQueue({ store, workerUrl: standIn, workerOptions: { steps: 2, delayMs: 1, summaryMs: 5_000 }, cancelGraceMs: 50, progressWriteMs: 0 });
    const run = newRun('a');
    const events: JobEvent[] = [];
    const summarising = new Promise<void>((resolve) =>
      queue!.subscribe(run.id, (e) => {
        events.push(e);
        if (e.kind === 'progress' && String(e.progress.phase).startsWith('comparing')) resolve();
      }),
    );
    queue.start();
    await summarising;
    expect(getRun(store, run.id)!.status).toBe('finished');
    expect(queue.cancel(run.id)).toBe(true); // the worker is still there, summarising
    await queue.idle(); // the grace period ends, the worker is stopped
    const after = getRun(store, run.id)!;
    expect(after.status).toBe('finished');
    expect(events.filter((e) => e.kind === 'status').at(-1)).toMatchObject({ status: 'finished' });
  });

  it('guards each status change: a cancelled queued run and a finished run are not overwritten', () => {
    const run = newRun('a');
    setRunStatus(store, run.id, 'finished');
    expect(setRunStatus(store, run.id, 'cancelled', null, { from: ['running'] })).toBe(false);
    expect(getRun(store, run.id)!.status).toBe('finished');
    const queued = newRun('b');
    expect(setRunStatus(store, queued.id, 'cancelled', null, { from: ['queued'] })).toBe(true);
    expect(getRun(store, queued.id)!.status).toBe('cancelled');
  });

  it('deleting a run whose fit runs here stops its worker first; a queued run of a deleted study never starts', async () => {
    queue = new JobQueue({ store, workerUrl: standIn, workerOptions: { steps: 100_000, delayMs: 5 }, progressWriteMs: 0 });
    const study = createStudy(store, { name: 'S' });
    const running = newRun('running', study.id);
    const other = createStudy(store, { name: 'T' });
    const first = newRun('first', other.id);
    const waiting = newRun('waiting', other.id);
    const started = new Promise<void>((resolve) => queue!.subscribe(running.id, (e) => e.kind === 'progress' && resolve()));
    queue.start();
    await started;
    expect(queue.isActive(running.id)).toBe(true);
    const outcome = await removeRun(store, running.id, queue);
    expect(outcome.message).toMatch(/^Deleted run "running" of study "S"/);
    expect(queue.isActive(running.id)).toBe(false);
    expect(getRun(store, running.id)).toBeUndefined();
    // The queue moves on to the next run, which is then deleted with its study (the queued one with it).
    await new Promise((r) => setTimeout(r, 100));
    expect(queue.isActive(first.id)).toBe(true);
    await removeStudy(store, other.id, queue);
    expect(getRun(store, first.id)).toBeUndefined();
    expect(getRun(store, waiting.id)).toBeUndefined();
    await queue.idle();
  });

  it('refuses to delete a run another live process is fitting, and says which process', async () => {
    const pid = livePid();
    const run = runningAs('elsewhere', pid);
    await expect(removeRun(store, run.id)).rejects.toThrow(InputError);
    await expect(removeRun(store, run.id)).rejects.toThrow(new RegExp(`Run "elsewhere" is being fitted by process ${pid} on .*Stop that fit first`));
    await expect(removeStudy(store, run.studyId)).rejects.toThrow(/is being fitted/);
    expect(getRun(store, run.id)!.status).toBe('running');
  });
});
