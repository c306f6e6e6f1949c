// Starting the workbench: open the data folder, recover the run queue, and listen. Bound to
// anything but loopback, the server refuses to start until an account exists (issue 8).
import { randomBytes } from 'node:crypto';
import { isIP } from 'node:net';
import { serve } from '@hono/node-server';
import { JobQueue } from '../jobs/index.js';
import { createFitRun, ensureDemoStudy } from '../services/index.js';
import { scannerFromSetting, type UploadScanner } from '../services/scan-upload.js';

/** The run queued when the demo study is first imported. */
export const DEMO_RUN = { name: 'Eight themes (demo)', themes: 8, sweeps: 400, seed: 20251, holdout: 0.1, covariates: ['branch_region', 'channel', 'age_band', 'wave'] } as const;
import { countAccounts, listRuns, openStore } from '../store/index.js';
import { createApp } from './app.js';
import { normaliseAllowedHost } from './hosts.js';
import { RequestRateLimiter, type RequestLimits } from './throttle.js';

export interface StartServerOptions {
  host?: string;
  port?: number;
  dataDir: string;
  /** Import the demo study on first start. */
  demo?: boolean;
  /** Fits at once (default 1). */
  concurrency?: number;
  uploadLimitBytes?: number;
  /**
   * Served over HTTPS (a TLS proxy in front): the session cookie gets `Secure` and the `__Host-`
   * prefix. Without the option, `THEMATA_SECURE_COOKIES=1` in the environment turns it on, so
   * `themata serve` can use it.
   */
  secureCookies?: boolean;
  /**
   * Host names the server also answers to, e.g. the public name a TLS proxy passes on in its Host
   * header. On loopback only loopback names are accepted otherwise; on other addresses any name is
   * accepted unless this list is given. Without the option, `THEMATA_ALLOWED_HOSTS` (names
   * separated by commas) is read from the environment.
   */
  allowedHosts?: readonly string[];
  /**
   * Request rate limits per signed-in account, or per address when nobody is signed in
   * (throttle.ts; defaults: bursts of 120, 20 a second, posts 30 and 5 a second). `false` turns
   * them off. `themata serve --requests-per-second N` sets them.
   */
  requestLimits?: RequestLimits | false;
  /** Fits one account may have queued or running at once (default 3; see src/jobs/queue.ts). */
  fitsPerAccount?: number;
  /**
   * Virus scanner for uploads (src/services/scan-upload.ts). Without the option the command in
   * `THEMATA_SCAN_COMMAND` is used; with neither, uploads are not scanned.
   */
  uploadScanner?: UploadScanner;
}

export interface RunningServer {
  readonly url: string;
  readonly port: number;
  close(): Promise<void>;
}

export function isLoopback(host: string): boolean {
  if (host === 'localhost') return true;
  const kind = isIP(host);
  if (kind === 4) return host.startsWith('127.');
  if (kind === 6) return host === '::1' || host === '0:0:0:0:0:0:0:1';
  return false;
}

/** `THEMATA_SECURE_COOKIES` / `THEMATA_ALLOWED_HOSTS` as options (for `themata serve`). */
export function settingsFromEnvironment(env: Record<string, string | undefined>): { secureCookies: boolean; allowedHosts: string[] } {
  const secure = (env.THEMATA_SECURE_COOKIES ?? '').trim().toLowerCase();
  return {
    secureCookies: secure === '1' || secure === 'true' || secure === 'yes',
    allowedHosts: (env.THEMATA_ALLOWED_HOSTS ?? '').split(',').map((x) => x.trim()).filter(Boolean),
  };
}

export class ServerStartError extends Error {
  override readonly name = 'ServerStartError';
}

export async function startServer(options: StartServerOptions): Promise<RunningServer> {
  const host = options.host ?? '127.0.0.1';
  const loopbackOnly = isLoopback(host);
  const fromEnv = settingsFromEnvironment(process.env);
  const allowedHosts = options.allowedHosts ?? fromEnv.allowedHosts;
  const badHost = allowedHosts.find((h) => !normaliseAllowedHost(h));
  if (badHost !== undefined) {
    throw new ServerStartError(`"${badHost}" is not a host name. List allowed hosts as names such as lab.example.org, separated by commas.`);
  }
  const store = openStore(options.dataDir);
  if (!loopbackOnly && countAccounts(store) === 0) {
    store.close();
    throw new ServerStartError(
      `Themata will not listen on ${host} (reachable from other computers) before an account exists. ` +
        'Add one with `themata users add NAME`, or serve on 127.0.0.1 for use on this computer only.',
    );
  }
  const demo = options.demo ? await ensureDemoStudy(store) : null;
  const queue = new JobQueue({ store, concurrency: options.concurrency, fitsPerAccount: options.fitsPerAccount });
  queue.start();
  if (demo !== null && demo.status !== 'skipped' && demo.studyId !== null && listRuns(store, demo.studyId).length === 0) {
    // A newcomer's first look should include themes: while the demo study has no run, a start
    // queues one run of the demo's eight themes with its four covariates (within a minute on two
    // cores). The command line imports the demo before it starts the server, so this keys on
    // "no run yet", not on "imported just now".
    const run = createFitRun(store, demo.studyId, { ...DEMO_RUN, covariates: [...DEMO_RUN.covariates] });
    queue.enqueue(run.id);
  }
  const app = createApp({
    store,
    queue,
    loopbackOnly,
    secureCookies: options.secureCookies ?? fromEnv.secureCookies,
    allowedHosts,
    uploadLimitBytes: options.uploadLimitBytes,
    uploadScanner: options.uploadScanner ?? scannerFromSetting(undefined, process.env),
    requestLimiter: options.requestLimits === false ? false : new RequestRateLimiter(options.requestLimits ?? {}),
    localCsrf: randomBytes(24).toString('base64url'),
  });
  const { server, port } = await new Promise<{ server: ReturnType<typeof serve>; port: number }>((resolve, reject) => {
    const s = serve({ fetch: app.fetch, hostname: host, port: options.port ?? 4180 }, (info) => resolve({ server: s, port: info.port }));
    s.once('error', reject);
  });
  const shown = host.includes(':') ? `[${host}]` : host;
  return {
    url: `http://${shown}:${port}/`,
    port,
    async close() {
      await queue.close();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        // Live progress streams keep connections open; end them so closing does not wait.
        (server as { closeAllConnections?: () => void }).closeAllConnections?.();
      });
      store.close();
    },
  };
}
