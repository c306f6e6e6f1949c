// One fit running in a worker thread of the queue: starts the worker, hands its messages to the
// run tracker (progress, trace, status; run-tracker.ts), asks it to stop at the next sweep or
// summary on cancel and terminates it when it has not stopped within the grace period, and says
// once, through `onSettled`, what the run is when the worker is done.
import type { Worker } from 'node:worker_threads';
import { startTypeScriptWorker } from '../platform/index.js';
import type { RunProgress, RunStatus, Store } from '../store/index.js';
import type { FromWorker } from './messages.js';
import { RunTracker } from './run-tracker.js';

export interface WorkerFitOptions {
  store: Store;
  runId: number;
  workerUrl: URL;
  workerOptions: Record<string, unknown>;
  progressWriteMs: number;
  cancelGraceMs: number;
  onProgress: (progress: RunProgress) => void;
  /** The worker is done; `after` is the run's status now (undefined when it was deleted). */
  onSettled: (after: { status: RunStatus; error: string | null } | undefined) => void;
}

export class WorkerFit {
  private readonly worker: Worker;
  private readonly tracker: RunTracker;
  private cancelling = false;
  private killTimer: NodeJS.Timeout | undefined;

  constructor(private readonly o: WorkerFitOptions) {
    this.tracker = new RunTracker(o.store, o.runId, o.progressWriteMs);
    this.worker = startTypeScriptWorker(o.workerUrl, { dataDir: o.store.dataDir, runId: o.runId, options: o.workerOptions });
    this.worker.on('message', (msg: FromWorker) => this.onMessage(msg));
    this.worker.on('error', (error) => this.settle('failed', `The fit stopped with an error: ${error.message}`));
    this.worker.on('exit', (code) => {
      if (this.cancelling) this.settle('cancelled', null);
      else this.settle('failed', `The fit stopped unexpectedly (worker exit code ${code}). Resume it to continue from its last checkpoint.`);
    });
  }

  /** Latest progress with the whole likelihood trace. */
  progress(): RunProgress {
    return this.tracker.snapshot();
  }

  /** Ask the worker to stop cleanly; terminate it after the grace period. */
  cancel(): void {
    if (this.cancelling) return;
    this.cancelling = true;
    this.worker.postMessage({ type: 'cancel' });
    this.killTimer = setTimeout(() => void this.worker.terminate(), this.o.cancelGraceMs);
    this.killTimer.unref();
  }

  /** Stop at once without a status change of the tracker's own (deletion, closing); the caller sets the status. */
  async stopNow(): Promise<void> {
    this.tracker.abandon();
    if (this.killTimer) clearTimeout(this.killTimer);
    await this.worker.terminate();
  }

  private onMessage(msg: FromWorker): void {
    switch (msg.type) {
      case 'started':
        this.tracker.started(msg.resumedFromSweep);
        break;
      case 'progress':
        this.o.onProgress(this.tracker.progress(msg.progress));
        break;
      case 'finished':
        this.settle('finished', null);
        break;
      case 'cancelled':
        this.settle('cancelled', null);
        break;
      case 'error':
        this.settle('failed', msg.message);
        break;
    }
  }

  private settle(status: RunStatus, error: string | null): void {
    if (this.tracker.isSettled) return;
    if (this.killTimer) clearTimeout(this.killTimer);
    const after = this.tracker.settle(status, error);
    void this.worker.terminate();
    this.o.onSettled(after);
  }
}
