// The merge step of AD-LDA (Newman, Asuncion, Smyth & Welling, "Distributed algorithms for topic
// models", JMLR 10, 2009, eq. 3): before the next sweep every partition adds the other
// partitions' count changes to its own copy, so all copies equal the counts implied by the shared
// z again. Each thread tracks whether it still owes a merge (PendingMerge), so the merge runs
// exactly once per sweep whether a sweep, a read of the counts or new priors comes first.
import { CTRL_SLOTS, LOG_LENGTH } from './protocol.js';

/** The part of a count state the merge needs (FastState). */
export interface MovesTarget {
  applyMoves(log: Int32Array, length: number): void;
}

export class PendingMerge {
  /** Parity of the sweep whose other-partition moves this copy has not applied yet, or -1. */
  private parity = -1;

  constructor(
    private readonly logs: Int32Array[][],
    private readonly ctrlAll: Int32Array,
    private readonly self: number,
  ) {}

  /** Records that a sweep of this parity has just ended on every partition. */
  owe(parity: number): void {
    this.parity = parity;
  }

  /** Applies every other partition's move log of the owed sweep, in partition order. */
  settle(state: MovesTarget): void {
    const parity = this.parity;
    if (parity < 0) return;
    this.parity = -1;
    const logs = this.logs[parity];
    for (let q = 0; q < logs.length; q++) {
      if (q === this.self) continue;
      state.applyMoves(logs[q], Atomics.load(this.ctrlAll, q * CTRL_SLOTS + LOG_LENGTH + parity));
    }
  }
}
