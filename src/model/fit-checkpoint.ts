// Checkpoints of a running fit (fit.ts): the chain's state in the versioned form checkpoint.ts
// encodes, and its timed hand-over to onCheckpoint, whose duration paces the next one
// (fit-schedule.ts).
import { type Checkpoint, CHECKPOINT_VERSION } from './checkpoint.js';
import type { FitRun } from './fit-run.js';
import type { CheckpointPacing } from './fit-schedule.js';
import type { FitHooks } from './fit-settings.js';

// The checkpoint's arrays are views of the live state (a checkpoint of a million answers holds
// G×K sums of hundreds of MB): onCheckpoint must encode or copy them before it returns.
/** The run's state as a checkpoint; before the first saved sample the (all-zero) sums are left out. */
export function checkpointOf(run: FitRun): Checkpoint {
  const { sampler, state } = run;
  return {
    version: CHECKPOINT_VERSION,
    K: run.settings.K,
    sweep: state.sweep,
    z: sampler.z.slice(),
    rngState: state.rng.saveState(),
    lambda: state.lambda.slice(),
    numFeatures: run.features.numFeatures,
    beta: state.beta.slice(),
    logLikelihoodTrace: Float64Array.from(state.trace),
    phiSum: state.numSamples > 0 ? state.phiSum : new Float64Array(0),
    thetaSum: state.numSamples > 0 ? state.thetaSum : new Float64Array(0),
    numSamples: state.numSamples,
    thetaSamples: [...state.thetaSamples],
    thetaSampleSweeps: [...state.thetaSampleSweeps],
    optimizations: state.optimizations,
  };
}

/** Hands a checkpoint to hooks.onCheckpoint and records when that ended and how long it took. */
export async function emitCheckpoint(run: FitRun, hooks: FitHooks, pacing: CheckpointPacing): Promise<void> {
  const t = performance.now();
  await hooks.onCheckpoint?.(checkpointOf(run));
  pacing.lastEnd = performance.now();
  pacing.lastMs = pacing.lastEnd - t;
}
