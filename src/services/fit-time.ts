// How long the phases after the sweeps take, so that a fit's "time left" is honest up to the
// stored results (issue 15), not only to the last sweep. A cost model in counts (answers D,
// themes K, contrasts C, held-out answers H, stored numbers) with rates measured on the
// development machine (2 cores; DEVELOPERS.md, "Time left"); the summarising phase then corrects
// itself from the steps it has timed (fit-job.ts).
import type { Run, Store } from '../store/index.js';
import type { PreparedCorpus } from './fit-job.js';
import { CONTRAST_DRAWS, summarySteps } from './run-summaries.js';

// Measured with a synthetic study of 20,000 answers, K = 20, 3 contrasts (1.08 s each), checks
// 0.62 s, storing 0.52 s for 7.9 million numbers; and of 3,000 answers, K = 5 (0.15 s a contrast,
// where the fixed part shows).
/** Seconds per draw × answer × theme of a contrast (bootstrap and posterior draws), and per contrast. */
const CONTRAST_SECONDS_PER_CELL = 2.7e-9;
const CONTRAST_SECONDS_FIXED = 0.05;
/** Seconds per answer × theme of the checks (coherence, fold-in of held-out answers), and in all. */
const CHECK_SECONDS_PER_CELL = 1.4e-6;
const CHECK_SECONDS_FIXED = 0.05;
/** Stored numbers per second in one SQLite transaction. */
const STORED_NUMBERS_PER_SECOND = 1.5e7;

export interface AfterSamplingEstimate {
  readonly summarySeconds: number;
  readonly storingSeconds: number;
  readonly totalSeconds: number;
}

export function estimateAfterSampling(store: Store, run: Run, prepared: PreparedCorpus): AfterSamplingEstimate {
  const K = run.settings.themes;
  const D = prepared.documentIds.length;
  const G = prepared.corpus.numGroups;
  const contrasts = summarySteps(store, run.studyId).length - 1;
  const summarySeconds =
    contrasts * (CONTRAST_DRAWS * D * K * CONTRAST_SECONDS_PER_CELL + CONTRAST_SECONDS_FIXED) + (D + prepared.heldOutIds.length) * K * CHECK_SECONDS_PER_CELL + CHECK_SECONDS_FIXED;
  const words = prepared.vocabularies.reduce((n, v) => n + v.stems.length, 0);
  const stored = G * K * (2 + Number(run.settings.keepThetaSamples ?? run.settings.maxSamples ?? 20)) + words * K + D * 2;
  const storingSeconds = stored / STORED_NUMBERS_PER_SECOND;
  return { summarySeconds, storingSeconds, totalSeconds: summarySeconds + storingSeconds };
}
