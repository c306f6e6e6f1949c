// Worker thread of the parallel sampler: keeps its own copy of the counts (FastState), samples
// its partition of link groups with the fast exact sweep, and merges the other partitions' moves
// of the previous sweep before each sweep (AD-LDA, Newman, Asuncion, Smyth & Welling,
// "Distributed algorithms for topic models", JMLR 10, 2009, §2). Commands arrive through shared
// control slots (protocol.ts).
import { receiveMessageOnPort, workerData } from 'node:worker_threads';
import { FastState } from '../fast-state.js';
import { createScratch, sweepGroups, type FastScratch } from '../fast-sweep.js';
import { Xoshiro128 } from '../rng.js';
import {
  ARG, CMD, CMD_EXIT, CMD_INIT, CMD_PRIORS, CMD_SWEEP, DONE, GEN, LOG_LENGTH, PARITY,
  STATUS, STATUS_ERROR, STATUS_OK, type InitMessage, type WorkerBoot,
} from './protocol.js';
import { PendingMerge } from './merge.js';

const boot = workerData as WorkerBoot;
const ctrl = boot.ctrl;
let job: InitMessage | null = null;
let state: FastState | null = null;
let scratch: FastScratch | null = null;
let pending: PendingMerge | null = null;
// GEN starts at 0 in a fresh control block; INIT may have been posted before this module loaded.
let seen = 0;

function run(cmd: number): void {
  if (cmd === CMD_INIT) {
    const received = receiveMessageOnPort(boot.port);
    if (!received) throw new Error('Parallel sampler: the worker found no initialisation message.');
    job = received.message as InitMessage;
    // Workers never expose counts, so they keep no dense table.
    state = new FastState(job.corpus, job.z, { K: job.K, groupPattern: job.groupPattern, alpha: job.alpha, beta: job.beta }, false);
    pending = new PendingMerge(job.logs, job.ctrlAll, boot.index);
    if (scratch === null || scratch.ngk.length !== job.K) scratch = createScratch(job.K);
    return;
  }
  if (job === null || state === null || scratch === null || pending === null) throw new Error('Parallel sampler: worker used before initialisation.');
  const p = boot.index;
  pending.settle(state);
  if (cmd === CMD_SWEEP) {
    const parity = Atomics.load(ctrl, PARITY);
    const rng = Xoshiro128.fromSeed(Atomics.load(ctrl, ARG), p);
    scratch.trackGroupLogLik = Atomics.load(job.track, 0) === 1;
    const length = sweepGroups(state, scratch, job.z, job.groupPattern, job.bounds[p], job.bounds[p + 1], rng, job.logs[parity][p]);
    Atomics.store(ctrl, LOG_LENGTH + parity, length);
    job.groupLogLik[p] = scratch.groupLogLik;
    // The next command comes only after every partition has finished this sweep.
    pending.owe(parity);
  } else if (cmd === CMD_PRIORS) {
    state.setPriors({ K: job.K, groupPattern: job.groupPattern, alpha: job.alpha, beta: job.beta });
  } else {
    throw new Error(`Parallel sampler: unknown command ${cmd}.`);
  }
}

for (;;) {
  Atomics.wait(ctrl, GEN, seen);
  seen = Atomics.load(ctrl, GEN);
  const cmd = Atomics.load(ctrl, CMD);
  if (cmd === CMD_EXIT) break;
  try {
    run(cmd);
    Atomics.store(ctrl, STATUS, STATUS_OK);
  } catch (error) {
    Atomics.store(ctrl, STATUS, STATUS_ERROR);
    boot.port.postMessage({ error: String((error as Error)?.stack ?? error) });
  }
  Atomics.store(ctrl, DONE, seen);
  Atomics.notify(ctrl, DONE);
}
