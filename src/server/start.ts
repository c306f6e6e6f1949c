// Starting the workbench: open the data folder, recover the run queue, and listen. Bound to
// anything but loopback, the server refuses to start until an account exists (issue 8).
import { randomBytes } from 'node:crypto';
import { isIP } from 'node:net';
import { serve } from '@hono/node-server';
import { JobQueue } from '../jobs/index.js';
import { ensureDemoStudy } from '../services/index.js';
import { countAccounts, openStore } from '../store/index.js';
import { createApp } from './app.js';

export interface StartServerOptions {
  host?: string;
  port?: number;
  dataDir: string;
  /** Import the demo study on first start. */
  demo?: boolean;
  /** Fits at once (default 1). */
  concurrency?: number;
  uploadLimitBytes?: number;
  secureCookies?: boolean;
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

export class ServerStartError extends Error {
  override readonly name = 'ServerStartError';
}

export async function startServer(options: StartServerOptions): Promise<RunningServer> {
  const host = options.host ?? '127.0.0.1';
  const loopbackOnly = isLoopback(host);
  const store = openStore(options.dataDir);
  if (!loopbackOnly && countAccounts(store) === 0) {
    store.close();
    throw new ServerStartError(
      `Themata will not listen on ${host} (reachable from other computers) before an account exists. ` +
        'Add one with `themata users add NAME`, or serve on 127.0.0.1 for use on this computer only.',
    );
  }
  if (options.demo) {
    await ensureDemoStudy(store);
  }
  const queue = new JobQueue({ store, concurrency: options.concurrency });
  queue.start();
  const app = createApp({
    store,
    queue,
    loopbackOnly,
    secureCookies: options.secureCookies,
    uploadLimitBytes: options.uploadLimitBytes,
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
