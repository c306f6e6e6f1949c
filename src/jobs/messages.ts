// Messages between the job queue (main thread) and a fit worker thread.
import type { RunProgress } from '../store/index.js';

/** What a worker receives as workerData. */
export interface FitWorkerData {
  readonly dataDir: string;
  readonly runId: number;
  /** Anything a test worker needs (e.g. how many steps to simulate). */
  readonly options?: Record<string, unknown>;
}

export type ToWorker = { type: 'cancel' };

export type FromWorker =
  | { type: 'started'; resumedFromSweep: number | null }
  | { type: 'progress'; progress: RunProgress }
  | { type: 'finished' }
  | { type: 'cancelled' }
  | { type: 'error'; message: string };
