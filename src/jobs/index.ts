// Public surface of the jobs layer: the persisted run queue and its worker threads.
export { JobQueue, type JobEvent, type JobListener, type JobQueueOptions } from './queue.js';
export { startTypeScriptWorker } from '../platform/index.js';
export type { FitWorkerData, FromWorker, ToWorker } from './messages.js';
export { CONTRAST_DRAWS, contrastKey } from './summary-keys.js';
