// When a sweep of a fit (fit.ts) does more than sample: re-estimating the hyperparameters, saving a
// posterior sample, emitting a checkpoint. Predicates in one place, so the schedule reads as a whole.
//
// Schedule (common practice, as in Wallach, Mimno & McCallum, "Rethinking LDA: why priors
// matter", NIPS 2009, §4): λ and β are re-estimated every `optimizeEvery` sweeps from sweep
// `optimizeFrom` on (default: half the burn-in, so that saved samples come from a chain whose
// priors have settled); samples are saved every `sampleEvery` sweeps after `burnIn`.
import type { FitSettings } from './fit-settings.js';

/** Periodic checkpoints take at most about 1/(1 + CHECKPOINT_SHARE) of a fit's time (common practice: 5%). */
const CHECKPOINT_SHARE = 19;
/** Checkpoints faster than this keep the fixed cadence of checkpointEvery. */
const SLOW_CHECKPOINT_MS = 1000;

/** λ and β are re-estimated after this sweep (never after the last one). */
export function isOptimizationSweep(s: FitSettings, sweep: number): boolean {
  return s.optimizeEvery > 0 && sweep > s.optimizeFrom && sweep % s.optimizeEvery === 0 && sweep < s.sweeps;
}

/** A posterior sample is saved after this sweep. */
export function isSampleSweep(s: FitSettings, sweep: number): boolean {
  return sweep > s.burnIn && (sweep - s.burnIn) % s.sampleEvery === 0;
}

/** A periodic checkpoint falls on this sweep (if affordable, below). */
export function isCheckpointSweep(s: FitSettings, sweep: number): boolean {
  return s.checkpointEvery > 0 && sweep % s.checkpointEvery === 0;
}

/** When the last checkpoint ended and how long it took (performance.now() milliseconds). */
export interface CheckpointPacing {
  lastEnd: number;
  lastMs: number;
}

/**
 * A periodic checkpoint that took over a second (large studies: hundreds of MB) delays the next
 * until the sampling since it is CHECKPOINT_SHARE times longer.
 */
export function isCheckpointAffordable(pacing: CheckpointPacing): boolean {
  return pacing.lastMs < SLOW_CHECKPOINT_MS || performance.now() - pacing.lastEnd >= CHECKPOINT_SHARE * pacing.lastMs;
}
