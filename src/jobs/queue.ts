// The run queue. Runs are persisted in the runs table (status 'queued' is the queue itself), so
// a restart loses nothing: runs left 'running' by a stopped process become 'interrupted' and can
// be resumed from their last checkpoint (a run a live `themata fit` process is fitting is left
// alone). At most `concurrency` fits run at once, each in its own
// worker thread so the server keeps answering while a fit computes (DESIGN §9).
// Each account may have at most `fitsPerAccount` fits queued or running (OWASP ASVS 4.0.3 V11.1.3
// "per-user limits"); who queued a run is kept in memory, so runs queued before a restart count
// for no one, and the single local user of a loopback server without accounts has no such limit.
import type { Worker } from 'node:worker_threads';
import {
  getRun,
  interruptAbandonedRuns,
  listRunsByStatus,
  processIsAlive,
  setRunStatus,
  type RunProgress,
  type RunStatus,
  type Store,
} from '../store/index.js';
import { InputError } from '../text/index.js';
import { startTypeScriptWorker } from '../platform/index.js';
import type { FromWorker } from './messages.js';
import { RunTracker } from './run-tracker.js';

export type JobEvent =
  | { runId: number; kind: 'status'; status: RunStatus; error: string | null }
  | { runId: number; kind: 'progress'; progress: RunProgress };

export type JobListener = (event: JobEvent) => void;

export interface JobQueueOptions {
  store: Store;
  /** Fits running at once (default 1: a fit already uses the cores it is given). */
  concurrency?: number;
  /** Worker module to run (default: the real fit worker). Tests pass a stand-in. */
  workerUrl?: URL;
  /** Passed to the worker as workerData.options. */
  workerOptions?: Record<string, unknown>;
  /** How long a cancelled worker may take to stop cleanly before it is terminated. */
  cancelGraceMs?: number;
  /** Minimum interval between progress writes to the database. */
  progressWriteMs?: number;
  /** Fits one account may have queued or running at once (default 3, common practice). */
  fitsPerAccount?: number;
}

/** Who asks for a fit: an account id, or null for the single local user (no limit). */
export type FitRequester = number | null;

interface Active {
  worker: Worker;
  cancelling: boolean;
  tracker: RunTracker;
  killTimer?: NodeJS.Timeout;
}

export class JobQueue {
  readonly concurrency: number;
  private readonly store: Store;
  private readonly workerUrl: URL;
  private readonly workerOptions: Record<string, unknown>;
  private readonly cancelGraceMs: number;
  private readonly progressWriteMs: number;
  private readonly active = new Map<number, Active>();
  private readonly listeners = new Map<number, Set<JobListener>>();
  private readonly anyListeners = new Set<JobListener>();
  private readonly idleWaiters: (() => void)[] = [];
  /** Account that queued each run still queued or running here. */
  private readonly requesters = new Map<number, number>();
  readonly fitsPerAccount: number;
  /** Runs being deleted: never launched, whatever their status says. */
  private readonly held = new Set<number>();
  private closed = false;

  constructor(options: JobQueueOptions) {
    this.store = options.store;
    this.concurrency = Math.max(1, Math.floor(options.concurrency ?? 1));
    this.workerUrl = options.workerUrl ?? new URL('./fit-worker.ts', import.meta.url);
    this.workerOptions = options.workerOptions ?? {};
    this.cancelGraceMs = options.cancelGraceMs ?? 15_000;
    this.progressWriteMs = options.progressWriteMs ?? 500;
    this.fitsPerAccount = Math.max(1, Math.floor(options.fitsPerAccount ?? 3));
  }

  /** Fits this account has queued or running now. */
  fitsOf(account: number): number {
    let n = 0;
    for (const [runId, owner] of this.requesters) {
      if (owner !== account) continue;
      if (this.active.has(runId) || getRun(this.store, runId)?.status === 'queued') n++;
      else this.requesters.delete(runId); // settled elsewhere (e.g. cancelled while queued by another process)
    }
    return n;
  }

  /** Throws an InputError when this account may not start another fit now. Call it before creating the run. */
  checkFitLimit(requester: FitRequester): void {
    if (requester === null) return;
    const n = this.fitsOf(requester);
    if (n >= this.fitsPerAccount) {
      throw new InputError(
        `You have ${n} fits queued or running, the most one account may have at once (${this.fitsPerAccount}). ` +
          'Wait for one to finish, or cancel one on its run page, then start this one.',
      );
    }
  }

  /**
   * Recover after a restart and start queued runs. A run left 'running' becomes 'interrupted' only
   * when its process has ended or its heartbeat is stale (store's abandonedReason): a fit a live
   * `themata fit` runs in another process goes on. A fresh queue runs nothing yet, so a run that
   * names this very process as its owner is left over too. Returns the number of runs interrupted.
   */
  start(): number {
    const interrupted = interruptAbandonedRuns(this.store, { isAlive: (pid) => pid !== process.pid && processIsAlive(pid) });
    this.schedule();
    return interrupted.length;
  }

  /** Queue a run that exists in the store (status set to 'queued'), on behalf of an account when given. */
  enqueue(runId: number, requester: FitRequester = null): void {
    const run = getRun(this.store, runId);
    if (!run) throw new Error(`No run with id ${runId}.`);
    if (requester !== null && this.requesters.get(runId) !== requester) {
      this.checkFitLimit(requester);
      this.requesters.set(runId, requester);
    }
    if (run.status !== 'queued') setRunStatus(this.store, runId, 'queued');
    this.emit({ runId, kind: 'status', status: 'queued', error: null });
    this.schedule();
  }

  /** Resume an interrupted, cancelled or failed run from its last checkpoint (the worker decides). */
  resume(runId: number, requester: FitRequester = null): boolean {
    const run = getRun(this.store, runId);
    if (!run || !['interrupted', 'cancelled', 'failed'].includes(run.status)) return false;
    this.enqueue(runId, requester);
    return true;
  }

  /** Cancel a queued or running run. Returns false when it was neither. */
  cancel(runId: number): boolean {
    const active = this.active.get(runId);
    if (active) {
      if (!active.cancelling) {
        active.cancelling = true;
        active.worker.postMessage({ type: 'cancel' });
        active.killTimer = setTimeout(() => void active.worker.terminate(), this.cancelGraceMs);
        active.killTimer.unref();
      }
      return true;
    }
    if (setRunStatus(this.store, runId, 'cancelled', null, { from: ['queued'] })) {
      this.emit({ runId, kind: 'status', status: 'cancelled', error: null });
      return true;
    }
    return false;
  }

  /**
   * Before runs are deleted: keep them from being launched, and stop the worker of any that is
   * running here at once (its results are about to go, so there is nothing to wait for). Call
   * `unhold` afterwards, whether the deletion happened or not.
   */
  async release(runIds: readonly number[]): Promise<void> {
    for (const id of runIds) this.held.add(id);
    await Promise.all(
      runIds.map(async (runId) => {
        const a = this.active.get(runId);
        if (!a) return;
        a.tracker.abandon();
        if (a.killTimer) clearTimeout(a.killTimer);
        this.active.delete(runId);
        await a.worker.terminate();
        setRunStatus(this.store, runId, 'cancelled', null, { from: ['running'] });
        this.emit({ runId, kind: 'status', status: 'cancelled', error: null });
      }),
    );
  }

  /** Runs of `release` may be launched again (a deletion that did not happen); starts queued runs. */
  unhold(runIds: readonly number[]): void {
    for (const id of runIds) this.held.delete(id);
    this.schedule();
  }

  isActive(runId: number): boolean {
    return this.active.has(runId);
  }

  /** Latest progress of a running fit (with its likelihood trace), if it is running here. */
  progress(runId: number): RunProgress | undefined {
    const a = this.active.get(runId);
    return a?.tracker.snapshot();
  }

  /** Listen to one run's events (or every run's with runId = null). Returns an unsubscribe. */
  subscribe(runId: number | null, listener: JobListener): () => void {
    if (runId === null) {
      this.anyListeners.add(listener);
      return () => this.anyListeners.delete(listener);
    }
    let set = this.listeners.get(runId);
    if (!set) this.listeners.set(runId, (set = new Set()));
    set.add(listener);
    return () => {
      set!.delete(listener);
      if (set!.size === 0) this.listeners.delete(runId);
    };
  }

  /** Resolves when nothing is running and nothing is queued. */
  idle(): Promise<void> {
    if (this.active.size === 0 && listRunsByStatus(this.store, ['queued']).length === 0) return Promise.resolve();
    return new Promise((resolve) => this.idleWaiters.push(resolve));
  }

  /** Stop every worker; their runs become 'interrupted' (resumable). */
  async close(): Promise<void> {
    this.closed = true;
    const stopping = [...this.active.entries()].map(async ([runId, a]) => {
      a.tracker.abandon();
      if (a.killTimer) clearTimeout(a.killTimer);
      await a.worker.terminate();
      setRunStatus(this.store, runId, 'interrupted', null, { from: ['running'] });
    });
    await Promise.all(stopping);
    this.active.clear();
  }

  private emit(event: JobEvent): void {
    for (const l of this.listeners.get(event.runId) ?? []) l(event);
    for (const l of this.anyListeners) l(event);
  }

  private schedule(): void {
    if (this.closed) return;
    if (this.active.size < this.concurrency) {
      for (const run of listRunsByStatus(this.store, ['queued'])) {
        if (this.active.size >= this.concurrency) break;
        if (!this.active.has(run.id) && !this.held.has(run.id)) this.launch(run.id);
      }
    }
    if (this.active.size === 0 && listRunsByStatus(this.store, ['queued']).every((r) => this.held.has(r.id))) {
      for (const resolve of this.idleWaiters.splice(0)) resolve();
    }
  }

  private launch(runId: number): void {
    setRunStatus(this.store, runId, 'running');
    const worker = startTypeScriptWorker(this.workerUrl, { dataDir: this.store.dataDir, runId, options: this.workerOptions });
    const a: Active = { worker, cancelling: false, tracker: new RunTracker(this.store, runId, this.progressWriteMs) };
    this.active.set(runId, a);
    this.emit({ runId, kind: 'status', status: 'running', error: null });
    worker.on('message', (msg: FromWorker) => this.onMessage(runId, a, msg));
    worker.on('error', (error) => this.settle(runId, a, 'failed', `The fit stopped with an error: ${error.message}`));
    worker.on('exit', (code) => {
      if (a.cancelling) this.settle(runId, a, 'cancelled', null);
      else this.settle(runId, a, 'failed', `The fit stopped unexpectedly (worker exit code ${code}). Resume it to continue from its last checkpoint.`);
    });
  }

  private onMessage(runId: number, a: Active, msg: FromWorker): void {
    switch (msg.type) {
      case 'started':
        a.tracker.started(msg.resumedFromSweep);
        break;
      case 'progress':
        this.emit({ runId, kind: 'progress', progress: a.tracker.progress(msg.progress) });
        break;
      case 'finished':
        this.settle(runId, a, 'finished', null);
        break;
      case 'cancelled':
        this.settle(runId, a, 'cancelled', null);
        break;
      case 'error':
        this.settle(runId, a, 'failed', msg.message);
        break;
    }
  }

  /** The worker is done: the tracker changes the status (guarded, see run-tracker.ts). */
  private settle(runId: number, a: Active, status: RunStatus, error: string | null): void {
    if (a.tracker.isSettled) return;
    if (a.killTimer) clearTimeout(a.killTimer);
    const after = a.tracker.settle(status, error);
    this.active.delete(runId);
    void a.worker.terminate();
    if (after) this.emit({ runId, kind: 'status', status: after.status, error: after.error });
    this.schedule();
  }
}
