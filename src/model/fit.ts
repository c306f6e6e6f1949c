// The fit driver: sweeps of a collapsed Gibbs sampler, hyperparameter optimization every few
// sweeps, saved posterior samples after burn-in, progress and checkpoints (docs/design.md §4). Pure:
// the caller (a worker thread, the CLI, a test) decides where progress and checkpoints go.
//
// The pieces: where the chain starts (fit-start.ts), what it carries (fit-run.ts), which sweeps
// optimize, save a sample or checkpoint (fit-schedule.ts, after Wallach, Mimno & McCallum, NIPS
// 2009), one sweep's work (fit-sweep.ts), checkpoints (fit-checkpoint.ts) and the result
// (fit-result.ts).
import type { GroupFeatures } from './features.js';
import { interceptOnlyFeatures } from './features.js';
import { emitCheckpoint } from './fit-checkpoint.js';
import { fitResult } from './fit-result.js';
import { type FitRun, openRun } from './fit-run.js';
import { type CheckpointPacing, isCheckpointAffordable, isCheckpointSweep } from './fit-schedule.js';
import { type FitHooks, type FitResult, type FitSettings, resolveFitSettings } from './fit-settings.js';
import { startingPoint } from './fit-start.js';
import { runOneSweep } from './fit-sweep.js';
import type { Corpus } from './types.js';

export { DEFAULT_FIT_SETTINGS } from './fit-settings.js';
export type { FitHooks, FitResult, FitSettings, SweepProgress } from './fit-settings.js';

/** Fits the polylingual DMR topic model by collapsed Gibbs sampling. */
export async function fitModel(
  corpus: Corpus,
  features: GroupFeatures | null,
  settings: Partial<FitSettings> & { K: number },
  hooks: FitHooks = {},
): Promise<FitResult> {
  const s = resolveFitSettings(settings);
  const feats = features ?? interceptOnlyFeatures(corpus.numGroups);
  const G = corpus.numGroups;
  if (feats.groupPattern.length !== G) throw new Error(`Features describe ${feats.groupPattern.length} groups; the corpus has ${G}.`);
  const starting = startingPoint(corpus, feats, s, hooks.resumeFrom);
  const run = openRun(corpus, feats, s, starting instanceof Promise ? await starting : starting);
  const began = performance.now();
  let stopped: boolean;
  try {
    stopped = await sweepUntilDoneOrStopped(run, hooks, began);
  } catch (error) {
    await run.sampler.dispose?.();
    throw error;
  }
  return fitResult(run, stopped, began);
}

/** The sweep loop; true when hooks.shouldStop ended it before the last sweep. */
async function sweepUntilDoneOrStopped(run: FitRun, hooks: FitHooks, began: number): Promise<boolean> {
  const { settings: s, state } = run;
  const pacing: CheckpointPacing = { lastEnd: began, lastMs: 0 };
  while (state.sweep < s.sweeps) {
    const ll = runOneSweep(run);
    reportProgress(run, hooks, began, ll);
    const stopped = state.sweep < s.sweeps && (hooks.shouldStop?.() ?? false);
    // Periodic checkpoints keep their cadence unless slow (fit-schedule.ts); stopping always saves.
    const due = isCheckpointSweep(s, state.sweep) && isCheckpointAffordable(pacing);
    if (hooks.onCheckpoint && (due || stopped)) await emitCheckpoint(run, hooks, pacing);
    if (stopped) return true;
    // Let the event loop deliver messages (cancel requests) between sweeps.
    await new Promise<void>((r) => setImmediate(r));
  }
  return false;
}

function reportProgress(run: FitRun, hooks: FitHooks, began: number, ll: number): void {
  const { settings: s, state } = run;
  const N = run.corpus.words.length;
  const seconds = (performance.now() - began) / 1000;
  const done = state.sweep - run.startSweep;
  hooks.onSweep?.({
    sweep: state.sweep,
    sweeps: s.sweeps,
    tokensPerSecond: seconds > 0 ? (done * N) / seconds : 0,
    logLikelihoodPerToken: ll,
    eta: done > 0 ? (seconds / done) * (s.sweeps - state.sweep) : 0,
  });
}
