// Public surface of the jobs layer: the run lifecycle (one executor, in this process or in a
// worker thread of the persisted run queue) and the names of the stored summaries.
export { JobQueue, type JobEvent, type JobListener, type JobQueueOptions, type FitRequester } from './queue.js';
export { runFitInProcess, PROGRESS_WRITE_MS, type InProcessOptions, type InProcessOutcome } from './run-in-process.js';
export { RunTracker } from './run-tracker.js';
export { startTypeScriptWorker } from '../platform/index.js';
export type { FitWorkerData, FromWorker, ToWorker } from './messages.js';
export { CONTRAST_DRAWS, contrastKey } from './summary-keys.js';
