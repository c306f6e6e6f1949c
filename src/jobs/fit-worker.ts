// The worker-thread side of a fit: opens its own connection to the data folder, runs the fit
// service for one run (resuming from its last checkpoint when there is one), forwards progress
// to the queue, and stops cleanly after the current sweep when asked to cancel. After the fit it
// computes the run's summaries (group contrasts for every covariate, and the checks) here, off the
// request path, so the results pages read them instead of computing them while someone waits.
import { parentPort, workerData } from 'node:worker_threads';
import { contrastCovariates, loadRunModel, runChecks, runContrasts, runFitJob } from '../services/index.js';
import { openStore, saveResults } from '../store/index.js';
import type { FitWorkerData, FromWorker, ToWorker } from './messages.js';
import { CONTRAST_DRAWS, contrastKey } from './summary-keys.js';

const data = workerData as FitWorkerData;
const port = parentPort!;
let stopRequested = false;
port.on('message', (msg: ToWorker) => {
  if (msg.type === 'cancel') stopRequested = true;
});
const send = (msg: FromWorker) => port.postMessage(msg);

/** Contrasts and checks of a finished run, stored with its results. Failures only lose speed. */
function summarise(): void {
  const store = openStore(data.dataDir);
  try {
    const model = loadRunModel(store, data.runId);
    if (!model) return;
    const names = contrastCovariates(store, model.run.studyId);
    names.forEach((by, i) => {
      if (stopRequested) return;
      send({ type: 'progress', progress: { phase: `comparing groups (${i + 1} of ${names.length})` } });
      try {
        saveResults(store, data.runId, { [contrastKey(by)]: { json: runContrasts(store, model, { by, draws: CONTRAST_DRAWS }) } });
      } catch {
        // A covariate the contrasts cannot use (e.g. one level only) is computed on demand instead.
      }
    });
    if (stopRequested) return;
    send({ type: 'progress', progress: { phase: 'checking the model' } });
    try {
      saveResults(store, data.runId, { checks: { json: runChecks(store, model) } });
    } catch {
      // Checks are computed when the Checks page is opened.
    }
  } finally {
    store.close();
  }
}

try {
  const outcome = await runFitJob({
    dataDir: data.dataDir,
    runId: data.runId,
    onStart: (resumedFromSweep) => send({ type: 'started', resumedFromSweep }),
    onProgress: (progress) => send({ type: 'progress', progress }),
    shouldStop: () => stopRequested,
  });
  if (!outcome.stopped) summarise();
  send(outcome.stopped ? { type: 'cancelled' } : { type: 'finished' });
} catch (error) {
  send({ type: 'error', message: error instanceof Error ? error.message : String(error) });
}
