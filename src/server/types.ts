// What every route can reach: the store, the job queue, and who is asking.
import type { JobQueue } from '../jobs/index.js';
import type { UploadScanner } from '../platform/index.js';
import type { ScryptCost, Store } from '../store/index.js';
import type { RequestRateLimiter, SignInThrottle } from './throttle.js';

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
  /** Request rate limits per account or address (createApp makes one with the defaults when absent; `false` turns them off). */
  readonly requestLimiter?: RequestRateLimiter | false;
  /** Largest upload accepted, in bytes (default 100 MB, common practice for survey exports). */
  readonly uploadLimitBytes?: number;
  /** Tests only: a lower scrypt cost for new password hashes, so tests run quickly. startServer never sets it; production always hashes at PASSWORD_COST. */
  readonly passwordCost?: ScryptCost;
  /** Virus scanner every upload passes before it is read (OWASP ASVS 4.0.3 V12.4.2); none when absent. */
  readonly uploadScanner?: UploadScanner;
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
