// How long the phases after the sweeps take, so that a fit's "time left" is honest up to the
// stored results (issue 15), not only to the last sweep. A cost model in counts (answers D,
// themes K, contrasts C, held-out answers H, stored numbers) with rates measured on the
// development machine (2 cores; DEVELOPERS.md, "Time left"); the summarising phase then corrects
// itself from the steps it has timed (fit-job.ts).
import type { Run, Store } from '../store/index.js';
import type { PreparedCorpus } from './fit-job.js';
import { CONTRAST_DRAWS, summarySteps } from './run-summaries.js';

// Measured on this project's development machine (2 cores; DEVELOPERS.md, "Time left") with
// the demo generator's studies of 20,000 and 200,000 answers, K = 50, 7 contrasts, through
// runFitJob: the contrasts' draws 3.4e9 cells in 5.2 s of profile time; reading the answers for
// them 23 µs each; checks 12.9 s for 192,000 answers; storing 5.3 s for 6.7e7 numbers.
/** Seconds per draw × resampling unit × theme of a contrast's bootstrap, and per contrast. */
const CONTRAST_SECONDS_PER_CELL = 1.5e-9;
const CONTRAST_SECONDS_FIXED = 0.05;
/** Resampling units of a typical covariate: about ten levels at the cap of 1000 (contrasts.ts in src/stats). */
const CONTRAST_UNITS_TYPICAL = 10_000;
/** Reading an answer's weight and levels for the contrasts (once for all of them). */
const READ_SECONDS_PER_ANSWER = 25e-6;
/** Seconds per answer × theme of the checks (coherence, fold-in of held-out answers), and in all. */
const CHECK_SECONDS_PER_CELL = 1.3e-6;
const CHECK_SECONDS_FIXED = 0.05;
/** Stored numbers per second in one SQLite transaction. */
const STORED_NUMBERS_PER_SECOND = 1.3e7;
/** The model keeps at most this many values of mixture samples (maxThetaSampleCells in src/model). */
const KEPT_SAMPLE_VALUES = 50e6;

export interface AfterSamplingEstimate {
  readonly summarySeconds: number;
  readonly storingSeconds: number;
  readonly totalSeconds: number;
}

export function estimateAfterSampling(store: Store, run: Run, prepared: PreparedCorpus): AfterSamplingEstimate {
  return afterSamplingSeconds({
    answers: prepared.documentIds.length,
    heldOut: prepared.heldOutIds.length,
    groups: prepared.corpus.numGroups,
    vocabularyWords: prepared.vocabularies.reduce((n, v) => n + v.stems.length, 0),
    themes: run.settings.themes,
    keptSamples: Number(run.settings.keepThetaSamples ?? run.settings.maxSamples ?? 20),
    contrasts: summarySteps(store, run.studyId).length - 1,
  });
}

/** The counts the phases after the sweeps depend on (known before a fit as well as during it). */
export interface AfterSamplingSize {
  readonly answers: number;
  readonly heldOut: number;
  readonly groups: number;
  readonly vocabularyWords: number;
  readonly themes: number;
  readonly keptSamples: number;
  readonly contrasts: number;
}

export function afterSamplingSeconds(n: AfterSamplingSize): AfterSamplingEstimate {
  const { answers: D, themes: K } = n;
  // A contrast's draws cost B × resampling units × K, the units at most 1000 per level and at
  // most the answers; the answers are read once for all contrasts.
  const units = Math.min(D, CONTRAST_UNITS_TYPICAL);
  const contrastSeconds = D * READ_SECONDS_PER_ANSWER + n.contrasts * (CONTRAST_DRAWS * units * K * CONTRAST_SECONDS_PER_CELL + CONTRAST_SECONDS_FIXED);
  const summarySeconds = contrastSeconds + (D + n.heldOut) * K * CHECK_SECONDS_PER_CELL + CHECK_SECONDS_FIXED;
  const stored = n.groups * K * 2 + Math.min(n.groups * K * n.keptSamples, KEPT_SAMPLE_VALUES) + n.vocabularyWords * K + D * 2;
  const storingSeconds = stored / STORED_NUMBERS_PER_SECOND;
  return { summarySeconds, storingSeconds, totalSeconds: summarySeconds + storingSeconds };
}
