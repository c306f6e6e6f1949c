// The run queue: scheduling. Runs are persisted in the runs table (status 'queued' is the queue
// itself), so a restart loses nothing: runs left 'running' by a stopped process become
// 'interrupted' and can be resumed from their last checkpoint (a run a live `themata fit` process
// is fitting is left alone). At most `concurrency` fits run at once, each in its own worker thread
// (worker-fit.ts) so the server keeps answering while a fit computes (docs/design.md §9). The
// parts: per-account limits (fit-limits.ts), events (run-events.ts), progress, trace and status
// of each fit (run-tracker.ts, shared with fits in the command line's process), and deletion holds.
import {
  getRun,
  interruptAbandonedRuns,
  listRunsByStatus,
  processIsAlive,
  setRunStatus,
  type RunProgress,
  type Store,
} from '../store/index.js';
import { FitLimits, type FitRequester } from './fit-limits.js';
import { RunEvents, type JobEvent, type JobListener } from './run-events.js';
import { WorkerFit } from './worker-fit.js';

export type { JobEvent, JobListener } from './run-events.js';
export type { FitRequester } from './fit-limits.js';

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

export class JobQueue {
  readonly concurrency: number;
  private readonly store: Store;
  private readonly workerUrl: URL;
  private readonly workerOptions: Record<string, unknown>;
  private readonly cancelGraceMs: number;
  private readonly progressWriteMs: number;
  private readonly active = new Map<number, WorkerFit>();
  private readonly events = new RunEvents();
  private readonly limits: FitLimits;
  private readonly idleWaiters: (() => void)[] = [];
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
    this.limits = new FitLimits(Math.max(1, Math.floor(options.fitsPerAccount ?? 3)), (runId) => this.active.has(runId) || getRun(this.store, runId)?.status === 'queued');
  }

  get fitsPerAccount(): number {
    return this.limits.fitsPerAccount;
  }

  /** Fits this account has queued or running now. */
  fitsOf(account: number): number {
    return this.limits.fitsOf(account);
  }

  /** Throws an InputError when this account may not start another fit now. Call it before creating the run. */
  checkFitLimit(requester: FitRequester): void {
    this.limits.check(requester);
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
    this.limits.take(runId, requester);
    if (run.status !== 'queued') setRunStatus(this.store, runId, 'queued');
    this.events.emit({ runId, kind: 'status', status: 'queued', error: null });
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
    const fit = this.active.get(runId);
    if (fit) {
      fit.cancel();
      return true;
    }
    if (setRunStatus(this.store, runId, 'cancelled', null, { from: ['queued'] })) {
      this.events.emit({ runId, kind: 'status', status: 'cancelled', error: null });
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
        const fit = this.active.get(runId);
        if (!fit) return;
        this.active.delete(runId);
        await fit.stopNow();
        setRunStatus(this.store, runId, 'cancelled', null, { from: ['running'] });
        this.events.emit({ runId, kind: 'status', status: 'cancelled', error: null });
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
    return this.active.get(runId)?.progress();
  }

  /** Listen to one run's events (or every run's with runId = null). Returns an unsubscribe. */
  subscribe(runId: number | null, listener: JobListener): () => void {
    return this.events.subscribe(runId, listener);
  }

  /** Resolves when nothing is running and nothing is queued. */
  idle(): Promise<void> {
    if (this.active.size === 0 && listRunsByStatus(this.store, ['queued']).length === 0) return Promise.resolve();
    return new Promise((resolve) => this.idleWaiters.push(resolve));
  }

  /** Stop every worker; their runs become 'interrupted' (resumable). */
  async close(): Promise<void> {
    this.closed = true;
    const stopping = [...this.active.entries()].map(async ([runId, fit]) => {
      await fit.stopNow();
      setRunStatus(this.store, runId, 'interrupted', null, { from: ['running'] });
    });
    await Promise.all(stopping);
    this.active.clear();
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
    const fit = new WorkerFit({
      store: this.store,
      runId,
      workerUrl: this.workerUrl,
      workerOptions: this.workerOptions,
      progressWriteMs: this.progressWriteMs,
      cancelGraceMs: this.cancelGraceMs,
      onProgress: (progress) => this.events.emit({ runId, kind: 'progress', progress }),
      onSettled: (after) => {
        this.active.delete(runId);
        if (after) this.events.emit({ runId, kind: 'status', status: after.status, error: after.error });
        this.schedule();
      },
    });
    this.active.set(runId, fit);
    this.events.emit({ runId, kind: 'status', status: 'running', error: null });
  }
}

