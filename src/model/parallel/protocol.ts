// Shared-memory protocol between the parallel sampler (main thread) and its worker threads.
//
// Each worker owns CTRL_SLOTS Int32 slots of one SharedArrayBuffer. The main thread writes a
// command and bumps GEN, then Atomics.notify; the worker runs the command, writes DONE = GEN and
// notifies back. Blocking on Atomics.wait keeps Sampler.sweep synchronous (types.ts). Payloads
// larger than a few ints (the corpus arrays of a new sampler) arrive as a message on a
// MessagePort that the worker reads synchronously with receiveMessageOnPort.
//
// One hand-off per sweep: a sweep command first merges the other partitions' moves of the
// previous sweep, then samples. Move logs are double-buffered by sweep parity, so a thread that
// is still reading the other partitions' logs of sweep s−1 never meets a log being written in
// sweep s.
import type { MessagePort } from 'node:worker_threads';
import type { Corpus } from '../types.js';

export const CTRL_SLOTS = 8;
export const GEN = 0;
export const CMD = 1;
export const ARG = 2;
export const DONE = 3;
export const STATUS = 4;
/** Length of the move log written in an even sweep; LOG_LENGTH + 1 for an odd sweep. */
export const LOG_LENGTH = 5;
/** Parity (0 or 1) of the sweep a CMD_SWEEP starts. */
export const PARITY = 7;

export const CMD_INIT = 1;
export const CMD_SWEEP = 2;
export const CMD_PRIORS = 3;
export const CMD_EXIT = 4;

export const STATUS_OK = 0;
export const STATUS_ERROR = 1;

/** What a worker needs to run its share: everything SharedArrayBuffer-backed, nothing copied per token. */
export interface InitMessage {
  corpus: Corpus;
  z: Uint16Array;
  K: number;
  groupPattern: Int32Array;
  alpha: Float64Array;
  beta: Float64Array;
  /** [g0, g1) of each partition; partition 0 is the main thread's. */
  bounds: Int32Array;
  /** Move logs: logs[parity][partition]. */
  logs: Int32Array[][];
  /** Control slots of all partitions (partition p at p·CTRL_SLOTS), for reading log lengths. */
  ctrlAll: Int32Array;
  /** [0] = 1 when the sweeps sum the group part of the likelihood (FastScratch.trackGroupLogLik). */
  track: Int32Array;
  /** Each partition's group-likelihood sum of its last sweep. */
  groupLogLik: Float64Array;
}

export interface WorkerBoot {
  index: number;
  ctrl: Int32Array;
  port: MessagePort;
}
