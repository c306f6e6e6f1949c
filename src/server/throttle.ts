// Sign-in throttling: failures are counted per account name and per client address, in memory.
// After `accountLimit` failures for one name within the window, or `addressLimit` from one
// address, sign-in is refused for `lockMs` without checking the password. With the defaults
// (5 per name, 15-minute lock) an account can be tried at most 20 times an hour, well inside
// OWASP ASVS 4.0.3 V2.2.1 ("no more than 100 failed attempts per hour"); the numbers themselves
// are common practice. Unknown names are counted like real ones, so a lock says nothing about
// whether an account exists. Counters live in this process only: a restart clears them.

export interface ThrottleLimits {
  /** Failures per account name before it is locked (default 5). */
  readonly accountLimit?: number;
  /** Failures per client address before it is locked (default 20; higher, as a lab may share one address). */
  readonly addressLimit?: number;
  /** Failures older than this are forgotten (default 15 minutes). */
  readonly windowMs?: number;
  /** How long a lock lasts (default 15 minutes). */
  readonly lockMs?: number;
  /** Clock, for tests. */
  readonly now?: () => number;
  /** Most keys kept; the oldest are dropped beyond it, so a flood of names cannot fill memory. */
  readonly maxKeys?: number;
}

interface Counter {
  count: number;
  first: number;
  lockedUntil: number;
}

export interface ThrottleVerdict {
  readonly allowed: boolean;
  /** Whole seconds until a locked sign-in may be tried again (0 when allowed). */
  readonly retryAfterSeconds: number;
}

export class SignInThrottle {
  private readonly counters = new Map<string, Counter>();
  private readonly accountLimit: number;
  private readonly addressLimit: number;
  private readonly windowMs: number;
  private readonly lockMs: number;
  private readonly now: () => number;
  private readonly maxKeys: number;

  constructor(limits: ThrottleLimits = {}) {
    this.accountLimit = limits.accountLimit ?? 5;
    this.addressLimit = limits.addressLimit ?? 20;
    this.windowMs = limits.windowMs ?? 15 * 60_000;
    this.lockMs = limits.lockMs ?? 15 * 60_000;
    this.now = limits.now ?? Date.now;
    this.maxKeys = limits.maxKeys ?? 10_000;
  }

  /** May this name, from this address, try a password now? */
  check(name: string, address: string): ThrottleVerdict {
    const t = this.now();
    let until = 0;
    for (const key of [accountKey(name), addressKey(address)]) {
      const counter = this.counters.get(key);
      if (counter && counter.lockedUntil > t) until = Math.max(until, counter.lockedUntil);
    }
    return until > 0 ? { allowed: false, retryAfterSeconds: Math.ceil((until - t) / 1000) } : { allowed: true, retryAfterSeconds: 0 };
  }

  /** Count a wrong password (or unknown name). */
  fail(name: string, address: string): void {
    this.bump(accountKey(name), this.accountLimit);
    this.bump(addressKey(address), this.addressLimit);
  }

  /** A right password clears the account's failures (the address keeps its count until the window passes). */
  succeed(name: string): void {
    this.counters.delete(accountKey(name));
  }

  private bump(key: string, limit: number): void {
    const t = this.now();
    let counter = this.counters.get(key);
    if (!counter || (counter.lockedUntil <= t && t - counter.first > this.windowMs)) {
      counter = { count: 0, first: t, lockedUntil: 0 };
    }
    this.counters.delete(key); // re-insert: Map order is then oldest activity first
    this.counters.set(key, counter);
    counter.count += 1;
    if (counter.count >= limit) {
      counter.lockedUntil = t + this.lockMs;
      counter.count = 0;
      counter.first = t;
    }
    this.prune(t);
  }

  private prune(t: number): void {
    if (this.counters.size <= this.maxKeys) return;
    for (const [key, counter] of this.counters) {
      if (this.counters.size <= this.maxKeys) break;
      if (counter.lockedUntil <= t) this.counters.delete(key);
    }
    // Still too many (all locked): drop the oldest; forgetting a lock early is the lesser harm.
    for (const key of this.counters.keys()) {
      if (this.counters.size <= this.maxKeys) break;
      this.counters.delete(key);
    }
  }
}

function accountKey(name: string): string {
  return `name:${name.trim()}`;
}

function addressKey(address: string): string {
  return `addr:${address}`;
}
