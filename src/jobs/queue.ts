// The run queue. Runs are persisted in the runs table (status 'queued' is the queue itself), so
// a restart loses nothing: runs left 'running' by a stopped process become 'interrupted' and can
// be resumed from their last checkpoint. At most `concurrency` fits run at once, each in its own
// worker thread so the server keeps answering while a fit computes (DESIGN §9).
import type { Worker } from 'node:worker_threads';
import {
  getRun,
  listRunsByStatus,
  markRunningAsInterrupted,
  setRunProgress,
  setRunStatus,
  type RunProgress,
  type RunStatus,
  type Store,
} from '../store/index.js';
import type { FromWorker } from './messages.js';
import { startTypeScriptWorker } from './worker-launch.js';

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
}

interface Active {
  worker: Worker;
  cancelling: boolean;
  settled: boolean;
  lastWrite: number;
  progress: RunProgress;
  trace: number[];
  killTimer?: NodeJS.Timeout;
}

const TRACE_LIMIT = 5000; // common practice: enough points for any chart, bounded memory

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
  private closed = false;

  constructor(options: JobQueueOptions) {
    this.store = options.store;
    this.concurrency = Math.max(1, Math.floor(options.concurrency ?? 1));
    this.workerUrl = options.workerUrl ?? new URL('./fit-worker.ts', import.meta.url);
    this.workerOptions = options.workerOptions ?? {};
    this.cancelGraceMs = options.cancelGraceMs ?? 15_000;
    this.progressWriteMs = options.progressWriteMs ?? 500;
  }

  /** Recover after a restart (running → interrupted) and start queued runs. Returns runs interrupted. */
  start(): number {
    const interrupted = markRunningAsInterrupted(this.store);
    this.schedule();
    return interrupted;
  }

  /** Queue a run that exists in the store (status set to 'queued'). */
  enqueue(runId: number): void {
    const run = getRun(this.store, runId);
    if (!run) throw new Error(`No run with id ${runId}.`);
    if (run.status !== 'queued') setRunStatus(this.store, runId, 'queued');
    this.emit({ runId, kind: 'status', status: 'queued', error: null });
    this.schedule();
  }

  /** Resume an interrupted, cancelled or failed run from its last checkpoint (the worker decides). */
  resume(runId: number): boolean {
    const run = getRun(this.store, runId);
    if (!run || !['interrupted', 'cancelled', 'failed'].includes(run.status)) return false;
    this.enqueue(runId);
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
    const run = getRun(this.store, runId);
    if (run?.status === 'queued') {
      setRunStatus(this.store, runId, 'cancelled');
      this.emit({ runId, kind: 'status', status: 'cancelled', error: null });
      return true;
    }
    return false;
  }

  isActive(runId: number): boolean {
    return this.active.has(runId);
  }

  /** Latest progress of a running fit (with its likelihood trace), if it is running here. */
  progress(runId: number): RunProgress | undefined {
    const a = this.active.get(runId);
    return a ? { ...a.progress, trace: a.trace.slice() } : undefined;
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
      a.settled = true;
      if (a.killTimer) clearTimeout(a.killTimer);
      await a.worker.terminate();
      setRunStatus(this.store, runId, 'interrupted');
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
        if (!this.active.has(run.id)) this.launch(run.id);
      }
    }
    if (this.active.size === 0 && listRunsByStatus(this.store, ['queued']).length === 0) {
      for (const resolve of this.idleWaiters.splice(0)) resolve();
    }
  }

  private launch(runId: number): void {
    setRunStatus(this.store, runId, 'running');
    const worker = startTypeScriptWorker(this.workerUrl, { dataDir: this.store.dataDir, runId, options: this.workerOptions });
    const a: Active = { worker, cancelling: false, settled: false, lastWrite: 0, progress: {}, trace: [] };
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
        // A resumed fit continues the likelihood trace of the sweeps its checkpoint holds.
        if (msg.resumedFromSweep !== null) a.trace = (getRun(this.store, runId)?.progress.trace ?? []).slice(0, msg.resumedFromSweep);
        break;
      case 'progress': {
        const p = msg.progress;
        if (Array.isArray(p.trace)) a.trace = p.trace.slice(-TRACE_LIMIT);
        // One trace point per sweep: closing or phase messages that repeat a sweep are not added.
        else if (typeof p.logLikelihoodPerToken === 'number' && Number.isFinite(p.logLikelihoodPerToken) && p.sweep === a.trace.length + 1) {
          a.trace.push(p.logLikelihoodPerToken);
          if (a.trace.length > TRACE_LIMIT) a.trace.splice(0, a.trace.length - TRACE_LIMIT);
        }
        // Merge, so a field the last message left out (e.g. speed in the closing message) stays shown.
        a.progress = { ...a.progress, ...p };
        delete a.progress.trace;
        const nowMs = Date.now();
        if (nowMs - a.lastWrite >= this.progressWriteMs) {
          a.lastWrite = nowMs;
          this.writeProgress(runId, a);
        }
        this.emit({ runId, kind: 'progress', progress: { ...a.progress, trace: a.trace.slice() } });
        break;
      }
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

  private writeProgress(runId: number, a: Active): void {
    try {
      setRunProgress(this.store, runId, { ...a.progress, trace: a.trace.slice() });
    } catch {
      // A busy database must not stop the fit; the next progress message writes again.
    }
  }

  private settle(runId: number, a: Active, status: RunStatus, error: string | null): void {
    if (a.settled) return;
    a.settled = true;
    if (a.killTimer) clearTimeout(a.killTimer);
    this.writeProgress(runId, a);
    setRunStatus(this.store, runId, status, error);
    this.active.delete(runId);
    void a.worker.terminate();
    this.emit({ runId, kind: 'status', status, error });
    this.schedule();
  }
}
