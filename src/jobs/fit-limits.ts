// Per-account limits on fits: each account may have at most `fitsPerAccount` fits queued or
// running at once (OWASP ASVS 4.0.3 V11.1.3 "per-user limits"). Who queued a run is kept in
// memory, so runs queued before a restart count for no one, and the single local user of a
// loopback server without accounts (requester null) has no such limit.
import { InputError } from '../text/index.js';

/** Who asks for a fit: an account id, or null for the single local user (no limit). */
export type FitRequester = number | null;

export class FitLimits {
  /** Account that queued each run still queued or running here. */
  private readonly requesters = new Map<number, number>();

  constructor(
    readonly fitsPerAccount: number,
    /** Whether a run still counts (queued, or running here). */
    private readonly isPending: (runId: number) => boolean,
  ) {}

  /** Fits this account has queued or running now. */
  fitsOf(account: number): number {
    let n = 0;
    for (const [runId, owner] of this.requesters) {
      if (owner !== account) continue;
      if (this.isPending(runId)) n++;
      else this.requesters.delete(runId); // settled elsewhere (e.g. cancelled while queued by another process)
    }
    return n;
  }

  /** Throws an InputError when this account may not start another fit now. */
  check(requester: FitRequester): void {
    if (requester === null) return;
    const n = this.fitsOf(requester);
    if (n >= this.fitsPerAccount) {
      throw new InputError(
        `You have ${n} fits queued or running, the most one account may have at once (${this.fitsPerAccount}). ` +
          'Wait for one to finish, or cancel one on its run page, then start this one.',
      );
    }
  }

  /** Counts the run for its requester, after checking the limit (a run already counted is not checked again). */
  take(runId: number, requester: FitRequester): void {
    if (requester === null || this.requesters.get(runId) === requester) return;
    this.check(requester);
    this.requesters.set(runId, requester);
  }
}
