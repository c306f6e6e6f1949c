// What every route can reach: the store, the job queue, and who is asking.
import type { JobQueue } from '../jobs/index.js';
import type { Store } from '../store/index.js';
import type { SignInThrottle } from './throttle.js';

export interface CurrentUser {
  /** Account id, or null in single-user local mode. */
  readonly id: number | null;
  readonly name: string;
  readonly local: boolean;
}

export interface AppDeps {
  readonly store: Store;
  readonly queue: JobQueue;
  /** True when the server listens on loopback only: with no accounts, one local user. */
  readonly loopbackOnly: boolean;
  /** Set the Secure flag on cookies and name the session cookie `__Host-themata_session` (when served over HTTPS behind a proxy). */
  readonly secureCookies?: boolean;
  /** Host names (without port) the server also answers to, e.g. the name a TLS proxy forwards; see hosts.ts. */
  readonly allowedHosts?: readonly string[];
  /** Sign-in failure counter (one per app by default). */
  readonly signInThrottle?: SignInThrottle;
  /** Largest upload accepted, in bytes (default 100 MB, common practice for survey exports). */
  readonly uploadLimitBytes?: number;
  /** CSRF token of the single local user (random per process). */
  readonly localCsrf?: string;
}

export interface AppEnv {
  Variables: {
    user: CurrentUser;
    csrf: string;
    deps: AppDeps;
  };
}
