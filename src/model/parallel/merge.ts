// The merge step of AD-LDA (Newman, Asuncion, Smyth & Welling, "Distributed algorithms for topic
// models", JMLR 10, 2009, eq. 3): after a sweep every partition adds the other partitions' count
// changes to its own copy, so all copies equal the counts implied by the shared z again.
import type { FastState } from '../fast-state.js';
import { CTRL_SLOTS, LOG_LENGTH } from './protocol.js';

/** Applies every partition's move log except `self` (logs are read in partition order). */
export function mergeOtherLogs(state: FastState, logs: Int32Array[], ctrlAll: Int32Array, self: number): void {
  for (let q = 0; q < logs.length; q++) {
    if (q === self) continue;
    state.applyMoves(logs[q], Atomics.load(ctrlAll, q * CTRL_SLOTS + LOG_LENGTH));
  }
}
