// Names of the run summaries stored beside the fit results; defined with the summaries in
// src/services/run-summaries.ts and re-exported here for the readers of the jobs layer.
export { CONTRAST_DRAWS, contrastKey } from '../services/index.js';
