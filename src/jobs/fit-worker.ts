// The worker-thread side of a fit: opens its own connection to the data folder, runs the fit
// service for one run (resuming from its last checkpoint when there is one; the service also
// computes and stores the run's summaries), forwards its start and progress to the queue, and
// stops cleanly at the next sweep or summary when asked to cancel. The same fit runs in the
// command line's process through run-in-process.ts, with the same lifecycle (run-tracker.ts).
import { parentPort, workerData } from 'node:worker_threads';
import { runFitJob } from '../services/index.js';
import type { FitWorkerData, FromWorker, ToWorker } from './messages.js';

const data = workerData as FitWorkerData;
const port = parentPort!;
let stopRequested = false;
port.on('message', (msg: ToWorker) => {
  if (msg.type === 'cancel') stopRequested = true;
});
const send = (msg: FromWorker) => port.postMessage(msg);

try {
  const outcome = await runFitJob({
    dataDir: data.dataDir,
    runId: data.runId,
    onStart: (resumedFromSweep) => send({ type: 'started', resumedFromSweep }),
    onProgress: (progress) => send({ type: 'progress', progress }),
    shouldStop: () => stopRequested,
  });
  send(outcome.stopped ? { type: 'cancelled' } : { type: 'finished' });
} catch (error) {
  send({ type: 'error', message: error instanceof Error ? error.message : String(error) });
}
