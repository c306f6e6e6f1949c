// A fit run in this process (the command line's `fit` and `resume`), with the lifecycle of a fit
// the server's queue runs in a worker thread: the same status changes (running, then finished,
// failed or — when stopped — interrupted), the same progress writes and trace (run-tracker.ts),
// and the same fit service, which stores the same results and summaries (fit-job.ts).
import { runFitJob, type FitDiagnostics } from '../services/index.js';
import { setRunStatus, type RunProgress, type RunStatus, type Store } from '../store/index.js';
import { RunTracker } from './run-tracker.js';

/** Minimum interval between progress writes to the database (as the queue's default). */
export const PROGRESS_WRITE_MS = 500;

export interface InProcessOptions {
  store: Store;
  runId: number;
  shouldStop?: () => boolean;
  onStart?: (resumedFromSweep: number | null) => void;
  /** The progress to show after each message (merged, with the whole trace). */
  onProgress?: (progress: RunProgress) => void;
  progressWriteMs?: number;
}

export interface InProcessOutcome {
  /** What the run is now: finished, or interrupted when stopped (resumable from its checkpoint). */
  status: RunStatus;
  diagnostics: FitDiagnostics | null;
}

/** Runs (or continues from its last checkpoint) a stored run here; a failure marks it failed and is rethrown. */
export async function runFitInProcess(options: InProcessOptions): Promise<InProcessOutcome> {
  const { store, runId } = options;
  const tracker = new RunTracker(store, runId, options.progressWriteMs ?? PROGRESS_WRITE_MS);
  setRunStatus(store, runId, 'running');
  try {
    const outcome = await runFitJob({
      store,
      runId,
      shouldStop: options.shouldStop,
      onStart: (from) => {
        tracker.started(from);
        options.onStart?.(from);
      },
      onProgress: (p) => options.onProgress?.(tracker.progress(p)),
    });
    // A stop here is the person's own (Ctrl+C): the run is interrupted, as when a server stops.
    const settled = tracker.settle(outcome.stopped ? 'interrupted' : 'finished', null);
    return { status: settled?.status ?? (outcome.stopped ? 'interrupted' : 'finished'), diagnostics: outcome.diagnostics };
  } catch (error) {
    // Guarded: a run that finished (or was deleted) meanwhile keeps what it is.
    tracker.settle('failed', error instanceof Error ? error.message : String(error));
    throw error;
  }
}
