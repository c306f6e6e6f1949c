// How long a fit will take and how much memory it will need, said before it starts (issue 15:
// "where a study is larger than one machine can fit in the goal, say so before the fit starts"),
// on the Runs page and by `themata fit`. A cost model in counts — answers, words, themes,
// sweeps, threads — whose rates were measured on the development machine (2 cores, 24 GiB;
// DEVELOPERS.md, "Time left") with the demo generator's studies of 20,000, 200,000 and a million
// answers (`npm run bench -- --only sampler --full`).
// It is an estimate for a machine like that one: the live progress of a fit corrects it.
import { fitInputSize, listRuns, vocabularySizes, type Store } from '../store/index.js';
import { afterSamplingSeconds } from './fit-time.js';
import { summarySteps } from './run-summaries.js';
import { runSettingsOf, type FitRequest } from './run-settings-schema.js';

/**
 * Sampler words per second beyond a sweep's fixed part, fast sampler, K = 50, 2 threads
 * (measured on an idle machine: 1.145 s a sweep of 7.39 million words at a million answers,
 * 0.059 s of 0.13 million at 20,000).
 */
const WORDS_PER_SECOND_TWO_THREADS = 6.7e6;
/** Words per second of one thread against two, at 200,000 answers, K = 50 (measured while other work ran: 0.477 s a sweep against 0.358 s). */
const ONE_THREAD_SHARE = 0.73;
/** A sweep's fixed part: priors, group mixtures, likelihood (0.040 s at K = 50, from the two sizes above). */
const SWEEP_FIXED_SECONDS_PER_THEME = 7.9e-4;
/** Building the corpus from the store, and the warm start, per word (measured at a million answers: 18.5 s and 23.4 s). */
const PREPARING_SECONDS_PER_WORD = 2.5e-6;
const STARTING_SECONDS_PER_WORD = 3.5e-6;
/** The process with its libraries and worker threads loaded (measured RSS, less the parts below). */
const BASE_BYTES = 450e6;
/**
 * Memory per word: corpus arrays, assignments, the answers' records, the workers' copies
 * (measured peak RSS: 4.56 GB at a million answers and 7.39 million words, 0.65 GB at 0.14
 * million words, less the base and the mixtures).
 */
const BYTES_PER_WORD = 400;
/** Memory per answer × theme: the mixtures' running sum and mean (float64) and a float32 copy. */
const BYTES_PER_ANSWER_THEME = 20;
/** Kept mixture samples are capped at 50 million values by the model (fit-settings.ts in src/model), the contrasts' copies at 10 million (contrasts.ts). */
const KEPT_SAMPLE_VALUES = 50e6;
const CONTRAST_SAMPLE_VALUES = 10e6;
/** Most of the machine's memory a fit should take before we say it does not fit (common practice). */
const MEMORY_SHARE = 0.8;

export interface MachineSize {
  readonly memoryBytes: number;
  readonly cores: number;
}

export interface FitEstimate {
  readonly answers: number;
  readonly words: number;
  readonly seconds: { readonly preparing: number; readonly starting: number; readonly sampling: number; readonly after: number; readonly total: number };
  readonly peakBytes: number;
  /** False when the estimate exceeds the machine's memory share; the notes say why. */
  readonly fits: boolean;
  readonly notes: string[];
}

/** The estimate of a fit of the study with these settings, on a machine of this size. */
export function estimateFit(store: Store, studyId: number, request: FitRequest, machine: MachineSize): FitEstimate {
  const settings = runSettingsOf(request);
  const { answers, words } = fitInputSize(store, studyId);
  const K = settings.themes;
  const train = 1 - settings.holdout;
  const trainWords = words * train;
  const threads = Math.max(1, Math.min(settings.threads, machine.cores));
  const rate = WORDS_PER_SECOND_TWO_THREADS * (threads > 1 ? threads / 2 : ONE_THREAD_SHARE);
  const sweepSeconds = trainWords / rate + K * SWEEP_FIXED_SECONDS_PER_THEME;
  const vocabularyWords = vocabularySizes(store, studyId).reduce((n, v) => n + v.words, 0);
  const after = afterSamplingSeconds({
    answers: Math.round(answers * train),
    heldOut: Math.round(answers * settings.holdout),
    groups: Math.round(answers * train),
    vocabularyWords,
    themes: K,
    keptSamples: Number(settings.keepThetaSamples ?? 20),
    contrasts: summarySteps(store, studyId).length - 1,
  });
  const seconds = {
    preparing: trainWords * PREPARING_SECONDS_PER_WORD,
    starting: trainWords * STARTING_SECONDS_PER_WORD,
    sampling: settings.sweeps * sweepSeconds,
    after: after.totalSeconds,
    total: 0,
  };
  seconds.total = seconds.preparing + seconds.starting + seconds.sampling + seconds.after;
  const cells = answers * K;
  const kept = cells * Number(settings.keepThetaSamples ?? 20);
  const mixtureBytes = cells * BYTES_PER_ANSWER_THEME + 4 * Math.min(kept, KEPT_SAMPLE_VALUES) + 4 * Math.min(kept, CONTRAST_SAMPLE_VALUES);
  const peakBytes = BASE_BYTES + words * BYTES_PER_WORD + mixtureBytes;
  const notes: string[] = [];
  const fits = peakBytes <= MEMORY_SHARE * machine.memoryBytes;
  if (!fits) {
    notes.push(
      `This fit needs about ${formatMemory(peakBytes)} of memory and this machine has ${formatMemory(machine.memoryBytes)}: ` +
        'fit fewer answers (a sample, or one wave at a time), or on a machine with more memory.',
    );
  }
  if (seconds.total > 3600) notes.push(`This fit takes more than an hour here: fewer sweeps (${Math.max(100, Math.round(settings.sweeps / 2))}), fewer themes or more threads shorten it.`);
  if (settings.threads > machine.cores) notes.push(`This machine has ${machine.cores} processor cores; the estimate uses ${threads} threads.`);
  const previous = listRuns(store, studyId).filter((r) => r.status === 'finished').length;
  if (previous === 0) notes.push('An estimate for a machine like the one Themata was measured on; the run\'s progress shows the real time left.');
  return { answers, words, seconds, peakBytes, fits, notes };
}

/** "about 12 min", "about 40 s", "about 2 h 5 min". */
export function formatDuration(seconds: number): string {
  return Number.isFinite(seconds) ? `about ${roundedDuration(seconds)}` : 'unknown';
}

/** "12 min", "40 s", "2 h 5 min" (at least 1 s). */
function roundedDuration(seconds: number): string {
  if (seconds < 60) return `${Math.max(1, Math.round(seconds))} s`;
  const minutes = Math.round(seconds / 60);
  return minutes < 60 ? `${minutes} min` : `${Math.floor(minutes / 60)} h ${minutes % 60} min`;
}

function formatMemory(bytes: number): string {
  return bytes >= 1e9 ? `${(bytes / 1e9).toFixed(1)} GB` : `${Math.max(1, Math.round(bytes / 1e6))} MB`;
}

/** One line for the command line and the Runs page. */
export function describeEstimate(e: FitEstimate): string {
  const s = e.seconds;
  return (
    `${e.answers.toLocaleString('en')} answers, ${e.words.toLocaleString('en')} words: ${formatDuration(s.total)} in all ` +
    `(preparing and starting ${roundedDuration(s.preparing + s.starting)}, sweeps ${roundedDuration(s.sampling)}, ` +
    `summaries and storing ${roundedDuration(s.after)}), about ${formatMemory(e.peakBytes)} of memory at the peak.`
  );
}
