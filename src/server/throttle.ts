// Sign-in throttling: failures are counted per account name and per client address, in memory.
// After `accountLimit` failures for one name within the window, or `addressLimit` from one
// address, sign-in is refused for `lockMs` without checking the password. With the defaults
// (5 per name, 15-minute lock) an account can be tried at most 20 times an hour, well inside
// OWASP ASVS 4.0.3 V2.2.1 ("no more than 100 failed attempts per hour"); the numbers themselves
// are common practice. Unknown names are counted like real ones, so a lock says nothing about
// whether an account exists. Counters live in this process only: a restart clears them.
import { getConnInfo } from '@hono/node-server/conninfo';
import type { Context, MiddlewareHandler } from 'hono';
import { ErrorPage } from '../../views/pages/login.js';
import { renderPage } from './render.js';
import type { AppEnv } from './types.js';

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

// Request rate limits (OWASP ASVS 4.0.3 V11.1.2 "realistic human time", V11.1.4 "anti-automation
// against excessive calls"). One token bucket per signed-in account, or per client address when
// nobody is signed in (the sign-in page, and the single local user of a loopback server with no
// accounts). A bucket holds `burst` requests and refills at `perSecond`; form posts, which change
// things and may start work, draw from a second, smaller bucket. The defaults are common practice
// for interactive pages: a person clicking through pages makes a few requests a second (htmx adds a
// few more), so bursts of 120 and 20 a second (30 and 5 a second for posts) never stop a person
// and do stop a script. Static assets are not counted (they are served before this check).

export interface RequestLimits {
  /** Requests a bucket holds, i.e. how many may come at once (default 120). */
  readonly burst?: number;
  /** Requests a second, sustained (default 20). */
  readonly perSecond?: number;
  /** Form posts a bucket holds (default 30). */
  readonly postBurst?: number;
  /** Form posts a second, sustained (default 5). */
  readonly postsPerSecond?: number;
  /** Most buckets kept; the least recently used are dropped beyond it (default 10,000). */
  readonly maxKeys?: number;
  /** Clock, for tests. */
  readonly now?: () => number;
}

export const DEFAULT_REQUESTS_PER_SECOND = 20;

/** Limits scaled from one number, as `themata serve --requests-per-second N` sets them: bursts of six
 * seconds' worth, form posts a quarter of the rate (N = 20 gives the defaults). */
export function requestLimitsFor(perSecond: number): RequestLimits {
  return { perSecond, burst: 6 * perSecond, postsPerSecond: perSecond / 4, postBurst: 1.5 * perSecond };
}

export interface RateVerdict {
  readonly allowed: boolean;
  /** Whole seconds until one more request would be allowed (0 when allowed). */
  readonly retryAfterSeconds: number;
}

interface Bucket {
  tokens: number;
  at: number;
}

export class RequestRateLimiter {
  private readonly buckets = new Map<string, Bucket>();
  private readonly limits: { burst: number; perSecond: number; postBurst: number; postsPerSecond: number };
  private readonly maxKeys: number;
  private readonly now: () => number;

  constructor(limits: RequestLimits = {}) {
    this.limits = {
      burst: Math.max(1, limits.burst ?? 120),
      perSecond: Math.max(1e-6, limits.perSecond ?? DEFAULT_REQUESTS_PER_SECOND),
      postBurst: Math.max(1, limits.postBurst ?? 30),
      postsPerSecond: Math.max(1e-6, limits.postsPerSecond ?? 5),
    };
    this.maxKeys = Math.max(1, limits.maxKeys ?? 10_000);
    this.now = limits.now ?? Date.now;
  }

  /** Count one request of `who` (an account or an address key); a post also draws on the post bucket. */
  take(who: string, post: boolean): RateVerdict {
    const t = this.now();
    const all = this.bucket(`all:${who}`, this.limits.burst, this.limits.perSecond, t);
    const posts = post ? this.bucket(`post:${who}`, this.limits.postBurst, this.limits.postsPerSecond, t) : undefined;
    if (all.tokens < 1 || (posts && posts.tokens < 1)) {
      const wait = Math.max(all.tokens < 1 ? (1 - all.tokens) / this.limits.perSecond : 0, posts && posts.tokens < 1 ? (1 - posts.tokens) / this.limits.postsPerSecond : 0);
      return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil(wait)) };
    }
    all.tokens -= 1;
    if (posts) posts.tokens -= 1;
    return { allowed: true, retryAfterSeconds: 0 };
  }

  /** Buckets held now (for tests of the memory bound). */
  get size(): number {
    return this.buckets.size;
  }

  private bucket(key: string, burst: number, perSecond: number, t: number): Bucket {
    let b = this.buckets.get(key);
    if (b) {
      b.tokens = Math.min(burst, b.tokens + ((t - b.at) / 1000) * perSecond);
      b.at = t;
      this.buckets.delete(key); // re-insert: Map order is then least recently used first
    } else {
      b = { tokens: burst, at: t };
    }
    this.buckets.set(key, b);
    // Forgetting a bucket gives that client a full one again: the lesser harm than unbounded memory.
    for (const old of this.buckets.keys()) {
      if (this.buckets.size <= this.maxKeys) break;
      this.buckets.delete(old);
    }
    return b;
  }
}

/** The client's address as the socket sees it (a proxy's address when behind one). */
export function clientAddress(c: Context): string {
  try {
    return getConnInfo(c).remote.address ?? 'unknown';
  } catch {
    return 'unknown'; // requests made in process (tests) have no socket
  }
}

/**
 * Count each request against its account (signed in) or its address (not signed in) and answer
 * 429 with `Retry-After` beyond the limits. Placed after the session check, so requests refused
 * for want of a session (answered without doing any work) are not counted, and before the CSRF
 * check, so a flood of posts is stopped before its body is read.
 */
export function requestRateLimit(): MiddlewareHandler<AppEnv> {
  return async (c, next) => {
    const limiter = c.get('deps').requestLimiter;
    if (!limiter) return next();
    const user = c.get('user') as AppEnv['Variables']['user'] | undefined;
    const who = user && user.id !== null ? `account:${user.id}` : `address:${clientAddress(c)}`;
    const verdict = limiter.take(who, c.req.method === 'POST');
    if (verdict.allowed) return next();
    c.header('Retry-After', String(verdict.retryAfterSeconds));
    const message =
      `Too many requests in a short time from ${user && user.id !== null ? 'this account' : 'this computer'}. ` +
      `Wait ${verdict.retryAfterSeconds} second${verdict.retryAfterSeconds === 1 ? '' : 's'} and try again; nothing was changed.`;
    if (c.req.header('HX-Request') === 'true') return c.text(message, 429);
    return renderPage(c, ErrorPage({ status: 429, message }), 429);
  };
}
